"""Plain-words wording of results: written once, used by the window, the workbook and the printout."""

from rankwise.wording.cautions import CAUTION_SHORT
from rankwise.wording.key_numbers import key_numbers
from rankwise.wording.numbers import format_p, format_percent, format_reading
from rankwise.wording.questions import QUESTION_TITLES, describe_question
from rankwise.wording.verdict import describe
from rankwise.wording.verdict_types import KeyNumber, Verdict

__all__ = [
    "CAUTION_SHORT",
    "QUESTION_TITLES",
    "KeyNumber",
    "Verdict",
    "describe",
    "describe_question",
    "format_p",
    "format_percent",
    "format_reading",
    "key_numbers",
]
