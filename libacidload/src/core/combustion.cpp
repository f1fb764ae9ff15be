#include "acidload/core/combustion.hpp"

#include <cmath>

#include "acidload/core/constants.hpp"
#include "acidload/core/error.hpp"
#include "acidload/core/gas.hpp"

namespace acidload {

namespace {
constexpr std::size_t i(Gas g) { return static_cast<std::size_t>(g); }
constexpr std::size_t e(Element x) { return static_cast<std::size_t>(x); }
}  // namespace

ElementTotals element_totals(const std::array<double, gas_count>& moles, double s, double cl, double f) {
  ElementTotals t{};
  for (Gas g : all_gases)
    for (std::size_t k = 0; k < element_count; ++k) t[k] += moles[i(g)] * formula(g).atoms[k];
  t[e(Element::S)] += s;
  t[e(Element::Cl)] += cl;
  t[e(Element::F)] += f;
  return t;
}

double Combustion::products_total() const {
  double n = 0;
  for (double v : products) n += v;
  return n;
}
double Combustion::dry_products_total() const { return products_total() - products[i(Gas::H2O)]; }
double Combustion::dry_o2_fraction() const { return products[i(Gas::O2)] / dry_products_total(); }

double stoichiometric_o2(const FuelGas& f) {
  return 2 * f[Gas::CH4] + 1.5 * f[Gas::H2S] + 0.5 * f[Gas::H2] + 3.5 * f[Gas::C2H6] + 5 * f[Gas::C3H8] +
         f.other_sulfur - 0.25 * (f.chlorine + f.fluorine) - f[Gas::O2];
}

Combustion burn(const FuelGas& f, const Air& air, double so3_share) {
  check::finite("engine.excess-air-ratio", air.excess_air_ratio);
  if (air.excess_air_ratio < 1)
    throw NotModelledError("excess-air ratio " + format_value(air.excess_air_ratio) +
                           " < 1: rich combustion is not modelled (lean burn, lambda >= 1)");
  check::in_range("engine.excess-air-ratio", air.excess_air_ratio, 1.0, 10.0, "(lambda)");
  check::in_range("air.water-fraction", air.water_fraction, 0.0, 0.2, "mol/mol");
  check::fraction("model.so3-share", so3_share);
  Combustion c;
  c.o2_demand = stoichiometric_o2(f);
  if (!(c.o2_demand > 0))
    throw InputError("fuel.composition", "O2 demand " + format_value(c.o2_demand),
                     "a fuel that needs oxygen to burn (it holds more O2 than it can use)");
  const double dry_air = air.excess_air_ratio * c.o2_demand / constants::air_o2;  // air = λ·demand/0.20946
  c.air = dry_air / (1 - air.water_fraction);
  c.air_moles[i(Gas::N2)] = dry_air * constants::air_n2;
  c.air_moles[i(Gas::O2)] = dry_air * constants::air_o2;
  c.air_moles[i(Gas::Ar)] = dry_air * constants::air_ar;
  c.air_moles[i(Gas::CO2)] = dry_air * constants::air_co2;
  c.air_moles[i(Gas::H2O)] = c.air - dry_air;

  const double sulfur = f.sulfur();
  auto& p = c.products;
  p[i(Gas::CO2)] = f[Gas::CH4] + f[Gas::CO2] + 2 * f[Gas::C2H6] + 3 * f[Gas::C3H8] + c.air_moles[i(Gas::CO2)];
  const double hydrogen = 4 * f[Gas::CH4] + 2 * f[Gas::H2S] + 2 * f[Gas::H2] + 6 * f[Gas::C2H6] +
                          8 * f[Gas::C3H8] + 2 * f[Gas::H2O] + 2 * c.air_moles[i(Gas::H2O)];
  p[i(Gas::HCl)] = f.chlorine;
  p[i(Gas::HF)] = f.fluorine;
  p[i(Gas::H2O)] = (hydrogen - f.chlorine - f.fluorine) / 2;
  p[i(Gas::SO2)] = sulfur * (1 - so3_share);
  p[i(Gas::SO3)] = sulfur * so3_share;
  // O2 left: supplied − used; SO3 takes ½ O2 more per S than SO2.
  p[i(Gas::O2)] = f[Gas::O2] + c.air_moles[i(Gas::O2)] - (c.o2_demand + f[Gas::O2]) - 0.5 * sulfur * so3_share;
  p[i(Gas::N2)] = f[Gas::N2] + c.air_moles[i(Gas::N2)];
  p[i(Gas::Ar)] = f[Gas::Ar] + c.air_moles[i(Gas::Ar)];
  return c;
}

void add_nox(Combustion& c, double n) {
  check::non_negative("nox", n);
  if (n > c.products[i(Gas::O2)] || n > 2 * c.products[i(Gas::N2)])
    throw InputError("engine.nox", format_value(n) + " mol NO2/mol fuel", "less NO2 than the excess O2 can form");
  c.products[i(Gas::N2)] -= 0.5 * n;  // N2 + 2 O2 → 2 NO2
  c.products[i(Gas::O2)] -= n;
  c.products[i(Gas::NO2)] += n;
}

double nox_at_actual_o2(double at_ref, double o2_actual, double o2_ref, double o2_air) {
  check::in_range("nox.o2-reference", o2_ref, 0.0, 0.2, "mol/mol");
  check::in_range("emissions.o2-of-air", o2_air, 0.2, 0.22, "mol/mol (21 % or 20.9 %)");
  return at_ref * (o2_air - o2_actual) / (o2_air - o2_ref);  // emission-limit O2 correction
}

double nox_per_mol_fuel(const Combustion& base, const NoxEmission& nox, double fuel_flow, double power) {
  check::non_negative("engine.nox", nox.value);
  if (nox.value == 0) return 0;
  check::positive("engine.fuel-flow", fuel_flow);
  const double M = molar_mass(Gas::NO2);
  if (nox.unit == NoxEmission::Unit::g_per_kWh) {
    check::positive("engine.electrical-power", power);
    return nox.value * 1e-3 * (power * 1e-3) / M / fuel_flow;  // kg/h / (kg/mol) / (mol fuel/h)
  }
  // mg/Nm³ dry at O2_ref → at the actual O2 → mol per mol fuel. The NO2 formed takes O2 and changes
  // the dry volume; with D0, O0 the dry and O2 moles before it and A = O2 of air [%],
  // n = K(A D0 − 100 O0 + (100 − A/2) n), K = c_ref·1e-6·V_m / (M (A − 100 O2_ref)): linear in n, solved exactly.
  check::in_range("nox.o2-reference", nox.o2_reference, 0.0, 0.2, "mol/mol");
  check::in_range("emissions.o2-of-air", nox.o2_air, 0.2, 0.22, "mol/mol (21 % or 20.9 %)");
  const double vm = molar_volume(ReferenceState::normal());
  const double A = 100 * nox.o2_air;
  const double K = nox.value * 1e-6 * vm / (M * (A - 100 * nox.o2_reference));
  const double D0 = base.dry_products_total(), O0 = base.products[static_cast<std::size_t>(Gas::O2)];
  return K * (A * D0 - 100 * O0) / (1 - (100 - 0.5 * A) * K);
}

}  // namespace acidload
