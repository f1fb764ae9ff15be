#include "acidload/core/exhaust.hpp"

#include <algorithm>

#include "acidload/core/dew_points.hpp"
#include "acidload/core/gas.hpp"
#include "acidload/core/species.hpp"
#include "acidload/core/error.hpp"
#include "acidload/core/so3_equilibrium.hpp"
#include "acidload/core/water.hpp"

namespace acidload {

ExhaustDewPoints exhaust_dew_points(const Combustion& c, double p, double margin) {
  check::positive("exhaust pressure", p);
  check::in_range("wall margin", margin, 0.0, 100.0, "K");
  ExhaustDewPoints d;
  const double pw = c.wet_fraction(Gas::H2O) * p;
  if (pw >= water::if97_p_min) d.water = water::saturation_temperature(pw);
  const double ps = c.wet_fraction(Gas::SO3) * p;
  if (ps > 0 && pw > 0) {
    d.sulfuric = dew_point::sulfuric_verhoff_banchero(pw, ps);
    // the two correlations reported beside it only from 1e-8 atm of SO3 up (below it ZareNezhad's
    // quadratic in ln p gives no temperature at all, under 0 K, and Okkes' is undefined): reported as none
    if (ps > 1e-8 * 101325) {
      d.sulfuric_zarenezhad = dew_point::sulfuric_zarenezhad(pw, ps);
      d.sulfuric_okkes = dew_point::sulfuric_okkes(pw, ps);
    }
    d.sulfuric_in_fitted_range = dew_point::in_fitted_range_verhoff_banchero(pw, ps);
  }
  const double ph = c.wet_fraction(Gas::HCl) * p;
  if (ph > 0 && pw > 0) d.hydrochloric = dew_point::hydrochloric_kiang(pw, ph);
  d.wall_margin = margin;
  d.minimum_wall_temperature = std::max({d.water, d.sulfuric, d.hydrochloric}) + margin;
  return d;
}

namespace {
constexpr std::size_t ix(Gas g) { return static_cast<std::size_t>(g); }
}  // namespace

Emissions emissions(const std::array<double, gas_count>& n, double o2_ref, double o2_air) {
  check::in_range("emissions.o2-reference", o2_ref, 0.0, 0.2, "mol/mol");
  check::in_range("emissions.o2-of-air", o2_air, 0.2, 0.22, "mol/mol (21 % or 20.9 %)");
  Emissions e;
  e.o2_reference = o2_ref;
  e.o2_air = o2_air;
  double wet = 0;
  for (double x : n) wet += x;
  if (!(wet > 0)) return e;
  const double dry = wet - n[ix(Gas::H2O)];
  const double vm = molar_volume(ReferenceState::normal());  // [m³/mol]
  e.flow_wet = wet * vm;
  e.flow_dry = dry * vm;
  e.water_wet = n[ix(Gas::H2O)] / wet;
  e.o2_dry = n[ix(Gas::O2)] / dry;
  const double corr = (o2_air - o2_ref) / (o2_air - e.o2_dry);  // dry at O2_ref = dry × (O2_air − O2_ref)/(O2_air − O2)
  const auto fig = [&](Gas g, bool has_dry) {
    EmissionFigure f;
    const double xw = n[ix(g)] / wet, xd = has_dry ? n[ix(g)] / dry : 0;
    const double M = molar_mass(g);  // [kg/mol]; mg/Nm³ = x·M/V_m·1e6
    f.ppmv_wet = xw * 1e6;
    f.mg_per_m3_wet = xw * M / vm * 1e6;
    f.ppmv_dry = xd * 1e6;
    f.mg_per_m3_dry = xd * M / vm * 1e6;
    if (has_dry && g != Gas::O2) f.ppmv_dry_at_ref = f.ppmv_dry * corr, f.mg_per_m3_dry_at_ref = f.mg_per_m3_dry * corr;
    return f;
  };
  e.so2 = fig(Gas::SO2, true);
  e.so3 = fig(Gas::SO3, true);
  e.hcl = fig(Gas::HCl, true);
  e.hf = fig(Gas::HF, true);
  e.nox = fig(Gas::NO2, true);
  e.h2o = fig(Gas::H2O, false);
  e.o2 = fig(Gas::O2, true);
  e.so2_mass_flow = n[ix(Gas::SO2)] * molar_mass(Gas::SO2);
  return e;
}

std::array<double, gas_count> after_oxidation_catalyst(const std::array<double, gas_count>& n, double eta) {
  check::fraction("emissions.catalyst-so3-conversion", eta);
  auto out = n;
  const double converted = eta * n[ix(Gas::SO2)];  // SO2 + ½ O2 → SO3
  out[ix(Gas::SO2)] -= converted;
  out[ix(Gas::SO3)] += converted;
  out[ix(Gas::O2)] -= 0.5 * converted;
  return out;
}

Combustion as_products(const std::array<double, gas_count>& n) {
  Combustion c;
  c.products = n;
  return c;
}

double so3_share_equilibrium_bound(const Combustion& c, double T, double p) {
  return so3::equilibrium_so3_share(T, c.wet_fraction(Gas::O2), p);
}

}  // namespace acidload
