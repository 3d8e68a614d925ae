// Fuel-pump preset keypad: four BCD digits keyed in, converted to whole litres by a multiply-by-ten loop, 4 digits to 14 bits. Expected: proved.
module pump_keypad_loop #(
    parameter D = 4,
    parameter W = 14
) (
    input      [4*D-1:0] keys,     // digit i in keys[4*i+3:4*i], least significant first
    output reg [W-1:0]   litres
);
    integer i;
    always @* begin
        litres = {W{1'b0}};
        for (i = D - 1; i >= 0; i = i - 1)
            litres = litres * 10 + keys[4*i +: 4];
    end
endmodule
