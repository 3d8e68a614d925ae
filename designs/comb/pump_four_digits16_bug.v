// Fuel-pump totaliser, 16-bit input into only 4 digits. Expected: disproved (too few digits: 65535 needs 5).
module pump_four_digits16_bug (
    input  [15:0] centilitres,
    output [15:0] bcd
);
    reg [15:0] digits;
    integer i, j;

    always @* begin
        digits = 16'd0;
        for (i = 15; i >= 0; i = i - 1) begin
            for (j = 0; j < 4; j = j + 1)
                if (digits[4*j +: 4] >= 4'd5)
                    digits[4*j +: 4] = digits[4*j +: 4] + 4'd3;
            digits = {digits[14:0], centilitres[i]};
        end
    end

    assign bcd = digits;
endmodule
