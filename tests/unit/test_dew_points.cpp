// Unit tests: acid dew points (directions, validation, fitted ranges) and the SO3 equilibrium.
#include <doctest/doctest.h>

#include <cmath>
#include <limits>
#include <string>

#include "acidload/core/constants.hpp"
#include "acidload/core/dew_points.hpp"
#include "acidload/core/error.hpp"
#include "acidload/core/so3_equilibrium.hpp"
#include "acidload/core/water.hpp"

using namespace acidload;

namespace {
constexpr double atm = constants::standard_atmosphere;
using Correlation = double (*)(double, double);
struct Named {
  const char* name;
  Correlation f;
};
const Named all[] = {{"Verhoff-Banchero", dew_point::sulfuric_verhoff_banchero},
                     {"Okkes", dew_point::sulfuric_okkes},
                     {"ZareNezhad", dew_point::sulfuric_zarenezhad},
                     {"Kiang", dew_point::hydrochloric_kiang}};
}  // namespace

TEST_CASE("more water or more acid gives a higher dew point") {
  for (const Named& c : all) {
    INFO(c.name);
    for (double h = 0.03; h <= 0.25; h += 0.01)
      for (double ppm : {1.0, 3.0, 10.0, 30.0, 100.0}) {
        const double pw = h * atm, pa = ppm * 1e-6 * atm;
        INFO("H2O " << h << ", acid " << ppm << " ppmv");
        CHECK(c.f(pw * 1.1, pa) > c.f(pw, pa));
        CHECK(c.f(pw, pa * 1.1) > c.f(pw, pa));
      }
  }
}

TEST_CASE("acid dew points lie above the water dew point and in a plausible band") {
  // 10 % H2O at 1 atm: water dew point 45.8 °C. SO3 at 10 ppmv, HCl at 100 ppmv (at 10 ppmv
  // Kiang's correlation gives 44.3 °C, below the water dew point: outside what it describes).
  const double t_water = water::dew_point(0.10, atm);
  for (const Named& c : all) {
    INFO(c.name);
    const double ppm = std::string(c.name) == "Kiang" ? 100.0 : 10.0;
    const double t = c.f(0.10 * atm, ppm * 1e-6 * atm);
    CHECK(t > t_water);
    CHECK(t < 450.0);
  }
}

TEST_CASE("invalid partial pressures throw InputError naming the field") {
  const double nan = std::numeric_limits<double>::quiet_NaN();
  const double inf = std::numeric_limits<double>::infinity();
  for (const Named& c : all) {
    INFO(c.name);
    const std::string acid = std::string(c.name) == "Kiang" ? "p_hcl" : "p_so3";
    for (double bad : {0.0, -1.0, nan, inf}) {
      INFO("bad value " << bad);
      CHECK_THROWS_AS(c.f(0.1 * atm, bad), InputError);
      CHECK_THROWS_AS(c.f(bad, 1.0), InputError);
    }
    try {
      c.f(0.1 * atm, 0.0);  // no acid: no acid dew point
      FAIL("no throw");
    } catch (const InputError& e) {
      CHECK(e.key() == acid);
    }
    try {
      c.f(0.0, 1.0);
      FAIL("no throw");
    } catch (const InputError& e) {
      CHECK(e.key() == "p_h2o");
    }
  }
}

TEST_CASE("Okkes needs pSO3 above 1e-8 atm") {
  CHECK_THROWS_AS(dew_point::sulfuric_okkes(0.1 * atm, 1e-9 * atm), InputError);
  CHECK(std::isfinite(dew_point::sulfuric_okkes(0.1 * atm, 1e-7 * atm)));
}

TEST_CASE("fitted ranges") {
  // Flue gas at 1 atm lies inside; a cylinder at 100 bar lies outside.
  CHECK(dew_point::in_fitted_range_verhoff_banchero(0.10 * atm, 10e-6 * atm));
  CHECK(dew_point::in_fitted_range_okkes(0.10 * atm, 10e-6 * atm));
  CHECK(dew_point::in_fitted_range_zarenezhad(0.10 * atm, 10e-6 * atm));
  CHECK(dew_point::in_fitted_range_kiang(0.10 * atm, 100e-6 * atm));
  CHECK_FALSE(dew_point::in_fitted_range_verhoff_banchero(0.10 * 100e5, 10e-6 * 100e5));
  CHECK_FALSE(dew_point::in_fitted_range_okkes(0.20 * atm, 10e-6 * atm));
  CHECK_FALSE(dew_point::in_fitted_range_zarenezhad(0.10 * atm, 1e-9 * atm));
  CHECK_FALSE(dew_point::in_fitted_range_kiang(0.10 * atm, 0.1 * atm));
  const auto r = dew_point::fitted_range_verhoff_banchero();
  CHECK(r.p_h2o_min < r.p_h2o_max);
  CHECK(r.p_acid_min < r.p_acid_max);
  CHECK(dew_point::in_fitted_range_verhoff_banchero(r.p_h2o_min, r.p_acid_max));
}

TEST_CASE("SO3 equilibrium: range, continuity and limits") {
  CHECK_THROWS_AS(so3::kp(so3::t_min - 1), InputError);
  CHECK_THROWS_AS(so3::kp(so3::t_max + 1), InputError);
  CHECK_THROWS_AS(so3::kp(std::numeric_limits<double>::quiet_NaN()), InputError);
  CHECK_THROWS_AS(so3::standard_entropy(so3::Species::SO3, 200.0), InputError);
  CHECK_THROWS_AS(so3::equilibrium_so3_share(1000, 1.5, atm), InputError);
  CHECK_THROWS_AS(so3::equilibrium_so3_share(1000, 0.1, 0.0), InputError);
  // The Shomate segments meet at 700, 1200 and 2000 K: Kp continuous to 1e-3 relative.
  for (double tb : {700.0, 1200.0, 2000.0}) {
    INFO("boundary " << tb);
    const double lo = so3::kp(tb - 1e-6), hi = so3::kp(tb + 1e-6);
    CHECK(std::fabs(hi - lo) / lo < 1e-3);
  }
  // No O2, no SO3; the share is a fraction; higher pressure drives it to SO3.
  CHECK(so3::equilibrium_so3_share(1000, 0.0, atm) == 0.0);
  for (double T = 300; T <= 3000; T += 100) {
    const double s = so3::equilibrium_so3_share(T, 0.1, atm);
    CHECK(s >= 0.0);
    CHECK(s <= 1.0);
    if (T >= 600) CHECK(so3::equilibrium_so3_share(T, 0.1, 100 * atm) > s);
  }
  // The share follows Kp: r = Kp·sqrt(x_O2·p/p°).
  const double r = so3::kp(1000) * std::sqrt(0.1 * 2e5 / so3::standard_pressure);
  CHECK(so3::equilibrium_so3_share(1000, 0.1, 2e5) == doctest::Approx(r / (1 + r)).epsilon(1e-12));
}
