"""Lifting a failed obligation to a real input, and replaying it on the whole model.

A failed obligation from stage ``s`` comes with solver values for the cone leaves: the stage
digits ``d{j}``, input bits ``b{o}`` and the design's unknown values.  When the digits read
as a value below ``2**s`` the state is reachable: ``x = value << (W - s)`` with the solver's
bits below it and a few choices for the bits it left open.  Each such ``x`` is replayed through
``problem.replay``; only a replay that shows a wrong output is a counterexample.
"""
from __future__ import annotations

import random
import re
from typing import Optional

from ..base import Counterexample
from ...model.node import mask

_LEAF = re.compile(r"^(?:in:)?(?P<kind>d|b|free|in|u)(?P<index>-?\d+)(?:_(?P<bit>\d+))?$")


def split_values(values: dict[str, int]) -> tuple[dict[int, int], dict[int, int], dict[int, int]]:
    """Solver values by leaf name -> (digits by index, bits by offset, leaf id -> value)."""
    digits: dict[int, int] = {}
    bits: dict[int, int] = {}
    leaves: dict[int, int] = {}
    for name, value in values.items():
        found = _LEAF.match(name)
        if not found:
            continue
        kind, index = found["kind"], int(found["index"])
        if kind == "d":
            digits[index] = value
        elif kind == "b":
            bits[index] = value & 1
        elif kind in ("free", "in"):
            leaves[index] = leaves.get(index, 0) | ((value & 1) << int(found["bit"]))
    return digits, bits, leaves


def candidate_inputs(values: dict[str, int], width: int, stage: int, stage_digits: int,
                     seed: int = 7, fills: int = 4) -> list[int]:
    """Inputs that reach the failed state, or [] when its digits cannot be a stage value."""
    digits, bits, _ = split_values(values)
    value = 0
    for j in range(stage_digits):
        digit = digits.get(j, 0)
        if digit > 9:
            return []
        value += digit * 10 ** j
    if value >= 1 << stage:
        return []
    low_width = width - stage
    fixed = 0
    fixed_mask = 0
    for offset, bit in bits.items():
        index = low_width - 1 - offset
        if 0 <= index < low_width:
            fixed |= bit << index
            fixed_mask |= 1 << index
    rng = random.Random(seed)
    out = []
    for k in range(fills):
        if k == 0:
            fill = 0
        elif k == 1:
            fill = mask(low_width)
        else:
            fill = rng.getrandbits(low_width) if low_width else 0
        low = (fixed & fixed_mask) | (fill & ~fixed_mask & mask(low_width))
        x = (value << low_width) | low
        if x not in out:
            out.append(x)
    return out


def confirm(problem, values: dict[str, int], stage: int, stage_digits: int,
            screen=None) -> Optional[Counterexample]:
    """A replayed counterexample reached from a failed obligation's state, or None.

    ``screen(inputs)`` may drop inputs a quick simulation shows right for every choice of
    unknown values; every input it keeps still goes through ``problem.replay``.
    """
    _, _, leaves = split_values(values)
    free_ids = {leaf.id for leaf in problem.free_leaves()}
    free_values = {k: v for k, v in leaves.items() if k in free_ids}
    inputs = [x for x in candidate_inputs(values, problem.width, stage, stage_digits)
              if problem.max_input is None or x <= problem.max_input]
    if screen is not None:
        inputs = screen(inputs)
    for x in inputs:
        for choice in (free_values, None):
            found = problem.replay(x, choice)
            if found is not None and found.replayed:
                return found
            if not free_values:
                break
    return None
