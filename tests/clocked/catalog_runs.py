"""Shared helpers: the clocked catalogue entries and their checks, run once per session."""
from __future__ import annotations

import functools

from bcdprove.clocked import check_clocked_model
from bcdprove.verilog import read_design
from tests.designs.catalog import DESIGNS, load_catalog

CLOCKED = {e.top: e for e in load_catalog() if e.clocked}


def model_of(top: str):
    entry = CLOCKED[top]
    return read_design([str(entry.path)], entry.top, dict(entry.parameters))


def protocol_options(top: str) -> dict:
    """The catalogue's protocol as check options (a pipeline needs its latency)."""
    raw = CLOCKED[top].raw
    if raw["protocol"] == "pipeline":
        return {"latency": raw["latency"], "clock": raw["clock"]}
    return {"clock": raw["clock"], "reset": raw["reset"],
            "reset_low": raw["reset_active_low"], "start": raw["start"], "done": raw["done"]}


@functools.lru_cache(maxsize=None)
def checked(top: str):
    """The clocked check of a catalogue entry with its catalogued protocol."""
    result = check_clocked_model(model_of(top), timeout=120, **protocol_options(top))
    result.overrides = dict(CLOCKED[top].parameters)
    return result


__all__ = ["CLOCKED", "DESIGNS", "checked", "model_of", "protocol_options"]
