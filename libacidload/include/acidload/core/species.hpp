#pragma once
// Elements, chemical formulas, molar masses and the KOH equivalents of the acids.
#include <array>
#include <cstddef>
#include <string>
#include <string_view>

namespace acidload {

//! The elements the model balances.
enum class Element { H, C, N, O, S, Cl, F, K, Ar };
inline constexpr std::size_t element_count = 9;

//! Standard atomic weight [g/mol]: IUPAC 2007 values, each inside its IUPAC 2011 interval;
//! F from PAC 88(3) 2016, K 39.0983, Ar 39.948.
double atomic_weight(Element e);
//! Element symbol as written in formulas ("Cl").
std::string_view symbol(Element e);

//! Atom counts of a molecule, by element.
struct Formula {
  std::array<double, element_count> atoms{};  //!< atoms per molecule, indexed by Element
  double operator[](Element e) const { return atoms[static_cast<std::size_t>(e)]; }
  double& operator[](Element e) { return atoms[static_cast<std::size_t>(e)]; }
};

//! Parses a formula such as "C2HCl3" or "CH3(CH2)2SH"; throws InputError naming the position.
Formula parse_formula(std::string_view text);
//! Molar mass of a formula [kg/mol].
double molar_mass(const Formula& f);
//! Molar mass of a formula given as text [kg/mol].
double molar_mass(std::string_view formula_text);

//! Gas species of fuel, air and exhaust.
enum class Gas { CH4, CO2, N2, O2, H2S, H2O, H2, C2H6, C3H8, Ar, SO2, SO3, HCl, HF, NO2 };
inline constexpr std::size_t gas_count = 15;
//! All gas species, in enum order.
inline constexpr std::array<Gas, gas_count> all_gases{Gas::CH4, Gas::CO2, Gas::N2, Gas::O2, Gas::H2S,
    Gas::H2O, Gas::H2, Gas::C2H6, Gas::C3H8, Gas::Ar, Gas::SO2, Gas::SO3, Gas::HCl, Gas::HF, Gas::NO2};
std::string_view formula_text(Gas g);           //!< e.g. "H2S"
const Formula& formula(Gas g);                  //!< atom counts
double molar_mass(Gas g);                       //!< [kg/mol]
//! Gas from its formula text ("H2S"); throws InputError listing the known species.
Gas gas_from_formula(std::string_view text);

//! Acids that reach the oil, as the oil sees them.
enum class Acid { H2SO4, HCl, HF, HNO3 };
inline constexpr std::size_t acid_count = 4;
std::string_view formula_text(Acid a);
double molar_mass(Acid a);                      //!< [kg/mol]
//! Base equivalents one mole of acid neutralises [mol KOH/mol]: H2SO4 2, HCl 1, HF 1, HNO3 1.
double koh_equivalents(Acid a);
//! Molar mass of KOH [kg/mol].
double koh_molar_mass();
//! mg KOH neutralised per mg of acid = equivalents · M_KOH / M_acid [mg/mg].
double mg_koh_per_mg(Acid a);

}  // namespace acidload
