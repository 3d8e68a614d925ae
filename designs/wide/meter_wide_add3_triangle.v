// Wide meter totaliser, triangular add-3 cell array (no cell where a digit is known to be zero), W bits (32..256). Expected: proved.
// Before stage s shifts in its bit, the digits hold the top s input bits, a number below 2**s,
// so only its digits_for(s) lowest digits can be non-zero; higher ones pass through as wires.
module meter_wide_triangle_cell (
    input  [3:0] a,
    output [3:0] y
);
    assign y = (a >= 4'd5) ? a + 4'd3 : a;
endmodule

module meter_wide_add3_triangle (count, bcd);
    parameter W = 64;

    function integer digits_for(input integer w);
        // floor(w*log10 2)+1 for w >= 1 (exact up to 1024); no digit is needed for w = 0.
        if (w == 0)
            digits_for = 0;
        else
            digits_for = (w * 30103) / 100000 + 1;
    endfunction

    localparam D = digits_for(W);

    input  [W-1:0]   count;
    output [4*D-1:0] bcd;

    wire [4*D-1:0] row [0:W];
    assign row[0] = {(4*D){1'b0}};

    genvar s, j;
    generate
        for (s = 0; s < W; s = s + 1) begin : stage
            wire [4*D-1:0] corrected;
            for (j = 0; j < D; j = j + 1) begin : dig
                if (j < digits_for(s)) begin : placed
                    meter_wide_triangle_cell unit (.a(row[s][4*j +: 4]), .y(corrected[4*j +: 4]));
                end else begin : known_zero
                    assign corrected[4*j +: 4] = row[s][4*j +: 4];
                end
            end
            assign row[s+1] = {corrected[4*D-2:0], count[W-1-s]};
        end
    endgenerate

    assign bcd = row[W];
endmodule
