"""Records built the way the window builds them: a readings sheet, its analysis, the real engine.

Imported by the record tests (not a conftest, so that its name cannot clash with another folder's)."""

from datetime import datetime, timedelta, timezone

from rankwise.readings import GroupColumn, ReadingSheet, parse_reading
from rankwise.records import ResultRecord, SignOff, Signature
from rankwise.stats.analysis import Question, Settings
from rankwise.stats.paired import compare_paired
from rankwise.stats.several import compare_several

# Hollander & Wolfe (1999), Nonparametric Statistical Methods, 2nd ed., p. 39 (paired, n = 9),
# typed as a technician would, with one note in each column.
FIRST = ["1.83", "0.50", "1.62", "2.48", "1.68", "1.88", "1.55", "3.06", "1.30", "scrap"]
SECOND = ["0.878", "0.647", "0.598", "2.05", "1.06", "1.29", "1.06", "3.14", "1.29", "n/a"]

SIGNED_AT = datetime(2026, 11, 30, 14, 5, 9, tzinfo=timezone(timedelta(hours=1)))


def signoff(name="Ann Lee", comment="checked against the gauge sheet"):
    prepared = Signature(name, "process technician", "accept the change", comment, SIGNED_AT)
    reviewed = Signature("Bo Park", "quality engineer", "accept the change", "", SIGNED_AT + timedelta(hours=2))
    return SignOff(prepared=prepared, reviewed=reviewed)


def paired_record(first_name="Before cure", second_name="After cure", signed=True, comma=False):
    """The paired example; with ``comma`` typed with decimal commas on a sheet that reads them."""
    mark = "," if comma else "."
    typed = [[t.replace(".", mark) for t in column] for column in (FIRST, SECOND)]
    sheet = ReadingSheet([
        GroupColumn(first_name, unit="µm", cells=[parse_reading(t, decimal=mark) for t in typed[0]]),
        GroupColumn(second_name, unit="µm", cells=[parse_reading(t, decimal=mark) for t in typed[1]]),
    ], decimal=mark)
    analysis = sheet.to_analysis(Question.PAIRED, Settings(characteristic="coating thickness"))
    a, b = analysis.groups
    result = compare_paired(a.values[:9], b.values[:9], name_a=a.name, name_b=b.name)
    return ResultRecord.now(analysis, sheet.snapshot(), result, signoff() if signed else None)


def several_record():
    """Zar (2010), Biostatistical Analysis, 5th ed., pH of four ponds (Kruskal-Wallis and Dunn)."""
    ponds = {
        "Pond 1": ["7.68", "7.69", "7.70", "7.70", "7.72", "7.73", "7.73", "7.76"],
        "Pond 2": ["7.71", "7.73", "7.74", "7.74", "7.78", "7.78", "7.80", "7.81"],
        "Pond 3": ["7.74", "7.75", "7.77", "7.78", "7.80", "7.81", "7.84"],
        "Pond 4": ["7.71", "7.71", "7.74", "7.79", "7.81", "7.85", "7.87", "7.91"],
    }
    sheet = ReadingSheet([GroupColumn(n, cells=[parse_reading(t) for t in v]) for n, v in ponds.items()])
    analysis = sheet.to_analysis(Question.SEVERAL, Settings())
    result = compare_several({g.name: g.values for g in analysis.groups})
    return ResultRecord.now(analysis, sheet.snapshot(), result, signoff())


def plan_record():
    """Noether (1987): alpha 0.05 two-sided, power 0.90, P(B > A) = 0.7 -> 44 parts per group."""
    from rankwise.stats.planning import plan_group_size

    sheet = ReadingSheet([GroupColumn("Wheel A", unit="µm"), GroupColumn("Wheel B", unit="µm")])
    settings = Settings(planned_prob_b_greater=0.7, power=0.9)
    analysis = sheet.to_analysis(Question.PLAN, settings)
    result = plan_group_size(prob_b_greater=0.7, alpha=0.05, power=0.9)
    return ResultRecord.now(analysis, sheet.snapshot(), result, signoff())
