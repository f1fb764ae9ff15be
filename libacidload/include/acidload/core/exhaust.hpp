#pragma once
// Dew points of the exhaust for heat recovery, and the equilibrium bound on the SO3 share.
#include "acidload/core/combustion.hpp"

namespace acidload {

//! Dew points of a wet exhaust [K] (0 where the species is absent).
struct ExhaustDewPoints {
  double water = 0;                    //!< IAPWS-IF97 saturation at the water partial pressure
  double sulfuric = 0;                 //!< H2SO4, Verhoff & Banchero (1974): the one used
  double sulfuric_zarenezhad = 0;      //!< H2SO4, ZareNezhad (2009), reported beside it
  double sulfuric_okkes = 0;           //!< H2SO4, Okkes (1987), reported beside it
  double hydrochloric = 0;             //!< HCl, Kiang (1981)
  bool sulfuric_in_fitted_range = false;  //!< the Verhoff–Banchero inputs lie in its fitted range
  double wall_margin = 0;              //!< margin added to the highest dew point [K]
  //! Lowest tube-wall temperature to keep (at the cooling-water inlet, the coldest metal):
  //! the highest dew point plus the margin [K].
  double minimum_wall_temperature = 0;
};

//! Default wall margin over the highest acid dew point [K] (15 K; common practice, no source).
inline constexpr double default_wall_margin = 15.0;

//! Dew points of exhaust of wet mole fractions `c.wet_fraction(…)` at `pressure` [Pa].
ExhaustDewPoints exhaust_dew_points(const Combustion& c, double pressure, double wall_margin = default_wall_margin);

//! One species in the exhaust: mole fractions and mass concentrations, wet and dry, and dry at the O2 reference.
struct EmissionFigure {
  double ppmv_wet = 0, ppmv_dry = 0;        //!< [µmol/mol]
  double mg_per_m3_wet = 0, mg_per_m3_dry = 0;  //!< [mg/Nm³] at 0 °C, 101.325 kPa
  double ppmv_dry_at_ref = 0, mg_per_m3_dry_at_ref = 0;  //!< dry, corrected to the reference O2
};
//! The exhaust leaving the engine (after liner uptake), and after an optional oxidation catalyst.
struct Emissions {
  double o2_reference = 0.05;   //!< reference O2, dry [mol/mol]
  double o2_air = 0.21;         //!< O2 of air in the correction [mol/mol]
  double o2_dry = 0;            //!< actual O2, dry [mol/mol]
  double water_wet = 0;         //!< H2O, wet [mol/mol]
  EmissionFigure so2, so3, hcl, hf, nox, h2o, o2;  //!< NOx as NO2; H2O has no dry figure (0)
  double flow_wet = 0, flow_dry = 0;  //!< exhaust [Nm³/h]
  double so2_mass_flow = 0;     //!< SO2 leaving [kg/h]
};
//! Emission figures of an exhaust of `moles` [mol/h by species]; the O2 correction c·(O2_air − O2_ref)/(O2_air − O2).
Emissions emissions(const std::array<double, gas_count>& moles, double o2_reference, double o2_air);

//! An oxidation catalyst converts a share η of the SO2 to SO3 (SO2 + ½ O2 → SO3) [mol/h by species].
std::array<double, gas_count> after_oxidation_catalyst(const std::array<double, gas_count>& moles, double so2_to_so3);

//! Combustion products per mole of fuel scaled from a stream [mol/h] (for the dew points of a stream).
Combustion as_products(const std::array<double, gas_count>& moles);

//! The SO3 share SO3/(SO2 + SO3) that equilibrium would allow in this exhaust at temperature T [K]
//! and pressure p [Pa]: an upper bound for ε, never the model (the real share is kinetically limited).
double so3_share_equilibrium_bound(const Combustion& c, double temperature, double pressure);

}  // namespace acidload
