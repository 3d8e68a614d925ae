// Utility-meter register reading, D BCD digits to W bits as a sum of digit times place weight, from the ones digit up (the weight is multiplied by ten each step). Expected: proved.
module meter_wide_bcd2bin_weights #(
    parameter D = 20,
    parameter W = 67
) (
    input      [4*D-1:0] reading,
    output reg [W-1:0]   units
);
    reg [W-1:0] weight;
    integer i;
    always @* begin
        units = {W{1'b0}};
        weight = {{(W-1){1'b0}}, 1'b1};
        for (i = 0; i < D; i = i + 1) begin
            units = units + reading[4*i +: 4] * weight;
            weight = weight * 4'd10;
        end
    end
endmodule
