// Fuel-pump preset keypad with a key-error lamp: 3 BCD digits to 10 bits, bad_key high exactly when a digit is above 9. Expected: proved.
module pump_keypad_checked (
    input  [11:0] keys,
    output [9:0]  litres,
    output        bad_key
);
    wire [3:0] d0 = keys[3:0];
    wire [3:0] d1 = keys[7:4];
    wire [3:0] d2 = keys[11:8];
    assign bad_key = (d0 > 4'd9) | (d1 > 4'd9) | (d2 > 4'd9);
    // For a bad key the sum below is meaningless; the lamp tells the pump to ignore it.
    assign litres = d2 * 7'd100 + d1 * 4'd10 + d0;
endmodule
