"""Machine curves, system curves, acceptance tests and similarity: the judgement against the
guarantee.

- :mod:`.characteristic`: :class:`PerformanceCurve` (datasheet points, fit, affinity laws,
  surge margin);
- :mod:`.system`: :class:`SystemCurve`, :class:`PipeSection`, :func:`operating_point`
  (intersection, throttle, speed change, NPSH margin);
- :mod:`.pump_acceptance`: :func:`pump_acceptance` after ISO 9906:2012;
- :mod:`.fan`: fan pressure, fan static pressure, air power, compressibility coefficient and
  efficiencies after ISO 5801;
- :mod:`.similarity`: :func:`compressor_similarity` after ASME PTC 10-1997.
"""

from .cases import (
    CurvesCaseResult,
    evaluate_curves_case,
    list_curves_demos,
    load_curves_demo,
    points_from_readings,
)
from .characteristic import FITS, HEAD_KINDS, PerformanceCurve
from .charts import Chart, case_charts
from .fan import FanTestResult, compressibility_coefficient, fan_test, mach_factor
from .pump_acceptance import GRADES, PumpAcceptanceResult, ToleranceGrade, pump_acceptance
from .report import curves_report, write_curves_report
from .similarity import (
    CompressorCondition,
    CompressorSimilarityResult,
    SimilarityCheck,
    SimilarityGroups,
    compressor_similarity,
)
from .system import OperatingPoint, PipeSection, SystemCurve, operating_point

__all__ = ["Chart", "case_charts", "CurvesCaseResult", "evaluate_curves_case", "list_curves_demos", "load_curves_demo",
           "FITS", "GRADES", "HEAD_KINDS", "CompressorCondition", "CompressorSimilarityResult",
           "FanTestResult", "OperatingPoint", "PerformanceCurve", "PipeSection",
           "PumpAcceptanceResult", "SimilarityCheck", "SimilarityGroups", "SystemCurve",
           "ToleranceGrade", "compressibility_coefficient", "compressor_similarity",
           "curves_report", "fan_test", "mach_factor", "operating_point", "points_from_readings",
           "pump_acceptance",
           "write_curves_report"]
