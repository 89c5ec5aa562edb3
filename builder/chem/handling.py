"""Handling notes from derived facts, driven by a rules file.

Contents
--------
- :data:`FACTS`: every fact a rule may test, with its type and unit.
- :func:`load_rules`: read and validate ``builder/data/handling_rules.yaml``
  (or another file); every problem is reported at once in a
  :class:`RulesError`.
- :func:`evaluate_rules`: facts -> list of :class:`Note`, in a stable order.
- :data:`SEVERITIES`.

Rule file format
----------------
``version: 1`` and ``rules:``, a list of mappings with exactly the keys

- ``id``: lower-case words joined by hyphens, unique;
- ``when``: a condition (below);
- ``text``: short wording of our own; ``{fact}`` inserts a value (3
  significant figures) and ``{fact|degC}`` a temperature given in K as whole
  degC; a fact that is missing prints as "unknown" (facts tested in ``when``
  are always known when the rule fires, except under ``any``);
- ``severity``: one of :data:`SEVERITIES`;
- ``source``: a standard, or "common practice".

A condition is one of

- ``{all: [cond, ...]}``, ``{any: [cond, ...]}``, ``{not: cond}``;
- ``{field: NAME, OP: VALUE}`` with OP one of ``eq ne lt le gt ge in``;
  VALUE is a literal (a list for ``in``) or, for comparisons, a reference to
  another fact ``{field: NAME, add: NUMBER}`` (``add`` optional, same unit).

Unknown facts
-------------
A fact that is missing or None is *unknown*. Conditions use three-valued
(Kleene) logic: a comparison with an unknown operand is unknown; ``not``
keeps unknown; ``all`` is false if any part is false, else unknown if any
part is unknown; ``any`` is true if any part is true, else unknown if any
part is unknown. A rule fires only when its condition is *true*, so a
missing value never makes a note appear by accident (and, equally, a note
that needs a value is absent until the value is known).

Severity levels are our own priorities for display, not GHS signal words:
``high`` (fire, explosion or rupture can follow directly), ``medium`` (a
hazard that needs a specific precaution), ``info`` (context).
"""

from __future__ import annotations

import re
import string
from dataclasses import dataclass
from pathlib import Path
from typing import Any

import yaml

from builder.chem.constants import T_ZERO_CELSIUS
from builder.chem.datafile import ID_RE, DataFileError, load_yaml

RULES_PATH = Path(__file__).resolve().parents[1] / "data" / "handling_rules.yaml"

SEVERITIES = ("high", "medium", "info")
"""Display priorities, most urgent first."""

FACTS: dict[str, tuple[type, str]] = {
    "flammable_category": (int, "GHS flammable-liquid category 1-4"),
    "flash_point": (float, "closed-cup flash point [K]"),
    "boiling_point": (float, "normal boiling point [K]"),
    "store_max_temperature": (float, "highest temperature the store reaches [K]"),
    "store_max_temperature_basis": (str, "'stated' or 'assumed default'"),
    "vapor_density_ratio": (float, "vapour density relative to air [-]"),
    "dominant_force": (str, "one of builder.chem.forces.FORCE_KINDS, e.g. 'dispersion'"),
    "is_hydrocarbon": (bool, "only C and H atoms"),
    "electrical_conductivity": (float, "liquid conductivity [S/m]"),
    "density": (float, "liquid density [kg/m3]"),
    "water_miscible": (bool, "miscible with water in all proportions"),
    "log_p": (float, "octanol-water partition coefficient, log10 [-]"),
    "vapor_hazard_ratio": (float, "saturated vapour concentration / OEL [-]"),
    "volatility_band": (str, "COSHH Essentials band: low, medium, high"),
    "physical_state": (str, "most likely state at 20 degC, 101.325 kPa: gas, liquid or solid"),
    "state_for_rules": (str, "the safer reading of the state at 20 degC (most mobile state allowed)"),
    "store_state_for_rules": (str, "the safer reading of the state at the highest store temperature"),
    "is_organic": (bool, "the structure contains carbon"),
    "state_alternatives": (str, "every state the intervals allow at 20 degC, e.g. 'liquid or gas'"),
    "state_clear": (bool, "one state only at 20 degC (the melting and boiling points are clear of it)"),
    "gas_group": (str, "GHS ch. 2.5 group: compressed, 'liquefied, high pressure', 'liquefied, low pressure'"),
    "declared_toxic_by_inhalation": (bool, "H330 or H331 declared"),
    "declared_oxidising_gas": (bool, "H270 declared"),
    "flammable_gas": (bool, "a flammable gas (category derived or H220/H221/H232 declared)"),
    "process_temperature": (float, "process temperature [K]"),
}
"""Fact name -> (type, description). Values are SI."""

COMPARISONS = ("eq", "ne", "lt", "le", "gt", "ge")
OPERATORS = COMPARISONS + ("in",)
RULE_KEYS = ("id", "when", "text", "severity", "source")
_ID_RE = ID_RE
_FILTERS = ("degC",)


class RulesError(DataFileError):
    """The rules file is invalid; ``problems`` lists every issue found."""



@dataclass(frozen=True)
class Note:
    """One handling note. ``text`` is final wording with values inserted."""

    id: str
    text: str
    severity: str
    source: str

    def as_dict(self) -> dict:
        return {"id": self.id, "text": self.text, "severity": self.severity, "source": self.source}


@dataclass(frozen=True)
class Rule:
    """A validated rule as read from the file."""

    id: str
    when: dict
    text: str
    severity: str
    source: str


# --------------------------------------------------------------- validation


def _type_ok(name: str, value: Any) -> bool:
    kind = FACTS[name][0]
    if kind is bool:
        return isinstance(value, bool)
    if kind is int:
        return isinstance(value, int) and not isinstance(value, bool)
    if kind is float:
        return isinstance(value, (int, float)) and not isinstance(value, bool)
    return isinstance(value, kind)


def _check_field(name: Any, where: str, problems: list[str]) -> bool:
    if not isinstance(name, str) or name not in FACTS:
        problems.append(f"{where}: unknown fact {name!r} (known: {', '.join(FACTS)})")
        return False
    return True


def _check_condition(cond: Any, where: str, problems: list[str]) -> None:
    if not isinstance(cond, dict):
        problems.append(f"{where}: a condition must be a mapping, got {type(cond).__name__}")
        return
    logical = [k for k in ("all", "any", "not") if k in cond]
    if logical:
        if len(cond) != 1:
            problems.append(f"{where}: '{logical[0]}' must be the only key, got {sorted(cond)}")
            return
        key = logical[0]
        body = cond[key]
        if key == "not":
            _check_condition(body, f"{where}.not", problems)
        elif not isinstance(body, list) or not body:
            problems.append(f"{where}.{key}: expected a non-empty list")
        else:
            for i, sub in enumerate(body):
                _check_condition(sub, f"{where}.{key}[{i}]", problems)
        return
    if "field" not in cond:
        problems.append(f"{where}: expected 'all', 'any', 'not' or 'field', got {sorted(cond)}")
        return
    ops = [k for k in cond if k != "field"]
    bad = [k for k in ops if k not in OPERATORS]
    if bad or len(ops) != 1:
        problems.append(
            f"{where}: need exactly one operator from {', '.join(OPERATORS)}; got {ops}"
        )
        return
    name, op = cond["field"], ops[0]
    if not _check_field(name, f"{where}.field", problems):
        return
    value = cond[op]
    if op == "in":
        if not isinstance(value, list) or not value:
            problems.append(f"{where}.in: expected a non-empty list")
        elif not all(_type_ok(name, v) for v in value):
            problems.append(f"{where}.in: values must be {FACTS[name][0].__name__} for {name}")
        return
    if isinstance(value, dict):
        extra = set(value) - {"field", "add"}
        if extra or "field" not in value:
            problems.append(f"{where}.{op}: a reference needs 'field' and optional 'add'")
            return
        if not _check_field(value["field"], f"{where}.{op}.field", problems):
            return
        add = value.get("add", 0)
        if not isinstance(add, (int, float)) or isinstance(add, bool):
            problems.append(f"{where}.{op}.add: expected a number")
        if FACTS[value["field"]][0] is not FACTS[name][0] and not (
            FACTS[name][0] in (int, float) and FACTS[value["field"]][0] in (int, float)
        ):
            problems.append(f"{where}.{op}: cannot compare {name} with {value['field']}")
        return
    if not _type_ok(name, value):
        problems.append(f"{where}.{op}: {value!r} is not a {FACTS[name][0].__name__} for {name}")
    elif op not in ("eq", "ne") and FACTS[name][0] in (str, bool):
        problems.append(f"{where}: operator {op!r} needs a number; {name} is not one")


def _check_text(text: Any, where: str, problems: list[str]) -> None:
    if not isinstance(text, str) or not text.strip():
        problems.append(f"{where}: expected non-empty text")
        return
    try:
        parsed = list(string.Formatter().parse(text))
    except ValueError as exc:
        problems.append(f"{where}: bad placeholder ({exc})")
        return
    for _, field, spec, conv in parsed:
        if field is None:
            continue
        name, _, filt = field.partition("|")
        if spec or conv:
            problems.append(f"{where}: placeholder {{{field}}} takes no format spec")
        if filt and filt not in _FILTERS:
            problems.append(f"{where}: unknown filter {filt!r} (known: {', '.join(_FILTERS)})")
        if name not in FACTS:
            problems.append(f"{where}: placeholder {{{name}}} is not a known fact")


def validate_rules(data: Any, path: str = "<rules>") -> tuple[Rule, ...]:
    """Validate parsed YAML and return the rules; raise RulesError listing all problems."""
    problems: list[str] = []
    if not isinstance(data, dict) or set(data) != {"version", "rules"}:
        raise RulesError(path, ["top level must have exactly 'version' and 'rules'"])
    if data["version"] != 1:
        problems.append(f"version: unsupported {data['version']!r} (expected 1)")
    if not isinstance(data["rules"], list):
        raise RulesError(path, problems + ["rules: expected a list"])
    rules, seen = [], set()
    for i, raw in enumerate(data["rules"]):
        where = f"rules[{i}]"
        if not isinstance(raw, dict):
            problems.append(f"{where}: expected a mapping")
            continue
        unknown = sorted(set(raw) - set(RULE_KEYS))
        missing = [k for k in RULE_KEYS if k not in raw]
        if unknown:
            allowed = ", ".join(RULE_KEYS)
            problems.append(f"{where}: unknown field(s) {unknown} (allowed: {allowed})")
        if missing:
            problems.append(f"{where}: missing field(s) {missing}")
            continue
        rid = raw["id"]
        where = f"rules[{i}] ({rid})"
        if not isinstance(rid, str) or not _ID_RE.match(rid):
            problems.append(f"{where}.id: use lower-case words joined by hyphens")
        elif rid in seen:
            problems.append(f"{where}.id: duplicate id")
        seen.add(rid)
        if raw["severity"] not in SEVERITIES:
            problems.append(f"{where}.severity: {raw['severity']!r} not in {SEVERITIES}")
        if not isinstance(raw["source"], str) or not raw["source"].strip():
            problems.append(f"{where}.source: expected non-empty text")
        _check_condition(raw["when"], f"{where}.when", problems)
        _check_text(raw["text"], f"{where}.text", problems)
        rules.append(Rule(rid, raw["when"], raw["text"], raw["severity"], raw["source"]))
    if problems:
        raise RulesError(path, problems)
    return tuple(rules)


def load_rules(path: Path | str = RULES_PATH) -> tuple[Rule, ...]:
    """Read and validate a rules file."""
    with open(path, encoding="utf-8") as fh:
        try:
            data = load_yaml(fh)
        except yaml.YAMLError as exc:
            raise RulesError(str(path), [f"not valid YAML: {exc}"]) from exc
    return validate_rules(data, str(path))


# --------------------------------------------------------------- evaluation

_CMP = {
    "eq": lambda a, b: a == b,
    "ne": lambda a, b: a != b,
    "lt": lambda a, b: a < b,
    "le": lambda a, b: a <= b,
    "gt": lambda a, b: a > b,
    "ge": lambda a, b: a >= b,
}


def _truth(cond: dict, facts: dict[str, Any]) -> bool | None:
    """Three-valued truth of a validated condition: True, False or None (unknown)."""
    if "all" in cond:
        parts = [_truth(c, facts) for c in cond["all"]]
        return False if False in parts else (None if None in parts else True)
    if "any" in cond:
        parts = [_truth(c, facts) for c in cond["any"]]
        return True if True in parts else (None if None in parts else False)
    if "not" in cond:
        inner = _truth(cond["not"], facts)
        return None if inner is None else not inner
    left = facts.get(cond["field"])
    if left is None:
        return None
    op = next(k for k in cond if k != "field")
    right = cond[op]
    if op == "in":
        return left in right
    if isinstance(right, dict):
        ref = facts.get(right["field"])
        if ref is None:
            return None
        right = ref + right.get("add", 0) if not isinstance(ref, (str, bool)) else ref
    return _CMP[op](left, right)


def _format_value(value: Any, filt: str, formats: dict | None = None) -> str:
    if value is None:
        return "unknown"
    if formats and filt in formats:
        return formats[filt](value)
    if filt == "degC":
        return f"{value - T_ZERO_CELSIUS:.0f}"
    if isinstance(value, float):
        rounded = float(f"{value:.3g}")
        return f"{rounded:,.0f}" if abs(rounded) >= 1000 else f"{value:.3g}"
    return str(value)


def _render(text: str, facts: dict[str, Any], formats: dict | None = None) -> str:
    out = []
    for literal, field, _, _ in string.Formatter().parse(text):
        out.append(literal)
        if field is not None:
            name, _, filt = field.partition("|")
            out.append(_format_value(facts.get(name), filt, formats))
    # one space between words; a number keeps its unit on the same line (no-break space)
    return _UNIT_AFTER_NUMBER.sub("\\1\u00a0\\2", " ".join("".join(out).split()))


_UNIT_AFTER_NUMBER = re.compile(r"(\d) (°C|K\b|kPa|Pa\b|ppm|%)")


def check_facts(facts: dict[str, Any]) -> None:
    """Raise ValueError for unknown fact names or values of the wrong type."""
    problems = [f"unknown fact {k!r}" for k in facts if k not in FACTS]
    problems += [
        f"fact {k!r}: {v!r} is not of type {FACTS[k][0].__name__}"
        for k, v in facts.items()
        if k in FACTS and v is not None and not _type_ok(k, v)
    ]
    if problems:
        raise ValueError("; ".join(problems))


def evaluate_rules(facts: dict[str, Any], rules: tuple[Rule, ...] | None = None,
                   formats: dict | None = None) -> list[Note]:
    """Return the notes whose conditions are true for ``facts``.

    Order: by severity (high, medium, info), then by position in the rules
    file. Missing or None facts are unknown and never make a rule fire (see
    the module docstring). ``rules`` defaults to the packaged rules file.
    ``formats`` maps a text filter (``{flash_point|degC}``) to the function that
    writes the value; the caller's formatting wins over the plain default here.

    Examples
    --------
    A one-rule file using the UN GHS Rev. 10 table 2.6.1 bound of 23 degC
    (296.15 K); toluene's closed-cup flash point is 277.15 K, i.e. 4 degC
    (IEC 60079-20-1 (2010) table, as shipped in ``chemicals`` 1.5.2):

    >>> rules = validate_rules({"version": 1, "rules": [{
    ...     "id": "low-flash-point", "when": {"field": "flash_point", "lt": 296.15},
    ...     "text": "Flash point {flash_point|degC} degC, below 23 degC.",
    ...     "severity": "high", "source": "UN GHS Rev. 10, table 2.6.1"}]})
    >>> [note.text for note in evaluate_rules({"flash_point": 277.15}, rules)]
    ['Flash point 4 degC, below 23 degC.']
    >>> evaluate_rules({"flash_point": None}, rules)  # unknown never fires
    []
    """
    check_facts(facts)
    if rules is None:
        rules = _default_rules()
    fired = [r for r in rules if _truth(r.when, facts) is True]
    fired.sort(key=lambda r: SEVERITIES.index(r.severity))
    return [Note(r.id, _render(r.text, facts, formats), r.severity, r.source) for r in fired]


_DEFAULT: tuple[Rule, ...] | None = None


def _default_rules() -> tuple[Rule, ...]:
    global _DEFAULT
    if _DEFAULT is None:
        _DEFAULT = load_rules(RULES_PATH)
    return _DEFAULT
