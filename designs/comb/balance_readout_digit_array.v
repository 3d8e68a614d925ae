// Lab-balance display, shift-and-add-3 loop with a separate digit register array, 12-bit to 4 digits. Expected: proved.
module balance_readout_digit_array #(
    parameter W = 12,
    parameter N = 4
) (
    input  [W-1:0]   milligrams,
    output [4*N-1:0] display
);
    reg [3:0] d [0:N-1];
    reg [4*N-1:0] packed_digits;
    integer bit_index, k;

    always @* begin
        for (k = 0; k < N; k = k + 1)
            d[k] = 4'd0;
        // Most significant input bit first: after each pass d[] holds the digits of the
        // prefix read so far.
        for (bit_index = W - 1; bit_index >= 0; bit_index = bit_index - 1) begin
            for (k = 0; k < N; k = k + 1)
                if (d[k] > 4'd4)
                    d[k] = d[k] + 4'd3;
            for (k = N - 1; k > 0; k = k - 1)
                d[k] = {d[k][2:0], d[k-1][3]};
            d[0] = {d[0][2:0], milligrams[bit_index]};
        end
        for (k = 0; k < N; k = k + 1)
            packed_digits[4*k +: 4] = d[k];
    end

    assign display = packed_digits;
endmodule
