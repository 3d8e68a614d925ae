"""The public API of clocked checks: protocol, unrolled obligations, engines, traces.

:func:`check_clocked_model` takes a clocked :class:`~bcdprove.model.design.Model` and the
protocol options (``--clock``, ``--reset`` ... on the command line), builds the obligations
of :mod:`bcdprove.spec.clocked` and decides each with an engine from the registry.  The
result holds one :class:`Obligation` per protocol obligation (a handshake has two: the first
conversion after reset and the next one), each with its verdict and, when disproved, the
failing run cycle by cycle (every input, register and output), replayed on the model.

Before the main problem of an obligation, its *hunts* run: the same obligation with the
other cycles' data inputs (and, for a second conversion, the first value) fixed, so that
a bug that needs history is found by simulation instead of one solver call per input.  A
hunt can only disprove; its counterexample is a real run like any other.
"""
from __future__ import annotations

import time
from dataclasses import dataclass, field
from typing import Mapping, Optional, Sequence

from .engines.base import DISPROVED, PROVED, UNKNOWN, Budget, Verdict
from .engines.registry import EngineOptions, make_engine
from .checking import EXIT_CODES, port_list
from .engines.running import assert_sound, run_engine
from .model.design import Model
from .model.unroll import CycleValues
from .spec.clocked import ClockedProblem, Protocol, build_clocked_problems, infer_protocol



@dataclass
class Obligation:
    """One protocol obligation and what the engines found.

    ``clocked`` is the problem the verdict is about: the main one, or the hunt that found
    the counterexample.  ``trace``, ``present_cycle`` and ``read_cycle`` describe the failing
    run (None when nothing failed); ``read_cycle`` None in a failing run means the result was
    never read (``done`` did not rise in the window).
    """

    main: ClockedProblem
    clocked: ClockedProblem
    verdict: Verdict
    leaf_values: dict[int, int] = field(default_factory=dict)
    trace: Optional[list[CycleValues]] = None
    present_cycle: Optional[int] = None
    read_cycle: Optional[int] = None
    too_few_digits: bool = False

    @property
    def title(self) -> str:
        return self.main.title


@dataclass
class ClockedResult:
    """Everything a clocked report needs."""

    model: Model
    protocol: Protocol
    obligations: list[Obligation]
    engine: str
    seconds: float
    timeout: Optional[float] = None
    notes: list[str] = field(default_factory=list)
    overrides: dict[str, int] = field(default_factory=dict)

    @property
    def status(self) -> str:
        """disproved if any obligation is, else unknown if any is, else proved."""
        statuses = [o.verdict.status for o in self.obligations]
        if DISPROVED in statuses:
            return DISPROVED
        if UNKNOWN in statuses:
            return UNKNOWN
        return PROVED

    @property
    def exit_code(self) -> int:
        """0 proved, 1 disproved, 3 unknown (2 is for input errors, raised before a result)."""
        return EXIT_CODES[self.status]

    @property
    def failing(self) -> Optional[Obligation]:
        """The first disproved obligation, if any."""
        return next((o for o in self.obligations if o.verdict.status == DISPROVED), None)

    def as_dict(self) -> dict:
        """A JSON-ready summary: status, protocol, each obligation's verdict and, for a
        failing one, the counterexample and the run (one object per cycle)."""
        protocol = self.protocol
        record = {"module": self.model.top, "files": list(self.model.files), "clocked": True,
                  "status": self.status, "exit_code": self.exit_code, "engine": self.engine,
                  "seconds": round(self.seconds, 3),
                  "protocol": {"kind": protocol.kind, "clock": protocol.clock,
                               "reset": protocol.reset,
                               "reset_active_low": protocol.reset_active_low,
                               "start": protocol.start, "done": protocol.done,
                               "latency": protocol.latency, "hold_input": protocol.hold_input,
                               "max_cycles": protocol.max_cycles},
                  "reasons": list(protocol.reasons), "obligations": []}
        for obligation in self.obligations:
            verdict = obligation.verdict
            item = {"title": obligation.title, "status": verdict.status,
                    "engine": verdict.engine, "seconds": round(verdict.seconds, 3),
                    "covered": verdict.covered, "reason": verdict.reason}
            found = verdict.counterexample
            if found is not None:
                problem = obligation.clocked.problem
                item["counterexample"] = {
                    "input": obligation.clocked.data_input,
                    "value": found.inputs[problem.input_ports[0]],
                    "present_cycle": obligation.present_cycle,
                    "read_cycle": obligation.read_cycle,
                    "expected": found.expected, "actual": found.actual, "wrong": found.wrong,
                    "note": found.note}
                item["run"] = [{"cycle": c.cycle, "inputs": c.inputs, "outputs": c.outputs,
                                "registers": c.registers} for c in obligation.trace or []]
            record["obligations"].append(item)
        record["notes"] = list(self.notes)
        return record


def check_clocked(files: Sequence[str], top: str, *, parameters: Mapping[str, int] | None = None,
                  include_dirs: Sequence[str] = (), defines: Mapping[str, str] | None = None,
                  **options) -> ClockedResult:
    """Read ``files`` with ``top`` as the top module and check it; see :func:`check_clocked_model`."""
    from .verilog import read_design

    model = read_design(list(files), top, dict(parameters or {}), include_dirs=list(include_dirs),
                        defines=dict(defines or {}))
    result = check_clocked_model(model, **options)
    result.overrides = dict(parameters or {})
    return result


def check_clocked_model(model: Model, *, clock: Optional[str] = None, reset: Optional[str] = None,
                        reset_low: Optional[bool] = None, start: Optional[str] = None,
                        done: Optional[str] = None, latency: Optional[int] = None,
                        hold_input: bool = False, max_cycles: Optional[int] = None,
                        inputs: Optional[Sequence[str]] = None,
                        outputs: Optional[Sequence[str]] = None, msd_first: bool = False,
                        max_input: Optional[int] = None, ties: Mapping[str, int] | None = None,
                        engine: str = "auto", timeout: Optional[float] = None,
                        exhaustive_limit: int = 24, random_vectors: int = 1 << 20, seed: int = 1,
                        smt_form: str = "multiply") -> ClockedResult:
    """Check the clocked ``model`` under its protocol (see :mod:`bcdprove.spec.clocked`).

    ``timeout`` bounds the whole check; an obligation not decided in time is unknown with
    the reason.  With ``engine="auto"`` an undecided obligation gets a last try with the smt
    engine in the time left.  Raises BcdproveError for bad ports or options.
    """
    started = time.monotonic()
    protocol = infer_protocol(model, clock=clock, reset=reset, reset_low=reset_low, start=start,
                              done=done, latency=latency, hold_input=hold_input,
                              max_cycles=max_cycles)
    problems = build_clocked_problems(model, protocol, inputs=port_list(inputs),
                                      outputs=port_list(outputs), msd_first=msd_first,
                                      max_input=max_input, ties=ties)
    options = EngineOptions(exhaustive_limit=exhaustive_limit, random_vectors=random_vectors,
                            seed=seed, smt_form=smt_form)
    runner = make_engine(engine, options)
    budget = Budget(timeout)
    obligations = [_decide(item, runner, engine, options, budget) for item in problems]
    return ClockedResult(model=model, protocol=protocol, obligations=obligations, engine=engine,
                         seconds=time.monotonic() - started, timeout=timeout,
                         notes=list(model.notes))


def _decide(item: ClockedProblem, runner, engine: str, options: EngineOptions,
            budget: Budget) -> Obligation:
    from .engines.random_sim import RandomEngine

    problem = item.problem
    if not problem.fits():
        return _too_few_digits(item, budget)
    hunter = RandomEngine(options.hunt_vectors, options.seed)
    for hunt in item.hunts:
        if budget.expired():
            break
        found = run_engine(hunter, hunt.problem, budget)
        if found.status == DISPROVED:
            found.covered = f"hunt ({hunt.hunt_note}): {found.covered}"
            return _explained(Obligation(item, hunt, found))
    verdict = run_engine(runner, problem, budget)
    if verdict.status == UNKNOWN and engine == "auto" and not budget.expired():
        from .engines.smt_miter import SmtEngine

        second = run_engine(SmtEngine(options.smt_form), problem, budget)
        if second.status != UNKNOWN:
            second.covered = f"{verdict.covered}; then {second.covered}"
            second.engine = f"auto ({second.engine})"
            verdict = second
        else:
            verdict.reason = f"{verdict.reason}; smt: {second.reason}"
    assert_sound(verdict)
    return _explained(Obligation(item, item, verdict))


def _too_few_digits(item: ClockedProblem, budget: Budget) -> Obligation:
    problem = item.problem
    capacity = problem.capacity()
    shown = problem.replay(capacity)
    if shown is None:   # replay treats every x >= 10**D as wrong; reaching here is a bug
        raise AssertionError(f"{capacity} replayed as right with {problem.digit_count} digits")
    shown.note = (f"{capacity:,} is the smallest value {problem.digit_count} digits cannot show; "
                  f"{problem.width} bits need {problem.needed_digits()} digits")
    verdict = Verdict(DISPROVED, "replay", budget.elapsed(), counterexample=shown,
                      covered=f"too few digits: inputs {capacity:,} .. {problem.top_value:,} "
                              f"cannot be shown")
    return _explained(Obligation(item, item, verdict, too_few_digits=True))


def _explained(obligation: Obligation) -> Obligation:
    """Fill in the failing run of a disproved obligation and say why it failed."""
    found = obligation.verdict.counterexample
    if obligation.verdict.status != DISPROVED or found is None:
        return obligation
    clocked = obligation.clocked
    values = clocked.leaf_values(found)
    obligation.leaf_values = values
    obligation.trace = clocked.unrolled.trace(values)
    obligation.present_cycle = clocked.present_cycle(values)
    obligation.read_cycle = clocked.read_cycle(values)
    protocol = clocked.protocol
    notes = [found.note] if found.note else []
    if obligation.read_cycle is None and protocol.done is not None:
        notes.append(f"`{protocol.done}` never rose {clocked.window}; the digits read are "
                     f"shown as 15 (no result)")
    elif clocked.stable_until is not None and obligation.read_cycle is not None:
        changed = _first_change(obligation.trace, clocked, obligation.read_cycle)
        if changed is not None:
            notes.append(f"the outputs changed in cycle {changed} although the input was held; "
                         f"the digits are shown as 15 (no steady result)")
    if clocked.hunt_note:
        notes.append(f"found with {clocked.hunt_note}")
    found.note = "; ".join(notes)
    return obligation


def _first_change(trace: list[CycleValues], clocked: ClockedProblem, read: int) -> Optional[int]:
    names = clocked.problem.output_ports
    for t in range(read + 1, clocked.stable_until + 1):
        if any(trace[t].outputs[n] != trace[read].outputs[n] for n in names):
            return t
    return None
