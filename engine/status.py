"""The status of a segment or station: a code from :class:`StatusCode` with its reason.

A :class:`Status` is also the text the outputs print (``"ok"`` or ``"code: reason"``, the
``status`` column of ``schedule.csv``), so it can be written and compared as text; the code is
what the program tests (never the text's prefix).
"""

from __future__ import annotations

from enum import Enum


class StatusCode(Enum):
    OK = "ok"
    NO_WALL = "no_wall"  # retained height below min_retained_height_ft: no wall needed
    OVER_LIMIT = "over_limit"  # retained height above max_retained_height_ft
    NO_SECTION = "no_section"  # nothing on the sizing grid holds the design height
    FAILS = "fails"  # the section fails a check at a station
    GRADES_CROSS = "grades_cross"  # the front grade stands above the retained grade at a station

    @property
    def failing(self) -> bool:
        """Could not be designed within the limits (exit code 3): where the grades cross the
        soil is retained from the other side, which no check of the section covers."""
        return self in (StatusCode.OVER_LIMIT, StatusCode.NO_SECTION, StatusCode.FAILS,
                        StatusCode.GRADES_CROSS)


class Status(str):
    """A status code with its reason, as the text ``"ok"`` or ``"<code>: <reason>"``."""

    code: StatusCode
    reason: str

    def __new__(cls, code: StatusCode, reason: str = "") -> Status:
        obj = super().__new__(cls, f"{code.value}: {reason}" if reason else code.value)
        obj.code = code
        obj.reason = reason
        return obj

    def __reduce__(self):
        return (Status, (self.code, self.reason))

    @property
    def ok(self) -> bool:
        return self.code is StatusCode.OK

    @property
    def failing(self) -> bool:
        return self.code.failing


OK = Status(StatusCode.OK)
