"""The SMT engine: one miter over bit-vectors, design digits against the specification, in z3.

The miter asks for an ``x <= top`` and values of every free leaf (untied inputs, unknown
values) such that the digits are wrong; unsat is a proof for every such choice.  Two
formulations of "wrong" are offered:

- ``divide``: some ``digit_i != (x / 10**i) % 10``;
- ``multiply``: not (every ``digit_i <= 9`` and ``sum(digit_i * 10**i) == x``), at a width
  where nothing wraps.  A digit vector with every digit at most 9 is unique, so both say
  the same.

bench/bench_check.py times both; :data:`DEFAULT_FORM` is the faster one there.
"""
from __future__ import annotations

import time

from .base import DISPROVED, PROVED, UNKNOWN, Budget, Verdict

FORMS = ("divide", "multiply")
# Measured with bench/bench_check.py at 8..20 bits on a shift-and-add-3 converter: the two
# forms are within a factor of two, divide ahead in most runs (e.g. 20 bits: 8.2 s against
# 10.2 s), so it is the default.
DEFAULT_FORM = "divide"


def _wrong_condition(problem, encoder, form: str):
    import z3

    x = encoder.term(problem.x)
    digits = [encoder.term(d) for d in problem.digits]
    if form == "divide":
        wide = problem.check_width()
        xw = z3.ZeroExt(wide - problem.width, x)
        wrong = []
        for i, d in enumerate(digits):
            expected = z3.URem(z3.UDiv(xw, z3.BitVecVal(10 ** i, wide)), z3.BitVecVal(10, wide))
            wrong.append(z3.ZeroExt(wide - 4, d) != expected)
        # Digits alone cannot show x >= 10**D: the missing top digit is wrong too.
        wrong.append(z3.UGE(xw, z3.BitVecVal(problem.capacity(), wide)))
        return z3.Or(*wrong)
    if form == "multiply":
        wide = problem.check_width()
        value = z3.BitVecVal(0, wide)
        in_range = []
        for d in reversed(digits):
            in_range.append(z3.ULE(d, z3.BitVecVal(9, 4)))
            value = value * 10 + z3.ZeroExt(wide - 4, d)
        right = z3.And(*in_range, value == z3.ZeroExt(wide - problem.width, x))
        return z3.Not(right)
    raise ValueError(f"unknown formulation {form!r}; choose one of {', '.join(FORMS)}")


def _shrunk(problem, found, budget: Budget, stats: dict):
    """The solver picks any failing input; a smaller one nearby reads better in a report."""
    from .replay import LaneChecker, shrink

    smaller = shrink(LaneChecker(problem), found, budget)
    if smaller is not found:
        stats["shrunk_from"] = str(problem.input_value(found))
    return smaller


class SmtEngine:
    """A single z3 query; the time limit comes from the budget."""

    name = "smt"

    def __init__(self, form: str = DEFAULT_FORM) -> None:
        if form not in FORMS:
            raise ValueError(f"unknown formulation {form!r}; choose one of {', '.join(FORMS)}")
        self.form = form

    def run(self, problem, budget: Budget) -> Verdict:
        import z3

        from ..model.smt import Z3Encoder, check_within

        started = time.monotonic()
        stats = {"form": self.form}
        encoder = Z3Encoder()
        solver = z3.Solver(ctx=getattr(encoder, "ctx", None))
        left = budget.remaining()
        if left is not None:
            if left <= 0:
                return Verdict(UNKNOWN, self.name, 0.0, covered="no query was posed",
                               reason="the time limit was reached", stats=stats)
        if problem.spec != "bin2bcd":
            # Other specifications state their own contract and "wrong" (one form each).
            assertions = problem.miter(encoder, self.form)
            stats["form"] = "multiply"
        else:
            assertions = [_wrong_condition(problem, encoder, self.form)]
        if problem.spec == "bin2bcd" and problem.max_input is not None:
            assertions.append(z3.ULE(encoder.term(problem.x),
                                     z3.BitVecVal(problem.max_input, problem.width)))
        answer = check_within(solver, left, assertions)
        seconds = time.monotonic() - started
        stats["solver_seconds"] = round(seconds, 3)
        range_text = problem.contract_words()
        if answer == z3.unsat:
            return Verdict(PROVED, self.name, seconds,
                           covered=f"{range_text}, by one miter ({stats['form']} form), unsat",
                           stats=stats)
        if answer == z3.sat:
            model = solver.model()
            x = encoder.leaf_values(model, [problem.x])[problem.x.id]
            free = encoder.leaf_values(model, problem.free_leaves())
            found = problem.replay(x, free)
            if found is None:
                # The solver's answer must survive replay; if not, say so rather than guess.
                return Verdict(UNKNOWN, self.name, seconds, covered=range_text,
                               reason=f"the solver's counterexample (input {x}) did not replay "
                                      f"as wrong on the model; please report this", stats=stats)
            found = _shrunk(problem, found, budget, stats)
            return Verdict(DISPROVED, self.name, time.monotonic() - started,
                           counterexample=found, covered=f"{range_text}, by one miter "
                                                         f"({stats['form']} form)", stats=stats)
        why = solver.reason_unknown()
        out_of_time = left is not None and time.monotonic() - started >= left * 0.95
        reason = ("solver stopped at the time limit"
                  if out_of_time or "timeout" in why or "canceled" in why
                  else f"solver gave up: {why}")
        return Verdict(UNKNOWN, self.name, seconds, covered=f"{range_text}: not decided",
                       reason=reason, stats=stats)
