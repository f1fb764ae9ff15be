#include "acidload/core/exhaust.hpp"

#include <algorithm>

#include "acidload/core/dew_points.hpp"
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
    d.sulfuric_zarenezhad = dew_point::sulfuric_zarenezhad(pw, ps);
    if (ps > 1e-8 * 101325) d.sulfuric_okkes = dew_point::sulfuric_okkes(pw, ps);
    d.sulfuric_in_fitted_range = dew_point::in_fitted_range_verhoff_banchero(pw, ps);
  }
  const double ph = c.wet_fraction(Gas::HCl) * p;
  if (ph > 0 && pw > 0) d.hydrochloric = dew_point::hydrochloric_kiang(pw, ph);
  d.wall_margin = margin;
  d.minimum_wall_temperature = std::max({d.water, d.sulfuric, d.hydrochloric}) + margin;
  return d;
}

double so3_share_equilibrium_bound(const Combustion& c, double T, double p) {
  return so3::equilibrium_so3_share(T, c.wet_fraction(Gas::O2), p);
}

}  // namespace acidload
