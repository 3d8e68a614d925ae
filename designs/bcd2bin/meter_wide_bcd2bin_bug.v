// Utility-meter register reading, D BCD digits to W bits by a multiply-by-ten loop. Expected: disproved (the step for the top digit position D-1 adds the digit twice).
module meter_wide_bcd2bin_bug #(
    parameter D = 20,
    parameter W = 67
) (
    input      [4*D-1:0] reading,
    output reg [W-1:0]   units
);
    integer i;
    always @* begin
        units = {W{1'b0}};
        for (i = D - 1; i >= 0; i = i - 1)
            if (i == D - 1)
                units = units * 4'd10 + reading[4*i +: 4] + reading[4*i +: 4];
            else
                units = units * 4'd10 + reading[4*i +: 4];
    end
endmodule
