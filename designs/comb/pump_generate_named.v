// Fuel-pump totaliser, generate-built add-3 array with named blocks stage[i].dig[j], 10-bit to 4 digits. Expected: proved.
module pump_generate_named #(
    parameter W = 10,
    parameter D = 4
) (
    input  [W-1:0]   centilitres,
    output [4*D-1:0] bcd
);
    genvar i, j;
    generate
        for (i = 0; i < W; i = i + 1) begin : stage
            // digits: the decimal digits of the top i+1 input bits.
            wire [4*D-1:0] digits;
            for (j = 0; j < D; j = j + 1) begin : dig
                wire [3:0] incoming;
                wire [3:0] corrected;
                if (i == 0) begin : top_stage
                    assign incoming = 4'd0;
                end else begin : later
                    assign incoming = stage[i-1].digits[4*j +: 4];
                end
                assign corrected = (incoming >= 4'd5) ? incoming + 4'd3 : incoming;
                // Doubling: this digit's low three bits move up, the digit below lends its top bit.
                if (j == 0) begin : lowest
                    assign digits[3:0] = {corrected[2:0], centilitres[W-1-i]};
                end else begin : upper
                    assign digits[4*j +: 4] = {corrected[2:0], stage[i].dig[j-1].corrected[3]};
                end
            end
        end
    endgenerate

    assign bcd = stage[W-1].digits;
endmodule
