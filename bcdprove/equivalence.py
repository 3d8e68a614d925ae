"""The public API of ``bcdprove equiv``: read two designs, pair their ports, decide equivalence.

:func:`equiv` reads Verilog (each design with its own reader, so both may define modules of
the same name); :func:`equiv_models` takes two models already built.  Both return an
:class:`EquivalenceResult` that the reports render.  "Equivalent" means: for every value of
the shared inputs and every way the unknown values (``x``, ``z``, out-of-range selects) of
both designs may be resolved, every output pair agrees (see ``spec/equivalence.py``).
"""
from __future__ import annotations

import time
from dataclasses import dataclass, field
from typing import Mapping, Optional, Sequence

from .engines.base import DISPROVED, PROVED, UNKNOWN, Budget, Verdict
from .engines.running import run_engine
from .errors import BcdproveError
from .model.design import Model
from .spec.equivalence import EquivalenceProblem, build_equivalence

EXIT_CODES = {PROVED: 0, DISPROVED: 1, UNKNOWN: 3}


@dataclass
class EquivalenceResult:
    """What was compared, how, and what was found."""

    problem: EquivalenceProblem
    verdict: Verdict
    engine: str
    seconds: float
    timeout: Optional[float] = None
    overrides_a: dict[str, int] = field(default_factory=dict)   # parameters the user set
    overrides_b: dict[str, int] = field(default_factory=dict)
    notes: list[str] = field(default_factory=list)

    @property
    def model_a(self) -> Model:
        return self.problem.model_a

    @property
    def model_b(self) -> Model:
        return self.problem.model_b

    @property
    def exit_code(self) -> int:
        """0 equivalent (proved), 1 different (disproved), 3 unknown; 2 is for input errors."""
        return EXIT_CODES[self.verdict.status]


def equiv(files: Sequence[str], top: str, against_files: Sequence[str], against_top: str, *,
          parameters: Mapping[str, int] | None = None,
          against_parameters: Mapping[str, int] | None = None,
          include_dirs: Sequence[str] = (), defines: Mapping[str, str] | None = None,
          **options) -> EquivalenceResult:
    """Read design ``top`` from ``files`` and ``against_top`` from ``against_files`` and
    compare them; see :func:`equiv_models` for the options.  The two reads are independent
    (separate preprocessing, parsing and graphs); ``include_dirs`` and ``defines`` apply to
    both.  Raises BcdproveError for anything wrong with the input.
    """
    from .verilog import read_design

    started = time.monotonic()
    model_a = read_design(list(files), top, dict(parameters or {}),
                          include_dirs=list(include_dirs), defines=dict(defines or {}))
    model_b = read_design(list(against_files), against_top, dict(against_parameters or {}),
                          include_dirs=list(include_dirs), defines=dict(defines or {}))
    result = equiv_models(model_a, model_b, started=started, **options)
    result.overrides_a = dict(parameters or {})
    result.overrides_b = dict(against_parameters or {})
    return result


def equiv_models(model_a: Model, model_b: Model, *, mapping: Mapping[str, str] | None = None,
                 engine: str = "auto", timeout: float | None = None, vectors: int = 1 << 13,
                 seed: int = 1, query_seconds: float = 5.0, latency: Optional[int] = None,
                 clock: Optional[str] = None, reset: Optional[str] = None,
                 reset_low: Optional[bool] = None, start: Optional[str] = None,
                 done: Optional[str] = None, hold_input: bool = False,
                 max_cycles: Optional[int] = None, started: float | None = None) -> EquivalenceResult:
    """Decide whether ``model_a`` and ``model_b`` compute the same outputs.

    ``mapping`` pairs ports of A (keys) with ports of B (values); the others pair by name.
    ``engine``: auto or sweep (difference hunt, SAT sweeping, output miter), miter (hunt, then
    one query per output down to the inputs), random (the hunt alone; never proves).
    ``timeout`` bounds the whole run from ``started`` (default now); past it: unknown with
    what was proved.  ``vectors``: random vectors of the hunt; ``query_seconds``: the limit of
    one solver query.

    Clocked designs: pipelines (``latency`` cycles) or, without ``latency``, handshake pairs
    (``start``, ``done``, ``max_cycles``, ``hold_input``), with ``clock``/``reset``/
    ``reset_low`` as for ``check``; see ``spec/clocked_equivalence.py`` for the reading.
    Protocol options for two combinational designs raise BcdproveError.
    """
    from .engines.sweeping import make_equivalence_engine

    started = time.monotonic() if started is None else started
    runner = make_equivalence_engine(engine, vectors=vectors, seed=seed,
                                     query_seconds=query_seconds)
    if model_a.is_clocked or model_b.is_clocked:
        from .spec.clocked_equivalence import build_clocked_equivalence

        problem = build_clocked_equivalence(model_a, model_b, latency=latency, mapping=mapping,
                                            clock=clock, reset=reset, reset_low=reset_low,
                                            start=start, done=done, hold_input=hold_input,
                                            max_cycles=max_cycles)
    else:
        given = [name for name, value in (("--latency", latency), ("--clock", clock),
                                          ("--reset", reset), ("--start", start),
                                          ("--done", done), ("--hold-input", hold_input or None),
                                          ("--max-cycles", max_cycles),
                                          ("--reset-low/--reset-high", reset_low))
                 if value is not None]
        if given:
            raise BcdproveError(f"{', '.join(given)}: both designs are combinational; "
                                f"protocol options apply to clocked designs")
        problem = build_equivalence(model_a, model_b, mapping)
    verdict = run_engine(runner, problem, Budget(timeout, start=started))
    return EquivalenceResult(problem=problem, verdict=verdict, engine=engine,
                             seconds=time.monotonic() - started, timeout=timeout,
                             notes=list(model_a.notes) + list(model_b.notes))
