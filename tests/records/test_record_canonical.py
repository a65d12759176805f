"""The stored form: canonical text, fingerprint, and a lossless way back to the objects."""

import dataclasses
import hashlib
import math

import pytest

from rankwise.records.canonical import canonical_bytes, decode, encode, sha256_hex, with_defaults
from rankwise.records.errors import RecordError
from rankwise.records.record import fingerprint, record_from_data, record_to_data
from rankwise.stats.results import ConfidenceInterval

from record_builders import paired_record, several_record, signoff


def test_canonical_text_has_sorted_keys_no_spaces_repr_floats_and_utf8():
    """The form written down in resources/decisions/record-fingerprint.md."""
    data = {"b": 1, "a": [0.1, 3.0, "µm", None, True]}
    assert canonical_bytes(data) == '{"a":[0.1,3.0,"µm",null,true],"b":1}'.encode("utf-8")
    assert sha256_hex(data) == hashlib.sha256(canonical_bytes(data)).hexdigest()


def test_floats_are_written_as_floats_whatever_type_they_arrive_as():
    interval = ConfidenceInterval(low=1, high=math.inf, level=0.95, method="m", high_included=False)
    assert encode(interval, ConfidenceInterval) == {
        "low": 1.0, "high": "Infinity", "level": 0.95, "method": "m", "attained_level": None,
        "low_included": True, "high_included": False}
    assert decode(encode(interval, ConfidenceInterval), ConfidenceInterval) == interval


def test_an_interval_stored_before_open_ends_were_kept_reads_back_closed():
    """A record written before intervals had open ends holds no low_included / high_included: its
    intervals read back with both ends closed, as they were meant; unknown fields stay refused."""
    older = {"low": 0.0, "high": 0.4, "level": 0.95, "method": "m", "attained_level": None}
    back = decode(older, ConfidenceInterval)
    assert back.low_included is True and back.high_included is True
    assert with_defaults(older, ConfidenceInterval) == {**older, "low_included": True, "high_included": True}
    with pytest.raises(RecordError):
        decode({**older, "colour": "red"}, ConfidenceInterval)
    with pytest.raises(RecordError):
        decode({"high": 0.4, "level": 0.95, "method": "m"}, ConfidenceInterval)


@pytest.mark.parametrize("build", [paired_record, several_record])
def test_a_record_goes_to_its_stored_form_and_back_unchanged(build):
    record = build()
    back = record_from_data(record_to_data(record))
    assert back.result == record.result
    assert back.signoff == record.signoff
    assert back.snapshot == record.snapshot
    assert back.created_at == record.created_at
    assert canonical_bytes(record_to_data(back)) == canonical_bytes(record_to_data(record))
    for original, restored in zip(record.analysis.groups, back.analysis.groups):
        assert len(original.values) == len(restored.values)
        assert all(a == b or (math.isnan(a) and math.isnan(b)) for a, b in zip(original.values, restored.values))


def test_the_fingerprint_changes_with_a_reading_a_setting_or_a_signature():
    record = paired_record()
    base = fingerprint(record)
    group = record.analysis.groups[0]
    changed_reading = dataclasses.replace(group, values=(1.84, *group.values[1:]))
    variants = [
        dataclasses.replace(record, analysis=dataclasses.replace(record.analysis, groups=(changed_reading,) + record.analysis.groups[1:])),
        dataclasses.replace(record, analysis=dataclasses.replace(
            record.analysis, settings=dataclasses.replace(record.analysis.settings, alpha=0.01))),
        dataclasses.replace(record, signoff=signoff(name="Ann Leigh")),
    ]
    fingerprints = {fingerprint(v) for v in variants}
    assert base not in fingerprints and len(fingerprints) == 3
    assert fingerprint(record) == base  # the same record always gives the same fingerprint


def test_damaged_stored_data_raise_a_plain_record_error():
    data = record_to_data(paired_record())
    data["result"]["fields"]["p_value"] = "about five percent"
    with pytest.raises(RecordError, match="damaged"):
        record_from_data(data)
    with pytest.raises(RecordError, match="does not know"):
        record_from_data({"record_format": 99})


def test_a_result_of_a_type_no_program_knows_is_refused_as_damaged():
    data = record_to_data(paired_record())
    data["result"]["type"] = "SomeOtherResult"
    with pytest.raises(RecordError, match="damaged"):
        record_from_data(data)
