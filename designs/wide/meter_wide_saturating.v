// Wide meter totaliser on a display two digits short of the full range: inputs above the display maximum show all nines, W bits (32..256). Expected: proved for inputs up to the display maximum (--max-input).
module meter_wide_saturating_core (value, bcd);
    parameter W = 64;
    parameter D = 20;

    input      [W-1:0]   value;
    output reg [4*D-1:0] bcd;

    integer i, j;
    always @* begin
        bcd = {(4*D){1'b0}};
        for (i = W - 1; i >= 0; i = i - 1) begin
            for (j = 0; j < D; j = j + 1)
                if (bcd[4*j +: 4] >= 4'd5)
                    bcd[4*j +: 4] = bcd[4*j +: 4] + 4'd3;
            bcd = {bcd[4*D-2:0], value[i]};
        end
    end
endmodule

module meter_wide_saturating (count, bcd);
    parameter W = 64;

    function integer digits_for(input integer w);
        digits_for = (w * 30103) / 100000 + 1;   // floor(w*log10 2)+1, exact for w <= 1024
    endfunction

    // The largest value S nines make, as a W-bit number.
    function [W-1:0] all_nines(input integer s);
        integer k;
        begin
            all_nines = 0;
            for (k = 0; k < s; k = k + 1)
                all_nines = all_nines * 10 + 9;
        end
    endfunction

    localparam D = digits_for(W);
    localparam S = D - 2;                        // digits on the display
    localparam [W-1:0] LIMIT = all_nines(S);

    input  [W-1:0]   count;
    output [4*S-1:0] bcd;

    wire [4*D-1:0] converted;
    meter_wide_saturating_core #(.W(W), .D(D)) core (.value(count), .bcd(converted));

    assign bcd = (count > LIMIT) ? {S{4'h9}} : converted[4*S-1:0];
endmodule
