"""The public API of ``bcdprove check``: read a design, build the binary-to-BCD problem, decide it.

:func:`check` reads Verilog; :func:`check_model` takes a model already built (tests, other
front ends).  Both return a :class:`CheckResult` holding the model, the problem and the
verdict.  When the design shows fewer digits than its inputs need, the verdict is disproved
with 10**D (the smallest value D digits cannot show, replayed like any counterexample), and
``digits_check`` holds a second verdict: whether the D digits present are right for every
input below 10**D.
"""
from __future__ import annotations

import time
from dataclasses import dataclass, field
from typing import Mapping, Optional, Sequence

from .engines.base import DISPROVED, PROVED, UNKNOWN, Budget, Verdict
from .engines.registry import EngineOptions, make_engine
from .engines.running import assert_sound, run_engine
from .engines.smt_miter import DEFAULT_FORM
from .model.design import Model
from .errors import BcdproveError
from .spec.bin2bcd import Bin2BcdProblem, build_problem

SPECS = ("bin2bcd", "bcd2bin", "signed")
EXIT_CODES = {PROVED: 0, DISPROVED: 1, UNKNOWN: 3}


@dataclass
class CheckResult:
    """Everything a report needs: what was read, what was asked, what was found."""

    model: Model
    problem: Bin2BcdProblem          # or Bcd2BinProblem / SignedProblem (``problem.spec``)
    verdict: Verdict
    engine: str
    seconds: float
    digits_check: Optional[Verdict] = None     # only when D digits cannot hold every input
    timeout: Optional[float] = None
    notes: list[str] = field(default_factory=list)
    overrides: dict[str, int] = field(default_factory=dict)   # parameters the user set

    @property
    def exit_code(self) -> int:
        """0 proved, 1 disproved, 3 unknown (2 is for input errors, raised before a result)."""
        return EXIT_CODES[self.verdict.status]


def port_list(names: str | Sequence[str] | None) -> list[str] | None:
    """Port names given as a list or as one comma-separated string; None when empty."""
    if names is None:
        return None
    if isinstance(names, str):
        names = names.split(",")
    cleaned = [n.strip() for n in names if n.strip()]
    return cleaned or None


def check(files: Sequence[str], top: str, *, parameters: Mapping[str, int] | None = None,
          include_dirs: Sequence[str] = (), defines: Mapping[str, str] | None = None,
          **options) -> CheckResult:
    """Read ``files`` with ``top`` as the top module and check it; see :func:`check_model`.

    Raises BcdproveError for anything wrong with the input (files, ports, options).
    """
    from .verilog import read_design

    started = time.monotonic()
    model = read_design(list(files), top, dict(parameters or {}), include_dirs=list(include_dirs),
                        defines=dict(defines or {}))
    result = check_model(model, started=started, **options)
    result.overrides = dict(parameters or {})
    return result


def check_model(model: Model, *, inputs: str | Sequence[str] | None = None,
                outputs: str | Sequence[str] | None = None, msd_first: bool = False,
                max_input: int | None = None, ties: Mapping[str, int] | None = None,
                engine: str = "auto", timeout: float | None = None, exhaustive_limit: int = 24,
                random_vectors: int = 1 << 20, seed: int = 1,
                smt_form: str = DEFAULT_FORM, started: float | None = None,
                progress=None, spec: str = "bin2bcd", invalid_flag: str | None = None,
                sign: str | None = None) -> CheckResult:
    """Check ``model`` against the specification ``spec`` with engine ``engine``.

    ``spec``: ``bin2bcd`` (binary input, BCD digit outputs), ``bcd2bin`` (BCD digit inputs,
    binary output; ``invalid_flag`` names an output that must be 1 exactly for digits above
    9) or ``signed`` (two's-complement input, ``sign`` output, magnitude digits).

    ``timeout`` (seconds) bounds the whole check, both verdicts included, counted from
    ``started`` (a ``time.monotonic()`` reading, e.g. before the design was read; default:
    now); running out gives unknown with what was covered.  Other options: see
    EngineOptions and build_problem; ``progress(done, total)`` is told of stages proved.
    """
    started = time.monotonic() if started is None else started
    problem = build_spec_problem(model, spec, inputs=port_list(inputs),
                                 outputs=port_list(outputs), msd_first=msd_first,
                                 max_input=max_input, ties=ties, invalid_flag=invalid_flag,
                                 sign=sign)
    options = EngineOptions(exhaustive_limit=exhaustive_limit, random_vectors=random_vectors,
                            seed=seed, smt_form=smt_form, progress=progress)
    runner = make_engine(engine, options)
    budget = Budget(timeout, start=started)
    digits_check = None
    if problem.fits():
        verdict = run_engine(runner, problem, budget)
    elif problem.spec == "bin2bcd":
        verdict, digits_check = _check_too_few_digits(problem, runner, budget)
        assert_sound(verdict)
    else:
        verdict, digits_check = _check_too_small(problem, runner, budget)
        assert_sound(verdict)
    return CheckResult(model=model, problem=problem, verdict=verdict, engine=engine,
                       seconds=time.monotonic() - started, digits_check=digits_check,
                       timeout=timeout, notes=list(model.notes))


def _check_too_few_digits(problem: Bin2BcdProblem, runner, budget: Budget) -> tuple[Verdict, Verdict]:
    capacity = problem.capacity()
    shown = problem.replay(capacity)
    if shown is None:   # replay treats every x >= 10**D as wrong; reaching here is a bug
        raise AssertionError(f"{capacity} replayed as right with {problem.digit_count} digits")
    shown.note = (f"{capacity:,} is the smallest value {problem.digit_count} digits cannot show; "
                  f"{problem.width} bits need {problem.needed_digits()} digits")
    below = problem.below_capacity()
    digits_check = run_engine(runner, below, budget)
    verdict = Verdict(DISPROVED, runner.name, digits_check.seconds, counterexample=shown,
                      covered=f"too few digits: inputs {capacity:,} .. {problem.top_value:,} "
                              f"cannot be shown",
                      stats={"digits_check": digits_check.status})
    return verdict, digits_check


def build_spec_problem(model: Model, spec: str, *, inputs=None, outputs=None,
                       msd_first: bool = False, max_input: int | None = None,
                       ties: Mapping[str, int] | None = None, invalid_flag: str | None = None,
                       sign: str | None = None):
    """The problem of specification ``spec``; BcdproveError for an option that does not
    belong to it (``--max-input``/``--msd-first`` are bin2bcd's, ``--invalid-flag``
    bcd2bin's, ``--sign`` signed's)."""
    if spec not in SPECS:
        raise BcdproveError(f"--spec {spec}: choose one of {', '.join(SPECS)}")
    if invalid_flag is not None and spec != "bcd2bin":
        raise BcdproveError(f"--invalid-flag is an option of --spec bcd2bin, not of --spec {spec}")
    if sign is not None and spec != "signed":
        raise BcdproveError(f"--sign is an option of --spec signed, not of --spec {spec}")
    if spec == "bin2bcd":
        return build_problem(model, inputs=inputs, outputs=outputs, msd_first=msd_first,
                             max_input=max_input, ties=ties)
    for given, option in ((max_input is not None, "--max-input"), (msd_first, "--msd-first")):
        if given:
            raise BcdproveError(f"{option} is an option of --spec bin2bcd, not of --spec {spec}")
    if spec == "bcd2bin":
        from .spec.bcd2bin import build_problem as build_bcd2bin
        return build_bcd2bin(model, inputs=inputs, outputs=outputs, ties=ties,
                             invalid_flag=invalid_flag)
    from .spec.signed import build_problem as build_signed
    return build_signed(model, inputs=inputs, outputs=outputs, ties=ties, sign=sign)


def _check_too_small(problem, runner, budget: Budget) -> tuple[Verdict, Verdict]:
    """The outputs cannot show every value of the contract (a bcd2bin output narrower than
    10**D - 1 needs, signed digits too few for 2**(W-1)): disproved at the smallest value
    they cannot show (replayed), and a second verdict for the values below it."""
    witness = problem.too_large_witness()
    shown = problem.replay(witness)
    if shown is None:   # no output can be right at the witness; reaching here is a bug
        raise AssertionError(f"input {witness} replayed as right although it cannot be shown")
    shown.note = problem.too_small_note()
    below = problem.below_capacity()
    digits_check = run_engine(runner, below, budget)
    verdict = Verdict(DISPROVED, runner.name, digits_check.seconds, counterexample=shown,
                      covered=problem.too_small_words(),
                      stats={"digits_check": digits_check.status})
    return verdict, digits_check
