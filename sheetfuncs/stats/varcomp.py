"""Variance components of the one-way random-effects model: how much variation lies between lots.

Model: ``y_ij = mu + a_i + e_ij`` with lot (group) effects ``a_i ~ N(0, s_b^2)`` and errors
``e_ij ~ N(0, s_w^2)``, all independent. With the one-way mean squares MSB (k - 1 df) and MSW
(N - k df), E[MSW] = s_w^2 and E[MSB] = s_w^2 + n0 s_b^2, where

    n0 = (N - sum n_i^2 / N) / (k - 1)

is the common group size when the sizes are equal (Searle, Casella & McCulloch 1992,
*Variance Components*, ch. 3). The ANOVA (method-of-moments) estimators are

    within   s_w^2 = MSW
    between  s_b^2 = (MSB - MSW) / n0, shown as 0 when negative (a note says so)
    total    s_w^2 + s_b^2
    ICC      s_b^2 / (s_w^2 + s_b^2), the share of the total variance that lies between groups.

Confidence intervals, two-sided at ``conf`` with a = (1 - conf)/2 in each tail:

* within: exact chi-square interval ``(N - k) MSW / chi2`` (e.g. Burdick & Graybill 1992,
  *Confidence Intervals on Variance Components*, ch. 2);
* between: the modified large-sample (MLS) interval of Ting, Burdick, Graybill, Jeyaratnam &
  Lu (1990) for a difference of expected mean squares, as recommended by Burdick & Graybill
  (1992, ch. 3) for the one-fold nested design;
* total: the MLS interval of Graybill & Wang (1980) for a positive sum of expected mean squares;
* ICC: the exact F-based interval (Searle 1971, *Linear Models*, ch. 9; Shrout & Fleiss 1979,
  ICC(1)), ``(F_L - 1) / (F_L + n0 - 1)`` with ``F_L = F / F(1 - a; k - 1, N - k)`` and
  likewise for the upper limit.

With unequal group sizes, n0 stands in for the common size and the between, total and ICC
intervals are approximate; the result says so. Mean squares come from the decimal-exact one-way
sums of squares whenever that path applies, and the point estimates are formed exactly.
"""

from __future__ import annotations

import math
from collections.abc import Mapping
from dataclasses import dataclass
from fractions import Fraction
from collections.abc import Callable
from typing import Any, ClassVar

from scipy import stats

from ..distributions import f_critical
from ..input import as_groups, check_conf
from .moments import compute_moments, scaled
from .group_moments import GroupMoments, group_moments, require_two
from .oneway import oneway_of, require_two_groups
from .interval import Interval

__all__ = ["VarianceComponents", "variance_components", "variance_components_of"]

#: The rows of ``VarianceComponents.table()`` after the header, in order.
ROWS = ("Between groups", "Within groups", "Total", "Intraclass correlation", "Effective group size n0")

METHOD = (
    "ANOVA estimators; within: chi-square interval; between: modified large-sample interval "
    "(Ting et al. 1990); total: modified large-sample interval (Graybill & Wang 1980); "
    "ICC: F-based interval (Searle 1971)"
)


@dataclass(frozen=True)
class VarianceComponents:
    """Variance components of a one-way random-effects model (ANOVA estimators).

    Fields: ``within`` (MSW), ``between`` ((MSB - MSW)/n0, truncated at 0; the untruncated value
    is ``between_raw``), ``total = within + between``, ``icc = between / total``; ``n0`` the
    effective group size; intervals ``within_ci``, ``between_ci``, ``total_ci``, ``icc_ci`` (each an
    :class:`~sheetfuncs.stats.interval.Interval`) at confidence ``conf``; ``method`` names the estimators and interval methods;
    ``notes`` plain-language remarks (truncation at 0, unequal sizes); ``ms_between``,
    ``ms_within``, ``df_between``, ``df_within``, ``k``, ``n_total``, ``balanced`` and ``exact``
    describe the one-way analysis behind them.

    Sources: Searle, Casella & McCulloch (1992) for the estimators and n0; Burdick & Graybill
    (1992), Ting et al. (1990) and Graybill & Wang (1980) for the variance intervals; Searle
    (1971) and Shrout & Fleiss (1979) for the ICC interval.
    """

    within: float
    between: float
    total: float
    icc: float
    n0: float
    within_ci: Interval
    between_ci: Interval
    total_ci: Interval
    icc_ci: Interval
    conf: float
    method: str
    notes: tuple[str, ...]
    between_raw: float
    ms_between: float
    ms_within: float
    df_between: int
    df_within: int
    k: int
    n_total: int
    balanced: bool
    exact: bool

    #: The table's header row.
    HEADER: ClassVar[tuple[str, ...]] = ("Component", "Estimate", "CI low", "CI high", "Share of total", "Note")

    def table(self) -> list[list[Any]]:
        """Header row (Component, Estimate, CI low, CI high, Share of total, Note), then Between
        groups, Within groups, Total, Intraclass correlation and Effective group size n0. Each
        Note cell holds the notes that concern its row (joined by "; "), or is blank."""
        by_row = _row_notes(
            between_raw=self.between_raw, n0=self.n0, balanced=self.balanced,
            within_zero=self.ms_within == 0.0, k=self.k, df_between=self.df_between,
        )

        def note(row: str) -> str | None:
            return "; ".join(by_row[row]) or None

        return [
            list(self.HEADER),
            [ROWS[0], self.between, *self.between_ci, self.icc, note(ROWS[0])],
            [ROWS[1], self.within, *self.within_ci, 1.0 - self.icc, note(ROWS[1])],
            [ROWS[2], self.total, *self.total_ci, 1.0, note(ROWS[2])],
            [ROWS[3], self.icc, *self.icc_ci, None, note(ROWS[3])],
            [ROWS[4], self.n0, None, None, None, note(ROWS[4])],
        ]


def _row_notes(
    *, between_raw: float, n0: float, balanced: bool, within_zero: bool, k: int, df_between: int
) -> dict[str, list[str]]:
    """The plain-language notes of a result, keyed by the table row each concerns (a note may
    concern several rows; the result's ``notes`` lists each once, in full). They are short: a
    spreadsheet keeps at most 255 characters of text in a cell of an array result, and the
    Between groups row can carry three of them (at most about 230 characters together)."""
    out: dict[str, list[str]] = {row: [] for row in ROWS}
    between, within, total, icc, size = ROWS
    if between_raw < 0:
        out[between].append(f"the estimate (MSB - MSW)/n0 came out negative ({between_raw:.4g}) and is shown as 0")
        out[icc].append("0 because the between-group estimate is shown as 0")
    if not balanced:
        for row in (between, total, icc):
            out[row].append("interval approximate: group sizes differ")
        out[size].append(f"group sizes differ: n0 = {n0:.6g} stands in for the common group size")
    else:
        out[size].append("the common group size (sizes are equal)")
    if within_zero:
        out[within].append("no variation within groups: the estimate and its interval are 0")
    if df_between < 4:
        out[between].append(
            f"only {k} groups ({df_between} degrees of freedom), so the interval is wide; more "
            "groups narrow it more than more values per group"
        )
    return out


def _upper_chi2_ratio(q: float, df: int) -> float:
    """F(q; df, inf) = chi2 upper-q point / df."""
    return float(stats.chi2.isf(q, df)) / df


def _lower_chi2_ratio(q: float, df: int) -> float:
    """F(1 - q; df, inf) = chi2 lower-q point / df."""
    return float(stats.chi2.ppf(q, df)) / df


def _mls_constants(a: float, n1: int, n2: int) -> tuple[float, float, float, float]:
    """G_q = 1 - 1/F(a; n_q, inf) and H_q = 1/F(1 - a; n_q, inf) - 1 for q = 1, 2 (Graybill & Wang 1980)."""
    g1 = 1.0 - 1.0 / _upper_chi2_ratio(a, n1)
    g2 = 1.0 - 1.0 / _upper_chi2_ratio(a, n2)
    h1 = 1.0 / _lower_chi2_ratio(a, n1) - 1.0
    h2 = 1.0 / _lower_chi2_ratio(a, n2) - 1.0
    return g1, g2, h1, h2


def _between_mls(s1: float, s2: float, n1: int, n2: int, n0: float, a: float) -> Interval:
    """Ting et al. (1990) MLS interval for (theta1 - theta2)/n0 (Burdick & Graybill 1992, ch. 3).

    ``s1 = MSB`` estimates theta1 with n1 df, ``s2 = MSW`` estimates theta2 with n2 df; each
    tail has probability ``a``. F(a; u, v) below is the upper-a point.
    """
    g1, g2, h1, h2 = _mls_constants(a, n1, n2)
    f_hi = f_critical(a, n1, n2)        # F(a; n1, n2)
    f_lo = f_critical(1.0 - a, n1, n2)  # F(1 - a; n1, n2)
    g12 = ((f_hi - 1.0) ** 2 - g1 * g1 * f_hi * f_hi - h2 * h2) / f_hi
    h12 = ((1.0 - f_lo) ** 2 - h1 * h1 * f_lo * f_lo - g2 * g2) / f_lo
    v_lo = g1 * g1 * s1 * s1 + h2 * h2 * s2 * s2 + g12 * s1 * s2
    v_hi = h1 * h1 * s1 * s1 + g2 * g2 * s2 * s2 + h12 * s1 * s2
    d = s1 - s2
    low = (d - math.sqrt(max(v_lo, 0.0))) / n0
    high = (d + math.sqrt(max(v_hi, 0.0))) / n0
    return Interval(max(low, 0.0), max(high, 0.0))


def _total_mls(s1: float, s2: float, n1: int, n2: int, n0: float, a: float) -> Interval:
    """Graybill & Wang (1980) MLS interval for theta1/n0 + (1 - 1/n0) theta2."""
    c1, c2 = 1.0 / n0, max(1.0 - 1.0 / n0, 0.0)
    g1, g2, h1, h2 = _mls_constants(a, n1, n2)
    est = c1 * s1 + c2 * s2
    low = est - math.sqrt((g1 * c1 * s1) ** 2 + (g2 * c2 * s2) ** 2)
    high = est + math.sqrt((h1 * c1 * s1) ** 2 + (h2 * c2 * s2) ** 2)
    return Interval(max(low, 0.0), high)


def _unit_free(
    interval: Callable[[float, float, int, int, float, float], Interval],
    s1: float, s2: float, n1: int, n2: int, n0: float, a: float,
) -> Interval:
    """An MLS ``interval`` computed on the mean squares divided by the larger of them (the
    intervals scale with the mean squares), so that their squares cannot overflow for values
    near the top of the double range; the ends are scaled back (``+inf`` beyond it)."""
    u = max(s1, s2)
    if u == 0 or not math.isfinite(u):
        return interval(s1, s2, n1, n2, n0, a)
    e = math.frexp(u)[1]
    iv = interval(math.ldexp(s1, -e), math.ldexp(s2, -e), n1, n2, n0, a)
    return Interval(scaled(iv.low, e), scaled(iv.high, e))


def _icc_interval(f: float, n1: int, n2: int, n0: float, a: float) -> Interval:
    """Searle (1971) F-based interval for s_b^2 / (s_b^2 + s_w^2)."""
    if math.isinf(f):
        return Interval(1.0, 1.0)
    f_l = f / f_critical(a, n1, n2)
    f_u = f / f_critical(1.0 - a, n1, n2)

    def icc(x: float) -> float:
        return min(max((x - 1.0) / (x + n0 - 1.0), 0.0), 1.0)

    return Interval(icc(f_l), icc(f_u))


def variance_components(
    groups: Any, conf: Any = 0.95, *, exact: bool | None = None,
    missing: str = "stop", relabel: Mapping[str, str] | None = None,
) -> VarianceComponents:
    """Between- and within-group variance components with confidence intervals.

    ``groups`` is anything :func:`sheetfuncs.as_groups` accepts (typically lots or batches, each
    measured several times); ``conf`` the confidence level. Estimators, the effective group size
    n0 and the interval methods are described, with their sources, in the module docstring.

    ``missing`` (``"stop"`` or ``"drop"``) and ``relabel`` are as in :func:`sheetfuncs.as_groups`.
    """
    g = as_groups(groups, missing=missing, relabel=relabel)
    require_two_groups(g)
    cf = check_conf(conf)
    return variance_components_of(group_moments(g, compute_moments(g, exact)), cf)


def variance_components_of(gm: GroupMoments, conf: Any = 0.95) -> VarianceComponents:
    """:func:`variance_components` from the groups' labels, counts and moments (no values
    needed)."""
    require_two(gm)
    cf = check_conf(conf)
    res = oneway_of(gm)
    k, n = res.k, res.n_total
    n1, n2 = res.df_between, res.df_within
    counts = res.counts
    n0_x = (Fraction(n) - Fraction(sum(c * c for c in counts), n)) / n1
    if res.exact:
        msb_x, msw_x = res.ss_between_exact / n1, res.ss_within_exact / n2
    else:
        msb_x, msw_x = Fraction(res.ms_between), Fraction(res.ms_within)
    between_raw_x = (msb_x - msw_x) / n0_x
    between_x = max(between_raw_x, Fraction(0))
    total_x = msw_x + between_x
    icc = float(between_x / total_x)  # total > 0: the one-way analysis rejects constant data
    n0 = float(n0_x)
    s1, s2 = float(msb_x), float(msw_x)
    a = (1.0 - cf) / 2.0
    balanced = len(set(counts)) == 1
    return VarianceComponents(
        within=s2, between=float(between_x), total=float(total_x), icc=icc, n0=n0,
        within_ci=Interval(n2 * s2 / float(stats.chi2.isf(a, n2)), n2 * s2 / float(stats.chi2.ppf(a, n2))),
        between_ci=_unit_free(_between_mls, s1, s2, n1, n2, n0, a),
        total_ci=_unit_free(_total_mls, s1, s2, n1, n2, n0, a),
        icc_ci=_icc_interval(res.f, n1, n2, n0, a), conf=cf, method=METHOD,
        notes=tuple(_notes(float(between_raw_x), balanced, n0, s2, n1, k)),
        between_raw=float(between_raw_x), ms_between=s1, ms_within=s2, df_between=n1,
        df_within=n2, k=k, n_total=n, balanced=balanced, exact=res.exact,
    )


def _notes(between_raw: float, balanced: bool, n0: float, ms_within: float, df_between: int,
           k: int) -> list[str]:
    """The plain-language notes of a result, each once (see :func:`_row_notes` for the table)."""
    notes: list[str] = []
    if between_raw < 0:
        notes.append(
            f"the between-group estimate (MSB - MSW)/n0 came out negative "
            f"({between_raw:.4g}) and is shown as 0: the groups vary no more than "
            "the values within them"
        )
    if not balanced:
        notes.append(
            f"group sizes differ: n0 = {n0:.6g} stands in for the common group size, so the "
            "between-group, total and ICC intervals are approximate"
        )
    if ms_within == 0.0:
        notes.append("there is no variation within groups: the within component and its interval are 0")
    if df_between < 4:
        notes.append(
            f"only {k} groups: the between-group component rests on {df_between} degrees of freedom, "
            "so its interval is wide; more groups narrow it more than more values per group"
        )
    return notes
