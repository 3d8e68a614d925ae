// Wide meter totaliser, structural add-3 cell array (every stage has a cell on every digit), W bits (32..256). Expected: proved.
module meter_wide_add3_cell (
    input      [3:0] a,
    output reg [3:0] y
);
    always @* begin
        case (a)
            4'd5:    y = 4'd8;
            4'd6:    y = 4'd9;
            4'd7:    y = 4'd10;
            4'd8:    y = 4'd11;
            4'd9:    y = 4'd12;
            4'd10:   y = 4'd13;
            4'd11:   y = 4'd14;
            4'd12:   y = 4'd15;
            4'd13:   y = 4'd0;
            4'd14:   y = 4'd1;
            4'd15:   y = 4'd2;
            default: y = a;      // 0..4 need no correction
        endcase
    end
endmodule

module meter_wide_add3_full (count, bcd);
    parameter W = 64;

    function integer digits_for(input integer w);
        digits_for = (w * 30103) / 100000 + 1;   // floor(w*log10 2)+1, exact for w <= 1024
    endfunction

    localparam D = digits_for(W);

    input  [W-1:0]   count;
    output [4*D-1:0] bcd;

    // row[s]: the digits of the top s input bits.
    wire [4*D-1:0] row [0:W];
    assign row[0] = {(4*D){1'b0}};

    genvar s, j;
    generate
        for (s = 0; s < W; s = s + 1) begin : stage
            wire [4*D-1:0] corrected;
            for (j = 0; j < D; j = j + 1) begin : dig
                meter_wide_add3_cell unit (.a(row[s][4*j +: 4]), .y(corrected[4*j +: 4]));
            end
            assign row[s+1] = {corrected[4*D-2:0], count[W-1-s]};
        end
    endgenerate

    assign bcd = row[W];
endmodule
