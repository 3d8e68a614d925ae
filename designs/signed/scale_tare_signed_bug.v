// Parcel-scale tare readout: signed 12-bit grams to a minus lamp and 4 magnitude digits. Expected: disproved (the magnitude is taken in 11 bits, so -2048 shows 0000).
module scale_tare_signed_bug (
    input  signed [11:0] grams,
    output               minus,
    output reg    [15:0] bcd
);
    wire [10:0] magnitude = grams[11] ? -grams[10:0] : grams[10:0];
    assign minus = grams[11];
    reg [11:0] rest;
    integer i;
    always @* begin
        rest = {1'b0, magnitude};
        for (i = 0; i < 4; i = i + 1) begin
            bcd[4*i +: 4] = rest % 10;
            rest = rest / 10;
        end
    end
endmodule
