// Water-meter readout, shift-and-add-3 loop, 12-bit to 4 digits. Expected: disproved (correction threshold 6 instead of 5).
module meter_threshold6_bug #(
    parameter W = 12,
    parameter D = 4
) (
    input  [W-1:0]   litres,
    output [4*D-1:0] bcd
);
    reg [4*D-1:0] digits;
    integer i, j;

    always @* begin
        digits = 0;
        for (i = W - 1; i >= 0; i = i - 1) begin
            for (j = 0; j < D; j = j + 1)
                if (digits[4*j +: 4] >= 4'd6)
                    digits[4*j +: 4] = digits[4*j +: 4] + 4'd3;
            digits = {digits[4*D-2:0], litres[i]};
        end
    end

    assign bcd = digits;
endmodule
