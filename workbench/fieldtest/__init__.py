"""Field-test data: import, batch evaluation, steady-state filter, uncertainty, design check.

Results are estimates from the readings given and depend on the validity of the property
model; they do not replace the equipment supplier's data, the applicable test codes or a
licensed engineer's judgement.
"""

from .batch import (
    DEFAULT_RESULTS,
    RESULTS,
    STANDARD_CONDITIONS,
    evaluate,
    evaluate_dask,
    with_unit_headers,
)
from .design import AffinityCorrection, DesignPoint, affinity_correction, compare_with_design
from .readers import PROBLEM_COLUMN, READING_KINDS, read_readings, readings_from_frame
from .steady import steady_state_flags
from .uncertainty import (
    InstrumentUncertainty,
    MonteCarloReport,
    UncertaintyReport,
    monte_carlo_uncertainty,
    propagate_uncertainty,
)

__all__ = [
    "AffinityCorrection", "DEFAULT_RESULTS", "DesignPoint", "InstrumentUncertainty",
    "MonteCarloReport", "PROBLEM_COLUMN", "READING_KINDS", "RESULTS", "STANDARD_CONDITIONS",
    "UncertaintyReport", "affinity_correction", "compare_with_design", "evaluate",
    "evaluate_dask", "monte_carlo_uncertainty", "propagate_uncertainty", "read_readings",
    "readings_from_frame", "steady_state_flags", "with_unit_headers",
]
