"""Frozen result objects of the statistics service: numbers, the method used, and warnings.

No wording beyond short plain-words warnings lives here: the verdict sentences are written once,
in ``rankwise.wording``, from these objects. Every field is documented so that the screen, the
workbook and the printout can show it with the same meaning.
"""

from __future__ import annotations

from dataclasses import dataclass
from typing import Iterator

from rankwise.stats.frozen_floats import FrozenFloats, freeze_fields


@dataclass(frozen=True)
class ConfidenceInterval:
    """A confidence set for an estimate: an interval whose ends may be open or closed.

    Attributes:
        low, high: the end points, in the readings' unit; ``low`` is -inf for an upper bound
            alone and ``high`` +inf for a lower bound alone (one-sided questions).
        level: the intended coverage (e.g. 0.95).
        method: how it was found, in words (e.g. "Moses, exact critical value").
        attained_level: the coverage actually achieved where it differs from ``level``
            (distribution-free intervals step in discrete jumps), else None.
        low_included, high_included: True when the end itself belongs to the set (a closed
            end), False when only values beyond it do (an open end: the test rejects the end
            itself but accepts every value just inside). An infinite end is never included.
    """

    low: float
    high: float
    level: float
    method: str
    attained_level: float | None = None
    low_included: bool = True
    high_included: bool = True

    def __iter__(self) -> Iterator[float]:
        """Unpack as ``low, high = interval``."""
        yield self.low
        yield self.high

    def contains(self, value: float) -> bool:
        """True when ``value`` belongs to the set, open and closed ends respected."""
        above = value > self.low or (self.low_included and value == self.low)
        below = value < self.high or (self.high_included and value == self.high)
        return bool(above and below)

    def lies_strictly_inside(self, low: float, high: float) -> bool:
        """True when every value of the set lies strictly between ``low`` and ``high`` (an open
        end may touch them)."""
        above = self.low > low or (self.low == low and not self.low_included)
        below = self.high < high or (self.high == high and not self.high_included)
        return bool(above and below)


@dataclass(frozen=True)
class TieBlock:
    """Readings that share one value and therefore one average (mid-) rank.

    Attributes:
        value: the shared reading.
        count: how many readings share it.
        first_rank, last_rank: the ranks the block spans.
        mid_rank: their average, given to each reading in the block.
        counts_by_group: how many readings of each group are in the block (group order).
    """

    value: float
    count: int
    first_rank: int
    last_rank: int
    mid_rank: float
    counts_by_group: tuple[int, ...]


@dataclass(frozen=True)
class NullDistribution:
    """Distribution of a test statistic if the change did nothing.

    Attributes:
        statistic: which statistic ("U of A", "W+", ...).
        support: the values the statistic can take, ascending.
        probabilities: the probability of each value (sums to 1).
        (Both are kept as ``FrozenFloats``: thousands of values, one array each; any sequence given is converted.)
        observed: the observed value of the statistic.
        exact: True for the exact permutation distribution, False when it was not affordable.
    """

    statistic: str
    support: FrozenFloats
    probabilities: FrozenFloats
    observed: float
    exact: bool

    def __post_init__(self) -> None:
        freeze_fields(self, "support", "probabilities")


@dataclass(frozen=True)
class GroupSummary:
    """Location and spread of one group's readings.

    Attributes:
        name: the group's name.
        n: readings used.
        n_dropped: blank / NaN entries dropped.
        median, q1, q3: median and quartiles (linear interpolation, numpy's default).
        minimum, maximum: the extreme readings.
    """

    name: str
    n: int
    n_dropped: int
    median: float
    q1: float
    q3: float
    minimum: float
    maximum: float


@dataclass(frozen=True)
class ShapeCheck:
    """Do the two groups have the same spread and shape? (needed to read a shift as a median shift)

    Attributes:
        spread_ratio: interquartile range of B divided by that of A (NaN when A's is 0).
        dispersion_method, dispersion_p: a rank-based test of equal spread and its p-value.
        shape_method, shape_p: a test of equal shape after aligning the medians, and its p-value.
        differ: True when spread or shape differ clearly; the verdict then speaks of
            "B tends to read higher/lower" rather than of medians.
    """

    spread_ratio: float
    dispersion_method: str
    dispersion_p: float
    shape_method: str
    shape_p: float
    differ: bool


@dataclass(frozen=True)
class BrunnerMunzelResult:
    """Brunner-Munzel test (tolerates unequal spreads): statistic, degrees of freedom, p."""

    statistic: float
    df: float
    p_value: float


@dataclass(frozen=True)
class MoodMedianResult:
    """Mood's median test (counts above / not above the grand median), not Mood's scale test.

    Attributes:
        grand_median: the median of all readings combined.
        table: counts above and not above the grand median, per group: ((above_a, above_b),
            (below_or_equal_a, below_or_equal_b)).
        statistic: chi-square statistic; p_value: its p-value.
    """

    grand_median: float
    table: tuple[tuple[int, ...], tuple[int, ...]]
    statistic: float
    p_value: float


@dataclass(frozen=True)
class TwoGroupResult:
    """Mann-Whitney U / Wilcoxon rank-sum comparison of group A (reference) with group B.

    Attributes:
        name_a, name_b: the groups' names ("A", "B" when not given).
        n_a, n_b: readings used; n_dropped_a, n_dropped_b: blanks / NaN dropped.
        values_a, values_b: the readings used, in entry order.
        ranks_a, ranks_b: each reading's mid-rank in the combined sample, in entry order.
        (These four are ``FrozenFloats``: up to millions of readings, one array each.)
        tie_blocks: every value shared by two or more readings, ascending.
        rank_sum_a, rank_sum_b: sums of ranks per group.
        u_a: rank_sum_a - n_a (n_a + 1) / 2 (pairs where A reads higher, ties counted half);
        u_b: n_a n_b - u_a; u: min(u_a, u_b).
        alternative: "two-sided", "b-greater" or "b-less"; alpha: significance level.
        p_value: p-value of the chosen method; method: "exact" or "normal".
        p_exact, p_normal: both p-values where computed (p_exact None when not affordable).
        mid_p: exact mid-p (secondary figure), or None.
        z: normal-approximation statistic for B versus A (tie-corrected, continuity-corrected),
            positive when B tends to read higher; always filled.
        critical_u: largest u with P(U <= u) <= alpha (alpha/2 per tail when two-sided) with no
            ties; None when no result can reach significance at these sizes.
        attained_alpha: the true size of the exact test at the critical value (<= alpha), or None.
        significant: p_value <= alpha.
        shift: Hodges-Lehmann estimate of B - A (median of all b_j - a_i), or None when skipped.
        shift_ci: its confidence set at ``confidence``, or None: two-sided for "two-sided", a
            lower bound (high = +inf) for "b-greater", an upper bound (low = -inf) for "b-less".
        prob_b_greater: P(B > A) + 0.5 P(B = A) over all pairs.
        rank_biserial: 2 prob_b_greater - 1 (Kerby 2014: favourable minus unfavourable pairs).
        summary_a, summary_b: medians, quartiles, extremes.
        null_distribution: distribution of U of A if the change did nothing (exact), or None.
        shape: same-spread/same-shape check, or None when too few readings.
        brunner_munzel, mood_median: the companion tests, or None when not computable.
        margin: equivalence margin, or None; equivalent: shift's (1 - 2 alpha) interval lies
            strictly inside (-margin, +margin), None without a margin;
        equivalence_ci: that (1 - 2 alpha) interval.
        min_parts_needed: with critical_u None, the smallest equal group size that could reach
            significance at alpha; otherwise None.
        warnings: plain-words notes (degenerate data, impossible significance, shapes differ...).
    """

    name_a: str
    name_b: str
    n_a: int
    n_b: int
    n_dropped_a: int
    n_dropped_b: int
    values_a: FrozenFloats
    values_b: FrozenFloats
    ranks_a: FrozenFloats
    ranks_b: FrozenFloats
    tie_blocks: tuple[TieBlock, ...]
    rank_sum_a: float
    rank_sum_b: float
    u_a: float
    u_b: float
    u: float
    alternative: str
    alpha: float
    confidence: float
    p_value: float
    method: str
    p_exact: float | None
    p_normal: float
    mid_p: float | None
    z: float
    critical_u: int | None
    attained_alpha: float | None
    significant: bool
    shift: float | None
    shift_ci: ConfidenceInterval | None
    prob_b_greater: float
    rank_biserial: float
    summary_a: GroupSummary
    summary_b: GroupSummary
    null_distribution: NullDistribution | None
    shape: ShapeCheck | None
    brunner_munzel: BrunnerMunzelResult | None
    mood_median: MoodMedianResult | None
    margin: float | None
    equivalent: bool | None
    equivalence_ci: ConfidenceInterval | None
    min_parts_needed: int | None
    warnings: tuple[str, ...]

    def __post_init__(self) -> None:
        freeze_fields(self, "values_a", "values_b", "ranks_a", "ranks_b")

    @property
    def median_a(self) -> float:
        """Median of A."""
        return self.summary_a.median

    @property
    def median_b(self) -> float:
        """Median of B."""
        return self.summary_b.median

    @property
    def quartiles_a(self) -> tuple[float, float]:
        """First and third quartile of A."""
        return (self.summary_a.q1, self.summary_a.q3)

    @property
    def quartiles_b(self) -> tuple[float, float]:
        """First and third quartile of B."""
        return (self.summary_b.q1, self.summary_b.q3)

    @property
    def brunner_munzel_p(self) -> float | None:
        """p-value of the Brunner-Munzel test, or None."""
        return None if self.brunner_munzel is None else self.brunner_munzel.p_value

    @property
    def mood_median_p(self) -> float | None:
        """p-value of Mood's median test, or None."""
        return None if self.mood_median is None else self.mood_median.p_value


@dataclass(frozen=True)
class PairedResult:
    """Wilcoxon signed-rank test on the differences d = b - a of the same parts.

    Attributes:
        name_a, name_b: names of the first ("before") and second ("after") readings.
        n: pairs used in the ranking (zeros excluded under "wilcox"); n_pairs: complete pairs;
        n_zero: pairs with no difference; n_dropped: incomplete pairs dropped.
        values_a, values_b: the complete pairs, in entry order; differences: b - a per pair.
        signed_ranks: each difference's signed mid-rank of |d| (0 for a dropped zero).
        (These four are ``FrozenFloats``, one array each.)
        tie_blocks: shared |d| values.
        w_plus, w_minus: rank sums of positive and negative differences.
        zero_method: "wilcox" or "pratt"; alternative, alpha, confidence as for two groups.
        p_value, method ("exact" or "normal"), p_exact, p_normal, z: as for two groups.
        critical_t: largest t with P(T <= t) <= alpha (per tail) with no ties, or None.
        significant: p_value <= alpha.
        shift: Hodges-Lehmann pseudo-median of d (median of the Walsh averages), or None.
        shift_ci: its confidence interval, or None.
        summary_a, summary_b: per-reading summaries; null_distribution: of W+ (exact), or None.
        margin, equivalent, equivalence_ci: as for two groups, on the pseudo-median.
        warnings: plain-words notes.
    """

    name_a: str
    name_b: str
    n: int
    n_pairs: int
    n_zero: int
    n_dropped: int
    values_a: FrozenFloats
    values_b: FrozenFloats
    differences: FrozenFloats
    signed_ranks: FrozenFloats
    tie_blocks: tuple[TieBlock, ...]
    w_plus: float
    w_minus: float
    zero_method: str
    alternative: str
    alpha: float
    confidence: float
    p_value: float
    method: str
    p_exact: float | None
    p_normal: float
    z: float
    critical_t: int | None
    significant: bool
    shift: float | None
    shift_ci: ConfidenceInterval | None
    summary_a: GroupSummary
    summary_b: GroupSummary
    null_distribution: NullDistribution | None
    margin: float | None
    equivalent: bool | None
    equivalence_ci: ConfidenceInterval | None
    warnings: tuple[str, ...]

    def __post_init__(self) -> None:
        freeze_fields(self, "values_a", "values_b", "differences", "signed_ranks")


@dataclass(frozen=True)
class PairComparison:
    """Dunn's test for one pair of groups (two-sided).

    Attributes:
        group_a, group_b: the groups' names.
        mean_rank_a, mean_rank_b: their mean ranks in the combined ranking.
        z: (mean_rank_b - mean_rank_a) / standard error (tie-corrected).
        p_value: two-sided p = 2 Phi(-|z|); p_adjusted: Holm-adjusted over the family.
        significant: p_adjusted <= alpha.
    """

    group_a: str
    group_b: str
    mean_rank_a: float
    mean_rank_b: float
    z: float
    p_value: float
    p_adjusted: float
    significant: bool


@dataclass(frozen=True)
class SeveralGroupsResult:
    """Kruskal-Wallis H test over several groups, with Dunn's pairwise follow-up (Holm).

    Attributes:
        summaries: per group, in the order given.
        values, ranks: per group, the readings used and their mid-ranks in entry order (``FrozenFloats``).
        tie_blocks: shared values across all groups.
        rank_sums, mean_ranks: per group.
        h: tie-corrected H; df: k - 1; tie_correction: the divisor 1 - sum(t^3 - t)/(N^3 - N).
        p_value: p of the chosen method; method: "chi-square", "exact permutation" or
            "Monte Carlo permutation"; p_chi_square: always filled; p_permutation: or None;
        epsilon_squared: effect size H / ((N^2 - 1) / (N + 1)).
        alpha, significant.
        comparison: "all-pairs" or "against-reference"; reference: its group name or None.
        pairs: Dunn's comparisons with Holm-adjusted p.
        mood_median: Mood's median test over all groups, or None.
        warnings: plain-words notes.
    """

    summaries: tuple[GroupSummary, ...]
    values: tuple[FrozenFloats, ...]
    ranks: tuple[FrozenFloats, ...]
    tie_blocks: tuple[TieBlock, ...]
    rank_sums: tuple[float, ...]
    mean_ranks: tuple[float, ...]
    h: float
    df: int
    tie_correction: float
    p_value: float
    method: str
    p_chi_square: float
    p_permutation: float | None
    epsilon_squared: float
    alpha: float
    significant: bool
    comparison: str
    reference: str | None
    pairs: tuple[PairComparison, ...]
    mood_median: MoodMedianResult | None
    warnings: tuple[str, ...]

    def __post_init__(self) -> None:
        for name in ("values", "ranks"):
            object.__setattr__(self, name, tuple(
                group if isinstance(group, FrozenFloats) else FrozenFloats(group) for group in getattr(self, name)))


@dataclass(frozen=True)
class PowerPoint:
    """Simulated or predicted power at one group size."""

    n_a: int
    n_b: int
    power: float


@dataclass(frozen=True)
class PlanResult:
    """How many parts per group (Noether 1987), with the assumptions it rests on.

    Attributes:
        paired: True for the same-parts (signed-rank) plan.
        n_a, n_b: parts needed per group (rounded up; equal for paired).
        alpha, power, ratio, alternative: as asked.
        shift, spread: the shift worth detecting and the readings' spread, or None when
            prob_b_greater was given directly.
        prob_b_greater: P(B > A) (or P(d > 0) + ... for paired) that the plan detects.
        method: "Noether (1987)" etc.
        assumptions: plain-words list of what the plan assumes.
        simulated_power: power of the exact test at (n_a, n_b) by simulation, or None.
        power_curve: predicted power against parts per group, for the planning chart.
        warnings: plain-words notes.
        groups: how many groups the plan is for (2, or 3 and more for the Kruskal-Wallis plan,
            where ``n_a`` = ``n_b`` = parts in each group).
    """

    paired: bool
    n_a: int
    n_b: int
    alpha: float
    power: float
    ratio: float
    alternative: str
    shift: float | None
    spread: float | None
    prob_b_greater: float
    method: str
    assumptions: tuple[str, ...]
    simulated_power: float | None
    power_curve: tuple[PowerPoint, ...]
    warnings: tuple[str, ...]
    groups: int = 2


@dataclass(frozen=True)
class CharacteristicRow:
    """One characteristic of the comparison.

    Attributes:
        name: the characteristic as named in the file ("Bore diameter [mm]" less its unit).
        result: the full two-group comparison of B against A for this characteristic.
        p_adjusted: its p-value adjusted for the number of characteristics compared.
        significant: p_adjusted <= alpha.
    """

    name: str
    result: TwoGroupResult
    p_adjusted: float
    significant: bool


@dataclass(frozen=True)
class CharacteristicsResult:
    """The two-group comparison repeated over many characteristics, with adjusted p-values.

    Attributes:
        name_a, name_b: the groups' names (A the reference, B the changed process).
        rows: one per characteristic, in the order given.
        adjust: "holm", "fdr" or "none"; adjust_method: the published method in words.
        alternative, alpha, confidence: as for each characteristic.
        warnings: plain-words notes about the comparison as a whole.
    """

    name_a: str
    name_b: str
    rows: tuple[CharacteristicRow, ...]
    adjust: str
    adjust_method: str
    alternative: str
    alpha: float
    confidence: float
    warnings: tuple[str, ...]

    def row(self, name: str) -> CharacteristicRow:
        """The row of the characteristic called ``name``; ``KeyError`` when there is none."""
        for row in self.rows:
            if row.name == name:
                return row
        raise KeyError(name)

    @property
    def n_significant(self) -> int:
        """How many characteristics differ by the adjusted p-value."""
        return sum(row.significant for row in self.rows)


Result = TwoGroupResult | PairedResult | SeveralGroupsResult | PlanResult | CharacteristicsResult
"""Any answer the statistics service gives."""
