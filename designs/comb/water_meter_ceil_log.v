// Water-meter readout with digit count localparam D = $ceil(W * $log10(2)), 14-bit to 5 digits. Expected: proved.
// The real-valued $ceil result is assigned to an integer localparam, so D is an exact integer
// (ceil(W * log10(2)) is the digit count of 2**W - 1 for every W >= 1).
module water_meter_ceil_log (litres, bcd);
    parameter W = 14;
    localparam integer D = $ceil(W * $log10(2));

    input  [W-1:0]   litres;
    output [4*D-1:0] bcd;

    reg [4*D-1:0] digits;
    integer i, j;

    always @* begin
        digits = 0;
        for (i = W - 1; i >= 0; i = i - 1) begin
            for (j = 0; j < D; j = j + 1)
                if (digits[4*j +: 4] > 4'd4)
                    digits[4*j +: 4] = digits[4*j +: 4] + 4'd3;
            digits = {digits[4*D-2:0], litres[i]};
        end
    end

    assign bcd = digits;
endmodule
