// Fuel-pump totaliser with a trimmed top digit, 18-bit input to 22-bit output (top digit 2 bits). Expected: proved.
// 2**18 - 1 = 262143, so the hundred-thousands digit never exceeds 2 and needs only two bits.
module pump_trimmed_top (
    input  [17:0] millilitres,
    output [21:0] bcd
);
    reg [23:0] digits;
    integer i, j;

    always @* begin
        digits = 24'd0;
        for (i = 17; i >= 0; i = i - 1) begin
            for (j = 0; j < 6; j = j + 1)
                if (digits[4*j +: 4] >= 4'd5)
                    digits[4*j +: 4] = digits[4*j +: 4] + 4'd3;
            digits = {digits[22:0], millilitres[i]};
        end
    end

    assign bcd = digits[21:0];
endmodule
