"""The package's floor plan: each stage imports only the stages below it (DEVELOPERS.md, "Architecture")."""
from __future__ import annotations

import ast
from pathlib import Path

PACKAGE = Path(__file__).resolve().parent.parent / "builder"

#: stage → the stages it may import (besides itself)
ALLOWED = {
    "core": set(),
    "chem": set(),
    "load": {"core", "chem"},
    "derive": {"core", "chem"},
    "review": {"core", "chem", "load", "derive"},
    "publish": {"core", "chem", "derive"},
    "fitting": {"chem"},
    "pipeline": {"core", "chem", "load", "derive", "review", "publish"},
    "cli": {"core", "chem", "load", "derive", "review", "publish", "pipeline"},
    "__main__": {"cli"},
}


def _stage(path: Path) -> str:
    rel = path.relative_to(PACKAGE)
    return rel.parts[0] if len(rel.parts) > 1 else rel.stem


def _imported_stages(path: Path) -> set[tuple[str, int]]:
    found = set()
    for node in ast.walk(ast.parse(path.read_text(encoding="utf-8"))):
        names = []
        if isinstance(node, ast.ImportFrom) and node.module and node.level == 0:
            names = [node.module]
        elif isinstance(node, ast.Import):
            names = [a.name for a in node.names]
        for name in names:
            parts = name.split(".")
            if parts[0] == "builder" and len(parts) > 1:
                found.add((parts[1], node.lineno))
    return found


def test_every_module_sits_in_a_known_stage():
    stages = {_stage(p) for p in PACKAGE.rglob("*.py") if p.name != "__init__.py" or p.parent != PACKAGE}
    assert stages <= set(ALLOWED), stages - set(ALLOWED)


def test_no_import_runs_upward_or_sideways():
    wrong = []
    for path in sorted(PACKAGE.rglob("*.py")):
        if path == PACKAGE / "__init__.py":
            continue
        stage = _stage(path)
        for target, line in _imported_stages(path):
            if target != stage and target not in ALLOWED[stage] and target != "__init__":
                wrong.append(f"{path.relative_to(PACKAGE.parent)}:{line}: {stage} imports {target}")
    assert not wrong, "\n".join(wrong)


def test_no_relative_imports_outside_a_package():
    """Absolute imports name the stage, so the rule above can be read off every import line."""
    relative = [f"{p.relative_to(PACKAGE.parent)}:{n.lineno}" for p in sorted(PACKAGE.rglob("*.py"))
                for n in ast.walk(ast.parse(p.read_text(encoding="utf-8")))
                if isinstance(n, ast.ImportFrom) and n.level > 0]
    assert not relative, relative
