"""Machine trains: machines and devices in series, with splits and merges on the way.

* :mod:`workbench.trains.steps` - the steps (:class:`CompressorStage`,
  :class:`TurbineSection`, :class:`PumpStage`, :class:`Cooler`, :class:`PressureLoss`,
  :class:`ThrottleValve`, :class:`PipeRun`, the split :class:`Extraction` and the merge
  :class:`Admission`) and the :class:`Station` and :class:`StepResult` records;
* :mod:`workbench.trains.core` - :class:`Train` and its :class:`TrainResult` (stations,
  machines, totals, tables from :data:`workbench.fields.FIELDS`);
* :mod:`workbench.trains.intercooled` - :func:`intercooled_compressor`;
* :mod:`workbench.trains.extraction` - :func:`extraction_turbine`.

Pressure ratios are quoted higher over lower pressure for every machine (outlet over inlet
for a compressor or pump, inlet over outlet for a turbine).  Train totals are shaft powers
and named so (``total_shaft_power``, ``absorbed_shaft_power``...); a machine result's
``power`` is its fluid power.  Flat dicts and tables use the plain field names of
:data:`workbench.fields.FIELDS` as keys (``pressure``, ``mass_flow``, ``shaft_power``),
as every other result does; ``headers=True`` gives labels with units instead.
"""

from .core import MACHINE_FIELDS, STATION_FIELDS, TOTAL_FIELDS, Train, TrainResult, run_train
from .extraction import ExtractionTurbineResult, extraction_turbine
from .intercooled import STAGE_RATIO_OPTIONS, IntercooledCompressorResult, intercooled_compressor
from .steps import (
    MACHINE_KINDS,
    Admission,
    CompressorStage,
    Cooler,
    Extraction,
    PipeRun,
    PressureLoss,
    PumpStage,
    Station,
    StepResult,
    ThrottleValve,
    TurbineSection,
)

__all__ = ["Admission", "CompressorStage", "Cooler", "Extraction", "PipeRun", "PressureLoss",
           "PumpStage", "Station", "StepResult", "ThrottleValve", "Train", "TrainResult",
           "TurbineSection", "run_train", "IntercooledCompressorResult",
           "ExtractionTurbineResult", "intercooled_compressor", "extraction_turbine",
           "MACHINE_KINDS", "MACHINE_FIELDS", "STATION_FIELDS", "TOTAL_FIELDS",
           "STAGE_RATIO_OPTIONS"]
