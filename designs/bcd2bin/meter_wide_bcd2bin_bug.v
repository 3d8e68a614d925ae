// Utility-meter register reading, D BCD digits to W bits by a shift-and-add loop (v * 10 as (v << 3) + (v << 1)). Expected: disproved (at digit position 7 the step adds v instead of v << 1, multiplying by 9; first wrong at 10**8).
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
            if (i == 7)
                units = (units << 3) + units + reading[4*i +: 4];
            else
                units = (units << 3) + (units << 1) + reading[4*i +: 4];
    end
endmodule
