"""CAS Registry Numbers: format and check digit.

The check digit is the sum of each digit times its position counted from the right
(the check digit itself excluded, starting at 1), modulo 10 (CAS, "CAS Registry
Number: check digit verification", common practice).
"""
from __future__ import annotations

import re

_CAS = re.compile(r"^(\d{2,7})-(\d{2})-(\d)$")


def cas_problem(text: str) -> str | None:
    """None when ``text`` is a well-formed CAS RN with a valid check digit, else the reason."""
    match = _CAS.match(text)
    if not match:
        return f"{text!r} is not a CAS number (expected e.g. '64-17-5')"
    digits = match[1] + match[2]
    total = sum(int(d) * i for i, d in enumerate(reversed(digits), start=1))
    if total % 10 != int(match[3]):
        return f"CAS number {text} fails its check digit (expected {total % 10}, got {match[3]})"
    return None
