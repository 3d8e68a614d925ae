// Fuel-pump price keypad, shift right and subtract, three BCD digits to 10 bits. Expected: disproved (subtracts 3 only from digits of 9 or more, so a digit 8 is left uncorrected).
module pump_keypad_shift_sub_bug (
    input      [11:0] cents_bcd,
    output reg [9:0]  cents
);
    reg [21:0] work;
    integer step, j;
    always @* begin
        work = {cents_bcd, 10'd0};
        for (step = 0; step < 10; step = step + 1) begin
            work = work >> 1;
            for (j = 0; j < 3; j = j + 1)
                if (work[10 + 4*j +: 4] >= 4'd9)
                    work[10 + 4*j +: 4] = work[10 + 4*j +: 4] - 4'd3;
        end
        cents = work[9:0];
    end
endmodule
