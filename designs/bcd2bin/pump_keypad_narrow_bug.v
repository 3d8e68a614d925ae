// Fuel-pump preset keypad, multiply-by-ten loop, 4 digits into a 13-bit output. Expected: disproved (output too narrow: 13 bits hold at most 8191, 4 digits reach 9999).
module pump_keypad_narrow_bug (
    input      [15:0] keys,
    output reg [12:0] litres
);
    integer i;
    always @* begin
        litres = 13'd0;
        for (i = 3; i >= 0; i = i - 1)
            litres = litres * 10 + keys[4*i +: 4];
    end
endmodule
