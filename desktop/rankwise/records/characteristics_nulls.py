"""A many-characteristics record stores no null distributions; reading it rebuilds them from the ranks.

Each characteristic's exact null distribution of U (thousands of values at 50 + 50 readings) made
almost all of such a record. It follows from the stored ranks alone: the exact permutation
distribution of the rank sum given the ties (``rankwise.stats.exact_ranksum``, the count the
comparison itself uses), computed exactly where the comparison computed it, which the stored
result says by holding an exact p-value.
"""

from __future__ import annotations

import dataclasses
from typing import Any

import numpy as np

from rankwise.records.canonical import encode
from rankwise.stats.exact_ranksum import rank_sum_distribution
from rankwise.stats.results import CharacteristicsResult, NullDistribution, Result, TwoGroupResult
from rankwise.stats.two_groups import null_distribution_of

_FIELD = "null_distribution"


def encoded_without_null_distributions(result: Result) -> Any:
    """``encode(result, Result)`` with each characteristic's null distribution left out, never
    encoded in the first place (encoding thousands of numbers per characteristic took seconds)."""
    if not isinstance(result, CharacteristicsResult):
        return encode(result, Result)
    rows = tuple(dataclasses.replace(row, result=dataclasses.replace(row.result, null_distribution=None))
                 for row in result.rows)
    return without_null_distributions(encode(dataclasses.replace(result, rows=rows), Result))


def without_null_distributions(result_data: Any) -> Any:
    """Stored result data with each characteristic's null distribution left out (other results as they are)."""
    if not _is_characteristics(result_data):
        return result_data
    fields = result_data["fields"]
    rows = [{**row, "result": {k: v for k, v in row["result"].items() if k != _FIELD}} for row in fields["rows"]]
    return {**result_data, "fields": {**fields, "rows": rows}}


def with_null_placeholders(result_data: Any) -> Any:
    """Stored result data of a record without null distributions, each filled with null so that they
    decode; ``with_null_distributions`` then rebuilds them. Data that are no such result stay as they are."""
    if not _is_characteristics(result_data) or not isinstance(result_data["fields"].get("rows"), list):
        return result_data
    fields = result_data["fields"]
    rows = [{**row, "result": {**row["result"], _FIELD: None}}
            if isinstance(row, dict) and isinstance(row.get("result"), dict) else row for row in fields["rows"]]
    return {**result_data, "fields": {**fields, "rows": rows}}


def with_null_distributions(result: CharacteristicsResult) -> CharacteristicsResult:
    """The result with every characteristic's null distribution rebuilt from its stored ranks.

    Raises ``ValueError`` when the stored ranks cannot give one (damaged data).
    """
    rows = tuple(dataclasses.replace(row, result=dataclasses.replace(
        row.result, null_distribution=rebuilt_null_distribution(row.result))) for row in result.rows)
    return dataclasses.replace(result, rows=rows)


def rebuilt_null_distribution(result: TwoGroupResult) -> NullDistribution | None:
    """The exact distribution of U of A if the change did nothing, from the result's ranks; None where
    the comparison had none (it then has no exact p-value either)."""
    if result.p_exact is None:
        return None
    doubled = np.rint(2.0 * np.concatenate([np.asarray(result.ranks_a, float), np.asarray(result.ranks_b, float)]))
    return null_distribution_of(rank_sum_distribution(doubled, result.n_a), result.u_a)


def _is_characteristics(result_data: Any) -> bool:
    return (isinstance(result_data, dict) and result_data.get("type") == CharacteristicsResult.__name__
            and isinstance(result_data.get("fields"), dict))
