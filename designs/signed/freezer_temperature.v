// Freezer temperature display: signed 8-bit tenths of a degree to a sign lamp and hundreds/tens/ones digit ports (-128 .. 127), shift-and-add-3 on the magnitude. Expected: proved.
module freezer_temperature (
    input  [7:0] tenths,        // two's complement, declared unsigned on purpose
    output       sign,
    output [3:0] ones,
    output [3:0] tens,
    output [3:0] hundreds
);
    wire [7:0] magnitude = tenths[7] ? (~tenths + 8'd1) : tenths;
    reg [19:0] work;             // {hundreds, tens, ones, binary}
    integer s, j;
    always @* begin
        work = {12'd0, magnitude};
        for (s = 0; s < 8; s = s + 1) begin
            for (j = 0; j < 3; j = j + 1)
                if (work[8 + 4*j +: 4] >= 4'd5)
                    work[8 + 4*j +: 4] = work[8 + 4*j +: 4] + 4'd3;
            work = work << 1;
        end
    end
    assign sign = tenths[7];
    assign {hundreds, tens, ones} = work[19:8];
endmodule
