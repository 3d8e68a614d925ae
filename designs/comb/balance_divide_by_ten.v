// Lab-balance display, repeated division by ten, 20-bit to 7 digits. Expected: proved.
module balance_divide_by_ten #(
    parameter W = 20,
    parameter D = 7
) (
    input      [W-1:0]   micrograms,
    output reg [4*D-1:0] bcd
);
    reg [W-1:0] quotient;
    integer k;

    always @* begin
        quotient = micrograms;
        for (k = 0; k < D; k = k + 1) begin
            bcd[4*k +: 4] = quotient % 10;
            quotient = quotient / 10;
        end
    end
endmodule
