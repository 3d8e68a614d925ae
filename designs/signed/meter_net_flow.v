// Bidirectional electricity meter, net energy as a signed W-bit count (negative while exporting) to an export lamp and magnitude digits; magnitude by negation, then a shift-and-add-3 loop, W = 64 or 128. Expected: proved.
module meter_net_flow (net, exporting, bcd);
    parameter W = 64;
    // Digits of 2**(w-1), the largest magnitude: floor((w-1) * log10(2)) + 1, log10(2) ~ 0.30103.
    function integer digits_for(input integer w);
        digits_for = ((w - 1) * 30103) / 100000 + 1;
    endfunction
    localparam D = digits_for(W);

    input  [W-1:0]   net;           // two's complement
    output           exporting;
    output [4*D-1:0] bcd;

    wire [W-1:0] magnitude = net[W-1] ? (~net + 1'b1) : net;
    reg [4*D+W-1:0] work;
    integer step, digit;
    always @* begin
        work = {{(4*D){1'b0}}, magnitude};
        for (step = 0; step < W; step = step + 1) begin
            for (digit = 0; digit < D; digit = digit + 1)
                if (work[W+4*digit +: 4] >= 4'd5)
                    work[W+4*digit +: 4] = work[W+4*digit +: 4] + 4'd3;
            work = work << 1;
        end
    end
    assign exporting = net[W-1];
    assign bcd = work[4*D+W-1:W];
endmodule
