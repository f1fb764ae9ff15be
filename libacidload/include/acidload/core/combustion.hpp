#pragma once
// Lean combustion of the fuel gas by element balance (λ ≥ 1), per mole of wet fuel.
#include <array>

#include "acidload/core/fuel.hpp"
#include "acidload/core/species.hpp"

namespace acidload {

//! Element totals of a gas mixture plus trace atoms [mol], indexed by Element.
using ElementTotals = std::array<double, element_count>;
//! Atoms in a set of species amounts [mol] (indexed by Gas), plus trace S, Cl, F atoms [mol].
ElementTotals element_totals(const std::array<double, gas_count>& moles, double trace_s = 0,
                             double trace_cl = 0, double trace_f = 0);

//! The combustion air.
struct Air {
  double excess_air_ratio = 1.8;  //!< λ, air over stoichiometric air [-]; lean burn 1.6–2.0 (common practice)
  double water_fraction = 0;      //!< water vapour in the humid air [mol/mol]; 0 = dry air
};

//! Result of burning one mole of wet fuel.
struct Combustion {
  double o2_demand = 0;  //!< stoichiometric O2, all S to SO2 [mol O2/mol fuel]
  double air = 0;        //!< humid air supplied [mol/mol fuel]
  std::array<double, gas_count> air_moles{};  //!< that air by species [mol/mol fuel]
  std::array<double, gas_count> products{};   //!< wet exhaust by species [mol/mol fuel]
  double charge() const { return 1.0 + air; }  //!< fuel + air [mol/mol fuel]
  double products_total() const;               //!< wet exhaust [mol/mol fuel]
  double dry_products_total() const;           //!< dry exhaust [mol/mol fuel]
  double dry_o2_fraction() const;              //!< O2 in the dry exhaust [mol/mol]
  double wet_fraction(Gas g) const { return products[static_cast<std::size_t>(g)] / products_total(); }
};

//! O2 demand for complete combustion, S to SO2 (docs/model.md §4.1):
//! 2·CH4 + 1.5·H2S + 0.5·H2 + 3.5·C2H6 + 5·C3H8 + S_other − ¼(Cl + F) − O2 [mol/mol fuel].
double stoichiometric_o2(const FuelGas& fuel);
//! Burns one mole of fuel with air: all S to SO2, of which a share `so3_share` [0–1] goes on to
//! SO3; organic Cl → HCl, F → HF; H left to H2O; C to CO2. Throws NotModelledError for λ < 1.
Combustion burn(const FuelGas& fuel, const Air& air, double so3_share);
//! Adds NOx as NO2 formed from the air (N2 + 2 O2 → 2 NO2) [mol NO2/mol fuel].
void add_nox(Combustion& c, double no2_per_mol_fuel);

//! Engine-out NOx as the engine maker or permit states it.
struct NoxEmission {
  enum class Unit { mg_per_m3_dry_at_o2_ref, g_per_kWh };
  double value = 0;                            //!< in `unit` (as NO2)
  Unit unit = Unit::mg_per_m3_dry_at_o2_ref;   //!< mg/Nm³ dry (0 °C, 101.325 kPa) at o2_reference, or g/kWh
  double o2_reference = 0.05;                  //!< reference O2 of the mg/Nm³ figure, dry [mol/mol]
  double o2_air = 0.21;                        //!< O2 of air in the correction, 0.21 (EU permits, TA Luft) or 0.209 (US EPA)
};
//! Concentration at the actual O2 from one at a reference O2: c·(O2_air − O2)/(O2_air − O2_ref), O2 dry
//! [mol/mol] (the emission-limit convention; O2_air 21 % in EU permits, 20.9 % in US EPA methods).
double nox_at_actual_o2(double at_reference, double o2_actual, double o2_reference, double o2_air = 0.21);
//! NO2 formed per mole of fuel so that the exhaust meets `nox` [mol/mol fuel]; solved together with
//! the O2 it consumes. fuel_flow [mol/h] and electrical_power [W] are used for g/kWh figures.
double nox_per_mol_fuel(const Combustion& without_nox, const NoxEmission& nox, double fuel_flow,
                        double electrical_power);

}  // namespace acidload
