// Fuel-pump preset keypad with a key-error lamp, 3 BCD digits to 10 bits. Expected: disproved (the lamp tests digits above 10, so a digit of exactly 10 is not flagged).
module pump_keypad_checked_bug (
    input  [11:0] keys,
    output [9:0]  litres,
    output        bad_key
);
    wire [3:0] d0 = keys[3:0];
    wire [3:0] d1 = keys[7:4];
    wire [3:0] d2 = keys[11:8];
    assign bad_key = (d0 > 4'd10) | (d1 > 4'd10) | (d2 > 4'd10);
    assign litres = d2 * 7'd100 + d1 * 4'd10 + d0;
endmodule
