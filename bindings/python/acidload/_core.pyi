# Type stubs of acidload._core, the pybind11 module (bindings/python/src/module.cpp). Units follow the
# core's table: hours, K, Pa, kg, m³, mol, mg KOH/g, g KOH/h.
from typing import Any, Dict, List, Optional, Sequence, Tuple

import numpy as np
import numpy.typing as npt

ZERO_CELSIUS: float  # 273.15 K
MOLAR_GAS_CONSTANT: float  # R [J/(mol·K)], CODATA 2018
STANDARD_ATMOSPHERE: float  # [Pa]
CASE_FORMAT_VERSION: int

def version() -> str: ...
def molar_mass(formula: str) -> float: ...  # [kg/mol]
def koh_equivalents(acid: str) -> float: ...  # [mol KOH/mol]
def molar_volume(temperature_k: float = 273.15, pressure_pa: float = 101325.0) -> float: ...  # [m³/mol]
def convert(value: float, from_unit: str, from_basis: str, to_unit: str, to_basis: str, molar_mass_kg_per_mol: float,
            reference_temperature_k: float, reference_pressure_pa: float, water_fraction: float,
            methane_fraction: float, lhv_j_per_mol: float, flow_mol_per_h: float) -> float: ...

class FigureRow:
    what: str
    molar_mass: float  # [kg/mol]
    ppmv_dry: float
    ppmv_wet: float
    mg_per_nm3_dry: float
    mg_per_nm3_wet: float
    mg_per_mj: float
    mg_per_nm3_methane: float
    mol_per_h: float

class FigureTable:
    lhv_volumetric: float  # [J/m³]
    rows: List[FigureRow]
    reference_temperature: float  # [K]
    reference_pressure: float  # [Pa]
    water_fraction: float
    methane_fraction: float
    molar_flow: float  # [mol/h]

def figure_in_every_unit(case: EngineCase, figure: str, species: str) -> FigureTable: ...

class _WaterModule:
    def saturation_pressure(self, temperature_k: float) -> float: ...  # [Pa]
    def saturation_temperature(self, pressure_pa: float) -> float: ...  # [K]
    def dew_point(self, water_fraction: float, total_pressure_pa: float) -> float: ...  # [K]

class _So3Module:
    T_MIN: float
    T_MAX: float
    STANDARD_PRESSURE: float
    def kp(self, temperature_k: float) -> float: ...  # [bar^-1/2]
    def standard_gibbs_reaction(self, temperature_k: float) -> float: ...  # [J/mol]
    def equilibrium_so3_share(self, temperature_k: float, o2_fraction: float, total_pressure_pa: float) -> float: ...

class _BaseNumberMethod:
    D2896: "_BaseNumberMethod"
    D4739: "_BaseNumberMethod"

class _Regime:
    above_floor: "_Regime"
    floor_acid: "_Regime"
    floor_weak: "_Regime"

class _OilProperties:
    fresh_tbn: float  # [mg KOH/g]
    fresh_tbn_method: _BaseNumberMethod
    weak_base_d2896: float  # [mg KOH/g]
    weak_base_d4739: float  # [mg KOH/g]
    base_floor: float  # [mg KOH/g]
    fresh_tan: float  # [mg KOH/g]
    additive_depletion: float  # [1/h]
    salt_titration_share: float  # [-]
    organic_neutralised_share: float  # [-]
    density_15: float  # [kg/m³]
    viscosity_per_oxidation: float  # [-] per A/cm
    viscosity_per_nitration: float  # [-] per A/cm
    def __init__(self) -> None: ...
    def fresh_reactive_base(self) -> float: ...  # [mg KOH/g]

class _OilState:
    mass: float  # [kg]
    base: float  # [mg KOH/g]
    strong_acid: float
    weak_acid: float
    salts: float
    oxidation: float  # [A/cm]
    nitration: float  # [A/cm]
    additive_acidity: float
    antioxidant: float  # share of fresh [0-1]
    def __init__(self, *, mass: float = ..., base: float = ..., strong_acid: float = 0.0, weak_acid: float = 0.0,
                 salts: float = 0.0, oxidation: float = 0.0, nitration: float = 0.0,
                 additive_acidity: float = 0.0, antioxidant: float = 1.0) -> None: ...

class _OilRates:
    strong_acid: float  # [g KOH/h]
    sulfurous_fresh: float  # [g KOH/h]
    nitration: float  # [A/cm · kg/h]
    oxidation: float  # [A/cm per h]
    organic_acid: float  # [mg KOH/g per h]
    antioxidant_depletion: float  # [share of fresh per h]
    depleted_factor: float  # [-]
    consumption: float  # [kg/h]
    continuous_makeup: bool
    def __init__(self) -> None: ...

class _OilBalance:
    fresh_base: float
    base_floor: float
    fresh_additive: float
    additive_depletion: float
    organic_neutralised_share: float
    def __init__(self) -> None: ...

class _OilLedger:
    base_added: float  # [g KOH]
    base_removed: float
    base_consumed: float
    acid_entered: float
    acid_removed: float
    sulfurous_taken_up: float
    def __init__(self) -> None: ...

class _SegmentOutcome:
    floor_reached_at: float  # [h], -1 if not
    acid_cleared_at: float  # [h], -1 if not
    antioxidant_spent_at: float  # [h], -1 if not
    end_regime: _Regime

class _OilModule:
    BaseNumberMethod: type[_BaseNumberMethod]
    Regime: type[_Regime]
    OilProperties: type[_OilProperties]
    OilState: type[_OilState]
    OilRates: type[_OilRates]
    OilBalance: type[_OilBalance]
    OilLedger: type[_OilLedger]
    SegmentOutcome: type[_SegmentOutcome]
    def balance_constants(self, oil: _OilProperties) -> _OilBalance: ...
    def fresh_oil(self, oil: _OilProperties, mass_kg: float) -> _OilState: ...
    def advance(self, state: _OilState, constants: _OilBalance, rates: _OilRates, hours: float,
                ledger: _OilLedger) -> Tuple[_OilState, _SegmentOutcome]: ...
    def steady_state(self, state: _OilState, constants: _OilBalance, rates: _OilRates) -> _OilState: ...
    def advance_record(self, state: _OilState, constants: _OilBalance, table: npt.ArrayLike,
                       continuous_makeup: bool = ...) -> _OilState: ...  # table: n × 7 rates, core units
    def top_up(self, state: _OilState, oil: _OilProperties, mass_kg: float, ledger: _OilLedger) -> _OilState: ...
    def oil_change(self, state: _OilState, oil: _OilProperties, residual_share: float, full_mass_kg: float,
                   ledger: _OilLedger) -> _OilState: ...
    def tbn(self, state: _OilState, oil: _OilProperties, method: _BaseNumberMethod) -> float: ...
    def tan(self, state: _OilState, oil: _OilProperties) -> float: ...
    def san(self, state: _OilState) -> float: ...

class _ScrubberModule:
    def thomas_steepness(self, width: float) -> float: ...
    def breakthrough_share(self, fed_share: float, steepness: float) -> float: ...
    def captured_share(self, fed_share: float, steepness: float) -> float: ...
    def bed_outlet_ratio(self, fed_share: float, efficiency: float, steepness: float) -> float: ...
    def fed_share_at_outlet_ratio(self, ratio: float, efficiency: float, steepness: float) -> float: ...
    def iron_oxide_theoretical_capacity(self) -> float: ...  # [kg S/kg Fe2O3]
    def caustic_per_sulfur(self) -> float: ...  # [kg NaOH/kg S]

class _EconomicsModule:
    def capital_recovery_factor(self, discount_rate: float, life_years: float) -> float: ...  # [1/year]

water: _WaterModule
scrubber: _ScrubberModule
economics: _EconomicsModule
so3: _So3Module
oil: _OilModule

class EngineCase:
    name: str
    segments: int
    streamed: bool  # the record is read from its file for each run instead of held
    max_hours: float  # [h]
    def lever_value(self, lever: str) -> float: ...
    def with_lever(self, lever: str, value: float) -> "EngineCase": ...

class LabSettings:
    def __init__(self) -> None: ...
    def to_dict(self) -> Dict[str, Any]: ...
class CaseFile:
    file: str
    title: str
    variants: List[EngineCase]
    lab: LabSettings
    overlays: List[str]
    format_version: int
    names: List[str]  # the variants' names, base first
    streamed: bool  # a variant's record is read from its file for each run instead of held
    def held(self) -> "CaseFile": ...  # every streamed record read into segments (at most 1 000 000 each)

def load_case(path: str, overlays: Sequence[str] = ..., stream: bool = ...) -> CaseFile: ...
def load_case_text(text: str, file_name: str, base_dir: str, overlays: Sequence[str] = ..., stream: bool = ...) -> CaseFile: ...
class SiteFile:
    file: str
    title: str
    name: str
    engine_names: List[str]
    currency: str
    gas_hours: List[float]

def is_site_file(path: str) -> bool: ...
def load_site(path: str) -> SiteFile: ...
def load_site_text(text: str, file_name: str, base_dir: str) -> SiteFile: ...
def run_site(site: SiteFile) -> Dict[str, Any]: ...
def section_keys(section: str) -> List[str]: ...
def case_keys() -> List[Dict[str, Any]]: ...

class CaseRun:
    names: List[str]
    def summary_json(self) -> str: ...
    def trajectories_csv(self) -> str: ...
    def trajectory(self, index: int) -> Dict[str, npt.NDArray[np.float64]]: ...
    def first_rates(self, index: int) -> Dict[str, float]: ...
    def write_results(self, folder: str) -> None: ...
    def summary_csv(self) -> str: ...
    def report_html(self, lab: str = ..., parameters: List[str] = ...) -> str: ...
    def write_report(self, path: str, lab: str = ..., parameters: List[str] = ...) -> None: ...

def run_case(case: CaseFile) -> CaseRun: ...

# ---- economics (variants by index; stages 0-based)
def has_economics(case: CaseFile) -> bool: ...
def stage_names(case: CaseFile, variant: int) -> List[str]: ...
def level_stage(case: CaseFile, variant: int) -> int: ...
def default_level_range(case: CaseFile, variant: int, stage: int) -> Tuple[float, float]: ...  # [ppmv dry]
def cheapest_level(case: CaseFile, variant: int, stage: int, low_ppmv: float, high_ppmv: float, points: int = ...,
                   tolerance_ppmv: float = ...) -> Dict[str, Any]: ...
def cost_sweep(case: CaseFile, variant: int, stage: int,
               levels_ppmv: Sequence[float]) -> Tuple[npt.NDArray[np.float64], npt.NDArray[np.float64]]: ...
def cost_items() -> List[str]: ...
def price_keys() -> List[str]: ...
def cost_monte_carlo(case: CaseFile, draws: int = ..., seed: int = ..., threads: int = ...) -> Dict[str, Any]: ...
def drain_interval(case: EngineCase) -> float: ...  # [h]
def sweep_drain_interval(case: EngineCase, lever: str, values: npt.ArrayLike, threads: int = 0) -> npt.NDArray[np.float64]: ...

class InverseAnswer:
    found: bool
    value: float
    interval_at_value: float  # [h]
    interval_at_low: float  # [h]
    interval_at_high: float  # [h]
    reason: str
    evaluations: int

def default_search(case: EngineCase, lever: str) -> Tuple[float, float, float]: ...  # (low, high, tolerance), core unit

def solve_for_interval(case: EngineCase, lever: str, target_hours: float, low: float, high: float,
                       tolerance: float) -> InverseAnswer: ...

def parse_quantity(text: str, kind: str) -> float: ...  # in the core's unit of the kind
def accepted_units(kind: str) -> List[str]: ...

# ---- calibration, forecast, Monte Carlo
class LabSample:
    charge: int  # 0-based charge of the record
    oil_hours: float  # [h]
    tbn: Optional[float]  # [mg KOH/g]
    tan: Optional[float]  # [mg KOH/g]
    san: Optional[float]  # [mg KOH/g]; the reporting limit when censored
    san_censored: bool
    oxidation: Optional[float]  # [A/cm]
    nitration: Optional[float]  # [A/cm]
    initial_ph: Optional[float]
    lab: str
    where: str
    tbn_method: Any
    date: str
    trended: Dict[str, float]
    other: Dict[str, str]
    oxidation_baseline: float  # [A/cm]
    nitration_baseline: float  # [A/cm]

def read_lab_samples(path: str) -> List[LabSample]: ...
def read_lab_notes(path: str) -> List[str]: ...
def parameter_keys() -> List[str]: ...
def lever_keys() -> List[Tuple[str, str]]: ...  # (lever, case key)
def parameter_bound(key: str) -> str: ...  # "positive", "share", "interval" or "free"
def parameter_range(key: str) -> Tuple[float, float, float, str]: ...  # low, high, prior sd (fit space), unit
def to_fit_space(key: str, x: float) -> float: ...
def from_fit_space(key: str, phi: float) -> float: ...
def from_fit_space(key: str, phi: float) -> float: ...
def dx_dphi(key: str, phi: float) -> float: ...
def get_parameter(case: EngineCase, key: str) -> float: ...  # core unit
def with_parameter(case: EngineCase, key: str, value: float) -> EngineCase: ...
def predict(case: EngineCase, samples: Sequence[LabSample]) -> Dict[str, Any]: ...
def fit_residuals(case: EngineCase, samples: Sequence[LabSample], parameters: Sequence[str],
                  phi: Sequence[float]) -> npt.NDArray[np.float64]: ...

class FitResult:
    keys: List[str]
    estimates: List[float]  # core units
    standard_errors: List[float]  # core units (delta method)
    initial: List[float]
    fit_estimates: List[float]  # log / logit space
    baselines: List[Dict[str, Any]]  # FTIR baselines fitted per lab [A/cm]
    samples: List[LabSample]  # the samples fitted, the case's per-lab baselines put in
    covariance: List[List[float]]  # fit space
    correlation: List[List[float]]
    residuals: Dict[str, Any]
    sum_of_squares: float
    observations: int
    degrees_of_freedom: int
    s2: float  # reduced chi-square
    iterations: int
    converged: bool
    flags: List[str]
    notes: List[str]
    warnings: List[str]
    chi2_p: float
    held: List[bool]
    fitted: EngineCase
    def overlay_text(self, case_file: str, lab_file: str) -> str: ...

def calibrate(case: EngineCase, samples: Sequence[LabSample], parameters: Sequence[str],
              precision: Dict[str, float] = ..., lab_precision: Dict[str, Dict[str, float]] = ...,
              priors: bool = ..., lab: LabSettings = ...) -> FitResult: ...
def viscosity_change(nu: float, nu_fresh: float) -> float: ...
def forecast(fit: FitResult, initial_ph: Optional[float] = ..., sample_interval: float = ...) -> Dict[str, Any]: ...
def predict_charge(fit: FitResult, next_charge: bool = ..., plan: Sequence[EngineCase] = ..., draws: int = ...,
                   seed: int = ..., model_form: bool = ..., lab_first: bool = ..., initial_ph: Optional[float] = ...) -> Dict[str, Any]: ...
def monte_carlo(case: EngineCase, inputs: Sequence[Tuple[str, str, float, float, float]], draws: int, seed: int,
                threads: int = ..., fit: Optional[FitResult] = ..., every_charge: bool = ...) -> Dict[str, Any]: ...
def trend(fit: FitResult, levels: Sequence[Tuple[str, float, float, bool]] = ..., lab: LabSettings = ...) -> Dict[str, Any]: ...
def default_alarm_levels() -> List[Tuple[str, float, float, bool, str]]: ...
def case_uncertainty(case_file: CaseFile) -> Tuple[List[Tuple[str, str, float, float, float]], int, int]: ...
