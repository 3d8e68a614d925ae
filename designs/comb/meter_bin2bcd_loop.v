// Water-meter readout, shift-and-add-3 loop over one shift register, 16-bit to 5 digits. Expected: proved.
// The register holds {digits, remaining binary}; each pass corrects every digit that would
// overflow when doubled, then shifts the next binary bit in.
module meter_bin2bcd_loop #(
    parameter W = 16,
    parameter D = (W * 30103) / 100000 + 1   // digits of 2**W - 1 (log10(2) ~ 0.30103)
) (
    input  [W-1:0]   litres,
    output [4*D-1:0] bcd
);
    reg [4*D+W-1:0] work;
    integer step, digit;

    always @* begin
        work = {{(4*D){1'b0}}, litres};
        for (step = 0; step < W; step = step + 1) begin
            for (digit = 0; digit < D; digit = digit + 1)
                if (work[W+4*digit +: 4] >= 4'd5)
                    work[W+4*digit +: 4] = work[W+4*digit +: 4] + 4'd3;
            work = work << 1;
        end
    end

    assign bcd = work[4*D+W-1:W];
endmodule
