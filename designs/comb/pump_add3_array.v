// Fuel-pump totaliser, structural add-3 cell array built with generate, 14-bit to 5 digits. Expected: proved.
module pump_add3_cell (
    input      [3:0] a,
    output reg [3:0] y
);
    // Values 10..15 never reach a cell in a correct array; they are mapped like the rest
    // so that the table is total.
    always @* begin
        case (a)
            4'd0: y = 4'd0;
            4'd1: y = 4'd1;
            4'd2: y = 4'd2;
            4'd3: y = 4'd3;
            4'd4: y = 4'd4;
            4'd5: y = 4'd8;
            4'd6: y = 4'd9;
            4'd7: y = 4'd10;
            4'd8: y = 4'd11;
            4'd9: y = 4'd12;
            default: y = a + 4'd3;
        endcase
    end
endmodule

module pump_add3_array #(
    parameter W = 14,
    parameter D = 5
) (
    input  [W-1:0]   pulses,
    output [4*D-1:0] bcd
);
    // row[s] holds the digits of the top s input bits.
    wire [4*D-1:0] row [0:W];
    assign row[0] = {(4*D){1'b0}};

    genvar s, j;
    generate
        for (s = 0; s < W; s = s + 1) begin : stage
            wire [4*D-1:0] corrected;
            for (j = 0; j < D; j = j + 1) begin : dig
                pump_add3_cell unit (.a(row[s][4*j +: 4]), .y(corrected[4*j +: 4]));
            end
            assign row[s+1] = {corrected[4*D-2:0], pulses[W-1-s]};
        end
    endgenerate

    assign bcd = row[W];
endmodule
