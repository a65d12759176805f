"""What the statistics service is asked: the question, the groups of readings, the settings.

These objects hold plain numbers only. The readings layer builds them from what was typed or
opened (``rankwise.readings``); scripts may build them directly.
"""

from __future__ import annotations

import enum
from dataclasses import dataclass, field

from rankwise.stats.frozen_floats import FrozenFloats, freeze_fields


class Question(str, enum.Enum):
    """The question a technician asks of the readings."""

    TWO_GROUPS = "two-groups"
    """Two independent groups: did the change move the readings (or: are they the same within a margin)?"""
    PAIRED = "paired"
    """The same parts measured twice (before / after)."""
    SEVERAL = "several"
    """Three or more independent groups at once."""
    PLAN = "plan"
    """How many parts should be measured per group next time."""
    CHARACTERISTICS = "characteristics"
    """Two independent groups compared on many characteristics of one part at once."""


ALTERNATIVES = ("two-sided", "b-greater", "b-less")
"""Allowed directions: B differs from A, B tends to read higher, B tends to read lower."""

METHODS = ("auto", "exact", "normal")
"""How the p-value is found: exact permutation distribution, normal approximation, or chosen by size."""


@dataclass(frozen=True)
class GroupReadings:
    """One group's readings as numbers, in entry order.

    Attributes:
        name: the group's name as the user wrote it ("Wheel A", "Press 2").
        values: the readings; NaN marks a blank that the statistics drop and count. Any sequence
            of numbers may be given; it is kept as ``FrozenFloats`` (one read-only array).
        unit: the unit of the readings ("µm", "N"), or "".
        lsl, usl, nominal: specification limits and nominal value, or None.
        decimals: the gauge resolution as a number of decimals, when known from the typed text.
    """

    name: str
    values: FrozenFloats
    unit: str = ""
    lsl: float | None = None
    usl: float | None = None
    nominal: float | None = None
    decimals: int | None = None

    def __post_init__(self) -> None:
        freeze_fields(self, "values")


@dataclass(frozen=True)
class Settings:
    """How the question is to be answered.

    Attributes:
        alpha: significance level (0.10, 0.05, 0.01 are offered in the window).
        alternative: "two-sided", "b-greater" or "b-less" (see ``ALTERNATIVES``).
        confidence: confidence level of the shift's interval.
        method: "auto", "exact" or "normal" (see ``METHODS``).
        margin: equivalence margin in the readings' unit (same within +/- margin?), or None.
        zero_method: paired question only: "wilcox" (drop zero differences) or "pratt".
        comparison: several groups only: "all-pairs" or "against-reference".
        reference: several groups only: name of the reference group for "against-reference".
        planned_shift, planned_spread: planning only: the shift worth detecting and the
            readings' spread (standard deviation), both in the readings' unit.
        planned_prob_b_greater: planning only: P(B > A) to detect, instead of shift and spread.
        power: planning only: the chance of detecting the planned shift.
        ratio: planning only: parts in B per part in A.
        plan_paired: planning only: plan for the same parts measured twice (signed-rank test)
            instead of two independent groups.
        plan_groups: planning only: how many separate groups the plan is for; 3 or more plans
            for the Kruskal-Wallis test (``rankwise.stats.planning.plan_several_size``).
        characteristic: what is measured ("Ra after grinding"), for titles and records.
        adjust: many characteristics only: how the p-values are adjusted for the number
            compared, "holm", "fdr" (Benjamini-Hochberg) or "none".
    """

    alpha: float = 0.05
    alternative: str = "two-sided"
    confidence: float = 0.95
    method: str = "auto"
    margin: float | None = None
    zero_method: str = "wilcox"
    comparison: str = "all-pairs"
    reference: str | None = None
    planned_shift: float | None = None
    planned_spread: float | None = None
    planned_prob_b_greater: float | None = None
    power: float = 0.8
    ratio: float = 1.0
    plan_paired: bool = False
    characteristic: str = ""
    adjust: str = "holm"
    plan_groups: int = 2


@dataclass(frozen=True)
class Characteristic:
    """One characteristic of a many-characteristics comparison: its readings in A and in B.

    Attributes:
        name: the characteristic ("Bore diameter"); each group's ``name`` is the group's,
            its ``unit``, limits and nominal are the characteristic's.
        a, b: the readings of A (reference) and B (changed process), blanks as NaN.
        margin: the equivalence margin in its unit ("same within +/- margin?"), or None.
    """

    name: str
    a: GroupReadings
    b: GroupReadings
    margin: float | None = None


@dataclass(frozen=True)
class Entry:
    """One entry of a group named in the notes: its row on the sheet, its text, and why it is named.

    Attributes:
        row: the 1-based row of the readings sheet.
        text: the entry exactly as typed.
        remark: plain words: why it is not used, or why it deserves a second look.
    """

    row: int
    text: str
    remark: str


@dataclass(frozen=True)
class GroupEntries:
    """How one group's entries on the sheet divide up: the single count that screen, workbook and
    paper all show.

    Attributes:
        name: the group's name.
        readings: entries read as readings (measured, or below a detection limit).
        censored: of those, readings below a detection limit (ranked below every measured reading).
        not_used: notes and unreadable entries, each once, in row order.
        empty_between: empty cells between the group's first and last entry (empty cells above
            the first entry or below the last are not counted).
        flagged: readings used as typed but worth a second look (a slipped decimal point?
            outside the limits?), one entry per remark.
    """

    name: str
    readings: int
    censored: int = 0
    not_used: tuple[Entry, ...] = ()
    empty_between: int = 0
    flagged: tuple[Entry, ...] = ()


@dataclass(frozen=True)
class Analysis:
    """A question, the groups of readings it concerns, and the settings.

    For the two-group and paired questions, ``groups[0]`` is A (the reference, e.g. the current
    process or "before") and ``groups[1]`` is B (the changed process, or "after").
    ``notes`` carries plain-words remarks from the readings layer (e.g. censored readings) that
    belong in the record beside the result. ``decimal_mark`` is how numbers are written for people
    ("." or ","), taken from the readings sheet, so that the verdict, the workbook's texts and the
    printout write numbers the way the technician typed them; it never changes a computation.
    For the many-characteristics question, ``groups`` holds A and B without readings (their
    names) and ``characteristics`` holds each characteristic's readings.
    ``entries`` says, per group, how the sheet's entries divided up (readings, notes, empty cells,
    flagged readings); empty for an analysis built without a sheet.
    """

    question: Question
    groups: tuple[GroupReadings, ...]
    settings: Settings = field(default_factory=Settings)
    notes: tuple[str, ...] = ()
    decimal_mark: str = "."
    characteristics: tuple[Characteristic, ...] = ()
    entries: tuple[GroupEntries, ...] = ()
