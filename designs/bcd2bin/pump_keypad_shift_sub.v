// Fuel-pump price keypad, three BCD digits to a 10-bit binary value by shifting right and subtracting 3 from every digit of 8 or more. Expected: proved.
module pump_keypad_shift_sub (
    input      [11:0] cents_bcd,
    output reg [9:0]  cents
);
    reg [21:0] work;     // {digits, binary}: the digits shift out into the binary part
    integer step, j;
    always @* begin
        work = {cents_bcd, 10'd0};
        for (step = 0; step < 10; step = step + 1) begin
            work = work >> 1;
            for (j = 0; j < 3; j = j + 1)
                if (work[10 + 4*j +: 4] >= 4'd8)
                    work[10 + 4*j +: 4] = work[10 + 4*j +: 4] - 4'd3;
        end
        cents = work[9:0];
    end
endmodule
