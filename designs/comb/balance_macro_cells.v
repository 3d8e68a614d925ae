// Lab-balance display, shift-and-add-3 built from macros and an included cell header, 12-bit to 4 digits. Expected: proved.
`timescale 1ns / 1ps
`include "bcd_cells.vh"

`ifdef BALANCE_WIDE_DISPLAY
  `define BALANCE_DIGITS 5
`else
  `define BALANCE_DIGITS 4
`endif

module balance_macro_cells #(
    parameter W = 12
) (
    input  [W-1:0]                   tenth_grams,
    output [4*`BALANCE_DIGITS-1:0]   bcd
);
    localparam D = `BALANCE_DIGITS;
    reg [4*D-1:0] digits;
    integer i, j;

    always @* begin
        digits = {4*D{1'b0}};
        for (i = W - 1; i >= 0; i = i - 1) begin
            for (j = 0; j < D; j = j + 1)
                digits[4*j +: 4] = `BCD_CORRECT(digits[4*j +: 4]);
            digits = {digits[4*D-2:0], tenth_grams[i]};
        end
    end

    assign bcd = digits;
endmodule
