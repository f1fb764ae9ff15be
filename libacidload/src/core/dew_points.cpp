#include "acidload/core/dew_points.hpp"

#include <cmath>
#include <string>

#include "acidload/core/constants.hpp"
#include "acidload/core/error.hpp"

namespace acidload::dew_point {

namespace {
constexpr double atm = constants::standard_atmosphere;  // [Pa]
constexpr double mmhg = constants::mmhg;                // [Pa]

void check_inputs(double p_h2o, const char* acid_field, double p_acid) {
  check::positive("p_h2o", p_h2o);
  check::positive(acid_field, p_acid);
}

// A correlation evaluated far outside its data can give no temperature (1/T <= 0, T <= 0 K).
double checked_result(double t, const char* correlation, double p_h2o, double p_acid) {
  if (!(std::isfinite(t) && t > 0))
    throw InputError(std::string("partial pressures (") + correlation + ")",
                     "p_h2o " + format_value(p_h2o) + " Pa, acid " + format_value(p_acid) + " Pa",
                     "partial pressures for which the correlation gives a temperature above 0 K");
  return t;
}

bool inside(const FittedRange& r, double p_h2o, double p_acid) {
  return p_h2o >= r.p_h2o_min && p_h2o <= r.p_h2o_max && p_acid >= r.p_acid_min && p_acid <= r.p_acid_max;
}
}  // namespace

double sulfuric_verhoff_banchero(double p_h2o, double p_so3) {
  check_inputs(p_h2o, "p_so3", p_so3);
  const double a = std::log(p_h2o / mmhg);  // correlation in mmHg
  const double b = std::log(p_so3 / mmhg);
  const double inv_t = 2.276e-3 - 2.943e-5 * a - 8.58e-5 * b + 6.2e-6 * a * b;  // [1/K]
  return checked_result(1.0 / inv_t, "Verhoff-Banchero", p_h2o, p_so3);
}

double sulfuric_okkes(double p_h2o, double p_so3) {
  check_inputs(p_h2o, "p_so3", p_so3);
  const double a = std::log10(p_h2o / atm);  // correlation in atm
  const double b = std::log10(p_so3 / atm);
  if (!(b + 8 > 0))
    throw InputError("p_so3", format_value(p_so3) + " Pa",
                     "above 1e-8 atm (1.01325e-3 Pa) for the Okkes correlation, whose "
                     "(log10 pSO3 + 8)^2.19 term is undefined below");
  const double t_c = 203.25 + 27.6 * a + 10.83 * b + 1.06 * std::pow(b + 8, 2.19);  // [°C]
  return checked_result(t_c + constants::zero_celsius, "Okkes", p_h2o, p_so3);
}

double sulfuric_zarenezhad(double p_h2o, double p_so3) {
  check_inputs(p_h2o, "p_so3", p_so3);
  const double w = std::log(p_h2o / mmhg);  // correlation in mmHg
  const double s = std::log(p_so3 / mmhg);
  const double t_c = 150 + 11.664 * s + 8.1328 * w - 0.383226 * s * w;  // [°C]
  return checked_result(t_c + constants::zero_celsius, "ZareNezhad", p_h2o, p_so3);
}

double hydrochloric_kiang(double p_h2o, double p_hcl) {
  check_inputs(p_h2o, "p_hcl", p_hcl);
  const double a = std::log(p_h2o / mmhg);  // correlation in mmHg
  const double c = std::log(p_hcl / mmhg);
  const double k_over_t = 3.7368 - 0.1591 * a - 0.0326 * c + 0.00269 * a * c;  // 1000/T [1/K]
  return checked_result(1000.0 / k_over_t, "Kiang", p_h2o, p_hcl);
}

// Ranges from memory (see the header); written in atm as they are usually quoted.
FittedRange fitted_range_verhoff_banchero() { return {0.01 * atm, 0.30 * atm, 1e-7 * atm, 1e-4 * atm}; }
FittedRange fitted_range_okkes() { return {0.05 * atm, 0.15 * atm, 1e-6 * atm, 1e-4 * atm}; }
FittedRange fitted_range_zarenezhad() { return {0.01 * atm, 0.30 * atm, 1e-7 * atm, 1e-4 * atm}; }
FittedRange fitted_range_kiang() { return {0.01 * atm, 0.30 * atm, 1e-6 * atm, 1e-2 * atm}; }

bool in_fitted_range_verhoff_banchero(double p_h2o, double p_so3) {
  return inside(fitted_range_verhoff_banchero(), p_h2o, p_so3);
}
bool in_fitted_range_okkes(double p_h2o, double p_so3) { return inside(fitted_range_okkes(), p_h2o, p_so3); }
bool in_fitted_range_zarenezhad(double p_h2o, double p_so3) {
  return inside(fitted_range_zarenezhad(), p_h2o, p_so3);
}
bool in_fitted_range_kiang(double p_h2o, double p_hcl) { return inside(fitted_range_kiang(), p_h2o, p_hcl); }

}  // namespace acidload::dew_point
