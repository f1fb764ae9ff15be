// Element balance and directions of the combustion and transfer model.
#include <doctest/doctest.h>

#include <cmath>
#include <string>

#include "../support/sanity_case.hpp"
#include "acidload/core/combustion.hpp"
#include "acidload/core/error.hpp"
#include "acidload/core/oil_rates.hpp"
#include "acidload/core/transfer.hpp"

using namespace acidload;
using acidload_test::sanity_gas;
using acidload_test::sanity_operation;

namespace {
FuelGas dirty_gas() {
  FuelAnalysis a;
  a.main[static_cast<std::size_t>(Gas::CH4)] = 0.55;
  a.main[static_cast<std::size_t>(Gas::CO2)] = 0.38;
  a.main[static_cast<std::size_t>(Gas::N2)] = 0.05;
  a.main[static_cast<std::size_t>(Gas::O2)] = 0.01;
  a.main[static_cast<std::size_t>(Gas::H2)] = 0.01;
  a.water_fraction = 0.04;
  a.h2s = {800, ConcentrationUnit::ppmv, Basis::dry};
  a.other_sulfur = {20, ConcentrationUnit::mg_per_m3, Basis::dry};
  a.chlorine = {40, ConcentrationUnit::mg_per_m3, Basis::dry};
  a.fluorine = {8, ConcentrationUnit::mg_per_m3, Basis::dry};
  return resolve(a);
}
double share(const FuelGas& g, const Operation& op, const TransferParameters& p = {}) {
  const Transfer t = transfer(g, op, p);
  return (t.inflow.strong_koh() + t.inflow.sulfurous_fresh_koh());
}
}  // namespace

TEST_CASE("element balance: S, Cl, F, C, H, O, N in equal out to 1e-12") {
  const FuelGas g = dirty_gas();
  Operation op = sanity_operation(g);
  op.air.water_fraction = 0.015;
  op.coldest_crankcase_surface = 273.15 + 35;  // wet crankcase
  op.starts_per_hour = 0.02;
  const Transfer t = transfer(g, op, {});
  for (double r : {1.0, 0.4, 0.0}) {
    std::array<double, gas_count> in{};
    for (Gas s : all_gases)
      in[static_cast<std::size_t>(s)] = op.fuel_flow * (g[s] + t.combustion.air_moles[static_cast<std::size_t>(s)]);
    const ElementTotals e_in = element_totals(in, g.other_sulfur * op.fuel_flow, g.chlorine * op.fuel_flow, g.fluorine * op.fuel_flow);
    std::array<double, gas_count> out{};
    const auto up = t.oil_uptake(r), vent = t.blowby_vented(r);
    for (std::size_t i = 0; i < gas_count; ++i) out[i] = t.exhaust[i] + up[i] + vent[i];
    const ElementTotals e_out = element_totals(out, t.unburnt_sulfur, t.unburnt_chlorine, t.unburnt_fluorine);
    for (std::size_t k = 0; k < element_count; ++k) {
      INFO(symbol(static_cast<Element>(k)) << " at base ratio " << r);
      CHECK(std::fabs(e_out[k] - e_in[k]) <= 1e-12 * std::fmax(1.0, e_in[k]));
    }
  }
}

TEST_CASE("rich combustion is refused plainly") {
  const FuelGas g = sanity_gas();
  Operation op = sanity_operation(g);
  op.air.excess_air_ratio = 0.95;
  CHECK_THROWS_AS(transfer(g, op, {}), NotModelledError);
}

TEST_CASE("directions of the acid load") {
  const FuelGas g = sanity_gas();
  const Operation op = sanity_operation(g);
  const double base = share(g, op);
  SUBCASE("hotter jacket water, less liner uptake") {
    Operation hot = op;
    hot.jacket_water_out = op.jacket_water_out + 10;
    CHECK(transfer(g, hot, {}).inflow.sulfuric_liner < transfer(g, op, {}).inflow.sulfuric_liner);
    CHECK(share(g, hot) < base);
  }
  SUBCASE("more blow-by, more acid") {
    Operation more = op;
    more.blowby_share = 0.02;
    CHECK(share(g, more) > base);
  }
  SUBCASE("more H2S, more acid") {
    const FuelGas sour = sanity_gas(600);
    CHECK(share(sour, sanity_operation(sour)) > 2 * base * 0.99);
  }
  SUBCASE("larger SO3 share, more acid") {
    TransferParameters p;
    p.so3_share = 0.04;
    CHECK(share(g, op, p) > base);
  }
  SUBCASE("colder breather surface, more crankcase uptake") {
    Operation cold = op;
    cold.coldest_crankcase_surface = 273.15 + 30;
    CHECK(transfer(g, cold, {}).wetness > transfer(g, op, {}).wetness);
    CHECK(transfer(g, cold, {}).inflow.sulfurous_fresh > transfer(g, op, {}).inflow.sulfurous_fresh);
  }
  SUBCASE("more cold starts, more crankcase uptake") {
    Operation starts = op;
    starts.starts_per_hour = 0.1;
    CHECK(transfer(g, starts, {}).inflow.sulfurous_fresh > transfer(g, op, {}).inflow.sulfurous_fresh);
  }
  SUBCASE("less remaining base, less SO2 uptake") {
    const Transfer t = transfer(g, op, {});
    CHECK(t.oil_uptake(0.5)[static_cast<std::size_t>(Gas::SO2)] < t.oil_uptake(1.0)[static_cast<std::size_t>(Gas::SO2)]);
    CHECK(t.sulfur_share_to_oil(0.0) < t.sulfur_share_to_oil(1.0));
  }
}

TEST_CASE("jacket water 80 -> 95 degC changes the acid load materially") {
  const FuelGas g = sanity_gas();
  Operation op80 = sanity_operation(g), op95 = op80;
  op80.jacket_water_out = 273.15 + 80;
  op95.jacket_water_out = 273.15 + 95;
  const double a80 = share(g, op80), a95 = share(g, op95);
  const double change = (a95 - a80) / a80;
  MESSAGE("acid load (strong + SO2 at fresh oil), 80 -> 95 degC: " << change * 100 << " %");
  CHECK(change < -0.10);  // material: more than a tenth less acid
  CHECK(change > -0.50);  // but the crankcase path remains
}

TEST_CASE("liner uptake factor: softplus shape") {
  CHECK(liner_uptake_factor(-50, 5) < 1e-4);
  CHECK(liner_uptake_factor(50, 5) == doctest::Approx(5.0).epsilon(1e-4));
  CHECK(liner_uptake_factor(0, 5) == doctest::Approx(0.5 * std::log(2.0)));
  CHECK(std::isfinite(liner_uptake_factor(1e5, 5)));
}

TEST_CASE("transfer parameters outside their range are named") {
  TransferParameters p;
  p.capture_so2 = 1.5;
  CHECK_THROWS_AS(validate(p), InputError);
  Operation op;
  op.jacket_water_out = 500;
  CHECK_THROWS_AS(validate(op), InputError);
}

TEST_CASE("an operating state's fields are each checked: the inline common case lets no bad value through") {
  // every field at a bad value (NaN, infinite, negative, beyond its range) is refused, named
  const auto refused = [](auto set, const char* key) {
    Operation op = sanity_operation(sanity_gas());
    CHECK_NOTHROW(validate(op));
    set(op);
    try {
      validate(op);
      FAIL("accepted a bad " << key);
    } catch (const InputError& e) {
      CHECK(std::string(e.what()).find(key) != std::string::npos);
    }
  };
  const double nan = std::nan(""), inf = HUGE_VAL;
  refused([&](Operation& o) { o.fuel_flow = nan; }, "engine.fuel-flow");
  refused([&](Operation& o) { o.fuel_flow = inf; }, "engine.fuel-flow");
  refused([&](Operation& o) { o.electrical_power = -1; }, "engine.electrical-power");
  refused([&](Operation& o) { o.load = 1.3; }, "engine.load");
  refused([&](Operation& o) { o.blowby_share = 1.01; }, "engine.blow-by");
  refused([&](Operation& o) { o.blowby_flow = inf; }, "engine.blow-by-flow");
  refused([&](Operation& o) { o.jacket_water_out = 200; }, "engine.jacket-water-out");
  refused([&](Operation& o) { o.coldest_crankcase_surface = nan; }, "engine.coldest-crankcase-surface");
  refused([&](Operation& o) { o.crankcase_pressure = 1e4; }, "engine.crankcase-pressure");
  refused([&](Operation& o) { o.exhaust_pressure = 1e6; }, "engine.exhaust-pressure");
  refused([&](Operation& o) { o.starts_per_hour = 11; }, "engine.starts-per-hour");
  refused([&](Operation& o) { o.jacket_water_at_start = nan; }, "engine.jacket-water-at-start");
}

TEST_CASE("oil rates: oxidation and antioxidant use from one temperature factor") {
  // docs/model.md: k_ox = k_ref·2^((T − T_ref)/ΔT_2), k_A = 2^((T − T_ref)/ΔT_2)/τ_A at the ring zone
  // T = sump + offset. Hand check at sump 88 °C, offset 30 K, T_ref 393.15 K, ΔT_2 10 K, k_ref 0.008,
  // τ_A 1500 h: 2^(−0.2) = 0.8705505633 (by hand: e^(−0.2·ln 2))
  const OxidationLaw law;
  const OilRates r = oil_rates(Transfer{}, law, 273.15 + 88, 0.2, true);
  CHECK(r.oxidation == doctest::Approx(0.008 * 0.8705505633).epsilon(1e-9));
  CHECK(r.antioxidant_depletion == doctest::Approx(0.8705505633 / 1500).epsilon(1e-9));
  // and bit for bit the library's own functions of one rate each, for both laws
  for (const auto kind : {OxidationLaw::Kind::doubling, OxidationLaw::Kind::arrhenius}) {
    OxidationLaw l;
    l.kind = kind;
    const OilRates x = oil_rates(Transfer{}, l, 355.0, 0.2, true);
    CHECK(x.oxidation == oxidation_rate(l, 355.0 + l.ring_zone_offset));
    CHECK(x.antioxidant_depletion == antioxidant_depletion_rate(l, 355.0 + l.ring_zone_offset));
    CHECK(x.organic_acid == l.organic_acid_yield * x.oxidation);
  }
}
