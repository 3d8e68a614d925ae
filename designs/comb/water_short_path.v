// Water-meter readout, single-digit short path (values below 10 bypass the converter) around an add-3 loop, 12-bit to 4 digits. Expected: proved.
module water_short_path_core #(
    parameter W = 12,
    parameter D = 4
) (
    input      [W-1:0]   value,
    output reg [4*D-1:0] bcd
);
    integer i, j;
    always @* begin
        bcd = 0;
        for (i = W - 1; i >= 0; i = i - 1) begin
            for (j = 0; j < D; j = j + 1)
                if (bcd[4*j +: 4] >= 4'd5)
                    bcd[4*j +: 4] = bcd[4*j +: 4] + 4'd3;
            bcd = {bcd[4*D-2:0], value[i]};
        end
    end
endmodule

module water_short_path (
    input  [11:0] litres,
    output [15:0] bcd
);
    wire [15:0] converted;
    water_short_path_core #(.W(12), .D(4)) core (.value(litres), .bcd(converted));

    // A single digit is its own BCD code; the display shows it without waiting for the core.
    assign bcd = (litres < 12'd10) ? {12'd0, litres[3:0]} : converted;
endmodule
