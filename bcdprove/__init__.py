"""bcdprove: formal checking of binary/BCD converter designs written in Verilog."""
