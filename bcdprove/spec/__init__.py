"""Specifications: each builds a problem (what the engines decide) from a design model."""
from .bin2bcd import Bin2BcdProblem, build_problem, decimal_digits, digits_needed

__all__ = ["Bin2BcdProblem", "build_problem", "decimal_digits", "digits_needed"]
