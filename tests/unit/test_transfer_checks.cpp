// check_segment (a record's check of every row: the warm-up liner integral replaced by its upper bound
// where the bound already passes the liner check) against segment_rates (the figures): on random
// operating states and transfer parameters within the keys' ranges, the one refuses exactly where the
// other does, with the same message. The comparison is with the library's own full path: a check of
// equivalence, not of a value (the integral itself is checked against Boost.Math in
// tests/reference/test_cold_running.cpp).
#include <doctest/doctest.h>

#include <cmath>
#include <random>
#include <string>

#include "../support/sanity_case.hpp"
#include "acidload/core/error.hpp"
#include "acidload/studies/timeline.hpp"

using namespace acidload;

namespace {
// "" where it passes, else the refusal's message
template <class F>
std::string refusal(F f) {
  try {
    f();
    return "";
  } catch (const Error& e) {
    return e.what();
  }
}
}  // namespace

TEST_CASE("a record's check of a row refuses exactly where the row's rates do") {
  std::mt19937_64 rng(20261203);
  std::uniform_real_distribution<double> u(0, 1);
  const OilCharge charge = acidload_test::sanity_charge();
  int passed = 0, refused = 0, by_liner = 0;
  for (int i = 0; i < 4000; ++i) {
    const double h2s = 5000 * u(rng) * u(rng);
    Segment s = acidload_test::sanity_segment(1 + 23 * u(rng), h2s);
    const double load = 0.2 + 0.8 * u(rng);
    s.operation.load = load;
    s.operation.electrical_power = 1e6 * load;
    s.operation.fuel_flow *= load;
    s.operation.jacket_water_out = 313.15 + 80 * u(rng);
    s.operation.jacket_water_at_start = 273.15 + 100 * u(rng);
    s.starts = u(rng) < 0.1 ? 0 : s.hours * 2 * u(rng) * u(rng);
    ModelParameters m;
    TransferParameters& p = m.transfer;
    p.liner_uptake = 0.1 * u(rng) * u(rng);
    p.liner_subcooling_scale = 0.05 + 15 * u(rng);
    p.liner_wall_rise = 200 * u(rng);
    p.liner_wall_rise_load_exponent = 3 * u(rng);
    p.warmup_hours = u(rng) < 0.2 ? 0 : 24 * u(rng) * u(rng);
    p.load_ramp_hours = u(rng) < 0.2 ? 0 : 24 * u(rng) * u(rng);
    p.warmup_start_load = u(rng);
    const std::string full = refusal([&] { segment_rates(s, charge, m); });
    const std::string checked = refusal([&] { check_segment(s, charge, m); });
    INFO("state " << i << ": H2S " << h2s << " ppmv, load " << load << ", liner uptake " << p.liner_uptake);
    CHECK(checked == full);
    (full.empty() ? passed : refused) += 1;
    by_liner += full.find("liner uptake below half") != std::string::npos;
  }
  // both outcomes met often, and the liner check (the one the bound stands in for) among the refusals
  CHECK(passed > 1000);
  CHECK(refused > 200);
  CHECK(by_liner > 150);
}

TEST_CASE("a record's check of a row: at the liner check's limit, refused exactly where the rates are") {
  // the liner uptake is λ·K (running and warm-up shares alike linear in λ): K from a small λ, then λ
  // set to put the uptake within ±1e-3 … ±1e-9 of its limit of 0.5, where the bound's margin decides
  std::mt19937_64 rng(3);
  std::uniform_real_distribution<double> u(0, 1);
  const OilCharge charge = acidload_test::sanity_charge();
  int passed = 0, refused = 0;
  for (int i = 0; i < 600; ++i) {
    Segment s = acidload_test::sanity_segment(1 + 23 * u(rng), 200 + 3000 * u(rng));
    s.operation.jacket_water_out = 313.15 + 40 * u(rng);
    s.starts = s.hours * 2 * u(rng);
    ModelParameters m;
    m.transfer.liner_subcooling_scale = 0.5 + 10 * u(rng);
    m.transfer.liner_wall_rise = 10 + 60 * u(rng);
    m.transfer.warmup_hours = 0.1 + 3 * u(rng);
    m.transfer.liner_uptake = 1e-4;
    Transfer t;
    segment_rates(s, charge, m, &t);
    const double per_hour = t.inflow.sulfuric_warmup / t.sulfur_flow;  // λ·(per-hour warm-up share)
    const double K = (t.liner_share + per_hour) / m.transfer.liner_uptake;
    if (!(K > 0)) continue;
    const double delta = (u(rng) < 0.5 ? -1 : 1) * std::pow(10.0, -3 - 6 * u(rng));
    m.transfer.liner_uptake = 0.5 / K * (1 + delta);
    if (m.transfer.liner_uptake > 0.1) continue;  // beyond the key's range: refused by its range instead
    const std::string full = refusal([&] { segment_rates(s, charge, m); });
    const std::string checked = refusal([&] { check_segment(s, charge, m); });
    INFO("state " << i << ": uptake within " << delta << " of the limit");
    CHECK(checked == full);
    (full.empty() ? passed : refused) += 1;
  }
  CHECK(passed > 100);
  CHECK(refused > 100);
}

TEST_CASE("the warm-up integral's bound lies above the integral") {
  // the bound's argument (the wall never colder than at the start, the load share integrated exactly) on
  // random inputs within the keys' ranges; a bound the check trusts must never fall below the quadrature
  std::mt19937_64 rng(11);
  std::uniform_real_distribution<double> u(0, 1);
  double tightest = 0;
  for (int i = 0; i < 20000; ++i) {
    const double js = 233.15 + 190 * u(rng), jr = js + (423.15 - js) * u(rng);
    const double tw = u(rng) < 0.2 ? 0 : 24 * u(rng), tr = u(rng) < 0.2 ? 0 : 24 * u(rng);
    const double rise = 200 * u(rng), e = 3 * u(rng), load = 0.05 + 0.95 * u(rng), sg = u(rng);
    const double scale = std::pow(10.0, -1 + 2.5 * u(rng)), dew = 330 + 150 * u(rng);
    const double E = warmup_liner_extra(dew, js, jr, tw, rise, e, load, sg, tr, scale);
    const double bound = warmup_liner_extra_bound(dew, js, jr, tw, rise, e, load, sg, tr, scale);
    INFO("case " << i << ": E " << E << " h, bound " << bound << " h");
    CHECK(E <= bound * (1 + 1e-12) + 1e-300);
    if (bound > 0 && E > 0) tightest = std::fmax(tightest, E / bound);
  }
  MESSAGE("the integral reached " << tightest << " of its bound");
  CHECK(tightest > 0.5);  // so a bound set at half its value would be seen
  // a wall that does not move (jacket water running at the start, no rise): the integrand is the load
  // share times a constant, integrated exactly by the rule, and the bound is the integral (by hand:
  // ∫₀ᵀ (l(t)/l − 1)·g dt = −t_r(1 − σ)/2·g)
  for (int i = 0; i < 200; ++i) {
    const double j = 300 + 100 * u(rng), tw = 24 * u(rng), tr = 24 * u(rng), sg = u(rng), scale = 0.5 + 10 * u(rng);
    const double dew = j + 40 * (u(rng) - 0.3);
    const double E = warmup_liner_extra(dew, j, j, tw, 0, 1, 1, sg, tr, scale);
    const double bound = warmup_liner_extra_bound(dew, j, j, tw, 0, 1, 1, sg, tr, scale);
    const double by_hand = -tr * (1 - sg) / 2 * liner_uptake_factor(dew - j, scale);
    CHECK(E == doctest::Approx(by_hand).epsilon(1e-12));
    CHECK(bound == doctest::Approx(by_hand).epsilon(1e-12));
  }
}
