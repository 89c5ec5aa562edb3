"""Reviewer tools: plausibility checks, the change report between revisions, entry scaffolding."""
