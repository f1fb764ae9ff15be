#pragma once
// The fuel gas: a lab analysis as stated, resolved into wet mole fractions.
#include <array>
#include <string>
#include <vector>

#include "acidload/core/gas.hpp"
#include "acidload/core/heating_value.hpp"
#include "acidload/core/species.hpp"

namespace acidload {

//! A halocarbon figure of a per-compound analysis.
struct CompoundFigure {
  std::string compound;       //!< name or formula from halocarbon_table()
  Concentration amount;       //!< the figure, of the compound itself (not "as Cl")
};

//! A fuel-gas analysis as a lab states it.
struct FuelAnalysis {
  //! Main components: mole fractions on `main_basis` (CH4, CO2, N2, O2, H2, C2H6, C3H8; others ignored).
  //! They are normalised so that, with H2S and the traces, the stated basis sums to 1.
  std::array<double, gas_count> main{};  //!< [mol/mol], indexed by Gas
  Basis main_basis = Basis::dry;         //!< basis of `main`
  double water_fraction = 0;             //!< water vapour in the wet gas [mol/mol]
  ReferenceState reference = ReferenceState::normal();            //!< state of "m³" figures
  CombustionReference combustion = CombustionReference::t15;      //!< heating-value reference
  Concentration h2s{0, ConcentrationUnit::ppmv, Basis::dry};       //!< hydrogen sulfide
  Concentration other_sulfur{0, ConcentrationUnit::mg_per_m3, Basis::dry};  //!< COS, mercaptans… as S
  Concentration chlorine{0, ConcentrationUnit::mg_per_m3, Basis::dry};      //!< organic Cl total, as Cl
  Concentration fluorine{0, ConcentrationUnit::mg_per_m3, Basis::dry};      //!< organic F total, as F
  std::vector<CompoundFigure> halocarbons;  //!< per-compound figures, added to the totals
};

//! A resolved fuel gas: wet mole fractions of the species and of trace atoms.
struct FuelGas {
  std::array<double, gas_count> x{};  //!< wet mole fractions, indexed by Gas; sums to 1 with the traces
  double other_sulfur = 0;  //!< S atoms in compounds other than H2S, per mole of wet gas [mol/mol]
  double chlorine = 0;      //!< organic Cl atoms per mole of wet gas [mol/mol]
  double fluorine = 0;      //!< organic F atoms per mole of wet gas [mol/mol]
  ReferenceState reference = ReferenceState::normal();        //!< state of "m³" figures
  CombustionReference combustion = CombustionReference::t15;  //!< heating-value reference
  double operator[](Gas g) const { return x[static_cast<std::size_t>(g)]; }
  double sulfur() const;  //!< total S atoms per mole of wet gas (H2S + other) [mol/mol]
};

//! H2S at or above this wet mole fraction (20 %) is outside the model: it is built for biogas and
//! landfill gas (typically below 1 %); a figure of 100 % or more is physically impossible.
inline constexpr double max_h2s_fraction = 0.2;

//! Resolves an analysis: normalises the main components, converts every contaminant figure to wet
//! mole fractions (figures per MJ are solved together with the heating value they depend on).
//! Throws InputError for negative or non-finite figures, main components far from summing to 1, or
//! H2S of `max_h2s_fraction` or more (the converted figure itself, on every path: ppmv, mg/Nm³, wet).
FuelGas resolve(const FuelAnalysis& a);

//! The same gas with another H2S content [wet mol/mol]: the main components are rescaled to keep the
//! sum at 1; water, other sulfur and halogens stay. Throws InputError outside [0, 0.2).
FuelGas with_h2s(const FuelGas& f, double h2s_wet_fraction);

//! Lower heating value of the wet gas [J/mol] (ISO 6976 net molar values; traces neglected).
double lower_heating_value(const FuelGas& f);
//! Lower heating value per m³ of wet gas at the fuel's reference state [J/m³] (ideal gas).
double lower_heating_value_volumetric(const FuelGas& f);
//! The conversion context of a fuel gas (for figures of its contaminants), at a flow [mol/h].
GasContext context(const FuelGas& f, double molar_flow = 0);

//! Fuel flow from electrical output and efficiency on the LHV basis:
//! ṅ = P_el / (η · LHV) [mol/h]; power [W], efficiency [0–1], lhv [J/mol].
double fuel_flow_from_power(double electrical_power, double electrical_efficiency, double lhv_molar);

}  // namespace acidload
