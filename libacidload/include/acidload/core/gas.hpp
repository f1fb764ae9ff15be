#pragma once
// Gas reference states, analysis basis and conversions of contaminant figures.
#include <string_view>

#include "acidload/core/constants.hpp"

namespace acidload {

//! The state a gas volume is quoted at ("Nm³" = normal state).
struct ReferenceState {
  double temperature = constants::zero_celsius;       //!< [K]
  double pressure = constants::standard_atmosphere;   //!< [Pa]
  //! 0 °C, 101.325 kPa: the state of "Nm³" (its molar volume is constants::normal_molar_volume)
  static ReferenceState normal() { return {constants::zero_celsius, constants::standard_atmosphere}; }
  static ReferenceState standard() { return {288.15, 101325.0}; }  //!< 15 °C, 101.325 kPa
};
//! Validates a reference state; throws InputError naming the field.
void validate(const ReferenceState& s);

//! Ideal-gas molar volume V_m = R·T/p [m³/mol] (CODATA R).
double molar_volume(const ReferenceState& s);

//! Whether an analysis figure refers to the gas with or without its water vapour.
enum class Basis { dry, wet };

//! Units a contaminant figure is quoted in.
enum class ConcentrationUnit {
  ppmv,               //!< mole fraction × 1e6, on the stated basis
  mg_per_m3,          //!< mg per m³ of gas at the reference state, on the stated basis
  mg_per_MJ,          //!< mg per MJ of fuel lower heating value (basis-free)
  mg_per_m3_methane,  //!< mg per m³ of methane in the gas, at the reference state (basis-free)
  mol_per_h,          //!< mol per hour carried by the gas flow (basis-free)
};
std::string_view name(ConcentrationUnit u);

//! A contaminant figure as a lab or specification states it.
struct Concentration {
  double value = 0;                                  //!< in `unit`
  ConcentrationUnit unit = ConcentrationUnit::ppmv;  //!< unit of `value`
  Basis basis = Basis::dry;                          //!< basis, where the unit has one
};

//! What a conversion needs to know of the gas that carries the contaminant.
struct GasContext {
  ReferenceState reference = ReferenceState::normal();  //!< state volumes are quoted at
  double water_fraction = 0;     //!< water vapour mole fraction of the wet gas [mol/mol]
  double methane_fraction = 0;   //!< methane mole fraction of the wet gas [mol/mol]
  double lhv_molar = 0;          //!< lower heating value of the wet gas [J/mol]
  double molar_flow = 0;         //!< wet gas flow [mol/h]
};

//! Converts a figure to the mole fraction in the wet gas [mol/mol]. molar_mass [kg/mol] is that
//! of the species the figure is stated as (e.g. S for "mg S/Nm³", Cl for "as Cl").
double to_wet_mole_fraction(const Concentration& c, double molar_mass, const GasContext& gas);
//! Converts a wet-gas mole fraction [mol/mol] to a figure in `unit` on `basis`.
double from_wet_mole_fraction(double x_wet, ConcentrationUnit unit, Basis basis, double molar_mass,
                              const GasContext& gas);
//! Converts between any two units and bases.
double convert(const Concentration& c, ConcentrationUnit to, Basis to_basis, double molar_mass,
               const GasContext& gas);

}  // namespace acidload
