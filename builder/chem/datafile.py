"""What the chemistry modules that read rules from ``builder/data`` share: the error for a bad file, the id pattern.

The handling rules, the hazard alerts and the storage table are data files checked when
they are read; each lists every problem it finds at once, through one error type.
"""
from __future__ import annotations

import re

#: ids of rules, alerts and groups: lower-case words joined by hyphens
ID_RE = re.compile(r"^[a-z0-9]+(-[a-z0-9]+)*$")


class DataFileError(ValueError):
    """A data file is invalid; ``problems`` lists every issue found.

    >>> print(DataFileError("rules.yaml", ["rule 1: no 'id'", "rule 2: unknown severity 'urgent'"]))
    rules.yaml: rule 1: no 'id'
    rules.yaml: rule 2: unknown severity 'urgent'
    """

    def __init__(self, path: str, problems: list[str]) -> None:
        super().__init__(path, problems)
        self.path = path
        self.problems = problems

    def __str__(self) -> str:
        return "\n".join(f"{self.path}: {p}" for p in self.problems)


def load_yaml(stream):
    """A data file of ``builder/data`` as Python data: YAML read with libyaml's parser when PyYAML has
    it (about ten times faster than the pure-Python one; the same safe constructor, so the same data)."""
    import yaml

    return yaml.load(stream, Loader=getattr(yaml, "CSafeLoader", yaml.SafeLoader))
