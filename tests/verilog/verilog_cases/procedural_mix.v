// case/casez, loops, memories with variable addresses, functions; compared against Icarus.
module procedural_mix(input [7:0] a, input [2:0] k, output reg [7:0] y0, output reg [3:0] y1,
                      output [7:0] y2, output reg [7:0] y3);
  reg [7:0] table_ [0:5];
  integer i;
  function [7:0] mix;
    input [7:0] v;
    input [2:0] r;
    integer j;
    begin
      mix = v;
      for (j = 0; j < 3; j = j + 1)
        if (r[j]) mix = {mix[6:0], mix[7]} ^ 8'h1d;
    end
  endfunction
  always @* begin
    for (i = 0; i < 6; i = i + 1) table_[i] = a + i * 7;
    table_[k] = ~a;
    y0 = table_[a[2:0]];
  end
  always @* begin
    casez (a[7:4])
      4'b1???: y1 = 4'd8;
      4'b01??: y1 = 4'd4;
      4'b001?: y1 = 4'd2;
      default: y1 = a[3:0];
    endcase
  end
  assign y2 = mix(a, k);
  always @* begin
    y3 = 0;
    for (i = 7; i >= 0; i = i - 1)
      if (a[i] && y3 == 0) y3 = i + 1;
  end
endmodule
