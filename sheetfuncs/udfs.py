"""The module users point xlwings at ("UDF Modules" = ``sheetfuncs.udfs``).

It holds every SF_ worksheet function and ``REGISTRY`` (their records, in the documented order),
and nothing else: xlwings' "Import Functions" scans ``dir()`` of this module for functions that
carry its ``__xlfunc__`` options, and its call path looks each function up here by name. The
functions are the very objects the decorators made (:mod:`sheetfuncs.worksheet.registry`); they
are defined in :mod:`sheetfuncs.worksheet.functions`, one module per topic, and documented in
docs/functions.md (``python -m sheetfuncs.worksheet.docs --markdown``).
"""

from .worksheet.functions import (  # noqa: F401
    REGISTRY,
    SF_BARTLETT, SF_BROWNFORSYTHE, SF_CHECKS, SF_CONTRAST, SF_DETECTABLE, SF_DFB, SF_DFT, SF_DFW,
    SF_DUNNETT, SF_EFFECT, SF_F, SF_FCRIT, SF_FROMSTATS, SF_FTAIL, SF_GLT, SF_GROUPS, SF_KRUSKAL,
    SF_LETTERS, SF_LEVENE, SF_MSB, SF_MSW, SF_P, SF_PAIRS, SF_POWER, SF_R2, SF_SAMPLESIZE,
    SF_SHAPIRO, SF_SSB, SF_SST, SF_SSW, SF_TABLE, SF_VARCOMP, SF_WELCH,
)
