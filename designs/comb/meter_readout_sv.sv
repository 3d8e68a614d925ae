// Electricity-meter readout, SystemVerilog-flavoured shift-and-add-3 (logic, always_comb, int loops, i--, '0), 16-bit to 5 digits. Expected: proved.
module meter_readout_sv #(
    parameter int W = 16,
    parameter int D = 5
) (
    input  logic [W-1:0]   watt_hours,
    output logic [4*D-1:0] bcd
);
    logic [4*D-1:0] digits;

    always_comb begin
        digits = '0;
        for (int i = W - 1; i >= 0; i--) begin
            for (int j = 0; j < D; j++) begin
                // Written out rather than `+=`: Icarus 11 drops `+=` on an indexed part-select.
                if (digits[4*j +: 4] >= 4'd5)
                    digits[4*j +: 4] = digits[4*j +: 4] + 4'd3;
            end
            digits = {digits[4*D-2:0], watt_hours[i]};
        end
        bcd = digits;
    end
endmodule
