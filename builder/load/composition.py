"""A mixture's ``composition``: the fraction syntax, one entry's list, and the checks across entries.

Fractions are written as in the entry format and on the ``profile --mix`` command line::

    40 % w/w        a mass fraction (w/w), volume fraction (v/v) or mole fraction (mol/mol)
    10-20 % w/w     a range, as suppliers state compositions
    0.5 mol/mol     a fraction of one (no percent sign)
    balance         what the other components leave (at most one per mixture)

Checks within one entry: each component names either a catalog entry (``component``) or an
inline structure (``smiles`` with a ``name``); every fraction has a basis and the stated
fractions share one; the fractions can sum to 100 % (with ranges: some consistent composition
exists). Checks across entries (``composition_problems``): unknown component ids, a component
mixture that itself contains a mixture (one level of nesting is allowed), and cycles.
"""
from __future__ import annotations

import difflib
import re

from builder.core.diagnostics import Diagnostic
from builder.core.model import Component, Entry, Fraction

#: the basis words of the format and what they mean
BASES = {"w/w": "mass", "v/v": "volume", "mol/mol": "mole"}
BASIS_WORDS = {v: k for k, v in BASES.items()}
COMPONENT_KEYS = ("component", "smiles", "name", "fraction")
#: stated fractions may miss 100 % by this much (rounding on a supplier's sheet), as a fraction of one
SUM_TOLERANCE = 0.005

_NUMBER = r"(\d+(?:\.\d*)?|\.\d+)"
_FRACTION = re.compile(rf"^{_NUMBER}(?:\s*(?:-|–|to)\s*{_NUMBER})?\s*(%)?\s*(\S+)?$")


class FractionProblem(ValueError):
    """A fraction text that cannot be read; ``hint`` says how to write it."""

    def __init__(self, message: str, hint: str | None = None):
        super().__init__(message)
        self.hint = hint


def parse_fraction(text) -> Fraction:
    """Read one fraction; raises ``FractionProblem``.

    >>> parse_fraction("10-20 % w/w")
    Fraction(text='10-20 % w/w', low=0.1, high=0.2, basis='mass', balance=False)
    >>> parse_fraction("0.5 mol/mol").low
    0.5
    >>> parse_fraction("balance").balance
    True
    """
    hint = "write e.g. '40 % w/w', '10-20 % v/v', '0.5 mol/mol' or 'balance'"
    if isinstance(text, bool) or not isinstance(text, (str, int, float)):
        raise FractionProblem(f"a fraction must be text like '40 % w/w', got {type(text).__name__}", hint)
    shown = str(text).strip()
    if shown.lower() == "balance":
        return Fraction(shown, balance=True)
    match = _FRACTION.match(shown)
    if not match:
        raise FractionProblem(f"cannot read the fraction '{shown}'", hint)
    low_text, high_text, percent, basis = match.groups()
    if basis is None:
        raise FractionProblem(f"the fraction '{shown}' has no basis",
                              "add w/w (mass), v/v (volume) or mol/mol (mole), e.g. '40 % w/w'")
    if basis not in BASES:
        raise FractionProblem(f"unknown basis '{basis}' in the fraction '{shown}'",
                              "the basis is w/w (mass), v/v (volume) or mol/mol (mole)")
    scale = 0.01 if percent else 1.0
    low = round(float(low_text) * scale, 12)
    high = round(float(high_text) * scale, 12) if high_text else low
    if high < low:
        raise FractionProblem(f"the range '{shown}' runs backwards", "write the smaller figure first")
    if high > 1.0 + 1e-12:
        raise FractionProblem(f"the fraction '{shown}' is more than 100 %",
                              "a fraction of one has no percent sign: '0.4 w/w' or '40 % w/w'")
    return Fraction(shown, low, high, BASES[basis])


def sum_problem(fractions: list[Fraction]) -> str | None:
    """Why no composition with these fractions sums to 100 %, or None when one does.

    >>> sum_problem([parse_fraction("40 % w/w"), parse_fraction("balance")]) is None
    True
    >>> sum_problem([parse_fraction("70-80 % w/w"), parse_fraction("40-50 % w/w")])
    'the fractions add up to 110–130 %: at least 110 % even at the lowest figures'
    """
    stated = [f for f in fractions if not f.balance]
    low = sum(f.low for f in stated)
    high = sum(f.high for f in stated)
    shown = f"{100 * low:.4g}" + (f"–{100 * high:.4g}" if high != low else "") + " %"
    if any(f.balance for f in fractions):
        if low > 1.0 + SUM_TOLERANCE:
            return f"the stated fractions add up to {shown}, leaving nothing for the balance"
        return None
    if low > 1.0 + SUM_TOLERANCE:
        return f"the fractions add up to {shown}: at least {100 * low:.4g} % even at the lowest figures"
    if high < 1.0 - SUM_TOLERANCE:
        return f"the fractions add up to {shown}: at most {100 * high:.4g} % even at the highest figures"
    return None


def read_composition(r, data, keypath=("composition",)) -> tuple[Component, ...]:
    """The components of ``data[keypath]`` (a list), each checked; ``r`` collects the problems."""
    items = data.get(keypath[-1])
    if items is None:
        return ()
    if not isinstance(items, list) or not items:
        r.error(keypath, "'composition' must be a list of components, each with a 'component' (an entry id) "
                "or 'smiles' and 'name', and a 'fraction'")
        return ()
    out: list[Component] = []
    seen: dict[str, int] = {}
    for i, item in enumerate(items):
        kp = keypath + (i,)
        item = r.mapping(item, kp, COMPONENT_KEYS, f"component {i + 1} of the composition")
        if not item:
            continue
        entry_id = r.text(item, kp + ("component",))
        smiles = r.text(item, kp + ("smiles",))
        name = r.text(item, kp + ("name",))
        if entry_id is not None and smiles is not None:
            r.error(kp, f"component {i + 1} names both an entry ('component') and a structure ('smiles')",
                    "keep one")
            continue
        if entry_id is None and smiles is None:
            r.error(kp, f"component {i + 1} needs 'component' (an entry id of the catalog) or 'smiles'",
                    at_key=True)
            continue
        if smiles is not None and name is None:
            r.error(kp, f"component {i + 1} gives a structure without a 'name'", "add e.g. 'name: water'",
                    at_key=True)
            continue
        if smiles is not None:
            from builder.load.entries import smiles_error
            if problem := smiles_error(smiles):
                r.error(kp + ("smiles",), *problem)
                continue
        if "fraction" not in item:
            r.error(kp, f"component {i + 1} has no 'fraction'", "e.g. 'fraction: 40 % w/w' or 'fraction: balance'",
                    at_key=True)
            continue
        try:
            fraction = parse_fraction(item["fraction"])
        except FractionProblem as exc:
            r.error(kp + ("fraction",), str(exc), exc.hint)
            continue
        key = entry_id or smiles
        if key in seen:
            r.error(kp, f"component {i + 1} repeats component {seen[key] + 1}", "give each component once")
            continue
        seen[key] = i
        out.append(Component(name or entry_id, fraction, entry_id, smiles))
    if len(out) != len(items):
        return ()
    balances = [i for i, c in enumerate(out) if c.fraction.balance]
    if len(balances) > 1:
        r.error(keypath + (balances[1], "fraction"), "more than one component is the balance",
                "at most one component may take what the others leave")
        return ()
    bases = {c.fraction.basis for c in out if not c.fraction.balance}
    if len(bases) > 1:
        r.error(keypath, "the fractions mix bases (" + ", ".join(sorted(BASIS_WORDS[b] for b in bases)) + ")",
                "state every fraction on one basis: all w/w, all v/v or all mol/mol")
        return ()
    if problem := sum_problem([c.fraction for c in out]):
        r.error(keypath, problem, "correct the fractions, or make one component 'balance'")
        return ()
    return tuple(out)


def composition_of_pairs(pairs: list[tuple[str, str]]) -> tuple[Component, ...]:
    """Inline components from (SMILES, fraction text) pairs, checked like a composition in a file;
    raises ``FractionProblem`` naming the first problem (``profile --mix``)."""
    from builder.load.entries import smiles_error

    out = []
    for smiles, text in pairs:
        if problem := smiles_error(smiles):
            raise FractionProblem(*problem)
        out.append(Component(smiles, parse_fraction(text), None, smiles))
    if len({c.smiles for c in out}) != len(out):
        raise FractionProblem("a structure is given twice", "give each component once")
    if sum(c.fraction.balance for c in out) > 1:
        raise FractionProblem("more than one component is the balance")
    bases = {c.fraction.basis for c in out if not c.fraction.balance}
    if len(bases) > 1:
        raise FractionProblem("the fractions mix bases", "state every fraction on one basis")
    if problem := sum_problem([c.fraction for c in out]):
        raise FractionProblem(problem, "correct the fractions, or make one component 'balance'")
    return tuple(out)


def composition_problems(entries: dict[str, Entry], known: set[str] | None = None) -> list[Diagnostic]:
    """Errors across entries: unknown component ids, nesting deeper than one level, cycles.

    ``entries``: the loaded entries by id (every mixture to check and whatever they name);
    ``known``: further ids that exist but were not loaded (checked alone, a file's neighbours).
    """
    out: list[Diagnostic] = []
    known = set(known or ()) | set(entries)
    for entry in entries.values():
        for i, comp in enumerate(entry.composition):
            if comp.entry_id is None:
                continue
            line, col = entry.line_of(f"composition.{i}.component")

            def error(message, hint=None, entry=entry, line=line, col=col):
                out.append(Diagnostic(entry.path, line, col, "error", message, hint))

            if comp.entry_id == entry.id:
                error("the mixture names itself as a component")
                continue
            if comp.entry_id not in known:
                close = difflib.get_close_matches(comp.entry_id, sorted(known), n=1)
                error(f"unknown component '{comp.entry_id}'",
                      f"did you mean '{close[0]}'?" if close else "name an entry id of the catalog (its file name)")
                continue
            inner = entries.get(comp.entry_id)
            if inner is None or not inner.composition:
                continue
            cycle = _path_back(entries, comp.entry_id, entry.id)
            if cycle:
                error("the composition runs in a circle: " + " → ".join([entry.id, *cycle]),
                      "a mixture cannot contain itself")
                continue
            deeper = [c.entry_id for c in inner.composition
                      if c.entry_id and entries.get(c.entry_id) is not None and entries[c.entry_id].composition]
            if deeper:
                error(f"component '{comp.entry_id}' is a mixture that itself contains the mixture '{deeper[0]}'",
                      "one level of nesting is allowed: name the inner mixture's components directly")
    return out


def _path_back(entries: dict[str, Entry], start: str, target: str, seen=None) -> list[str]:
    """A chain of component ids from ``start`` back to ``target``, or [] when there is none."""
    seen = seen or set()
    if start in seen:
        return []
    seen.add(start)
    entry = entries.get(start)
    for comp in (entry.composition if entry else ()):
        if comp.entry_id == target:
            return [start, target]
        if comp.entry_id and (rest := _path_back(entries, comp.entry_id, target, seen)):
            return [start, *rest]
    return []
