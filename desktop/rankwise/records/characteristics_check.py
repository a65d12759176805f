"""The readings as entered of a many-characteristics record, read again, must give the analysed readings."""

from __future__ import annotations

from rankwise.readings import ReadingsError
from rankwise.readings.characteristics import analysis_from_snapshot
from rankwise.records.canonical import encode
from rankwise.records.compare import data_differences
from rankwise.records.record import ResultRecord
from rankwise.stats.analysis import Characteristic


def characteristics_readings_differences(record: ResultRecord) -> list[str]:
    """Each characteristic's readings of A and B rebuilt from the readings as entered, against the
    stored analysis (in plain words, one line per difference)."""
    analysis = record.analysis
    if len(analysis.groups) != 2:
        return ["The analysis no longer names the two processes compared."]
    try:
        rebuilt = analysis_from_snapshot(
            record.snapshot, [item.name for item in analysis.characteristics], analysis.groups[0].name,
            analysis.groups[1].name, settings=analysis.settings,
            margins=[item.margin for item in analysis.characteristics])
    except ReadingsError as error:
        return [f"The readings as entered can no longer be analysed as they were signed: {error}"]
    hint = tuple[Characteristic, ...]
    return [f"The readings as entered no longer give the analysed readings ({difference})."
            for difference in data_differences(encode(analysis.characteristics, hint),
                                               encode(rebuilt.characteristics, hint))]
