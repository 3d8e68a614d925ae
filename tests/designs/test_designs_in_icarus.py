"""Every combinational catalogue entry, simulated in Icarus Verilog, must behave as catalogued.

Referee: Icarus Verilog runs the design; the expected digits come from Python str(int) as
reference code (see catalog.reference_bcd). A correct design must show the right digits on
every vector; a buggy one must be wrong at its ``first_failing_input`` and, where the catalogue
claims that input is the smallest, right on every tested input below it.
"""
from __future__ import annotations

import random
from pathlib import Path

import pytest

from tests.designs.catalog import (Entry, combinational_bench, expected_display, load_catalog,
                                   parse_bench_output)
from tests.support.icarus import run_icarus

# Up to this width every input is simulated; beyond it, corners plus seeded random values.
EXHAUSTIVE_WIDTH = 14
RANDOM_VECTORS = 300
# Wider entries already get about 2*W + 2*W*log10(2) corner values, and a structural array of
# W*D cells costs tens of milliseconds per vector in an event-driven simulator.
RANDOM_VECTORS_WIDE = 64
# A buggy design whose smallest failing input is at most this is checked on every value below it.
EXHAUSTIVE_BELOW_FAILURE = 1 << 16

ENTRIES = load_catalog()
COMBINATIONAL = [e for e in ENTRIES if not e.clocked]


def corner_inputs(width: int) -> set[int]:
    """0, 1, 2^k - 1, 2^k, 10^k - 1, 10^k and all ones, as far as they fit in ``width`` bits."""
    top = (1 << width) - 1
    values = {0, 1, top}
    for k in range(width + 1):
        values.update({(1 << k) - 1, 1 << k})
    power = 1
    while power <= top:
        values.update({power - 1, power})
        power *= 10
    return {v for v in values if 0 <= v <= top}


def vectors_for(entry: Entry) -> list[int]:
    """The inputs an entry is simulated on, in increasing order (seeded, so runs repeat)."""
    top = (1 << entry.width) - 1
    if entry.width <= EXHAUSTIVE_WIDTH:
        return list(range(top + 1))
    chosen = corner_inputs(entry.width)
    generator = random.Random(f"{entry.name}-vectors")
    count = RANDOM_VECTORS if entry.width <= 32 else RANDOM_VECTORS_WIDE
    chosen.update(generator.randint(0, top) for _ in range(count))
    failure = entry.first_failing_input
    if failure is not None:
        chosen.update({failure, failure - 1, failure + 1})
        if failure <= EXHAUSTIVE_BELOW_FAILURE:
            chosen.update(range(failure))
        else:
            chosen.update(generator.randint(0, failure - 1) for _ in range(count))
    if entry.max_input is not None:
        chosen.update({entry.max_input, entry.max_input + 1})
    return sorted(v for v in chosen if 0 <= v <= top)


def simulate(entry: Entry, vectors: list[int], tmp_path: Path) -> list[int | None]:
    vector_file = tmp_path / "vectors.hex"
    vector_file.write_text("".join(f"{v:x}\n" for v in vectors))
    bench = combinational_bench(entry, vector_file, len(vectors))
    output = run_icarus([entry.path], "bcdprove_bench", extra_text=bench,
                        include_dirs=entry.include_dirs)
    return parse_bench_output(output, len(vectors))


def _params(entries: list[Entry]):
    return [pytest.param(e, id=e.name, marks=[pytest.mark.icarus] + ([pytest.mark.slow] if e.slow else []))
            for e in entries]


@pytest.mark.parametrize("entry", _params(COMBINATIONAL))
def test_design_behaves_as_catalogued(entry: Entry, tmp_path: Path):
    vectors = vectors_for(entry)
    shown = simulate(entry, vectors, tmp_path)
    wrong = [v for v, s in zip(vectors, shown) if s != expected_display(entry, v)]
    if entry.expected == "proved":
        assert wrong == [], f"{entry.name}: wrong digits for {wrong[:10]}"
        return
    assert entry.expected == "disproved"
    failure = entry.first_failing_input
    assert failure in wrong, f"{entry.name}: catalogued failing input {failure} simulates right"
    # Every tested input below the catalogued one must be right, otherwise it is not the smallest.
    assert min(wrong) == failure, f"{entry.name}: {min(wrong)} fails before {failure}"


def test_catalogue_lists_every_design_file():
    """A design file left out of the catalogue would never be checked (common practice)."""
    from tests.designs.catalog import DESIGNS
    listed = {e.file for e in ENTRIES}
    on_disk = {str(p.relative_to(DESIGNS)) for p in DESIGNS.rglob("*")
               if p.suffix in {".v", ".sv"} and "include" not in p.parts}
    assert on_disk - listed == set()
    assert listed - on_disk == set()


def test_catalogue_entries_are_well_formed():
    for entry in ENTRIES:
        assert entry.expected in {"proved", "disproved"}, entry.name
        if entry.expected == "proved":
            assert entry.bug is None and entry.first_failing_input is None, entry.name
        else:
            assert entry.bug and entry.first_failing_input is not None, entry.name
        first_line = entry.path.read_text().splitlines()[0]
        assert first_line.startswith("// ") and "Expected: " + entry.expected in first_line, entry.name
