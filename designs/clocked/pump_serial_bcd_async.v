// Fuel-pump serial converter: start/done handshake, asynchronous active-low reset, digit register array, 10-bit to 4 digits. Expected: proved.
// Same protocol as the meter serial converter: start while idle latches the total; W edges
// later done rises with the digits valid, and stays high until the next start.
module pump_serial_bcd_async #(
    parameter W = 10,
    parameter D = 4
) (
    input                clk,
    input                rst_n,
    input                start,
    input      [W-1:0]   total,
    output reg           done,
    output reg [4*D-1:0] bcd
);
    localparam COUNT_BITS = $clog2(W + 1);

    reg [3:0]            digit [0:D-1];
    reg [W-1:0]          pending;
    reg [COUNT_BITS-1:0] bits_left;
    integer k;   // loop index of the combinational block
    integer r;   // loop index of the clocked block: one variable per process, no shared driver

    // The digits after one more input bit: correct every digit >= 5, then double.
    reg [3:0] next_digit [0:D-1];
    reg [3:0] fixed [0:D-1];
    always @* begin
        for (k = 0; k < D; k = k + 1)
            fixed[k] = (digit[k] >= 4'd5) ? digit[k] + 4'd3 : digit[k];
        next_digit[0] = {fixed[0][2:0], pending[W-1]};
        for (k = 1; k < D; k = k + 1)
            next_digit[k] = {fixed[k][2:0], fixed[k-1][3]};
        for (k = 0; k < D; k = k + 1)
            bcd[4*k +: 4] = digit[k];
    end

    always @(posedge clk or negedge rst_n) begin
        if (!rst_n) begin
            done      <= 1'b0;
            pending   <= {W{1'b0}};
            bits_left <= {COUNT_BITS{1'b0}};
            for (r = 0; r < D; r = r + 1)
                digit[r] <= 4'd0;
        end else if (bits_left != 0) begin
            for (r = 0; r < D; r = r + 1)
                digit[r] <= next_digit[r];
            pending   <= {pending[W-2:0], 1'b0};
            bits_left <= bits_left - 1'b1;
            done      <= (bits_left == 1);
        end else if (start) begin
            done      <= 1'b0;
            pending   <= total;
            bits_left <= W;
            for (r = 0; r < D; r = r + 1)
                digit[r] <= 4'd0;
        end
    end
endmodule
