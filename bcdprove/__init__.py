"""bcdprove: formal checking of binary/BCD converter designs written in Verilog.

The public API, which the command line itself uses:

- :func:`read_design` reads Verilog files into a :class:`~bcdprove.model.Model`;
- :func:`check` / :func:`check_model` prove a combinational converter or find the input that
  breaks it; :func:`check_clocked` / :func:`check_clocked_model` do the same for serial and
  pipelined converters under a clocking protocol;
- :func:`equiv` / :func:`equiv_models` show that two designs compute the same outputs, or
  find an input where they differ;
- :func:`evaluate_vectors` evaluates a model on input vectors.
"""
from .checking import CheckResult, check, check_model
from .clocked import ClockedResult, check_clocked, check_clocked_model
from .equivalence import EquivalenceResult, equiv, equiv_models
from .errors import BcdproveError, DesignError, UnsupportedConstruct
from .evaluation import evaluate_vectors
from .verilog import read_design

__version__ = "0.1.0"

__all__ = [
    "BcdproveError", "CheckResult", "ClockedResult", "DesignError", "EquivalenceResult",
    "UnsupportedConstruct", "check", "check_clocked", "check_clocked_model", "check_model",
    "equiv", "equiv_models", "evaluate_vectors", "read_design",
]
