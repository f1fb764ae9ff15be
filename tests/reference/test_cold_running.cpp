// Cold running: the colder liner during warm-up and the crankcase wetness step, against an
// independent quadrature (Boost.Math Gauss–Kronrod 61, adaptive) of the same integral, and the
// logistic step's width from its definition.
#include "../support/reference_check.hpp"
#include "../support/sanity_case.hpp"

#include <boost/math/quadrature/gauss_kronrod.hpp>
#include <cmath>

#include "acidload/core/transfer.hpp"

using namespace acidload;

namespace {
// softplus liner factor written again here, not taken from the library: (ΔT_s/10 K)·ln(1 + e^{Δ/ΔT_s})
double g_ref(double subcooling, double scale) { return scale / 10.0 * std::log1p(std::exp(subcooling / scale)); }
}  // namespace

TEST_CASE("warm-up liner uptake per start: Gauss-Legendre against adaptive Gauss-Kronrod") {
  double worst = 0;
  // (dew point, jacket at start, running, warm-up, rise, exponent, load, start-load share, load ramp, scale)
  const double cases[][10] = {{410, 323.15, 363.15, 0.5, 40, 1, 1.0, 0.3, 0.1, 5},
                              {400, 293.15, 371.15, 0.75, 40, 1, 0.8, 0.2, 0.2, 5},
                              {395, 333.15, 368.15, 0.3, 30, 1.5, 1.0, 0.5, 0.5, 2},
                              {380, 283.15, 358.15, 1.0, 45, 1, 0.6, 0.0, 0.05, 8},
                              // a small ΔT_s against the wall's rise, drawn at random within the keys' ranges among
                              // cases with E above 1e-4 h: a fixed 16 panels were off by 1.7e-4, 7.1e-5, 4.2e-5, 1.7e-5
                              {375.0, 251.0, 315.4, 0, 171.7, 1.362, 0.8424, 0.3105, 23.84, 0.2161},
                              {468.7, 400.5, 420.8, 23.53, 78.2, 0.2032, 0.6232, 0.3221, 22.29, 0.03899},
                              {342.2, 257.1, 390.4, 1.546, 21.04, 1.243, 0.1902, 0.04165, 23.73, 0.07937},
                              {382.6, 308.7, 368.9, 0, 52.6, 1.829, 0.9978, 0.1459, 1.753, 0.01473}};
  for (const auto& c : cases) {
    const double dew = c[0], js = c[1], jr = c[2], tw = c[3], rise = c[4], e = c[5], load = c[6], sg = c[7], tr = c[8],
                 sc = c[9];
    const double wall_run = jr + rise * std::pow(load, e);
    const auto integrand = [&](double t) {
      const double share = tr > 0 && t < tr ? sg + (1 - sg) * t / tr : 1.0;
      const double jacket = tw > 0 && t < tw ? js + (jr - js) * t / tw : jr;
      const double wall = jacket + rise * std::pow(load * share, e);
      return share * g_ref(dew - wall, sc) - g_ref(dew - wall_run, sc);
    };
    // adaptive, on each side of the kink where the earlier ramp ends, to 1e-13
    using gk = boost::math::quadrature::gauss_kronrod<double, 61>;
    const double kink = std::fmin(tw, tr), end = std::fmax(tw, tr);
    const double ref = gk::integrate(integrand, 0.0, kink, 10, 1e-13) + (end > kink ? gk::integrate(integrand, kink, end, 10, 1e-13) : 0.0);
    const double lib = warmup_liner_extra(dew, js, jr, tw, rise, e, load, sg, tr, sc);
    INFO("acidload " << lib << " h, Gauss-Kronrod " << ref << " h");
    CHECK(std::fabs(lib - ref) <= 1e-9 * std::fabs(ref));
    worst = std::fmax(worst, std::fabs(lib - ref) / std::fabs(ref));
  }
  REFERENCE_CHECK("warm-up liner uptake per start (worst relative deviation of eight cases)", worst, 0.0, absolute, 1e-9,
                  "rel", "Boost.Math adaptive Gauss-Kronrod 61 of the same integrand, tol 1e-13");
}

TEST_CASE("liner wall during warm-up: from jacket water and load at both ends") {
  // derived from the definition: T_w(0) = T_j,start + ΔT·(σ l)^e; after both ramps T_j,run + ΔT·l^e
  CHECK(warmup_liner_wall(0, 323.15, 363.15, 0.5, 40, 1, 1.0, 0.3, 0.1) == doctest::Approx(323.15 + 12).epsilon(1e-14));
  CHECK(warmup_liner_wall(0.6, 323.15, 363.15, 0.5, 40, 1, 1.0, 0.3, 0.1) == doctest::Approx(403.15).epsilon(1e-14));
  CHECK(warmup_liner_wall(0.25, 323.15, 363.15, 0.5, 40, 1, 1.0, 0.3, 0.1) == doctest::Approx(343.15 + 40).epsilon(1e-14));
  // no warm-up at all: nothing extra; jacket already at its running value and full load from the start: nothing extra
  CHECK(warmup_liner_extra(410, 323.15, 363.15, 0, 40, 1, 1, 0.3, 0, 5) == 0);
  CHECK(std::fabs(warmup_liner_extra(410, 363.15, 363.15, 0.5, 40, 1, 1, 1.0, 0.1, 5)) < 1e-15);
}

TEST_CASE("crankcase wetness: a logistic step whose 10-90 % width is the stated spread") {
  // derived from the definition: w_s = 0.9 at T_cold = T_dp − W/2 and 0.1 at T_dp + W/2, 0.5 at T_dp
  const double dew = 320, width = 15;
  REFERENCE_CHECK("wetness at T_dp − W/2", crankcase_wetness(dew, dew - width / 2, width, 0, 0.5), 0.9, absolute, 1e-12, "-",
                  "derived: logistic 10-90 % width");
  REFERENCE_CHECK("wetness at T_dp + W/2", crankcase_wetness(dew, dew + width / 2, width, 0, 0.5), 0.1, absolute, 1e-12, "-",
                  "derived: logistic 10-90 % width");
  CHECK(crankcase_wetness(dew, dew, width, 0, 0.5) == doctest::Approx(0.5).epsilon(1e-14));
  // one start an hour with half an hour of warm-up keeps the crankcase wet at least half the time
  CHECK(crankcase_wetness(dew, dew + 60, width, 1, 0.5) >= 0.5);
}

TEST_CASE("starts add liner acid: one start every 4 h on the sanity case") {
  const FuelGas g = acidload_test::sanity_gas();
  Operation op = acidload_test::sanity_operation(g);
  const TransferParameters p;
  const Transfer none = transfer(g, op, p);
  op.starts_per_hour = 0.25;
  const Transfer some = transfer(g, op, p);
  CHECK(none.inflow.sulfuric_warmup == 0);
  CHECK(some.inflow.sulfuric_warmup > 0);
  CHECK(some.inflow.sulfuric_liner == doctest::Approx(none.inflow.sulfuric_liner + some.inflow.sulfuric_warmup).epsilon(1e-12));
  CHECK(some.liner_temperature_at_start < some.liner_temperature);
  MESSAGE("liner acid, one start every 4 h: +" << 100 * some.inflow.sulfuric_warmup / none.inflow.sulfuric_liner
          << " %; wall at start " << some.liner_temperature_at_start - 273.15 << " degC, running "
          << some.liner_temperature - 273.15 << " degC, in-cylinder dew point " << some.cylinder_acid_dew_point - 273.15);
}
