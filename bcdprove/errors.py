"""Errors a user can act on.  The command line prints them as ``file:line: message``."""
from __future__ import annotations

from typing import Optional


class BcdproveError(Exception):
    """Bad input: an unreadable file, a syntax error, an unsupported construct, a bad option.

    ``file`` and ``line`` point at the original source (after mapping back through the
    preprocessor), or are None when the problem is not in a file (a bad option).
    """

    def __init__(self, message: str, file: Optional[str] = None, line: Optional[int] = None):
        super().__init__(message)
        self.message = message
        self.file = file
        self.line = line

    def __str__(self) -> str:
        if self.file is not None and self.line is not None:
            return f"{self.file}:{self.line}: {self.message}"
        if self.file is not None:
            return f"{self.file}: {self.message}"
        return self.message


class UnsupportedConstruct(BcdproveError):
    """A construct the reader knows it does not model; the message names it."""


class DesignError(BcdproveError):
    """A design that is not valid: multiple drivers, combinational loop, latch, ..."""
