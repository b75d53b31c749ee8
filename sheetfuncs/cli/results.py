"""The pairwise comparisons, the compact letters and the effect sizes of one analysis, as
records for ``sheetfuncs table --json``.

Every number is read from the :class:`sheetfuncs.stats.Analysis` the command computed once (the
same core call as the report's); nothing is recomputed here. An analysis that could not run on
the data is written as ``{"available": false, "what": ..., "reason": ...}``.
"""

from __future__ import annotations

from typing import Any

__all__ = ["analysis_records", "effects_record", "letters_record", "pairwise_record"]


def unavailable_record(res: Any) -> dict[str, Any]:
    """An analysis that could not run, with its reason in plain words."""
    return {"available": False, "what": res.what, "reason": res.reason}


def pairwise_record(pw: Any) -> dict[str, Any]:
    """The comparisons: the method, what the intervals are, and one record per pair
    (``difference`` is the mean of ``group_a`` minus the mean of ``group_b``)."""
    from ..stats import PairwiseResult

    if not isinstance(pw, PairwiseResult):
        return unavailable_record(pw)
    return {
        "available": True,
        "method": pw.method,
        "method_name": pw.method_name,
        "alpha": pw.alpha,
        "interval": pw.interval,
        "statistic_name": pw.statistic_name,
        "ms_within": pw.ms_within,
        "df_within": pw.df_within,
        "notes": list(pw.notes),
        "rows": [
            {"group_a": r.group_a, "group_b": r.group_b, "difference": r.difference, "se": r.se,
             "ci_low": r.ci.low, "ci_high": r.ci.high, "statistic": r.statistic, "p": r.p,
             "differs": r.differs, "df": df}
            for r, df in zip(pw.rows, pw.row_df)
        ],
    }


def letters_record(let: Any) -> dict[str, Any]:
    """The compact letters, one record per group in the groups' order; groups that share a
    letter are not shown different by the comparisons in ``pairwise``."""
    from ..stats import LettersResult

    if not isinstance(let, LettersResult):
        return unavailable_record(let)
    return {
        "available": True,
        "method": let.method,
        "alpha": let.alpha,
        "groups": [{"group": lab, "mean": m, "letters": x}
                   for lab, m, x in zip(let.labels, let.means, let.letters)],
    }


def effects_record(eff: Any) -> dict[str, Any]:
    """The effect sizes, with the intervals for eta squared and Cohen's f at ``conf``."""
    from ..stats import EffectSizes

    if not isinstance(eff, EffectSizes):
        return unavailable_record(eff)
    return {
        "available": True,
        "conf": eff.conf,
        "eta_squared": eff.eta_squared,
        "eta_squared_ci": {"low": eff.eta_squared_ci.low, "high": eff.eta_squared_ci.high},
        "omega_squared": eff.omega_squared,
        "epsilon_squared": eff.epsilon_squared,
        "cohens_f": eff.cohens_f,
        "cohens_f_ci": {"low": eff.cohens_f_ci.low, "high": eff.cohens_f_ci.high},
        "exact": eff.exact,
        "notes": list(eff.notes),
    }


def analysis_records(an: Any, skipped: str | None = None) -> dict[str, Any]:
    """The comparisons (and Games–Howell's when the checks find unequal spreads and the chosen
    method pools them; else ``null``), the letters and the effect sizes of ``an``; ``skipped``
    is why the comparisons and letters were not computed, when they were left out."""
    out = {
        "pairwise": pairwise_record(an.pairwise),
        "unequal_variance_pairs": (None if an.unequal_pairs is None
                                   else pairwise_record(an.unequal_pairs)),
        "letters": letters_record(an.letters),
        "effect_sizes": effects_record(an.effects),
    }
    if skipped is not None:
        for key in ("pairwise", "letters"):
            if not out[key]["available"]:
                out[key]["reason"] = skipped
    return out
