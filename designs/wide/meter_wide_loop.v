// Wide meter totaliser, shift-and-add-3 loop over one {digits, binary} register, W bits (32..256) to digits_for(W) digits. Expected: proved.
module meter_wide_loop (count, bcd);
    parameter W = 64;

    // Digits of 2**w - 1, i.e. floor(w * log10(2)) + 1 with log10(2) ~ 0.30103; exact for
    // every w from 1 to 1024.
    function integer digits_for(input integer w);
        digits_for = (w * 30103) / 100000 + 1;
    endfunction

    localparam D = digits_for(W);

    input  [W-1:0]   count;
    output [4*D-1:0] bcd;

    reg [4*D+W-1:0] work;
    integer step, digit;

    always @* begin
        work = {{(4*D){1'b0}}, count};
        for (step = 0; step < W; step = step + 1) begin
            for (digit = 0; digit < D; digit = digit + 1)
                if (work[W+4*digit +: 4] >= 4'd5)
                    work[W+4*digit +: 4] = work[W+4*digit +: 4] + 4'd3;
            work = work << 1;
        end
    end

    assign bcd = work[4*D+W-1:W];
endmodule
