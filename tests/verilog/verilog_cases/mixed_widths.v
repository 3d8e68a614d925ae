// Width and sign rules of IEEE 1364-2005 clauses 5.4 and 5.5, compared against Icarus.
module mixed_widths(input [7:0] a, input signed [7:0] s, input [3:0] n,
                    output [15:0] y0, y1, y2, y3, y4, y5, y6, y7);
  assign y0 = a + s;                         // unsigned: s zero-extended
  assign y1 = s + 16'sd0 - a[3:0];           // unsigned because of the select
  assign y2 = (s * 3'sd3) >>> 1;             // signed multiply in 16 bits
  assign y3 = {a, s} >> n;
  assign y4 = (a > s) ? s : -a;
  assign y5 = s ** 2 + (a % (n + 1)) + a / n;
  assign y6 = {4{n[1:0]}} ^ ~a;
  assign y7 = $signed(a[7:4]) * s + (s >>> n) + (a <<< n[1:0]);
endmodule
