// Shared add-3 correction for the macro-built converters: one decimal digit before doubling.
`ifndef BCD_CELLS_VH
`define BCD_CELLS_VH

`define BCD_THRESHOLD 4'd5
`define BCD_CORRECT(digit) (((digit) >= `BCD_THRESHOLD) ? (digit) + 4'd3 : (digit))

`endif
