// Wide meter totaliser, digits by repeated division by ten, W bits (32..256). Expected: proved.
module meter_wide_divide (count, bcd);
    parameter W = 64;

    function integer digits_for(input integer w);
        digits_for = (w * 30103) / 100000 + 1;   // floor(w*log10 2)+1, exact for w <= 1024
    endfunction

    localparam D = digits_for(W);

    input      [W-1:0]   count;
    output reg [4*D-1:0] bcd;

    reg [W-1:0] rest;
    integer k;

    always @* begin
        rest = count;
        for (k = 0; k < D; k = k + 1) begin
            bcd[4*k +: 4] = rest % 10;
            rest = rest / 10;
        end
    end
endmodule
