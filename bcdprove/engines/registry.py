"""Engine names on the command line mapped to engine objects.

``make_engine(name, options)`` is the one place that knows every engine; the wide-converter
engine (``stages``) is imported only when asked for or when ``auto`` looks for it, so a
missing or broken optional engine never stops the others.
"""
from __future__ import annotations

from dataclasses import dataclass
from typing import Callable, Optional

from ..errors import BcdproveError
from .smt_miter import DEFAULT_FORM

ENGINE_NAMES = ("auto", "exhaustive", "random", "smt", "stages")


@dataclass
class EngineOptions:
    """Settings the engines take from the command line."""

    exhaustive_limit: int = 24          # exhaustive proves up to 2**limit inputs
    random_vectors: int = 1 << 20       # vectors of the random engine
    hunt_vectors: int = 1 << 14         # vectors of auto's quick bug hunt
    seed: int = 1                       # random engine seed, for reproducible runs
    smt_form: str = DEFAULT_FORM        # smt miter formulation: divide | multiply
    progress: Optional[Callable[[int, int], None]] = None   # stages done of total, for a bar


class StagesBySpec:
    """``--engine stages`` for every specification: the stage engine of the problem's spec
    (bin2bcd: :mod:`.stages`; bcd2bin: :mod:`.prefix_stages`; signed: :mod:`.signed_stages`,
    which reduces to the bin2bcd stages when the design takes the magnitude first)."""

    name = "stages"

    def __init__(self, bin2bcd, progress=None) -> None:
        self.bin2bcd = bin2bcd
        self.progress = progress

    def run(self, problem, budget):
        if problem.spec == "bin2bcd":
            return self.bin2bcd.run(problem, budget)
        if problem.spec == "bcd2bin":
            from .prefix_stages import PrefixStageEngine
            return PrefixStageEngine(progress=self.progress).run(problem, budget)
        from .signed_stages import SignedStageEngine
        return SignedStageEngine(self.bin2bcd).run(problem, budget)


def stage_engine(options: EngineOptions):
    """The wide-converter engine, or None when it is not installed."""
    try:
        from .stages import StageEngine
    except ImportError:
        return None
    # Its own defaults otherwise: none of the other options are about stage induction.
    return StagesBySpec(StageEngine(progress=options.progress), progress=options.progress)


def make_engine(name: str, options: EngineOptions | None = None):
    """The engine called ``name``; BcdproveError for an unknown or unavailable one."""
    options = options or EngineOptions()
    if name == "random":
        from .random_sim import RandomEngine
        return RandomEngine(options.random_vectors, options.seed)
    if name == "exhaustive":
        from .exhaustive import ExhaustiveEngine
        return ExhaustiveEngine(options.exhaustive_limit)
    if name == "smt":
        from .smt_miter import FORMS, SmtEngine
        if options.smt_form not in FORMS:
            raise BcdproveError(f"--smt-form {options.smt_form}: choose one of {', '.join(FORMS)}")
        return SmtEngine(options.smt_form)
    if name == "stages":
        engine = stage_engine(options)
        if engine is None:
            raise BcdproveError("the stages engine is not available in this installation")
        return engine
    if name == "auto":
        from .auto import AutoEngine
        return AutoEngine(options)
    raise BcdproveError(f"--engine {name}: choose one of {', '.join(ENGINE_NAMES)}")
