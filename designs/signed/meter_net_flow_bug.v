// Bidirectional electricity meter, signed W-bit net energy to an export lamp and magnitude digits. Expected: disproved (the magnitude of a negative count is its one's complement, ~net, so every negative value shows one less; first wrong in bit order at -2**(W-1)).
module meter_net_flow_bug (net, exporting, bcd);
    parameter W = 64;
    function integer digits_for(input integer w);
        digits_for = ((w - 1) * 30103) / 100000 + 1;
    endfunction
    localparam D = digits_for(W);

    input  [W-1:0]   net;           // two's complement
    output           exporting;
    output [4*D-1:0] bcd;

    wire [W-1:0] magnitude = net[W-1] ? ~net : net;
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
