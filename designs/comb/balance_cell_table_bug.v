// Lab-balance display, structural add-3 cell array, 12-bit to 4 digits. Expected: disproved (cell table entry for 7 gives 11 instead of 10).
module balance_cell_table_bug_cell (
    input      [3:0] a,
    output reg [3:0] y
);
    always @* begin
        case (a)
            4'd5:    y = 4'd8;
            4'd6:    y = 4'd9;
            4'd7:    y = 4'd11;
            4'd8:    y = 4'd11;
            4'd9:    y = 4'd12;
            default: y = a;
        endcase
    end
endmodule

module balance_cell_table_bug #(
    parameter W = 12,
    parameter D = 4
) (
    input  [W-1:0]   milligrams,
    output [4*D-1:0] bcd
);
    wire [4*D-1:0] row [0:W];
    assign row[0] = {(4*D){1'b0}};

    genvar s, j;
    generate
        for (s = 0; s < W; s = s + 1) begin : stage
            wire [4*D-1:0] corrected;
            for (j = 0; j < D; j = j + 1) begin : dig
                balance_cell_table_bug_cell unit (.a(row[s][4*j +: 4]), .y(corrected[4*j +: 4]));
            end
            assign row[s+1] = {corrected[4*D-2:0], milligrams[W-1-s]};
        end
    endgenerate

    assign bcd = row[W];
endmodule
