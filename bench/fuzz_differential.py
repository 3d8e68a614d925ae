"""A large differential campaign: the Verilog reader against Icarus Verilog, for developers.

    python3 bench/fuzz_differential.py --seed 7 --cases 5000 [--x] [--no-avoid] [--no-shrink]

Prints a table (cases, vectors, bits compared, findings by kind, time) and then each finding
minimised, with its seed so that ``generate_case(seed, index, ...)`` rebuilds it.  Constructs
of the open reader bugs in tests/verilog/differential/regressions.py are left out unless
--no-avoid is given.  Exit status 1 when anything was found.
"""
from __future__ import annotations

import argparse
import collections
import sys
import time
from pathlib import Path

sys.path.insert(0, str(Path(__file__).resolve().parent.parent))

from tests.verilog.differential.harness import minimise_finding, run_campaign  # noqa: E402
from tests.verilog.differential.regressions import avoided_constructs  # noqa: E402


def main(argv=None) -> int:
    parser = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    parser.add_argument("--seed", type=int, default=1)
    parser.add_argument("--cases", type=int, default=2000)
    parser.add_argument("--start", type=int, default=0, help="index of the first case")
    parser.add_argument("--x", action="store_true", help="run the x campaign")
    parser.add_argument("--vectors", type=int, default=6, help="vectors per case")
    parser.add_argument("--batch", type=int, default=50, help="cases per Icarus compile")
    parser.add_argument("--no-avoid", action="store_true",
                        help="also generate constructs of open reader bugs")
    parser.add_argument("--no-shrink", action="store_true", help="show findings as generated")
    parser.add_argument("--show", type=int, default=3, help="findings shown per kind")
    args = parser.parse_args(argv)

    avoid = frozenset() if args.no_avoid else avoided_constructs()
    started = time.time()
    result = run_campaign(args.seed, args.cases, x_campaign=args.x, vector_count=args.vectors,
                          batch=args.batch, start=args.start, minimise=False, avoid=avoid)
    elapsed = time.time() - started
    kinds = collections.Counter(f.kind for f in result.findings)
    tolerated = collections.Counter(f.kind for f in result.tolerated)

    print(f"{'campaign':<24}{'x' if args.x else 'main'}")
    print(f"{'seed':<24}{args.seed}")
    print(f"{'cases':<24}{result.cases} (from index {args.start})")
    print(f"{'vectors':<24}{result.vectors}")
    print(f"{'bits compared':<24}{result.compared_bits}")
    print(f"{'avoided constructs':<24}{', '.join(sorted(avoid)) or '-'}")
    print(f"{'time':<24}{elapsed:.1f} s ({1000 * elapsed / max(result.cases, 1):.0f} ms a case)")
    for kind, count in sorted(kinds.items()):
        print(f"{'finding: ' + kind:<24}{count}")
    for kind, count in sorted(tolerated.items()):
        print(f"{'tolerated: ' + kind:<24}{count}")
    if not kinds:
        print(f"{'findings':<24}0")

    shown: collections.Counter = collections.Counter()
    for finding in result.findings:
        if shown[finding.signature] >= args.show:
            continue
        shown[finding.signature] += 1
        if not args.no_shrink and finding.kind not in ("icarus-rejected", "icarus-x"):
            minimise_finding(finding, args.x)
        print()
        print(finding.describe())
    return 1 if result.findings else 0


if __name__ == "__main__":
    sys.exit(main())
