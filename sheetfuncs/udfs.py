"""The module users point xlwings at ("UDF Modules" = ``sheetfuncs.udfs``): every SF_ function."""

from .worksheet.registry import (  # noqa: F401
    REGISTRY,
    SF_BARTLETT, SF_BROWNFORSYTHE, SF_CHECKS, SF_CONTRAST, SF_DETECTABLE, SF_DFB, SF_DFT, SF_DFW,
    SF_DUNNETT, SF_EFFECT, SF_F, SF_FCRIT, SF_FROMSTATS, SF_FTAIL, SF_GLT, SF_GROUPS, SF_KRUSKAL,
    SF_LETTERS, SF_LEVENE, SF_MSB, SF_MSW, SF_P, SF_PAIRS, SF_POWER, SF_R2, SF_SAMPLESIZE,
    SF_SHAPIRO, SF_SSB, SF_SST, SF_SSW, SF_TABLE, SF_VARCOMP, SF_WELCH,
)

if __name__ == "__main__":
    from sheetfuncs.worksheet.registry import main

    raise SystemExit(main())
