#include "acidload/core/gas.hpp"

#include "acidload/core/constants.hpp"
#include "acidload/core/error.hpp"

namespace acidload {

void validate(const ReferenceState& s) {
  check::temperature("reference.temperature", s.temperature);
  check::positive("reference.pressure", s.pressure);
}

double molar_volume(const ReferenceState& s) {
  validate(s);
  return constants::molar_gas_constant * s.temperature / s.pressure;  // V_m = R T / p
}

std::string_view name(ConcentrationUnit u) {
  switch (u) {
    case ConcentrationUnit::ppmv: return "ppmv";
    case ConcentrationUnit::mg_per_m3: return "mg/m3";
    case ConcentrationUnit::mg_per_MJ: return "mg/MJ";
    case ConcentrationUnit::mg_per_m3_methane: return "mg/m3 CH4";
    case ConcentrationUnit::mol_per_h: return "mol/h";
  }
  return "?";
}

namespace {
// Factor f such that (figure on `basis`) = f · (figure on the wet basis): a dry-basis mole fraction
// is the wet one divided by (1 − x_H2O).
double basis_factor(Basis basis, const GasContext& gas) {
  if (basis == Basis::wet) return 1.0;
  check::in_range("gas.water-fraction", gas.water_fraction, 0.0, 0.999999, "mol/mol");
  return 1.0 / (1.0 - gas.water_fraction);
}
// (figure) = per_unit · x_wet for each unit.
double per_unit(ConcentrationUnit unit, Basis basis, double molar_mass, const GasContext& gas) {
  check::positive("molar-mass", molar_mass);
  switch (unit) {
    case ConcentrationUnit::ppmv: return 1e6 * basis_factor(basis, gas);
    case ConcentrationUnit::mg_per_m3:  // mg/m³ = x · M / V_m, M in mg/mol
      return basis_factor(basis, gas) * molar_mass * 1e6 / molar_volume(gas.reference);
    case ConcentrationUnit::mg_per_MJ:  // mg per MJ of LHV = x · M / LHV_molar
      check::positive("gas.lhv-molar", gas.lhv_molar);
      return molar_mass * 1e6 / (gas.lhv_molar * 1e-6);
    case ConcentrationUnit::mg_per_m3_methane:  // per m³ of CH4 = (mg/m³ of gas, wet) / x_CH4
      check::in_range("gas.methane-fraction", gas.methane_fraction, 1e-12, 1.0, "mol/mol");
      return molar_mass * 1e6 / molar_volume(gas.reference) / gas.methane_fraction;
    case ConcentrationUnit::mol_per_h:
      check::positive("gas.molar-flow", gas.molar_flow);
      return gas.molar_flow;
  }
  return 0;
}
}  // namespace

double to_wet_mole_fraction(const Concentration& c, double molar_mass, const GasContext& gas) {
  check::non_negative("concentration", c.value);
  return c.value / per_unit(c.unit, c.basis, molar_mass, gas);
}

double from_wet_mole_fraction(double x_wet, ConcentrationUnit unit, Basis basis, double molar_mass,
                              const GasContext& gas) {
  check::fraction("mole-fraction", x_wet);
  return x_wet * per_unit(unit, basis, molar_mass, gas);
}

double convert(const Concentration& c, ConcentrationUnit to, Basis to_basis, double molar_mass,
               const GasContext& gas) {
  return from_wet_mole_fraction(to_wet_mole_fraction(c, molar_mass, gas), to, to_basis, molar_mass, gas);
}

}  // namespace acidload
