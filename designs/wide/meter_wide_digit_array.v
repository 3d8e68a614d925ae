// Wide meter totaliser, shift-and-add-3 loop with a separate digit register array, W bits (32..256) to digits_for(W) digits. Expected: proved.
module meter_wide_digit_array (count, bcd);
    parameter W = 64;

    function integer digits_for(input integer w);
        // floor(w * log10(2)) + 1, exact for w = 1..1024.
        digits_for = (w * 30103) / 100000 + 1;
    endfunction

    localparam D = digits_for(W);

    input      [W-1:0]   count;
    output reg [4*D-1:0] bcd;

    reg [3:0] digit [0:D-1];
    integer i, k;

    always @* begin
        for (k = 0; k < D; k = k + 1)
            digit[k] = 4'd0;
        for (i = W - 1; i >= 0; i = i - 1) begin
            for (k = 0; k < D; k = k + 1)
                if (digit[k] >= 4'd5)
                    digit[k] = digit[k] + 4'd3;
            // Double the whole number: each digit takes the top bit of the digit below.
            for (k = D - 1; k > 0; k = k - 1)
                digit[k] = {digit[k][2:0], digit[k-1][3]};
            digit[0] = {digit[0][2:0], count[i]};
        end
        for (k = 0; k < D; k = k + 1)
            bcd[4*k +: 4] = digit[k];
    end
endmodule
