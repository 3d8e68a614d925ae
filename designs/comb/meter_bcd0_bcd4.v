// Gas-meter readout with digit ports bcd0..bcd4, 16-bit to 5 digits. Expected: proved.
module meter_bcd0_bcd4 (
    input  [15:0] count,
    output [3:0]  bcd0,
    output [3:0]  bcd1,
    output [3:0]  bcd2,
    output [3:0]  bcd3,
    output [3:0]  bcd4
);
    reg [35:0] work;   // {five digits, sixteen binary bits}
    integer step;

    always @* begin
        work = {20'd0, count};
        for (step = 0; step < 16; step = step + 1) begin
            if (work[19:16] > 4) work[19:16] = work[19:16] + 3;
            if (work[23:20] > 4) work[23:20] = work[23:20] + 3;
            if (work[27:24] > 4) work[27:24] = work[27:24] + 3;
            if (work[31:28] > 4) work[31:28] = work[31:28] + 3;
            if (work[35:32] > 4) work[35:32] = work[35:32] + 3;
            work = work << 1;
        end
    end

    assign {bcd4, bcd3, bcd2, bcd1, bcd0} = work[35:16];
endmodule
