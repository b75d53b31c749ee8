"""The published sources of the methods behind the report's figures, as the About sheet lists them.

One entry per method; :func:`reference_keys` picks those an analysis used, in the order the
About sheet shows them.
"""

from __future__ import annotations

from ..context import ReportContext

__all__ = ["REFERENCES", "reference_keys"]

REFERENCES = {
    "oneway": "One-way analysis of variance: Fisher, R. A. (1925), Statistical Methods for Research "
              "Workers; e.g. Montgomery, D. C., Design and Analysis of Experiments, ch. 3.",
    "fdist": "F upper tail from the regularised incomplete beta function: Abramowitz & Stegun (1964), 26.6.2.",
    "t": "t intervals for group means: NIST/SEMATECH e-Handbook of Statistical Methods, 7.2.2.1.",
    "welch": "Welch, B. L. (1951), Biometrika 38, 330–336.",
    "kruskal": "Kruskal, W. H. & Wallis, W. A. (1952), Journal of the American Statistical Association 47, 583–621.",
    "levene": "Levene, H. (1960), in Contributions to Probability and Statistics, 278–292; median-centred form: "
              "Brown, M. B. & Forsythe, A. B. (1974), JASA 69, 364–367.",
    "bartlett": "Bartlett, M. S. (1937), Proceedings of the Royal Society A 160, 268–282.",
    "normality": "Shapiro, S. S. & Wilk, M. B. (1965), Biometrika 52, 591–611 (Royston's 1995 approximation); "
                 "above 5,000 residuals D'Agostino, R. B. & Pearson, E. S. (1973), Biometrika 60, 613–622.",
    "effects": "Effect sizes and their intervals: Cohen, J. (1988), Statistical Power Analysis for the Behavioral "
               "Sciences; Steiger, J. H. (2004), Psychological Methods 9, 164–182; Smithson, M. (2003), "
               "Confidence Intervals.",
    "tukey": "Tukey, J. W. (1953), The Problem of Multiple Comparisons; Kramer, C. Y. (1956), Biometrics 12, 307–310.",
    "games-howell": "Games, P. A. & Howell, J. F. (1976), Journal of Educational Statistics 1, 113–125.",
    "bonferroni": "Bonferroni adjustment: e.g. Dunn, O. J. (1961), JASA 56, 52–64.",
    "holm": "Holm, S. (1979), Scandinavian Journal of Statistics 6, 65–70.",
    "sidak": "Šidák, Z. (1967), JASA 62, 626–633.",
    "scheffe": "Scheffé, H. (1953), Biometrika 40, 87–104.",
    "dunnett": "Dunnett, C. W. (1955), JASA 50, 1096–1121.",
    "letters": "Compact letter display: Piepho, H.-P. (2004), Journal of Computational and Graphical Statistics 13, 456–466.",
}


def reference_keys(an: ReportContext) -> list[str]:
    """The keys of :data:`REFERENCES` behind the figures of ``an``, each once, in order."""
    keys = ["oneway", "fdist", "t", "welch", "kruskal", "levene", "bartlett", "normality", "effects",
            an.method]
    if an.control is not None:
        keys.append("dunnett")
    keys.append("letters")
    return list(dict.fromkeys(keys))
