// Parcel-scale readout, 14-bit to 5 digits. Expected: disproved (top digit not driven from the converter: tied to 0).
module scale_missing_top_digit_bug (
    input  [13:0] grams,
    output [19:0] bcd
);
    reg [15:0] low_digits;
    reg [19:0] digits;
    integer i, j;

    always @* begin
        digits = 20'd0;
        for (i = 13; i >= 0; i = i - 1) begin
            for (j = 0; j < 5; j = j + 1)
                if (digits[4*j +: 4] >= 4'd5)
                    digits[4*j +: 4] = digits[4*j +: 4] + 4'd3;
            digits = {digits[18:0], grams[i]};
        end
        low_digits = digits[15:0];
    end

    // The ten-thousands digit was left off the display connector.
    assign bcd = {4'd0, low_digits};
endmodule
