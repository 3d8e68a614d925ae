// Parcel-scale tare readout: signed 12-bit grams after tare to a minus lamp and 4 magnitude digits (-2048 .. 2047). Expected: proved.
module scale_tare_signed (
    input  signed [11:0] grams,
    output               minus,
    output reg    [15:0] bcd
);
    wire [11:0] magnitude = grams[11] ? -grams : grams;   // -(-2048) is 2048 as unsigned bits
    assign minus = grams[11];
    reg [11:0] rest;
    integer i;
    always @* begin
        rest = magnitude;
        for (i = 0; i < 4; i = i + 1) begin
            bcd[4*i +: 4] = rest % 10;
            rest = rest / 10;
        end
    end
endmodule
