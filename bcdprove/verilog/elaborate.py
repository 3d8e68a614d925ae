"""Elaboration: a parsed Verilog source and a top module name in, a flattened Model out.

Contract of :func:`elaborate`: every problem with the input raises BcdproveError (or its
subclasses DesignError / UnsupportedConstruct) carrying the original file and line; no other
exception escapes for bad input.  Deep designs are elaborated on a worker thread with a large
stack, so long chains of logic do not exhaust Python's recursion limit.
"""
from __future__ import annotations

import gc
import sys
import threading
from typing import Any, Mapping, Optional, Sequence

from pyverilog.vparser import ast as vast

from ..errors import BcdproveError
from ..model.design import Model
from ..model.node import Graph
from ._modules import Elaborator

__all__ = ["elaborate", "module_definitions"]

_STACK_BYTES = 512 * 1024 * 1024
_RECURSION_LIMIT = 200_000


def module_definitions(source: vast.Source, pre: Any) -> dict[str, vast.ModuleDef]:
    """The modules of a source by name; a name defined twice is an error."""
    from .parser import location
    modules: dict[str, vast.ModuleDef] = {}
    for definition in source.description.definitions or ():
        if isinstance(definition, vast.ModuleDef):
            if definition.name in modules:
                loc = location(pre, definition)
                raise BcdproveError(f"module `{definition.name}` is defined twice",
                                    loc.file, loc.line)
            modules[definition.name] = definition
    return modules


def elaborate(source: vast.Source, pre: Any, top: str, parameters: Optional[Mapping[str, int]] = None,
              graph: Optional[Graph] = None, files: Sequence[str] = ()) -> Model:
    """Flatten module ``top`` of ``source`` into a Model (see the package docstring)."""
    modules = module_definitions(source, pre)
    if top not in modules:
        found = ", ".join(sorted(modules)) or "none"
        raise BcdproveError(f"unknown top module `{top}` (modules found: {found})")
    graph = graph if graph is not None else Graph()
    model = Model(graph, top, list(files))
    model.notes.extend(getattr(pre, "notes", ()) or ())
    elaborator = Elaborator(graph, pre, model, modules)
    _run_deep(lambda: elaborator.elaborate(top, dict(parameters or {})))
    return model


def _run_deep(work) -> None:
    """Run ``work`` on a thread with a big stack; re-raise what it raised."""
    outcome: dict[str, BaseException] = {}

    def target() -> None:
        old_limit = sys.getrecursionlimit()
        sys.setrecursionlimit(max(old_limit, _RECURSION_LIMIT))
        # The graph only grows while elaborating and holds no reference cycles worth
        # collecting; the cyclic collector rescanning it would make elaboration quadratic.
        collecting = gc.isenabled()
        gc.disable()
        try:
            work()
        except RecursionError:
            outcome["error"] = BcdproveError("design too deeply nested to elaborate "
                                             "(recursion limit)")
        except BcdproveError as error:  # handed to the caller's thread below
            outcome["error"] = error
        except Exception as error:  # a reader bug must still end in a message, not a trace
            outcome["error"] = BcdproveError(
                f"internal error while elaborating ({type(error).__name__}: {error}); "
                "please report it with the design")
            outcome["error"].__cause__ = error
        except BaseException as error:  # KeyboardInterrupt and the like: re-raised as is
            outcome["error"] = error
        finally:
            if collecting:
                _promote_to_oldest_generation()
                gc.enable()
            sys.setrecursionlimit(old_limit)

    try:
        previous = threading.stack_size(_STACK_BYTES)
    except (ValueError, RuntimeError):
        previous = None
    try:
        worker = threading.Thread(target=target, name="bcdprove-elaborate")
        worker.start()
    finally:
        if previous is not None:
            threading.stack_size(previous)
    worker.join()
    if "error" in outcome:
        raise outcome["error"]


def _promote_to_oldest_generation() -> None:
    """Move every tracked object to the collector's oldest generation without scanning it.

    What elaboration made is the model, which lives on, or the elaborator's own structures,
    which a full collection frees as before.  Left in the youngest generation, all of it
    would be scanned by the next young collection and again when promoted (a quarter of a
    second at 256 bits).  Freezing and unfreezing at once is that move; it is skipped while
    a caller keeps objects frozen, since unfreezing would release theirs too.
    """
    if gc.get_freeze_count() == 0:
        gc.freeze()
        gc.unfreeze()
