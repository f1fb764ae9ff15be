"""Species and gas conversions from acidload's core."""
from __future__ import annotations

from typing import Any, Dict, Optional

from . import _core
from ._checks import number

__all__ = ["molar_mass", "molar_volume", "convert", "convert_figure", "parse_quantity", "accepted_units", "CONCENTRATION_UNITS"]

#: The units of a contaminant figure acidload converts between.
CONCENTRATION_UNITS = ("ppmv", "mg/m3", "mg/MJ", "mg/m3 CH4", "mol/h")
#: Their other spellings, as the program and case files take them too: ppm, mg/Nm3, mg/kWh, mg/Nm3 CH4.


def molar_mass(formula: str) -> float:
    """Molar mass of a chemical formula such as ``"C2HCl3"`` or ``"CH3(CH2)2SH"`` [kg/mol], from IUPAC
    standard atomic weights. A malformed formula raises :class:`acidload.InputError`."""
    return _core.molar_mass(formula)


def molar_volume(temperature_k: float = 273.15, pressure_pa: float = 101325.0) -> float:
    """Ideal-gas molar volume R·T/p [m³/mol] (CODATA R) at a reference state: T [K], p [Pa]."""
    return _core.molar_volume(number(temperature_k, "temperature_k"), number(pressure_pa, "pressure_pa"))


def convert(value: float, from_unit: str, to_unit: str, *, molar_mass_kg_per_mol: float,
            from_basis: Optional[str] = None, to_basis: Optional[str] = None, reference_temperature_k: float = 273.15,
            reference_pressure_pa: float = 101325.0, water_fraction: float = 0.0, methane_fraction: float = 0.0,
            lhv_j_per_mol: float = 0.0, flow_mol_per_h: float = 0.0) -> float:
    """A contaminant figure in another unit and basis (acidload::convert).

    Units are read by the same C++ parser as the program's ``convert`` and case files, so they take the
    same spellings: ``"ppmv"`` (or ``"ppm"``), ``"mg/Nm3"`` or ``"mg/m3"`` (at the reference state),
    ``"mg/MJ"`` (of the gas's lower heating value), ``"mg/kWh"``, ``"mg/Nm3 CH4"`` or ``"mg/m3 CH4"``
    (per m³ of methane), ``"mol/h"`` (carried by the flow), each optionally followed by ``dry`` or
    ``wet`` (ppmv and mg/Nm3 only). The basis is the one the unit names, else ``from_basis`` /
    ``to_basis`` (``"dry"`` or ``"wet"``), else dry; a unit and an argument naming different bases
    raise :class:`acidload.InputError`, as does a unit the program would refuse.
    ``molar_mass_kg_per_mol`` is that of the species the figure is stated as (S for "as S").
    ``water_fraction`` and ``methane_fraction`` are mole fractions of the wet gas [mol/mol];
    ``lhv_j_per_mol`` its lower heating value [J/mol]; ``flow_mol_per_h`` the wet gas flow [mol/h].
    """
    return _core.convert(number(value, "value"), from_unit, from_basis or "", to_unit, to_basis or "",
                         number(molar_mass_kg_per_mol, "molar_mass_kg_per_mol"),
                         number(reference_temperature_k, "reference_temperature_k"),
                         number(reference_pressure_pa, "reference_pressure_pa"), number(water_fraction, "water_fraction"),
                         number(methane_fraction, "methane_fraction"), number(lhv_j_per_mol, "lhv_j_per_mol"),
                         number(flow_mol_per_h, "flow_mol_per_h"))


def convert_figure(figure: str, case: Any, *, species: str = "H2S", variant: Optional[str] = None) -> Dict[str, Any]:
    """A contaminant figure in every unit for the gas of a case, as ``acidload convert FIGURE --case``
    prints it: ``figure`` as the program reads it (``"300 ppmv"``, ``"450 mg/Nm3 wet"``,
    ``"60 mg/Nm3 CH4"``, ``"25 mg/MJ"``); ``case`` a :class:`acidload.Case` (its ``variant``, default the
    base case), a :class:`acidload.Variant` or a path to a case file; ``species`` ``"H2S"``, ``"S"``,
    ``"Cl"``, ``"F"`` or a halocarbon by name or formula (then rows ``"as Cl"`` and ``"as F"`` follow).

    Returns ``{"gas": {...}, "rows": [...]}``: the gas of the case's first segment (reference state
    [K], [Pa], water and methane mole fractions of the wet gas, LHV [J/m³], fuel flow [mol/h]) and for
    each row ``what``, ``molar_mass`` [kg/mol], ``ppmv_dry``, ``ppmv_wet``, ``mg_per_nm3_dry``,
    ``mg_per_nm3_wet``, ``mg_per_mj``, ``mg_per_nm3_methane`` and ``mol_per_h`` (0 without a flow)."""
    from ._case import Case, Variant, load_case
    if isinstance(case, Variant):
        if variant is not None:
            raise TypeError("variant= goes with a Case, not a Variant")
        v = case
    else:
        if not isinstance(case, Case):
            case = load_case(case)
        v = case.variant(variant)
    t = _core.figure_in_every_unit(v._engine_case, figure, species)
    rows = [{k: getattr(r, k) for k in ("what", "molar_mass", "ppmv_dry", "ppmv_wet", "mg_per_nm3_dry", "mg_per_nm3_wet",
                                        "mg_per_mj", "mg_per_nm3_methane", "mol_per_h")} for r in t.rows]
    gas = {"reference_temperature_k": t.reference_temperature, "reference_pressure_pa": t.reference_pressure,
           "water_fraction": t.water_fraction, "methane_fraction": t.methane_fraction,
           "lhv_j_per_m3": t.lhv_volumetric, "flow_mol_per_h": t.molar_flow}
    return {"gas": gas, "rows": rows}


def parse_quantity(text: str, kind: str) -> float:
    """A value with its unit as a case file writes it — ``"1.2 MW"``, ``"90 degC"``, ``"600 L"``,
    ``"0.25 g/kWh"`` — parsed for a kind of quantity into the core's unit: temperature → K,
    temperature_change → K, power → W, volume → m³, mass → kg, molar_flow → mol/h (Nm³ at 0 °C,
    101.325 kPa), fraction → -, acid_number → mg KOH/g, specific_consumption → kg/J, duration → h,
    pressure → Pa, density → kg/m³, per_hour → 1/h, oxidation → A/cm, oxidation_rate → A/cm per h,
    molar_energy → J/mol, count and number → -. A bad value raises :class:`acidload.InputError`
    listing the accepted units (:func:`accepted_units`)."""
    return _core.parse_quantity(text, kind)


def accepted_units(kind: str) -> list:
    """The units a kind of quantity accepts, as written in case files (e.g. ``["degC", "K"]``)."""
    return list(_core.accepted_units(kind))
