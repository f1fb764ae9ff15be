#include "acidload/studies/figure_table.hpp"

#include "acidload/core/halocarbons.hpp"
#include "acidload/core/species.hpp"

namespace acidload {

namespace {
FigureRow row(std::string what, double x, double m, const GasContext& g) {
  FigureRow r;
  r.what = std::move(what);
  r.molar_mass = m;
  r.ppmv_dry = from_wet_mole_fraction(x, ConcentrationUnit::ppmv, Basis::dry, m, g);
  r.ppmv_wet = from_wet_mole_fraction(x, ConcentrationUnit::ppmv, Basis::wet, m, g);
  r.mg_per_nm3_dry = from_wet_mole_fraction(x, ConcentrationUnit::mg_per_m3, Basis::dry, m, g);
  r.mg_per_nm3_wet = from_wet_mole_fraction(x, ConcentrationUnit::mg_per_m3, Basis::wet, m, g);
  r.mg_per_mj = from_wet_mole_fraction(x, ConcentrationUnit::mg_per_MJ, Basis::wet, m, g);
  r.mg_per_nm3_methane = from_wet_mole_fraction(x, ConcentrationUnit::mg_per_m3_methane, Basis::wet, m, g);
  r.mol_per_h = g.molar_flow > 0 ? from_wet_mole_fraction(x, ConcentrationUnit::mol_per_h, Basis::wet, m, g) : 0;
  return r;
}
}  // namespace

FigureTable figure_in_every_unit(const Segment& s, const Concentration& given, std::string_view species) {
  FigureTable t;
  t.gas = context(s.fuel, s.operation.fuel_flow);
  t.lhv_volumetric = lower_heating_value_volumetric(s.fuel);
  double M = 0;  // molar mass the figure is stated as [kg/mol]
  Formula compound;
  bool is_compound = false;
  if (species == "H2S") M = molar_mass(Gas::H2S);
  else if (species == "S") M = atomic_weight(Element::S) * 1e-3;
  else if (species == "Cl") M = atomic_weight(Element::Cl) * 1e-3;
  else if (species == "F") M = atomic_weight(Element::F) * 1e-3;
  else {
    compound = parse_formula(find_halocarbon(species).formula);
    M = molar_mass(compound);
    is_compound = true;
  }
  const double x = to_wet_mole_fraction(given, M, t.gas);  // wet mole fraction of the species
  t.rows.push_back(row(std::string(species), x, M, t.gas));
  if (is_compound) {
    if (compound[Element::Cl] > 0) t.rows.push_back(row("as Cl", x * compound[Element::Cl], atomic_weight(Element::Cl) * 1e-3, t.gas));
    if (compound[Element::F] > 0) t.rows.push_back(row("as F", x * compound[Element::F], atomic_weight(Element::F) * 1e-3, t.gas));
  }
  return t;
}

}  // namespace acidload
