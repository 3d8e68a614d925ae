// Parcel-scale readout with one port per digit (ones, tens, hundreds, thousands), 13-bit to 4 digits. Expected: proved.
module scale_digit_ports (
    input      [12:0] grams,
    output reg [3:0]  ones,
    output reg [3:0]  tens,
    output reg [3:0]  hundreds,
    output reg [3:0]  thousands
);
    integer i;

    always @* begin
        {thousands, hundreds, tens, ones} = 16'd0;
        for (i = 12; i >= 0; i = i - 1) begin
            if (ones      >= 4'd5) ones      = ones      + 4'd3;
            if (tens      >= 4'd5) tens      = tens      + 4'd3;
            if (hundreds  >= 4'd5) hundreds  = hundreds  + 4'd3;
            if (thousands >= 4'd5) thousands = thousands + 4'd3;
            {thousands, hundreds, tens, ones} = {thousands[2:0], hundreds, tens, ones, grams[i]};
        end
    end
endmodule
