"""The one value type: a number, its unit, an optional uncertainty and its provenance.

Every number that reaches a page, an export or ``cohesion profile`` is a ``Value``.

Provenance kinds (exactly these):

- ``measured``   measured in-house
- ``literature`` a handbook, paper, standard or database
- ``supplier``   the supplier's documentation
- ``computed``   exact from the structure (formula, molar mass, electron count)
- ``estimated``  a named estimation method, with an uncertainty
- ``rule``       derived by a named rule from other values
- ``assumed``    a default the builder applied
"""
from __future__ import annotations

import math
from dataclasses import dataclass, field

from builder.core.units import format_value

KINDS = ("measured", "literature", "supplier", "computed", "estimated", "rule", "assumed")
#: kinds that must name a bibliography source
SOURCED_KINDS = ("measured", "literature", "supplier")


@dataclass(frozen=True)
class Provenance:
    """Where a value came from: a source key for data, a method id for derived values."""

    kind: str
    source: str | None = None
    method: str | None = None
    note: str | None = None

    def __post_init__(self):
        if self.kind not in KINDS:
            raise ValueError(f"unknown provenance kind {self.kind!r}; expected one of {', '.join(KINDS)}")
        if self.kind in SOURCED_KINDS and not self.source:
            raise ValueError(f"a {self.kind} value needs a source")
        if self.kind not in SOURCED_KINDS and not self.method:
            raise ValueError(f"a {self.kind} value needs a method")

    def as_dict(self) -> dict:
        out = {"kind": self.kind}
        for key in ("source", "method", "note"):
            if getattr(self, key):
                out[key] = getattr(self, key)
        return out


@dataclass(frozen=True)
class Value:
    """A number in ``unit`` (SI for physical quantities), with uncertainty and provenance.

    ``uncertainty`` is a standard uncertainty in the same unit.  ``conditions`` holds
    SI-float conditions such as ``{"at": 293.15}`` (K) or ``{"pressure": 101325.0}``.
    """

    value: float
    unit: str
    provenance: Provenance
    uncertainty: float | None = None
    conditions: tuple[tuple[str, float], ...] = field(default_factory=tuple)

    def __post_init__(self):
        if not isinstance(self.value, (int, float)) or not math.isfinite(self.value):
            raise ValueError(f"a value must be a finite number, got {self.value!r}")
        if self.uncertainty is not None and (not math.isfinite(self.uncertainty) or self.uncertainty < 0):
            raise ValueError(f"an uncertainty must be a non-negative finite number, got {self.uncertainty!r}")

    @property
    def kind(self) -> str:
        return self.provenance.kind

    def text(self) -> str:
        """The value as a person reads it."""
        return format_value(self.value, self.unit, self.uncertainty)

    def as_dict(self) -> dict:
        out = {"value": _clean(self.value), "unit": self.unit.replace("**", "^"),
               "provenance": self.provenance.as_dict()}
        if self.uncertainty is not None:
            out["uncertainty"] = _clean(self.uncertainty)
        if self.conditions:
            out["conditions"] = {k: _clean(v) for k, v in self.conditions}
        return out


@dataclass(frozen=True)
class Label:
    """A classification in words (a category, a band, a force class) with its provenance."""

    text: str
    provenance: Provenance
    #: a machine-readable form where there is one (a category number, a tuple of possible categories)
    code: int | str | tuple | None = None

    @property
    def kind(self) -> str:
        return self.provenance.kind

    def as_dict(self) -> dict:
        out = {"text": self.text, "provenance": self.provenance.as_dict()}
        if self.code is not None:
            out["code"] = list(self.code) if isinstance(self.code, tuple) else self.code
        return out


def _clean(x: float) -> float:
    """Round to 10 significant digits so exports are stable across platforms."""
    return float(f"{x:.10g}")


def computed(value: float, unit: str, method: str) -> Value:
    return Value(float(value), unit, Provenance("computed", method=method))


def estimated(value: float, unit: str, method: str, uncertainty: float | None, note: str | None = None) -> Value:
    return Value(float(value), unit, Provenance("estimated", method=method, note=note), uncertainty)
