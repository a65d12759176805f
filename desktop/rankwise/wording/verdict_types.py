"""The shapes in which worded results reach the window, the workbook and the printout."""

from __future__ import annotations

from dataclasses import dataclass

from rankwise.wording.cautions import CAUTION_SHORT


@dataclass(frozen=True)
class Verdict:
    """A result in plain words.

    Attributes:
        headline: one short sentence a technician reads first ("Wheel B reads higher than Wheel A.").
        sentences: one to three sentences with the shift and its interval in the part's units, the
            level and the method; never claims sameness from a non-significant test.
        method_note: which test and which p-value method, in words.
        assumption_notes: plain-words notes on assumptions and warnings.
        caution: the cautions note (``rankwise.wording.CAUTION_SHORT``).
    """

    headline: str
    sentences: tuple[str, ...]
    method_note: str
    assumption_notes: tuple[str, ...]
    caution: str


def cautioned_verdict(headline: str, sentences: list[str] | tuple[str, ...], method_note: str,
                      assumption_notes: tuple[str, ...]) -> Verdict:
    """A ``Verdict`` that carries the cautions note, as every verdict shown or printed must."""
    return Verdict(headline=headline, sentences=tuple(sentences), method_note=method_note,
                   assumption_notes=tuple(assumption_notes), caution=CAUTION_SHORT)


@dataclass(frozen=True)
class KeyNumber:
    """One key number as shown to people.

    Attributes:
        key: a stable identifier ("p_value", "u_a").
        label: the label on screen and paper ("p-value").
        text: the value formatted for reading (at the readings' resolution where it is a reading).
        tooltip: what the number means, in plain words.
        value: the raw number (None when not applicable), for workbooks that store numbers.
    """

    key: str
    label: str
    text: str
    tooltip: str
    value: float | None
