// Wide meter totaliser with a single-digit short path, W bits (32..256). Expected: disproved (short path taken for count <= 10 instead of < 10: only the input 10 is shown wrong).
module meter_wide_short_path_bug (count, bcd);
    parameter W = 64;

    function integer digits_for(input integer w);
        digits_for = (w * 30103) / 100000 + 1;   // floor(w*log10 2)+1, exact for w <= 1024
    endfunction

    localparam D = digits_for(W);

    input  [W-1:0]   count;
    output [4*D-1:0] bcd;

    reg [4*D-1:0] converted;
    integer i, j;

    always @* begin
        converted = {(4*D){1'b0}};
        for (i = W - 1; i >= 0; i = i - 1) begin
            for (j = 0; j < D; j = j + 1)
                if (converted[4*j +: 4] >= 4'd5)
                    converted[4*j +: 4] = converted[4*j +: 4] + 4'd3;
            converted = {converted[4*D-2:0], count[i]};
        end
    end

    assign bcd = (count <= 10) ? {{(4*D-4){1'b0}}, count[3:0]} : converted;
endmodule
