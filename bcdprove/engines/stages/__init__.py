"""Stage induction for wide binary-to-BCD converters: the engine ``stages``.

See /work/shared/notes/ENGINE.md for the method; :mod:`.engine` for the chain,
:mod:`.reference` for the canonical stages, :mod:`.mining`, :mod:`.cuts`,
:mod:`.obligations` and :mod:`.lifting` for its parts.
"""
from .engine import StageEngine

__all__ = ["StageEngine"]
