// Fuel-pump totaliser with a display enable (blank code 4'hF on every digit while en is low), 12-bit to 4 digits. Expected: proved with en tied to 1.
module pump_enable (
    input         en,
    input  [11:0] centilitres,
    output [15:0] bcd
);
    reg [15:0] digits;
    integer i, j;

    always @* begin
        digits = 16'd0;
        for (i = 11; i >= 0; i = i - 1) begin
            for (j = 0; j < 4; j = j + 1)
                if (digits[4*j +: 4] >= 4'd5)
                    digits[4*j +: 4] = digits[4*j +: 4] + 4'd3;
            digits = {digits[14:0], centilitres[i]};
        end
    end

    assign bcd = en ? digits : 16'hFFFF;
endmodule
