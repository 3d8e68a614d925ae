"""Speed of the lane simulator against its goals; prints a table, asserts nothing about time.

Goals: every input of a 24-bit shift-and-add-3 converter (2**24 lanes, chunks of 2**20) in
at most 5 s; 100,000 random vectors of a 64-bit converter in at most 5 s (packing and
unpacking included).  Every run also checks its digits against a reference, so a fast
wrong simulator shows up as "wrong", not as a good time.

    python3 bench/bench_simulate.py [--quick]
"""
from __future__ import annotations

import random
import sys
import time
from pathlib import Path

sys.path.insert(0, str(Path(__file__).resolve().parent.parent))

from bcdprove.model.node import Graph  # noqa: E402
from bcdprove.model.simulate import Simulator, counting_planes, pack, unpack  # noqa: E402
from tests.support.converters import division_by_ten, double_dabble  # noqa: E402


def _exhaustive(builder, width: int, chunk_bits: int) -> tuple[int, float, float, bool]:
    """All inputs, compared lane-parallel with a division-by-ten model of the same width."""
    g = Graph()
    x, digits = builder(g, width)
    _, reference = division_by_ten(g, width)
    started = time.perf_counter()
    simulator = Simulator(digits)
    checker = Simulator(reference)
    build = time.perf_counter() - started
    chunk = 1 << min(chunk_bits, width)
    correct = True
    checking = 0.0
    started = time.perf_counter()
    for start in range(0, 1 << width, chunk):
        planes = {x.id: counting_planes(start, chunk, width)}
        got = simulator.run(chunk, planes)
        mark = time.perf_counter()
        want = checker.run(chunk, planes)
        correct &= all(a.value == b.value for a, b in zip(got, want))
        checking += time.perf_counter() - mark
    run = time.perf_counter() - started - checking
    return simulator.gate_count, build, run, correct


def _random_vectors(builder, width: int, count: int) -> tuple[int, float, float, bool]:
    """``count`` random inputs through pack, run and unpack; digits checked with Python str."""
    g = Graph()
    x, digits = builder(g, width)
    started = time.perf_counter()
    simulator = Simulator(digits)
    build = time.perf_counter() - started
    rng = random.Random(1)
    values = [rng.getrandbits(width) for _ in range(count)]
    started = time.perf_counter()
    results = simulator.run(count, {x.id: pack(values, width)})
    lanes = [unpack(r.value, count) for r in results]
    run = time.perf_counter() - started
    correct = all([lanes[k][j] for k in range(len(digits))]
                  == [int(c) for c in reversed(str(v).zfill(len(digits)))]
                  for j, v in enumerate(values))
    return simulator.gate_count, build, run, correct


def main() -> None:
    quick = "--quick" in sys.argv
    rows = []
    exhaustive_width = 20 if quick else 24
    cases = [
        (f"double dabble {exhaustive_width}-bit, all inputs", 5.0,
         lambda: _exhaustive(double_dabble, exhaustive_width, 20)),
        ("double dabble 64-bit, 100,000 random", 5.0,
         lambda: _random_vectors(double_dabble, 64, 100_000)),
        ("division by ten 64-bit, 100,000 random", None,
         lambda: _random_vectors(division_by_ten, 64, 100_000)),
        ("double dabble 512-bit, 2,000 random", None,
         lambda: _random_vectors(double_dabble, 512, 2_000)),
    ]
    for name, goal, case in cases:
        gates, build, run, correct = case()
        rows.append((name, gates, build, run, goal, correct))
    print(f"{'case':44} {'gates':>8} {'build s':>8} {'run s':>8} {'goal s':>7}  result")
    for name, gates, build, run, goal, correct in rows:
        within = goal is None or build + run <= goal
        verdict = "wrong" if not correct else "ok" if within else "slow"
        goal_text = f"{goal:.1f}" if goal is not None else "-"
        print(f"{name:44} {gates:8d} {build:8.2f} {run:8.2f} {goal_text:>7}  {verdict}")


if __name__ == "__main__":
    main()
