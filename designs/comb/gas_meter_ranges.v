// Gas-meter readout with ascending ranges, negative indices, a constant function sizing the output and $clog2, 14-bit to 5 digits. Expected: proved.
// reading[0] is the most significant input bit and bcd[0] the most significant output bit
// (ascending ranges); the digit register is indexed from -4 so that digit j sits at
// [4*j-1 : 4*j-4].
module gas_meter_ranges (reading, bcd);
    parameter W = 14;

    function integer digits_for(input integer w);
        integer limit_digits;
        begin
            // Digits of 2**w - 1: log10(2) ~ 0.30103, exact for every w from 1 to 1024.
            limit_digits = (w * 30103) / 100000 + 1;
            digits_for = limit_digits;
        end
    endfunction

    localparam D = digits_for(W);
    localparam COUNT_BITS = $clog2(W + 1);

    input  [0:W-1]   reading;
    output [0:4*D-1] bcd;

    reg [4*D-5:-4]        digits;
    reg [COUNT_BITS-1:0]  taken;   // input bits consumed so far
    integer j;

    always @* begin
        digits = {4*D{1'b0}};
        for (taken = 0; taken < W; taken = taken + 1) begin
            for (j = 0; j < D; j = j + 1)
                if (digits[4*j-4 +: 4] >= 4'd5)
                    digits[4*j-4 +: 4] = digits[4*j-4 +: 4] + 4'd3;
            digits = {digits[4*D-6:-4], reading[taken]};
        end
    end

    assign bcd = digits;
endmodule
