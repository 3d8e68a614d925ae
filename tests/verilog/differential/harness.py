"""Running generated cases through Icarus Verilog and through the reader, and comparing.

Icarus is the referee.  Many cases share one compile: each case is its own file (its own top
module), one test bench instantiates all of them, applies the same number of vectors to each
and prints every output in binary (``%b`` shows x and z bit by bit).  The reader reads each
case file on its own; the model's outputs are evaluated on the same vectors and compared bit
for bit.

Rules of comparison (main campaign): Icarus must print only 0 and 1 (else the generator is
wrong), and the model must give a known value equal to it.  In the x campaign: every bit
Icarus prints as x or z must be unknown in the model; a bit Icarus knows must either equal
the model's or be unknown in the model, the latter only when the case holds an x source.
"""
from __future__ import annotations

import os
import random
import re
import subprocess
import tempfile
import traceback
from concurrent.futures import ThreadPoolExecutor
from dataclasses import dataclass, field
from pathlib import Path
from typing import Callable, Optional, Sequence

from tests.support.icarus import run_icarus

from .generator import Case, generate_case, make_vectors

BENCH_TOP = "diff_bench"
ICARUS_TIMEOUT = 15.0      # seconds; a batch normally takes well under one


# --------------------------------------------------------------------------- results
@dataclass
class Finding:
    """One disagreement between the reader and Icarus (or a case one side could not run)."""

    kind: str                 # "value", "unknown", "known-where-x", "reader-error", "icarus-x",
                              # "icarus-rejected", "width"
    case: Case
    vector: dict[str, int] = field(default_factory=dict)
    output: str = ""
    icarus: str = ""          # Icarus's bits, most significant first
    model: str = ""           # the model's bits, x where unknown
    detail: str = ""
    minimised: Optional[Case] = None
    minimised_outputs: dict = field(default_factory=dict)   # output -> (Icarus bits, model bits)

    @property
    def signature(self) -> tuple:
        if self.kind == "reader-error":
            return (self.kind, _normalise(self.detail))
        return (self.kind, self.output)

    def describe(self) -> str:
        lines = [f"{self.kind} in case {self.case.name} (seed {self.case.seed!r})"]
        if self.output:
            lines.append(f"  output {self.output}: Icarus {self.icarus}  model {self.model}")
        if self.vector:
            lines.append("  vector " + ", ".join(f"{k}={v:#x}" for k, v in self.vector.items()))
        if self.detail:
            lines.append("  " + self.detail.strip().replace("\n", "\n  "))
        shown = self.minimised or self.case
        lines.append("  minimised:" if self.minimised else "  text:")
        lines.append("    " + shown.text().rstrip().replace("\n", "\n    "))
        for name, (icarus, model) in self.minimised_outputs.items():
            mark = "" if icarus == model else "   <- differs"
            lines.append(f"  minimised {name}: Icarus {icarus}  model {model}{mark}")
        return "\n".join(lines)


@dataclass
class CampaignResult:
    cases: int = 0
    vectors: int = 0
    compared_bits: int = 0
    findings: list[Finding] = field(default_factory=list)
    # x campaign, in a case whose x meets an operator the standard makes wholly x (clause
    # 5.1.5) or an if/case condition (clause 9.4: x takes the else branch): Icarus x where the
    # model knows the bit, or a different 0/1; counted and shown, not failures
    tolerated: list[Finding] = field(default_factory=list)

    def merge(self, other: "CampaignResult") -> None:
        self.cases += other.cases
        self.vectors += other.vectors
        self.compared_bits += other.compared_bits
        self.findings.extend(other.findings)
        self.tolerated.extend(other.tolerated)


def _normalise(message: str) -> str:
    first = message.strip().splitlines()[0] if message.strip() else ""
    first = re.sub(r"^.*?\.v:\d+:\s*", "", first)
    return re.sub(r"[`'\"]?\b\w*\d\w*\b[`'\"]?", "#", first)[:80]


# --------------------------------------------------------------------------- Icarus side
def _bench_text(cases: Sequence[Case], vectors: Sequence[Sequence[dict[str, int]]]) -> str:
    lines = [f"module {BENCH_TOP};"]
    for n, case in enumerate(cases):
        connections = []
        for port in case.inputs:
            lines.append(f"  reg [{port.width - 1}:0] c{n}_{port.name};")
            connections.append(f".{port.name}(c{n}_{port.name})")
        for port in case.outputs:
            lines.append(f"  wire [{port.width - 1}:0] c{n}_{port.name};")
            connections.append(f".{port.name}(c{n}_{port.name})")
        lines.append(f"  {case.name} u{n} ({', '.join(connections)});")
    # wait first, so every always @* block is waiting for its inputs when they change
    lines.append("  initial begin")
    lines.append("    #1;")
    steps = max((len(v) for v in vectors), default=0)
    for step in range(steps):
        for n, case in enumerate(cases):
            if step < len(vectors[n]):
                for port in case.inputs:
                    lines.append(f"    c{n}_{port.name} = {port.width}'h{vectors[n][step][port.name]:x};")
        lines.append("    #1;")
        for n, case in enumerate(cases):
            if step < len(vectors[n]):
                formats = " ".join("%b" for _ in case.outputs)
                names = ", ".join(f"c{n}_{p.name}" for p in case.outputs)
                lines.append(f'    $display("R {n} {step} {formats}", {names});')
    lines += ["  end", "endmodule", ""]
    return "\n".join(lines)


def icarus_outputs(cases: Sequence[Case], vectors: Sequence[Sequence[dict[str, int]]],
                   directory: Path) -> dict[tuple[int, int], list[str]]:
    """Icarus's output bits for each (case number, vector number), one string per output.

    Raises AssertionError (from run_icarus) when the batch does not compile.
    """
    files = []
    for case in cases:
        path = directory / f"{case.name}.v"
        path.write_text(case.text())
        files.append(path)
    try:
        text = run_icarus(files, BENCH_TOP, extra_text=_bench_text(cases, vectors),
                          timeout=ICARUS_TIMEOUT)
    except subprocess.TimeoutExpired as error:
        raise AssertionError(f"Icarus did not finish in {ICARUS_TIMEOUT} s") from error
    results: dict[tuple[int, int], list[str]] = {}
    for line in text.splitlines():
        fields = line.split()
        if len(fields) >= 3 and fields[0] == "R":
            results[(int(fields[1]), int(fields[2]))] = fields[3:]
    return results


def icarus_outputs_robust(cases: Sequence[Case], vectors, directory: Path):
    """Like :func:`icarus_outputs`, but a case Icarus rejects is left out (its entry: the error)."""
    try:
        return icarus_outputs(cases, vectors, directory), {}
    except AssertionError as error:
        if len(cases) == 1:
            return {}, {0: str(error)}
    half = len(cases) // 2
    first, first_bad = icarus_outputs_robust(cases[:half], vectors[:half], directory)
    second, second_bad = icarus_outputs_robust(cases[half:], vectors[half:], directory)
    merged = dict(first)
    merged.update({(n + half, v): bits for (n, v), bits in second.items()})
    bad = dict(first_bad)
    bad.update({n + half: e for n, e in second_bad.items()})
    return merged, bad


# --------------------------------------------------------------------------- model side
def _simulator(x_campaign: bool) -> Callable:
    """How the model is run: the scalar evaluator (the model's own operator semantics,
    fast on wide arithmetic) sampled over free values; in the x campaign the project's
    three-valued simulator bcdprove.model.simulate, whose unknown mask is what is checked.
    """
    if x_campaign:
        try:
            from bcdprove.model.simulate import simulate
            return simulate
        except ImportError:
            pass
    return _simulate_by_sampling


def _simulate_by_sampling(roots, vectors, free=None):
    """Per root, per lane (value, unknown_mask), by evaluating with several choices of free values.

    A bit is unknown when it differs between choices.  This under-approximates the unknown
    bits, which is the safe direction for the x campaign's "Icarus x must be unknown" check.
    """
    from bcdprove.model import Op, evaluate, leaves, mask
    free_leaves = [n for n in leaves(roots) if n.op == Op.FREE]
    lanes = len(next(iter(vectors.values()))) if vectors else 1
    rng = random.Random(0)
    choices = [lambda n: 0, lambda n: mask(n.width)] + [lambda n: rng.randrange(1 << n.width)] * 6
    out = [[None] * lanes for _ in roots]
    for lane in range(lanes):
        values = {ident: lane_values[lane] for ident, lane_values in vectors.items()}
        seen = []
        for choose in (choices if free_leaves else choices[:1]):
            trial = dict(values)
            trial.update({n.id: choose(n) for n in free_leaves})
            for leaf in leaves(roots):
                trial.setdefault(leaf.id, 0)
            seen.append(evaluate(roots, trial))
        for r in range(len(roots)):
            first = seen[0][r]
            unknown = 0
            for other in seen[1:]:
                unknown |= first ^ other[r]
            out[r][lane] = (first & ~unknown, unknown)
    return out


def model_outputs(case: Case, path: Path, vectors: Sequence[dict[str, int]], x_campaign: bool = False):
    """Per vector, per output: (value, unknown_mask) from the reader's model of ``case``."""
    from bcdprove.verilog import read_design
    model = read_design([str(path)], case.name)
    roots = [model.port(p.name).node for p in case.outputs]
    lanes = {}
    for port in case.inputs:
        leaf = model.port(port.name).node
        lanes[leaf.id] = [v[port.name] for v in vectors]
    per_root = _simulator(x_campaign)(roots, lanes)
    return [[per_root[r][lane] for r in range(len(roots))] for lane in range(len(vectors))]


def _bits(value: int, unknown: int, width: int) -> str:
    return "".join("x" if unknown >> i & 1 else str(value >> i & 1) for i in reversed(range(width)))


# --------------------------------------------------------------------------- comparison
def compare_case(case: Case, path: Path, vectors, icarus: dict, number: int,
                 x_campaign: bool, result: CampaignResult) -> list[Finding]:
    """Compare one case; findings are returned (and counted in ``result``)."""
    findings: list[Finding] = []
    try:
        model = model_outputs(case, path, vectors, x_campaign)
    except Exception as error:  # every failure of the reader on valid Verilog is a finding
        detail = f"{type(error).__name__}: {error}"
        if not hasattr(error, "file"):
            detail += "\n" + "".join(traceback.format_exception(error)[-3:])
        return [Finding("reader-error", case, detail=detail)]
    for step, vector in enumerate(vectors):
        printed = icarus.get((number, step))
        if printed is None or len(printed) != len(case.outputs):
            return [Finding("icarus-rejected", case, detail=f"no output for vector {step}")]
        result.vectors += 1
        for port, bits, (value, unknown) in zip(case.outputs, printed, model[step]):
            finding = _compare_bits(case, port, bits, value, unknown, x_campaign)
            result.compared_bits += port.width
            if finding is not None:
                finding.vector = dict(vector)
                if finding.kind in ("known-where-word-x", "x-resolved-differently"):
                    result.tolerated.append(finding)
                    continue
                findings.append(finding)
                break
        if findings:
            break
    return findings


def _compare_bits(case: Case, port, bits: str, value: int, unknown: int, x_campaign: bool):
    model_bits = _bits(value, unknown, port.width)
    make = lambda kind: Finding(kind, case, output=port.name, icarus=bits, model=model_bits)  # noqa: E731
    if len(bits) != port.width:
        return make("width")
    tolerated = None
    for i, bit in enumerate(reversed(bits)):
        model_unknown = unknown >> i & 1
        if bit in "xzXZ":
            if not x_campaign:
                return make("icarus-x")
            if not model_unknown:
                if not case.has_word_x:
                    return make("known-where-x")
                tolerated = tolerated or make("known-where-word-x")
        elif model_unknown:
            if not (x_campaign and case.has_x_source):
                return make("unknown")
        elif int(bit) != value >> i & 1:
            if x_campaign and case.has_x_source and case.has_word_x:
                tolerated = tolerated or make("x-resolved-differently")
                continue
            return make("value")
    return tolerated


# --------------------------------------------------------------------------- campaigns
def run_cases(cases: Sequence[Case], vector_count: int, x_campaign: bool = False,
              batch: int = 50, workers: int = 2) -> CampaignResult:
    """Run ``cases`` on Icarus (batched) and through the reader; collect findings."""
    result = CampaignResult()
    batches = [list(cases[i:i + batch]) for i in range(0, len(cases), batch)]
    with tempfile.TemporaryDirectory(prefix="bcdprove-diff-") as tmp:
        directory = Path(tmp)
        vector_sets = [[make_vectors(c, vector_count) for c in b] for b in batches]
        # Icarus runs in other processes: overlap it with the reader, which runs here
        with ThreadPoolExecutor(max_workers=max(1, workers)) as pool:
            futures = []
            for k, (group, vectors) in enumerate(zip(batches, vector_sets)):
                sub = directory / f"batch{k}"
                sub.mkdir()
                futures.append(pool.submit(icarus_outputs_robust, group, vectors, sub))
            for k, (group, vectors, future) in enumerate(zip(batches, vector_sets, futures)):
                icarus, rejected = future.result()
                sub = directory / f"batch{k}"
                for n, case in enumerate(group):
                    result.cases += 1
                    if n in rejected:
                        finding = Finding("icarus-rejected", case, detail=rejected[n])
                        # Icarus's own internal failures are its bugs, not the generator's
                        internal = "Assertion" in rejected[n] or "assert:" in rejected[n]
                        (result.tolerated if internal else result.findings).append(finding)
                        continue
                    result.findings.extend(compare_case(case, sub / f"{case.name}.v", vectors[n],
                                                        icarus, n, x_campaign, result))
    return result


def run_campaign(seed: int | str, count: int, x_campaign: bool = False, vector_count: int = 6,
                 batch: int = 50, start: int = 0, minimise: bool = True,
                 avoid: frozenset = frozenset()) -> CampaignResult:
    """Generate cases ``start .. start+count-1`` of campaign ``seed`` and run them."""
    cases = [generate_case(seed, i, x_campaign, avoid) for i in range(start, start + count)]
    result = run_cases(cases, vector_count, x_campaign, batch)
    if minimise:
        for finding in result.findings:
            if finding.kind not in ("icarus-rejected", "icarus-x"):
                minimise_finding(finding, x_campaign)
    return result


# --------------------------------------------------------------------------- shrinking
def _still_fails(candidates: Sequence[Case], finding: Finding, x_campaign: bool) -> list[bool]:
    vector = [finding.vector] if finding.vector else [{p.name: 0 for p in finding.case.inputs}]
    renamed = [c.renamed(f"shr{k}c") for k, c in enumerate(candidates)]
    with tempfile.TemporaryDirectory(prefix="bcdprove-shrink-") as tmp:
        directory = Path(tmp)
        icarus, rejected = icarus_outputs_robust(renamed, [vector] * len(renamed), directory)
        verdicts = []
        for n, case in enumerate(renamed):
            if n in rejected:
                verdicts.append(False)
                continue
            scratch = CampaignResult()
            found = compare_case(case, directory / f"{case.name}.v", vector, icarus, n,
                                 x_campaign, scratch)
            verdicts.append(any(f.signature == finding.signature for f in found))
        return verdicts


def shrink(finding: Finding, x_campaign: bool = False, rounds: int = 60, batch: int = 80) -> Case:
    """The smallest variant of the finding's case that fails the same way (greedy, by size)."""
    current = finding.case
    for _ in range(rounds):
        candidates = sorted({c.text(): c for c in current.shrink_variants()}.values(),
                            key=lambda c: c.size)[:batch]
        if not candidates:
            break
        verdicts = _still_fails(candidates, finding, x_campaign)
        smaller = [c for c, bad in zip(candidates, verdicts) if bad and c.size < current.size]
        if not smaller:
            break
        current = smaller[0]
    return current


def minimise_finding(finding: Finding, x_campaign: bool = False) -> None:
    """Shrink ``finding`` and record both sides' outputs of the minimised case."""
    finding.minimised = shrink(finding, x_campaign)
    if finding.kind != "reader-error" and finding.vector:
        try:
            finding.minimised_outputs = replay(finding.minimised, finding.vector, x_campaign)
        except Exception as error:  # the record is for people; never lose the finding over it
            finding.minimised_outputs = {"?": (str(error)[:200], "")}


def environment_seed() -> Optional[int]:
    """The extra seed from BCDPROVE_FUZZ_SEED, if that variable is set."""
    text = os.environ.get("BCDPROVE_FUZZ_SEED")
    return int(text) if text else None


def replay(case: Case, vector: dict[str, int], x_campaign: bool = False) -> dict[str, tuple[str, str]]:
    """Per output of ``case`` on one vector: (Icarus's bits, the model's bits, x where unknown)."""
    with tempfile.TemporaryDirectory(prefix="bcdprove-replay-") as tmp:
        directory = Path(tmp)
        icarus = icarus_outputs([case], [[vector]], directory)[(0, 0)]
        model = model_outputs(case, directory / f"{case.name}.v", [vector], x_campaign)[0]
    return {port.name: (bits, _bits(value, unknown, port.width))
            for port, bits, (value, unknown) in zip(case.outputs, icarus, model)}
