"""The project's small error hierarchy.

``InputError`` is bad input: the command line prints its one line and exits 2.
``DesignError`` is a failure of the method itself (a bug or non-convergence): exit 1.
"""

from __future__ import annotations

from pathlib import Path

MAX_LINE = 800  # characters of a message in the one line (longer is cut in the middle)


class WallError(Exception):
    """Root of every error the project raises on purpose."""


class InputError(WallError, ValueError):
    """Bad input: names the file, the line or key, what is wrong and what to do.

    Args:
        message: what is wrong and what to do.
        file: the input file concerned (path or name), if any.
        where: the line (``"line 12"``) or key (``"[soil] unit_weight_pcf"``), if any.
    """

    def __init__(self, message: str, file: str | Path | None = None, where: str | None = None):
        self.message = message
        self.file = None if file is None else str(file)
        self.where = where
        super().__init__(self.one_line())

    def one_line(self) -> str:
        """The single line the command line prints."""
        parts = [p for p in (self.file, self.where) if p]
        head = ": ".join(parts)
        text = " ".join(self.message.split())
        if len(text) > MAX_LINE:  # a value quoted whole would bury what to do
            text = text[:MAX_LINE * 3 // 4] + " ... " + text[-MAX_LINE // 4:]
        return f"{head}: {text}" if head else text


class ProfileError(InputError):
    """A grade profile or alignment that cannot be used."""


class DesignError(WallError):
    """The engine could not do what it must (a bug, or the audit disagreeing)."""
