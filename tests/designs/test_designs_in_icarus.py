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

from tests.designs.catalog import (Entry, combinational_bench, expected_display, handshake_bench,
                                   load_catalog, parse_bench_output, parse_handshake_output,
                                   pipeline_bench, reference_bcd)
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
HANDSHAKE = [e for e in ENTRIES if e.clocked and e.raw["protocol"] == "handshake"]
PIPELINE = [e for e in ENTRIES if e.clocked and e.raw["protocol"] == "pipeline"]


# Past this width (the slow entries, W = 128 and 256) an event-driven simulator spends about a
# second (W = 128) to several seconds (W = 256) on one vector of a structural array, so only some
# powers are corners and few random values are added.
THIN_CORNERS_WIDTH = 64
RANDOM_VECTORS_THIN = 4


def corner_inputs(width: int) -> set[int]:
    """0, 1, 2^k - 1, 2^k, 10^k - 1, 10^k and all ones, as far as they fit in ``width`` bits.

    Above THIN_CORNERS_WIDTH only every width/4-th power of two and width/8-th power of ten.
    """
    top = (1 << width) - 1
    thin = width > THIN_CORNERS_WIDTH
    two_stride, ten_stride = (width // 4, width // 8) if thin else (1, 1)
    values = {0, 1, top}
    for k in range(0, width + 1, two_stride):
        values.update({(1 << k) - 1, 1 << k})
    k = 0
    while 10 ** k <= top:
        if k % ten_stride == 0:
            values.update({10 ** k - 1, 10 ** k})
        k += 1
    return {v for v in values if 0 <= v <= top}


def vectors_for(entry: Entry) -> list[int]:
    """The inputs an entry is simulated on, in increasing order (seeded, so runs repeat)."""
    top = (1 << entry.width) - 1
    if entry.width <= EXHAUSTIVE_WIDTH:
        return list(range(top + 1))
    chosen = corner_inputs(entry.width)
    generator = random.Random(f"{entry.name}-vectors")
    if entry.width <= 32:
        count = RANDOM_VECTORS
    elif entry.width <= THIN_CORNERS_WIDTH:
        count = RANDOM_VECTORS_WIDE
    else:
        count = RANDOM_VECTORS_THIN
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


def _run(entry: Entry, vectors: list[int], tmp_path: Path, make_bench) -> str:
    vector_file = tmp_path / "vectors.hex"
    vector_file.write_text("".join(f"{v:x}\n" for v in vectors))
    bench = make_bench(entry, vector_file, len(vectors))
    return run_icarus([entry.path], "bcdprove_bench", extra_text=bench,
                      include_dirs=entry.include_dirs)


def simulate(entry: Entry, vectors: list[int], tmp_path: Path) -> list[int | None]:
    return parse_bench_output(_run(entry, vectors, tmp_path, combinational_bench), len(vectors))


def run_transactions(entry: Entry, vectors: list[int], tmp_path: Path) -> list[tuple[int | None, int | None]]:
    """(edges from start to done, display) per start/done transaction, in order, after one reset."""
    return parse_handshake_output(_run(entry, vectors, tmp_path, handshake_bench), len(vectors))


def run_stream(entry: Entry, vectors: list[int], tmp_path: Path) -> list[int | None]:
    """Display a pipeline shows for each vector, aligned by the catalogued latency."""
    latency = int(entry.raw["latency"])
    rows = parse_bench_output(_run(entry, vectors, tmp_path, pipeline_bench), len(vectors) + latency)
    # Row n is taken after edge n + 1 and shows vector n + 1 - latency.
    return rows[latency - 1:latency - 1 + len(vectors)]


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
    listed = {e.file for e in load_catalog(spec=None)}
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
            assert entry.bug, entry.name
            assert entry.first_failing_input is not None or "failing_sequence" in entry.raw, entry.name
        first_line = entry.path.read_text().splitlines()[0]
        assert first_line.startswith("// ") and "Expected: " + entry.expected in first_line, entry.name


def _clocked_vectors(entry: Entry) -> list[int]:
    """Every input in increasing order: each conversion follows the one for the value below it."""
    assert entry.width <= EXHAUSTIVE_WIDTH, "clocked entries are simulated exhaustively"
    return list(range(1 << entry.width))


@pytest.mark.parametrize("entry", _params(HANDSHAKE))
def test_handshake_design_behaves_as_catalogued(entry: Entry, tmp_path: Path):
    vectors = _clocked_vectors(entry)
    results = run_transactions(entry, vectors, tmp_path)
    wrong = [v for v, (_, shown) in zip(vectors, results) if shown != reference_bcd(v)]
    if entry.expected == "proved":
        assert wrong == [], f"{entry.name}: wrong digits for {wrong[:10]}"
        edges = {edges for edges, _ in results}
        assert edges == {int(entry.raw["latency"])}, f"{entry.name}: done after {sorted(edges)} edges"
        return
    assert wrong, f"{entry.name}: no transaction is wrong"
    _check_clocked_failure(entry, wrong, tmp_path, lambda seq: [s for _, s in run_transactions(entry, seq, tmp_path)])


@pytest.mark.parametrize("entry", _params(PIPELINE))
def test_pipeline_design_behaves_as_catalogued(entry: Entry, tmp_path: Path):
    # A seeded shuffle after the increasing sweep: consecutive inputs then differ in many bits.
    vectors = _clocked_vectors(entry)
    shuffled = list(vectors)
    random.Random(f"{entry.name}-stream").shuffle(shuffled)
    stream = vectors + shuffled
    shown = run_stream(entry, stream, tmp_path)
    wrong = [i for i, (v, s) in enumerate(zip(stream, shown)) if s != reference_bcd(v)]
    if entry.expected == "proved":
        assert wrong == [], f"{entry.name}: wrong digits at stream positions {wrong[:10]}"
        return
    assert wrong, f"{entry.name}: no stream position is wrong"
    _check_clocked_failure(entry, [stream[i] for i in wrong], tmp_path, lambda seq: run_stream(entry, seq, tmp_path))


def _check_clocked_failure(entry: Entry, wrong_inputs: list[int], tmp_path: Path, run_sequence) -> None:
    """A buggy clocked design fails where catalogued: as a first transaction, or in its sequence."""
    failure = entry.first_failing_input
    if failure is not None:
        # The increasing sweep starts every conversion afresh for these bugs, so its first wrong
        # input is the smallest one that fails as the first conversion after reset.
        assert min(wrong_inputs) == failure, f"{entry.name}: first wrong input {min(wrong_inputs)}"
        (alone,) = run_sequence([failure])
        assert alone != reference_bcd(failure), f"{entry.name}: {failure} alone simulates right"
    sequence = entry.raw.get("failing_sequence")
    if sequence is not None:
        position = entry.raw["failing_position"]
        shown = run_sequence(sequence)
        assert shown[position] != reference_bcd(sequence[position]), f"{entry.name}: sequence simulates right"
        for value, seen in zip(sequence[:position], shown[:position]):
            assert seen == reference_bcd(value), f"{entry.name}: {value} already wrong earlier in the sequence"
    assert failure is not None or sequence is not None, entry.name
