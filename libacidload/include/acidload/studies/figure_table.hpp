#pragma once
// A contaminant figure in every unit for the gas of a segment: what `acidload convert FIGURE --case`
// prints and acidload.convert_figure() returns (docs/model.md §2: the conversions themselves).
#include <string>
#include <string_view>
#include <vector>

#include "acidload/core/fuel.hpp"
#include "acidload/core/gas.hpp"
#include "acidload/studies/timeline.hpp"

namespace acidload {

//! The figure of one species in every unit.
struct FigureRow {
  std::string what;               //!< the species as given ("H2S", "S", "Cl", "F", a halocarbon), or "as Cl", "as F"
  double molar_mass = 0;          //!< of what the row is counted as [kg/mol]
  double ppmv_dry = 0, ppmv_wet = 0;              //!< [ppmv]
  double mg_per_nm3_dry = 0, mg_per_nm3_wet = 0;  //!< [mg/Nm³] at the gas's reference state
  double mg_per_mj = 0;                           //!< per MJ of the gas's lower heating value [mg/MJ]
  double mg_per_nm3_methane = 0;                  //!< per Nm³ of methane [mg/Nm³ CH4]
  double mol_per_h = 0;                           //!< carried by the segment's fuel flow [mol/h] (0 without a flow)
};

//! The gas the figure belongs to and the figure's rows: the species, then for a halocarbon its Cl
//! and F content (when it has them).
struct FigureTable {
  GasContext gas;                   //!< reference state, water and methane fractions, LHV, flow
  double lhv_volumetric = 0;        //!< lower heating value [J/m³] at the reference state
  std::vector<FigureRow> rows;
};

//! `given` (any unit and basis) of `species` — "H2S", "S", "Cl", "F", or a halocarbon by name or
//! formula (core/halocarbons.hpp) — in the gas and fuel flow of segment `s`. InputError for an
//! unknown species.
FigureTable figure_in_every_unit(const Segment& s, const Concentration& given, std::string_view species);

}  // namespace acidload
