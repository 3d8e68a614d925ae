// Generate loops, parameter overrides, port width mismatches, gates; compared against Icarus.
module hm_cell #(parameter W = 3, parameter signed [4:0] K = -3) (input [W-1:0] x, output [W:0] y);
  assign y = x * 2 + K;
endmodule
module hierarchy_mix(input [7:0] a, input [1:0] b, output [15:0] y, output [4:0] z, output g);
  genvar i;
  generate for (i = 0; i < 4; i = i + 1) begin : lane
    wire [2:0] part;
    hm_cell #(.W(3), .K(i)) u (.x(a[2*i +: 2]), .y(part));
    assign y[4*i +: 4] = {1'b0, part};
  end endgenerate
  hm_cell #(4) wide (.x(b), .y(z));
  xor (g, a[0], a[1], b[0]);
endmodule
