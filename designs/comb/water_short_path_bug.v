// Water-meter readout with a single-digit short path, 12-bit to 4 digits. Expected: disproved (short path taken for values up to 10 instead of below 10).
module water_short_path_bug (
    input  [11:0] litres,
    output [15:0] bcd
);
    reg [15:0] converted;
    integer i, j;

    always @* begin
        converted = 16'd0;
        for (i = 11; i >= 0; i = i - 1) begin
            for (j = 0; j < 4; j = j + 1)
                if (converted[4*j +: 4] >= 4'd5)
                    converted[4*j +: 4] = converted[4*j +: 4] + 4'd3;
            converted = {converted[14:0], litres[i]};
        end
    end

    assign bcd = (litres <= 12'd10) ? {12'd0, litres[3:0]} : converted;
endmodule
