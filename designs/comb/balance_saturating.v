// Lab-balance display saturating at 9999 (four digits), 16-bit input. Expected: proved.
// Inputs above the display maximum show 9999; the converter only ever sees 0..9999.
module balance_saturating (
    input  [15:0] milligrams,
    output [15:0] bcd
);
    localparam [15:0] DISPLAY_MAX = 16'd9999;

    wire [13:0] shown = (milligrams > DISPLAY_MAX) ? DISPLAY_MAX[13:0] : milligrams[13:0];
    reg  [15:0] digits;
    integer i, j;

    always @* begin
        digits = 16'd0;
        for (i = 13; i >= 0; i = i - 1) begin
            for (j = 0; j < 4; j = j + 1)
                if (digits[4*j +: 4] >= 4'd5)
                    digits[4*j +: 4] = digits[4*j +: 4] + 4'd3;
            digits = {digits[14:0], shown[i]};
        end
    end

    assign bcd = digits;
endmodule
