"""The cautions every human-facing output carries (DESIGN.md section 8), in our own words."""

CAUTIONS: tuple[str, ...] = (
    "PRELIMINARY DESIGN AID ONLY - not a construction document until reviewed.",
    "Soil parameters must come from a site-specific geotechnical investigation; "
    "wallsched uses only the values given to it.",
    "All results must be checked, and the design sealed, by a licensed professional engineer.",
    "Local codes and the building official govern over anything computed here.",
    "Method limits: cantilevered reinforced-concrete walls only; drained backfill unless a water "
    "level is given; no global (slope) stability, settlement or seismic site response is checked.",
)


def caution_text(prefix: str = "") -> str:
    """The cautions as lines, each starting with ``prefix``."""
    return "\n".join(f"{prefix}{line}" for line in CAUTIONS)


# the cautions as the epilog of every command's --help (click keeps "\b" paragraphs as written)
EPILOG = "\b\nCAUTIONS\n" + "\n".join(f"- {c}" for c in CAUTIONS)
