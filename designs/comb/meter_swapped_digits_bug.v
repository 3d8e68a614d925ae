// Electricity-meter readout, 10-bit to 4 digits. Expected: disproved (digit order swapped: most significant digit in the low nibble).
module meter_swapped_digits_bug (
    input  [9:0]  kilowatt_hours,
    output [15:0] bcd
);
    reg [15:0] digits;
    integer i, j;

    always @* begin
        digits = 16'd0;
        for (i = 9; i >= 0; i = i - 1) begin
            for (j = 0; j < 4; j = j + 1)
                if (digits[4*j +: 4] >= 4'd5)
                    digits[4*j +: 4] = digits[4*j +: 4] + 4'd3;
            digits = {digits[14:0], kilowatt_hours[i]};
        end
    end

    assign bcd = {digits[3:0], digits[7:4], digits[11:8], digits[15:12]};
endmodule
