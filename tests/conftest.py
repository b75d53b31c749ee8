from hypothesis import HealthCheck, settings

from tests.support.calc import calc_office  # noqa: F401  (a fixture)
from tests.support.spark import spark_session  # noqa: F401  (a fixture)
from tests.support.xlwings_com import xlwings_com  # noqa: F401  (a fixture)
from tests.support.xlwings_engine import xlwings_pipeline  # noqa: F401  (a fixture)

# Property tests repeat exactly from run to run (no flaky CI) and have no per-example deadline.
settings.register_profile(
    "sheetfuncs", derandomize=True, deadline=None, suppress_health_check=[HealthCheck.too_slow]
)
settings.load_profile("sheetfuncs")
