// Lab-balance display, shift-and-add-3 loop, 12-bit to 4 digits. Expected: disproved (adds 2 instead of 3 when correcting).
module balance_add2_bug #(
    parameter W = 12,
    parameter D = 4
) (
    input  [W-1:0]   milligrams,
    output [4*D-1:0] bcd
);
    reg [4*D+W-1:0] work;
    integer step, digit;

    always @* begin
        work = {{(4*D){1'b0}}, milligrams};
        for (step = 0; step < W; step = step + 1) begin
            for (digit = 0; digit < D; digit = digit + 1)
                if (work[W+4*digit +: 4] >= 4'd5)
                    work[W+4*digit +: 4] = work[W+4*digit +: 4] + 4'd2;
            work = work << 1;
        end
    end

    assign bcd = work[4*D+W-1:W];
endmodule
