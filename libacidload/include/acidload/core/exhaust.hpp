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

//! The SO3 share SO3/(SO2 + SO3) that equilibrium would allow in this exhaust at temperature T [K]
//! and pressure p [Pa]: an upper bound for ε, never the model (the real share is kinetically limited).
double so3_share_equilibrium_bound(const Combustion& c, double temperature, double pressure);

}  // namespace acidload
