#pragma once
// Values with units as written in case files ("450 ppmv", "1.2 MW", "92 degC"), from a closed
// list of units per kind of quantity, converted once to the core's units (core.hpp).
#include <string>
#include <string_view>
#include <vector>

#include "acidload/core/gas.hpp"
#include "acidload/io/document.hpp"

namespace acidload::io {

//! Kinds of quantity a key can hold. Each has a closed list of accepted units.
enum class Kind {
  temperature,          //!< degC, K            → K
  temperature_change,   //!< K, degC (a difference) → K
  power,                //!< W, kW, MW          → W
  volume,               //!< L, m3              → m³
  mass,                 //!< kg, g, t           → kg
  molar_flow,           //!< Nm3/h, mol/h, kmol/h, Nm3/min → mol/h (Nm³ at 0 °C, 101.325 kPa)
  fraction,             //!< %, or a bare number from 0 to 1 → [-]
  acid_number,          //!< mg KOH/g           → mg KOH/g
  specific_consumption, //!< g/kWh              → kg/J
  duration,             //!< h, d (24 h), min   → h
  pressure,             //!< Pa, kPa, bar, mbar, MPa → Pa (absolute)
  density,              //!< kg/m3, kg/L, g/cm3 → kg/m³
  per_hour,             //!< 1/h                → 1/h
  oxidation,            //!< A/cm, A/0.1mm      → A/cm (A/0.1mm × 100: 0.1 mm = 0.01 cm)
  oxidation_rate,       //!< A/cm/h             → A/cm per h
  molar_energy,         //!< J/mol, kJ/mol      → J/mol
  money,                //!< a bare number: an amount in the case's currency → [currency]
  price_per_volume,     //!< per L, per m3      → currency per m³
  price_per_mass,       //!< per kg, per t      → currency per kg
  price_per_energy,     //!< per MWh, per kWh   → currency per J
  years,                //!< years              → [year]
  mass_ratio,           //!< kg/kg, or a bare number → [kg/kg]
  count,                //!< a bare number ≥ 0  → [-]
  number,               //!< a bare number      → [-]
};
//! The units a kind accepts, as written, e.g. {"degC", "K"}.
const std::vector<std::string>& accepted_units(Kind k);
//! A plain name for a kind, e.g. "temperature".
std::string_view kind_name(Kind k);

//! Parses "<number> <unit>" (one or more spaces; the number in plain decimal or exponent form) for
//! a kind, returning the value in the core's unit. A bare number is accepted only for kinds whose
//! unit is fixed (fraction, count, number). NaN, infinities and numbers beyond ±1e300 are refused.
//! Errors name the key path, the value, and the accepted units of the kind.
double quantity(const Document& doc, const Node& node, Kind k);

//! A contaminant figure: "<number> <unit> [dry|wet]" with unit ppmv, ppm (taken as ppmv),
//! mg/Nm3, mg/m3 (at the case's reference state), mg/MJ, mg/Nm3 CH4, mol/h; the basis defaults
//! to `default_basis`.
Concentration concentration(const Document& doc, const Node& node, Basis default_basis);

//! Parses a plain number (for CSV cells and bare values); throws the same errors.
double number(const Document& doc, const Node& node);

//! A value in the core unit expressed in `unit`, one of the kind's units ("" for a bare number,
//! "%" for a fraction); an unknown unit gives the core value unchanged.
double from_core_unit(Kind k, std::string_view unit, double core_value);
//! The unit a value is written in, as the parser normalises it ("" for a bare number or bad text).
std::string unit_written(std::string_view text);

//! The same parsers on text alone, for CSV cells: return false with `why` filled when bad.
bool parse_quantity_text(std::string_view text, Kind k, double& out, std::string& why);

}  // namespace acidload::io
