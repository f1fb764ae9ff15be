#pragma once
// The sanity case of docs/model.md §5.5: a 1 MW electrical engine at 40 % efficiency on a
// 50 % methane / 50 % CO2 gas with 300 ppmv H2S, λ 1.8, 600 L of TBN-6 oil, makeup 0.2 g/kWh.
// Invented operating data for tests; nothing here is a measurement.
#include "acidload/core/fuel.hpp"
#include "acidload/core/transfer.hpp"
#include "acidload/studies/timeline.hpp"

namespace acidload_test {

inline acidload::FuelGas sanity_gas(double h2s_ppmv = 300) {
  using namespace acidload;
  FuelAnalysis a;
  a.main[static_cast<std::size_t>(Gas::CH4)] = 0.5;
  a.main[static_cast<std::size_t>(Gas::CO2)] = 0.5;
  a.h2s = {h2s_ppmv, ConcentrationUnit::ppmv, Basis::dry};
  return resolve(a);
}

inline acidload::Operation sanity_operation(const acidload::FuelGas& gas) {
  using namespace acidload;
  Operation op;
  op.electrical_power = 1e6;
  op.fuel_flow = fuel_flow_from_power(1e6, 0.40, lower_heating_value(gas));
  op.nox = {500, NoxEmission::Unit::mg_per_m3_dry_at_o2_ref, 0.05};
  return op;
}

inline acidload::Segment sanity_segment(double hours, double h2s_ppmv = 300) {
  using namespace acidload;
  Segment s;
  s.hours = hours;
  s.fuel = sanity_gas(h2s_ppmv);
  s.operation = sanity_operation(s.fuel);
  s.oil_temperature = 273.15 + 88;
  s.oil_consumption = 0.2e-3 * 1000;  // 0.2 g/kWh at 1000 kW [kg/h]
  return s;
}

inline acidload::OilCharge sanity_charge() {
  acidload::OilCharge c;
  c.oil.fresh_tbn = 6.0;
  c.mass = 0.600 * c.oil.density_15;  // 600 L at 15 °C
  return c;
}

}  // namespace acidload_test
