// Fuel-pump nozzle number from two keypad digits on ports tens and ones, 2 digits to 7 bits. Expected: proved.
module pump_tens_ones (
    input  [3:0] tens,
    input  [3:0] ones,
    output [6:0] nozzle
);
    // ten times tens as (tens << 3) + (tens << 1)
    assign nozzle = {tens, 3'b000} + {tens, 1'b0} + ones;
endmodule
