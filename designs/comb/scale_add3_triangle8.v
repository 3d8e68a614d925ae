// Parcel-scale readout, hand-placed triangular add-3 array (7 cells), 8-bit to 3 digits. Expected: proved.
// A cell is placed only where its digit can reach 5: the ones digit from the third input bit
// on, the tens digit once six bits are in (a 6-bit prefix can be 50..63). Elsewhere the digits
// are known to be below 5 and pass straight through.
module scale_add3_triangle8_cell (
    input  [3:0] a,
    output [3:0] y
);
    assign y = (a > 4'd4) ? a + 4'd3 : a;
endmodule

module scale_add3_triangle8 (
    input  [7:0]  grams,
    output [11:0] bcd
);
    wire [3:0] ones1, ones2, ones3, ones4, ones5;
    wire [3:0] tens1, tens2;

    // Ones digit, one cell per input bit from the third on.
    scale_add3_triangle8_cell u_ones1 (.a({1'b0, grams[7:5]}),      .y(ones1));
    scale_add3_triangle8_cell u_ones2 (.a({ones1[2:0], grams[4]}),  .y(ones2));
    scale_add3_triangle8_cell u_ones3 (.a({ones2[2:0], grams[3]}),  .y(ones3));
    scale_add3_triangle8_cell u_ones4 (.a({ones3[2:0], grams[2]}),  .y(ones4));
    // Tens digit: the carries shifted out of the ones column so far.
    scale_add3_triangle8_cell u_tens1 (.a({1'b0, ones1[3], ones2[3], ones3[3]}), .y(tens1));
    scale_add3_triangle8_cell u_ones5 (.a({ones4[2:0], grams[1]}),  .y(ones5));
    scale_add3_triangle8_cell u_tens2 (.a({tens1[2:0], ones4[3]}),  .y(tens2));

    assign bcd = {2'b00, tens1[3], tens2[3],      // hundreds (at most 2)
                  tens2[2:0], ones5[3],           // tens
                  ones5[2:0], grams[0]};          // ones
endmodule
