"""acidload: the acid load of sour biogas on gas-engine oil — TBN, TAN, SAN and drain intervals.

The Python face of the acidload C++ library (the same code as the ``acidload`` program)::

    import acidload
    case = acidload.load_case("cases/demo-site.yaml")        # or load_case_text, case_from_dict, case(**inputs)
    result = acidload.run(case)
    result.summary                                            # dict, as the program's summary.json
    result["raw gas"].trajectory["tan"]                       # numpy array [mg KOH/g]
    result.to_dataframe()                                     # pandas, when installed
    acidload.drain_interval(case, h2s_ppmv=np.linspace(0, 600, 61))   # a sweep, in C++ [h]
    acidload.solve_for_interval(case, target_h=4000, h2s_ppmv=(0, 800))
    acidload.Site("cases/demo-landfill-site.yaml").run()     # engines sharing one gas supply and train

Keyword inputs carry their unit in the name (``h2s_ppmv``, ``oil_volume_l``, ``jacket_water_out_c``);
the core's own units are hours, K, Pa, kg, m³, mol and mg KOH/g. Errors are ValueError subclasses
(:class:`InputError` with the file, line, column or the key path). Results are estimates that support,
not replace, the engine maker's and oil supplier's limits and lab analysis.
"""
from . import _core
from ._economics import COST_ITEMS, Costs, cheapest_level, cost_monte_carlo, cost_sweep, costs
from ._case import KEYWORDS, Case, Variant, case, case_from_dict, load_case, load_case_text
from ._calibration import (PARAMETERS, Fit, default_alarm_levels, fit, fit_residuals, forecast, monte_carlo, predict,
                           read_lab, read_lab_samples, trend)
from ._site import Site, SiteResult
from ._fleet import FLEET_COLUMNS, CaseOutcome, FleetResult, monte_carlo_many, run_many
from ._errors import Error, FitRefusedError, InputError, NoAnswerError, NotModelledError
from ._gas import CONCENTRATION_UNITS, accepted_units, convert, convert_figure, molar_mass, molar_volume, parse_quantity
from ._results import TRAJECTORY_UNITS, Result, VariantResult, run
from ._studies import LEVERS, InverseAnswer, drain_interval, solve_for_interval
from . import economics, oil, scrubber, so3, water

#: The version of the library, the program and this package (defined once, in CMakeLists.txt).
__version__: str = _core.version()

__all__ = [
    "__version__",
    # cases
    "Case", "Variant", "load_case", "load_case_text", "case_from_dict", "case", "KEYWORDS",
    # runs and studies
    "run", "Result", "VariantResult", "TRAJECTORY_UNITS", "drain_interval", "solve_for_interval",
    "InverseAnswer", "LEVERS",
    # sites: engines sharing one gas supply and one scrubbing train
    "Site", "SiteResult",
    # fleets: many cases on all cores or a Dask cluster
    "run_many", "monte_carlo_many", "FleetResult", "CaseOutcome", "FLEET_COLUMNS",
    # economics
    "costs", "Costs", "cheapest_level", "cost_sweep", "cost_monte_carlo", "COST_ITEMS",
    # calibration and uncertainty
    "read_lab", "read_lab_samples", "fit", "Fit", "fit_residuals", "forecast", "predict", "trend", "default_alarm_levels",
    "monte_carlo", "PARAMETERS",
    # errors
    "Error", "InputError", "NotModelledError", "NoAnswerError", "FitRefusedError",
    # physics from the core
    "molar_mass", "molar_volume", "convert", "convert_figure", "parse_quantity", "accepted_units", "CONCENTRATION_UNITS", "water", "so3", "oil", "scrubber", "economics",
]
