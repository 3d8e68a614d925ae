"""The contract every engine meets: take a problem and a budget, return a verdict with evidence.

An engine sees only the model (through the problem the specification built); it never
touches the Verilog reader.  Adding an engine means one new module here that provides an
object with ``name`` and ``run``; no other engine changes.

Soundness rules every engine keeps:
- ``proved`` only when every obligation it posed came back unsatisfiable (or every input
  was simulated) and together they reach from the inputs to the outputs;
- ``disproved`` only with a counterexample that was replayed on the model and showed the
  wrong output (see ``Counterexample.replayed``);
- a limit reached is ``unknown`` with ``reason`` and ``covered`` filled in.
"""
from __future__ import annotations

import time
from dataclasses import dataclass, field
from typing import Any, Optional, Protocol

PROVED = "proved"
DISPROVED = "disproved"
UNKNOWN = "unknown"


@dataclass
class Budget:
    """A wall-clock limit shared by every engine of one check (``seconds=None``: no limit)."""

    seconds: Optional[float] = None
    start: float = field(default_factory=time.monotonic)

    def elapsed(self) -> float:
        return time.monotonic() - self.start

    def remaining(self) -> Optional[float]:
        if self.seconds is None:
            return None
        return max(0.0, self.seconds - self.elapsed())

    def expired(self) -> bool:
        left = self.remaining()
        return left is not None and left <= 0.0


@dataclass
class Counterexample:
    """A concrete input (and, where the design reads unknown values, a choice for them)."""

    inputs: dict[str, int]                    # port name -> value
    expected: list[int]                       # what the specification asks for, per digit / word
    actual: list[int]                         # what the replay on the model produced
    wrong: list[int]                          # positions (digit indices) that differ
    free_values: dict[int, int] = field(default_factory=dict)   # free node id -> value chosen
    replayed: bool = False                    # set only by the replay, never by an engine's claim
    note: str = ""                            # e.g. "10000 is the smallest value 4 digits cannot show"


@dataclass
class Verdict:
    status: str                               # PROVED | DISPROVED | UNKNOWN
    engine: str
    seconds: float = 0.0
    counterexample: Optional[Counterexample] = None
    covered: str = ""                         # what was covered, in words a user reads
    reason: str = ""                          # for UNKNOWN: why it stopped
    stats: dict[str, Any] = field(default_factory=dict)


class Engine(Protocol):
    name: str

    def run(self, problem: Any, budget: Budget) -> Verdict:
        """Decide ``problem`` within ``budget``; never claim more than was shown."""
        ...
