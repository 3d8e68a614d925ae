// Wide meter totaliser: add-3 loop core wrapped with a single-digit short path and a display enable (tie en = 1), W bits (32..256). Expected: proved with en tied to 1.
module meter_wide_wrapped_core (value, bcd);
    parameter W = 64;
    parameter D = 20;

    input      [W-1:0]   value;
    output reg [4*D-1:0] bcd;

    integer i, j;
    always @* begin
        bcd = {(4*D){1'b0}};
        for (i = W - 1; i >= 0; i = i - 1) begin
            for (j = 0; j < D; j = j + 1)
                if (bcd[4*j +: 4] > 4'd4)
                    bcd[4*j +: 4] = bcd[4*j +: 4] + 4'd3;
            bcd = {bcd[4*D-2:0], value[i]};
        end
    end
endmodule

module meter_wide_wrapped (en, count, bcd);
    parameter W = 64;

    function integer digits_for(input integer w);
        digits_for = (w * 30103) / 100000 + 1;   // floor(w*log10 2)+1, exact for w <= 1024
    endfunction

    localparam D = digits_for(W);

    input            en;
    input  [W-1:0]   count;
    output [4*D-1:0] bcd;

    wire [4*D-1:0] converted;
    meter_wide_wrapped_core #(.W(W), .D(D)) core (.value(count), .bcd(converted));

    // Below ten the binary value already is its own ones digit.
    wire short_path = count < 10;
    wire [4*D-1:0] digits = short_path ? {{(4*D-4){1'b0}}, count[3:0]} : converted;

    // With the display disabled every digit shows the blank code 4'hF.
    assign bcd = en ? digits : {(4*D){1'b1}};
endmodule
