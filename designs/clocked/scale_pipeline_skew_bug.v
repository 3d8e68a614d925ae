// Parcel-scale pipelined converter, 8-bit to 3 digits, latency W + 1. Expected: disproved (stage 4 takes its input bit from the weight one clock behind it).
module scale_pipeline_skew_bug #(
    parameter W = 8,
    parameter D = 3
) (
    input            clk,
    input  [W-1:0]   grams,
    output [4*D-1:0] bcd
);
    // One shift-and-add-3 step: correct every digit >= 5, then shift the next bit in.
    function [4*D-1:0] dabble_step;
        input [4*D-1:0] digits;
        input           next_bit;
        integer j;
        reg [4*D-1:0] fixed;
        begin
            fixed = digits;
            for (j = 0; j < D; j = j + 1)
                if (fixed[4*j +: 4] >= 4'd5)
                    fixed[4*j +: 4] = fixed[4*j +: 4] + 4'd3;
            dabble_step = {fixed[4*D-2:0], next_bit};
        end
    endfunction

    // Stage k holds the digits of the top k bits of its weight and the bits still to come.
    reg [4*D-1:0] digits  [0:W];
    reg [W-1:0]   pending [0:W];
    integer k;

    always @(posedge clk) begin
        digits[0]  <= {(4*D){1'b0}};
        pending[0] <= grams;
        for (k = 1; k <= W; k = k + 1) begin
            // Stage 4 reads the bit from the stage before its own, which belongs to the next
            // weight: right only while consecutive weights agree in that bit.
            if (k == 4)
                digits[k] <= dabble_step(digits[k-1], pending[k-2][W-2]);
            else
                digits[k] <= dabble_step(digits[k-1], pending[k-1][W-1]);
            pending[k] <= pending[k-1] << 1;
        end
    end

    assign bcd = digits[W];
endmodule
