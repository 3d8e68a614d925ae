// Wide meter totaliser, doubling-table cell per digit (x entries for digits 10-15), W bits (32..256). Expected: proved.
module meter_wide_doubling_cell (
    input      [3:0] digit,
    input            carry_in,
    output reg [3:0] doubled,
    output reg       carry_out
);
    always @* begin
        case (digit)
            4'd0: {carry_out, doubled} = {1'b0, 3'd0, carry_in};
            4'd1: {carry_out, doubled} = {1'b0, 3'd1, carry_in};
            4'd2: {carry_out, doubled} = {1'b0, 3'd2, carry_in};
            4'd3: {carry_out, doubled} = {1'b0, 3'd3, carry_in};
            4'd4: {carry_out, doubled} = {1'b0, 3'd4, carry_in};
            4'd5: {carry_out, doubled} = {1'b1, 3'd0, carry_in};   // 10 + cin
            4'd6: {carry_out, doubled} = {1'b1, 3'd1, carry_in};   // 12 + cin
            4'd7: {carry_out, doubled} = {1'b1, 3'd2, carry_in};
            4'd8: {carry_out, doubled} = {1'b1, 3'd3, carry_in};
            4'd9: {carry_out, doubled} = {1'b1, 3'd4, carry_in};   // 18 + cin
            default: begin
                // 10..15 are not digits and never reach a cell of a correct converter.
                carry_out = 1'bx;
                doubled   = 4'bx;
            end
        endcase
    end
endmodule

module meter_wide_doubling (count, bcd);
    parameter W = 64;

    function integer digits_for(input integer w);
        digits_for = (w * 30103) / 100000 + 1;   // floor(w*log10 2)+1, exact for w <= 1024
    endfunction

    localparam D = digits_for(W);

    input  [W-1:0]   count;
    output [4*D-1:0] bcd;

    wire [4*D-1:0] row [0:W];
    assign row[0] = {(4*D){1'b0}};

    genvar s, j;
    generate
        for (s = 0; s < W; s = s + 1) begin : stage
            wire [D:0]     carry;
            wire [4*D-1:0] doubled;
            assign carry[0] = count[W-1-s];
            for (j = 0; j < D; j = j + 1) begin : dig
                meter_wide_doubling_cell unit (
                    .digit(row[s][4*j +: 4]), .carry_in(carry[j]),
                    .doubled(doubled[4*j +: 4]), .carry_out(carry[j+1]));
            end
            assign row[s+1] = doubled;
        end
    endgenerate

    assign bcd = row[W];
endmodule
