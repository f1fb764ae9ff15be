#pragma once
// Organic halogen compounds common in landfill and digester gas, and their Cl and F content.
#include <string_view>
#include <vector>

#include "acidload/core/species.hpp"

namespace acidload {

//! A halocarbon a lab may report: a plain name and its formula.
struct Halocarbon {
  std::string_view name;     //!< e.g. "tetrachloroethene"
  std::string_view formula;  //!< e.g. "C2Cl4"
};

//! The table of halocarbons known by name (formulas by structure; names IUPAC or common).
const std::vector<Halocarbon>& halocarbon_table();
//! Looks up a halocarbon by name or formula; throws InputError listing the known names.
const Halocarbon& find_halocarbon(std::string_view name_or_formula);
//! The parsed formula of an entry of halocarbon_table() (parsed once per process: a gas is resolved
//! for every new row of a record).
const Formula& halocarbon_formula(const Halocarbon& entry);
//! Its molar mass [kg/mol] (molar_mass of the formula, made once).
double halocarbon_molar_mass(const Halocarbon& entry);

//! Elemental chlorine and fluorine carried by a set of compounds.
struct HalogenTotals {
  double chlorine = 0;  //!< Cl atoms per mole of gas [mol/mol]
  double fluorine = 0;  //!< F atoms per mole of gas [mol/mol]
};

//! One compound of a per-compound analysis, as a mole fraction in the gas [mol/mol].
struct CompoundFraction {
  std::string_view compound;  //!< name or formula from halocarbon_table()
  double mole_fraction = 0;   //!< [mol/mol]
};
//! Sums compounds to Cl and F by formula: x_Cl = Σ x_i · n_Cl,i.
HalogenTotals halogen_totals(const std::vector<CompoundFraction>& compounds);

}  // namespace acidload
