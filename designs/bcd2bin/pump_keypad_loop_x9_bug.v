// Fuel-pump preset keypad, multiply-by-ten loop written as shifts, 4 digits to 14 bits. Expected: disproved (times ten written as (v << 3) + v, which is times nine).
module pump_keypad_loop_x9_bug #(
    parameter D = 4,
    parameter W = 14
) (
    input      [4*D-1:0] keys,
    output reg [W-1:0]   litres
);
    integer i;
    always @* begin
        litres = {W{1'b0}};
        for (i = D - 1; i >= 0; i = i - 1)
            litres = (litres << 3) + litres + keys[4*i +: 4];
    end
endmodule
