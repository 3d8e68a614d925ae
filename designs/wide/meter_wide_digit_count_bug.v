// Wide meter totaliser, add-3 loop, W bits (32..256). Expected: disproved for W >= 64 (digit count estimated as W*29/100 + 1: the top digit is missing); Expected: proved for W = 32, where the estimate is still exact.
module meter_wide_digit_count_bug (count, bcd);
    parameter W = 64;

    // log10(2) rounded down to 0.29. At W = 32 this still gives 10 digits (9.28 -> 9, plus 1),
    // which is right; at W = 64 it gives 19 where 2**64 - 1 has 20, at W = 256 75 instead of 78.
    function integer digits_for(input integer w);
        digits_for = (w * 29) / 100 + 1;
    endfunction

    localparam D = digits_for(W);

    input  [W-1:0]   count;
    output [4*D-1:0] bcd;

    reg [4*D-1:0] digits;
    integer i, j;

    always @* begin
        digits = {(4*D){1'b0}};
        for (i = W - 1; i >= 0; i = i - 1) begin
            for (j = 0; j < D; j = j + 1)
                if (digits[4*j +: 4] >= 4'd5)
                    digits[4*j +: 4] = digits[4*j +: 4] + 4'd3;
            digits = {digits[4*D-2:0], count[i]};
        end
    end

    assign bcd = digits;
endmodule
