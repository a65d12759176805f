"""Names for groups added to a sheet: they continue the naming the sheet already uses.

A, B -> C; "Press 1", "Press 2" -> "Press 3" (zero padding kept: "Lot 07" -> "Lot 08");
"Wheel A" -> "Wheel B"; anything else -> "Group N", N the new group's place in the sheet.
"""

from __future__ import annotations

import re
from collections.abc import Iterator, Sequence

_ENDS_IN_NUMBER = re.compile(r"^(.*?)(\d+)$")
_ENDS_IN_LETTER = re.compile(r"^(.*?(?:^|[\s_-]))([A-Za-z])$")


def _continuing(last: str) -> Iterator[str]:
    """Names following ``last`` in its own pattern (nothing when it has none)."""
    number = _ENDS_IN_NUMBER.match(last)
    if number:
        prefix, digits = number.groups()
        value = int(digits)
        while True:
            value += 1
            yield f"{prefix}{value:0{len(digits)}d}"
    letter = _ENDS_IN_LETTER.match(last)
    if letter:
        prefix, char = letter.groups()
        end = "Z" if char.isupper() else "z"
        for code in range(ord(char) + 1, ord(end) + 1):
            yield f"{prefix}{chr(code)}"


def next_group_names(existing: Sequence[str], count: int) -> list[str]:
    """``count`` new names, none already in ``existing``, continuing the last group's pattern."""
    taken = set(existing)
    names: list[str] = []
    candidates = _continuing(existing[-1].strip()) if existing else iter(())
    for candidate in candidates:
        if len(names) == count:
            break
        if candidate not in taken:
            names.append(candidate)
            taken.add(candidate)
    number = len(existing) + len(names)
    while len(names) < count:
        number += 1
        candidate = f"Group {number}"
        if candidate not in taken:
            names.append(candidate)
            taken.add(candidate)
    return names
