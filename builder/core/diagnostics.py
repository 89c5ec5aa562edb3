"""Diagnostics: every problem found in the entries, printed as ``path:line:col: severity: message``."""
from __future__ import annotations

from dataclasses import dataclass

SEVERITIES = ("error", "warning")


@dataclass(frozen=True, order=True)
class Diagnostic:
    """One problem in one file, at a 1-based line and column."""

    path: str
    line: int
    col: int
    severity: str
    message: str
    hint: str | None = None

    def __post_init__(self):
        if self.severity not in SEVERITIES:
            raise ValueError(f"unknown severity {self.severity!r}")

    def __str__(self) -> str:
        text = f"{self.path}:{self.line}:{self.col}: {self.severity}: {self.message}"
        if self.hint:
            text += f" ({self.hint})"
        return text

    def as_dict(self) -> dict:
        out = {"path": self.path, "line": self.line, "col": self.col,
               "severity": self.severity, "message": self.message}
        if self.hint:
            out["hint"] = self.hint
        return out


class CatalogError(Exception):
    """The catalog could not be built; ``diagnostics`` lists every reason."""

    def __init__(self, diagnostics: list[Diagnostic]):
        super().__init__(f"{sum(d.severity == 'error' for d in diagnostics)} error(s) in the entries")
        self.diagnostics = diagnostics


def errors(diagnostics: list[Diagnostic]) -> list[Diagnostic]:
    return [d for d in diagnostics if d.severity == "error"]
