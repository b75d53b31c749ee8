"""The pure core: functions on cleaned groups that return frozen result objects.

One module per topic: ``moments`` (exact and floating-point sums of squares),
``group_moments`` (the groups' labels, counts and moments without values, from which most
analyses have an ``..._of`` form) and ``group_variances`` (the per-group variances some tests
need), ``oneway``, ``linear`` (general
linear test, contrasts), ``describe``, ``alternatives`` (Welch, Brown–Forsythe,
Kruskal–Wallis), ``residuals``, ``variances`` (Levene, Bartlett), ``normality`` (of the
residuals), ``checks`` (all checks and their reading rule), ``comparisons`` and ``lettering``,
``effects``, ``planning``, ``varcomp``; ``interval`` and ``outcome`` are the shared result
pieces; ``analysis`` computes every result once for the fronts that show several, and
``centring`` gives the values a spreadsheet can recompute from. No I/O, no global state. Other
layers import from this package, not its modules.
"""

from .alternatives import (
    BrownForsytheResult, KruskalResult, WelchResult, brown_forsythe, brown_forsythe_of, kruskal,
    kruskal_from_counts, welch, welch_of,
)
from .analysis import Analysis, analyse, analyse_of
from .checks import SD_RATIO_LIMIT, SMALL_GROUP_N, ChecksResult, checks, checks_of
from .centring import centred_values, centring_constant
from .comparisons import (
    METHOD_NAMES, METHODS, PairRow, PairwiseResult, dunnett, dunnett_of, pairwise, pairwise_of,
    parse_method,
)
from .describe import DescribeResult, GroupSummary, describe, describe_of, middle_value
from .effects import EffectSizes, effect_sizes, effect_sizes_of, noncentrality_interval
from .group_moments import GroupMoments, group_moments, moments_only
from .interval import Interval
from .lettering import LettersResult, letter_sets, letters, letters_of
from .linear import ContrastResult, LinearTestResult, contrast, linear_test
from .moments import ExactMoments, FloatMoments, compute_moments
from .normality import SHAPIRO_WILK_MAX_N, NormalityResult, shapiro_residuals
from .oneway import OneWayResult, oneway, oneway_from_moments, oneway_from_sums, oneway_of, oneway_from_summary, require_two_groups
from .outcome import Unavailable, attempt
from .planning import PowerPlan, cohens_f_from_difference, detectable_effect, plan, power, sample_size
from .residuals import residuals
from .variances import BartlettResult, LeveneResult, bartlett, bartlett_of, levene, levene_result
from .varcomp import VarianceComponents, variance_components, variance_components_of
from .wording import df_text, sentence

__all__ = [
    "BrownForsytheResult", "KruskalResult", "WelchResult", "brown_forsythe", "kruskal", "welch",
    "brown_forsythe_of", "kruskal_from_counts", "welch_of",
    "Analysis", "analyse", "analyse_of", "checks_of", "bartlett_of", "levene_result",
    "dunnett_of", "pairwise_of", "describe_of", "middle_value", "effect_sizes_of",
    "GroupMoments", "group_moments", "moments_only", "letters_of", "oneway_of",
    "variance_components_of",
    "SD_RATIO_LIMIT", "SHAPIRO_WILK_MAX_N", "SMALL_GROUP_N", "BartlettResult", "ChecksResult",
    "LeveneResult", "NormalityResult", "bartlett", "checks", "levene", "residuals",
    "shapiro_residuals",
    "centred_values", "centring_constant",
    "METHOD_NAMES", "METHODS", "PairRow", "PairwiseResult", "dunnett", "pairwise", "parse_method",
    "DescribeResult", "GroupSummary", "describe",
    "EffectSizes", "effect_sizes", "noncentrality_interval",
    "Interval",
    "LettersResult", "letter_sets", "letters",
    "ContrastResult", "LinearTestResult", "contrast", "linear_test",
    "ExactMoments", "FloatMoments", "compute_moments",
    "OneWayResult", "oneway", "oneway_from_moments", "oneway_from_sums", "oneway_from_summary", "require_two_groups",
    "Unavailable", "attempt",
    "PowerPlan", "cohens_f_from_difference", "detectable_effect", "plan", "power", "sample_size",
    "VarianceComponents", "variance_components",
    "df_text", "sentence",
]
