// Gas-meter readout, doubling-table cells, 16-bit to 5 digits. Expected: disproved (the table has no entries for digit 9, which falls into the x default).
// Each cell doubles one decimal digit and adds the carry from the digit below; the carry out
// depends only on the digit (>= 5), so a row settles without a carry chain.
module meter_doubling_x_bug_cell (
    input      [3:0] digit,
    input            carry_in,
    output reg [3:0] doubled,
    output reg       carry_out
);
    always @* begin
        case ({digit, carry_in})
            5'b0000_0: {carry_out, doubled} = 5'b0_0000;
            5'b0000_1: {carry_out, doubled} = 5'b0_0001;
            5'b0001_0: {carry_out, doubled} = 5'b0_0010;
            5'b0001_1: {carry_out, doubled} = 5'b0_0011;
            5'b0010_0: {carry_out, doubled} = 5'b0_0100;
            5'b0010_1: {carry_out, doubled} = 5'b0_0101;
            5'b0011_0: {carry_out, doubled} = 5'b0_0110;
            5'b0011_1: {carry_out, doubled} = 5'b0_0111;
            5'b0100_0: {carry_out, doubled} = 5'b0_1000;
            5'b0100_1: {carry_out, doubled} = 5'b0_1001;
            5'b0101_0: {carry_out, doubled} = 5'b1_0000;
            5'b0101_1: {carry_out, doubled} = 5'b1_0001;
            5'b0110_0: {carry_out, doubled} = 5'b1_0010;
            5'b0110_1: {carry_out, doubled} = 5'b1_0011;
            5'b0111_0: {carry_out, doubled} = 5'b1_0100;
            5'b0111_1: {carry_out, doubled} = 5'b1_0101;
            5'b1000_0: {carry_out, doubled} = 5'b1_0110;
            5'b1000_1: {carry_out, doubled} = 5'b1_0111;
            // Not a decimal digit: a correct converter never gets here, so leave it open.
            default:   {carry_out, doubled} = 5'bx_xxxx;
        endcase
    end
endmodule

module meter_doubling_x_bug #(
    parameter W = 16,
    parameter D = 5
) (
    input  [W-1:0]   cubic_decimetres,
    output [4*D-1:0] bcd
);
    wire [4*D-1:0] row [0:W];
    assign row[0] = {(4*D){1'b0}};

    genvar s, j;
    generate
        for (s = 0; s < W; s = s + 1) begin : stage
            wire [D:0]     carry;     // carry[D] is always 0 when D digits suffice
            wire [4*D-1:0] doubled;
            assign carry[0] = cubic_decimetres[W-1-s];
            for (j = 0; j < D; j = j + 1) begin : dig
                meter_doubling_x_bug_cell unit (
                    .digit(row[s][4*j +: 4]), .carry_in(carry[j]),
                    .doubled(doubled[4*j +: 4]), .carry_out(carry[j+1]));
            end
            assign row[s+1] = doubled;
        end
    endgenerate

    assign bcd = row[W];
endmodule
