"""Reading Verilog: preprocess, parse and elaborate into the word-level Model.

:func:`read_design` is the one entry point later stages use.
"""
from __future__ import annotations

from typing import Mapping, Optional, Sequence

from ..model.design import Model
from ..model.node import Graph

__all__ = ["module_names", "read_design"]


def read_design(files: Sequence[str], top: str, parameters: Optional[Mapping[str, int]] = None,
                include_dirs: Sequence[str] = (), defines: Optional[Mapping[str, str]] = None,
                graph: Optional[Graph] = None) -> Model:
    """Read ``files`` and elaborate module ``top`` (its parameters overridden by
    ``parameters``) into a Model.

    The Model holds the top's ports in declaration order (inputs as INPUT leaves, outputs as
    their drivers), the top's final parameter values, every net and variable of every
    instance by hierarchical name, probes (``work@i=3``: a procedural variable at the end of
    a loop iteration), registers of clocked blocks, and notes (warnings).  Every problem
    with the input raises BcdproveError with the original file and line.
    """
    from .elaborate import elaborate
    from .parser import parse
    from .preprocess import preprocess

    pre = preprocess(list(files), include_dirs=include_dirs, defines=defines)
    source = parse(pre)
    return elaborate(source, pre, top, parameters, graph, files)


def module_names(files: Sequence[str], include_dirs: Sequence[str] = (),
                 defines: Optional[Mapping[str, str]] = None) -> set[str]:
    """The names of the modules ``files`` define (after preprocessing and parsing)."""
    from .elaborate import module_definitions
    from .parser import parse
    from .preprocess import preprocess

    pre = preprocess(list(files), include_dirs=include_dirs, defines=defines)
    return set(module_definitions(parse(pre), pre))
