"""The bcd2bin and signed catalogue entries, simulated in Icarus Verilog, behave as catalogued.

Referee: Icarus Verilog runs the design; expected values come from Python as reference code:
``int(digits)`` of the input's nibbles for BCD to binary, ``str(abs(v))`` and the sign of
the two's-complement value for signed readouts.  Narrow entries are simulated on every input
of their contract (every valid digit vector; every nibble pattern when an invalid-digit flag
is checked; every bit pattern of a signed input); wide ones on corners and seeded random
values.  A correct design is right everywhere; a buggy one is first wrong at its catalogued
input, in the order an exhaustive run visits inputs.
"""
from __future__ import annotations

import random
from pathlib import Path

import pytest

from tests.designs.catalog import Entry, load_catalog
from tests.designs.spec_benches import input_width, parse_rows, spec_bench
from tests.support.icarus import run_icarus

BCD2BIN = load_catalog(spec="bcd2bin")
SIGNED = load_catalog(spec="signed")
EXHAUSTIVE_DIGITS = 4
EXHAUSTIVE_SIGNED_WIDTH = 14
RANDOM_VECTORS = 64


def _bcd(value: int) -> int:
    """Packed BCD of value (Python str as reference code)."""
    return int(str(value), 16)


def _spelled(packed: int, digits: int) -> int | None:
    """The number the nibbles spell (Python int of the hex text), None for a nibble above 9."""
    text = format(packed, f"0{digits}x")
    return int(text) if text.isdigit() else None


def bcd2bin_vectors(entry: Entry) -> list[int]:
    digits = entry.raw["digits"]
    if digits <= EXHAUSTIVE_DIGITS:
        if entry.raw.get("invalid_flag"):
            return list(range(16 ** digits))
        return [_bcd(v) for v in range(10 ** digits)]
    top = 10 ** digits - 1
    chosen = {0, 1, 9, top}
    for k in range(digits + 1):
        chosen.update({10 ** k - 1, 10 ** k, 10 ** k + 1})
    for k in range(top.bit_length() + 1):
        chosen.update({(1 << k) - 1, 1 << k})
    generator = random.Random(f"{entry.name}-vectors")
    chosen.update(generator.randint(0, top) for _ in range(RANDOM_VECTORS))
    values = sorted(_bcd(v) for v in chosen if 0 <= v <= top)
    if entry.first_failing_input is not None:
        failure = _spelled(entry.first_failing_input, digits)
        values = sorted(set(values) | {_bcd(v) for v in (failure - 1, failure, failure + 1)})
    return values


def _port_widths(entry: Entry) -> dict[str, int]:
    """Digit input ports: one port holds every digit, several ports one digit each."""
    if entry.spec == "signed" or len(entry.inputs) == 1:
        return {entry.inputs[0]: input_width(entry)}
    return {port: 4 for port in entry.inputs}


def _simulate(entry: Entry, vectors: list[int], tmp_path: Path):
    vector_file = tmp_path / "vectors.hex"
    vector_file.write_text("".join(f"{v:x}\n" for v in vectors))
    bench = spec_bench(entry, vector_file, len(vectors), _port_widths(entry))
    return parse_rows(run_icarus([entry.path], "bcdprove_bench", extra_text=bench), len(vectors))


def bcd2bin_wrong(entry: Entry, vectors: list[int], rows) -> list[int]:
    digits = entry.raw["digits"]
    flagged = bool(entry.raw.get("invalid_flag"))
    wrong = []
    for packed, row in zip(vectors, rows):
        value = _spelled(packed, digits)
        shown = row[0]
        if flagged:
            flag = row[1]
            if value is None:
                right = flag == 1          # the binary output does not matter here
            else:
                right = flag == 0 and shown == value
        else:
            right = shown == value
        if not right:
            wrong.append(packed)
    return wrong


def signed_wrong(entry: Entry, vectors: list[int], widths: list[int], rows) -> list[int]:
    width = entry.width
    wrong = []
    for raw, row in zip(vectors, rows):
        value = raw - (1 << width) if raw >> (width - 1) else raw
        if None in row:
            wrong.append(raw)
            continue
        packed, offset = 0, 0
        for part, bits in zip(row[1:], widths[1:]):
            packed |= part << offset
            offset += bits
        if row[0] != (1 if value < 0 else 0) or packed != _bcd(abs(value)):
            wrong.append(raw)
    return wrong


def _judge(entry: Entry, wrong: list[int]) -> None:
    if entry.expected == "proved":
        assert wrong == [], f"{entry.name}: wrong for {[hex(w) for w in wrong[:10]]}"
        return
    failure = entry.first_failing_input
    assert failure in wrong, f"{entry.name}: catalogued failing input {failure:#x} simulates right"
    assert min(wrong) == failure, f"{entry.name}: {min(wrong):#x} fails before {failure:#x}"


def _params(entries: list[Entry]):
    return [pytest.param(e, id=e.name, marks=[pytest.mark.icarus] + ([pytest.mark.slow] if e.slow else []))
            for e in entries]


@pytest.mark.parametrize("entry", _params(BCD2BIN))
def test_bcd2bin_design_behaves_as_catalogued(entry: Entry, tmp_path: Path):
    vectors = bcd2bin_vectors(entry)
    _, rows = _simulate(entry, vectors, tmp_path)
    _judge(entry, bcd2bin_wrong(entry, vectors, rows))


def signed_vectors(entry: Entry) -> list[int]:
    """Every bit pattern up to EXHAUSTIVE_SIGNED_WIDTH bits; past it the extremes, +-1,
    +-(10**k - 1, 10**k), +-2**k and seeded random values, as bit patterns."""
    width = entry.width
    if width <= EXHAUSTIVE_SIGNED_WIDTH:
        return list(range(1 << width))
    low, high = -(1 << (width - 1)), (1 << (width - 1)) - 1
    chosen = {0, 1, -1, low, low + 1, high}
    k = 1
    while 10 ** k <= high:
        chosen.update({10 ** k - 1, 10 ** k, -(10 ** k) + 1, -(10 ** k)})
        k += 1
    for k in range(width - 1):
        chosen.update({1 << k, -(1 << k)})
    generator = random.Random(f"{entry.name}-vectors")
    chosen.update(generator.randint(low, high) for _ in range(RANDOM_VECTORS))
    return sorted(v & ((1 << width) - 1) for v in chosen)


@pytest.mark.parametrize("entry", _params(SIGNED))
def test_signed_design_behaves_as_catalogued(entry: Entry, tmp_path: Path):
    vectors = signed_vectors(entry)
    widths, rows = _simulate(entry, vectors, tmp_path)
    _judge(entry, signed_wrong(entry, vectors, widths, rows))


def test_handbook_value_of_two_bcd_digits():
    """Two-digit BCD 1001 1001 spells 99 (common practice), and the reference agrees."""
    assert _spelled(0b1001_1001, 2) == 99


def test_spec_entries_are_well_formed():
    for entry in BCD2BIN + SIGNED:
        assert entry.expected in {"proved", "disproved"}, entry.name
        if entry.expected == "proved":
            assert entry.bug is None and entry.first_failing_input is None, entry.name
        else:
            assert entry.bug and entry.first_failing_input is not None, entry.name
        first_line = entry.path.read_text().splitlines()[0]
        assert first_line.startswith("// ") and "Expected: " + entry.expected in first_line, entry.name
    for entry in BCD2BIN:
        if entry.first_failing_input is not None:
            assert entry.raw["first_failing_digits"] == format(
                entry.first_failing_input, f"0{entry.raw['digits']}X"), entry.name
    for entry in SIGNED:
        if entry.first_failing_input is not None:
            raw, width = entry.first_failing_input, entry.width
            assert entry.raw["first_failing_value"] == (raw - (1 << width) if raw >> (width - 1) else raw)
