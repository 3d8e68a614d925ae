// Utility-meter register reading: D BCD digits (20 or 40) converted to binary by a multiply-by-ten loop, W = bits of 10**D - 1 (67 or 133). Expected: proved.
module meter_wide_bcd2bin #(
    parameter D = 20,
    parameter W = 67
) (
    input      [4*D-1:0] reading,
    output reg [W-1:0]   units
);
    integer i;
    always @* begin
        units = {W{1'b0}};
        for (i = D - 1; i >= 0; i = i - 1)
            units = units * 4'd10 + reading[4*i +: 4];
    end
endmodule
