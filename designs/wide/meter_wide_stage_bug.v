// Wide meter totaliser, add-3 cell array, W bits (32..256). Expected: disproved for W > 40 (the cell of stage 40, digit 7 corrects from 6 instead of 5); Expected: proved for W <= 40, where that stage does not exist.
module meter_wide_stage_bug_cell (
    input  [3:0] a,
    output [3:0] y
);
    parameter THRESHOLD = 5;
    assign y = (a >= THRESHOLD) ? a + 4'd3 : a;
endmodule

module meter_wide_stage_bug (count, bcd);
    parameter W = 64;

    function integer digits_for(input integer w);
        digits_for = (w * 30103) / 100000 + 1;   // floor(w*log10 2)+1, exact for w <= 1024
    endfunction

    localparam D = digits_for(W);

    input  [W-1:0]   count;
    output [4*D-1:0] bcd;

    // row[s]: digits of the top s input bits; stage s corrects row[s] and shifts bit s in.
    wire [4*D-1:0] row [0:W];
    assign row[0] = {(4*D){1'b0}};

    genvar s, j;
    generate
        for (s = 0; s < W; s = s + 1) begin : stage
            wire [4*D-1:0] corrected;
            for (j = 0; j < D; j = j + 1) begin : dig
                meter_wide_stage_bug_cell #(.THRESHOLD((s == 40 && j == 7) ? 6 : 5))
                    unit (.a(row[s][4*j +: 4]), .y(corrected[4*j +: 4]));
            end
            assign row[s+1] = {corrected[4*D-2:0], count[W-1-s]};
        end
    endgenerate

    assign bcd = row[W];
endmodule
