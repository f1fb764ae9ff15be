// Element balance and directions of the combustion and transfer model.
#include <doctest/doctest.h>

#include <cmath>

#include "../support/sanity_case.hpp"
#include "acidload/core/combustion.hpp"
#include "acidload/core/error.hpp"
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
