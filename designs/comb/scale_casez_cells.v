// Parcel-scale readout, add-3 cells written as casez with wildcards, loop of cell calls, 12-bit to 4 digits. Expected: proved.
module scale_casez_cells #(
    parameter W = 12,
    parameter D = 4
) (
    input  [W-1:0]   grams,
    output [4*D-1:0] bcd
);
    // Digit >= 5 is 8..15 (top bit set) or 5, 6, 7 (0101, 0110, 0111).
    function [3:0] corrected;
        input [3:0] digit;
        begin
            casez (digit)
                4'b1???: corrected = digit + 4'd3;
                4'b0101,
                4'b011?: corrected = digit + 4'd3;
                default: corrected = digit;
            endcase
        end
    endfunction

    reg [4*D-1:0] digits;
    integer i, j;

    always @* begin
        digits = {(4*D){1'b0}};
        for (i = W - 1; i >= 0; i = i - 1) begin
            for (j = 0; j < D; j = j + 1)
                digits[4*j +: 4] = corrected(digits[4*j +: 4]);
            digits = {digits[4*D-2:0], grams[i]};
        end
    end

    assign bcd = digits;
endmodule
