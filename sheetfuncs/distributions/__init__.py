"""Distributions that know nothing of groups: F and noncentral F, the studentized range,
many-to-one t, and the normality tests' statistics.

Other layers import from this package, not its modules.
"""

from .f import check_df, f_critical, f_tail
from .noncentral_f import ncf_cdf, ncf_sf
from .normality import (
    SHAPIRO_WILK_MAX_N, dagostino_pearson, kurtosis_z, shapiro_wilk, shapiro_wilk_coefficients,
    skewness_z,
)
from .many_to_one import many_to_one_critical, many_to_one_tail, many_to_one_tails
from .studentized_range import range_critical, range_criticals, range_tail, range_tails

__all__ = [
    "check_df", "f_critical", "f_tail", "ncf_cdf", "ncf_sf",
    "SHAPIRO_WILK_MAX_N", "dagostino_pearson", "kurtosis_z", "shapiro_wilk",
    "shapiro_wilk_coefficients", "skewness_z",
    "many_to_one_critical", "many_to_one_tail", "many_to_one_tails", "range_critical",
    "range_criticals", "range_tail", "range_tails",
]
