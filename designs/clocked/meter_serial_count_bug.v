// Utility-meter serial converter, 12-bit to 4 digits. Expected: disproved (bit counter loaded with W+1: one extra doubling).
// Protocol: while idle, start = 1 at a rising edge latches reading and clears the digits;
// the next W edges each shift one bit in; done rises with the W-th of them, bcd is valid
// while done is 1, and done stays 1 until the next start.
module meter_serial_count_bug #(
    parameter W = 12,
    parameter D = 4
) (
    input                clk,
    input                rst,
    input                start,
    input      [W-1:0]   reading,
    output reg           done,
    output     [4*D-1:0] bcd
);
    reg [W-1:0]         pending;   // input bits not yet shifted in, top bit next
    reg [4*D-1:0]       digits;
    reg [$clog2(W+1)-1:0] remaining;
    reg                 busy;

    reg [4*D-1:0] corrected;
    integer j;
    always @* begin
        corrected = digits;
        for (j = 0; j < D; j = j + 1)
            if (corrected[4*j +: 4] >= 4'd5)
                corrected[4*j +: 4] = corrected[4*j +: 4] + 4'd3;
    end

    always @(posedge clk) begin
        if (rst) begin
            busy      <= 1'b0;
            done      <= 1'b0;
            digits    <= {(4*D){1'b0}};
            pending   <= {W{1'b0}};
            remaining <= 0;
        end else if (start && !busy) begin
            busy      <= 1'b1;
            done      <= 1'b0;
            digits    <= {(4*D){1'b0}};
            pending   <= reading;
            remaining <= W + 1;   // one pass too many
        end else if (busy) begin
            digits    <= {corrected[4*D-2:0], pending[W-1]};
            pending   <= pending << 1;
            remaining <= remaining - 1'b1;
            if (remaining == 1) begin
                busy <= 1'b0;
                done <= 1'b1;
            end
        end
    end

    assign bcd = digits;
endmodule
