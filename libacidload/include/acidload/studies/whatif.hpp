#pragma once
// What-if comparisons: an engine case and its variants, each summarised as a table row.
#include <optional>
#include <string>
#include <vector>

#include "acidload/core/exhaust.hpp"
#include "acidload/core/plausibility.hpp"
#include "acidload/core/transfer.hpp"
#include "acidload/studies/timeline.hpp"

namespace acidload {

//! Everything one run needs.
struct EngineCase {
  std::string name;                //!< the variant's name ("raw gas", "scrubbed to 50 ppmv", …)
  OilCharge charge;                //!< the oil and how it is kept
  ModelParameters model;           //!< calibratable parameters and limits
  std::vector<Segment> record;     //!< the operating record
  RunOptions options;              //!< output and detection settings
  double exhaust_temperature = 723.15;  //!< for the SO3 equilibrium bound [K]
  double catalyst_so3_conversion = -1;  //!< oxidation catalyst: share of SO2 it turns to SO3 [-]; < 0: none fitted
  FuelGasLimits fuel_gas_limits;        //!< the engine maker's fuel-gas limits, for plausibility warnings
};

//! One row of a comparison.
struct VariantSummary {
  std::string name;
  AcidInflow inflow;             //!< first segment [mol/h]
  AcidInflow::PerAcid inflow_koh;    //!< first segment, as KOH [g KOH/h]
  double sulfur_share_to_oil = 0;      //!< share of fuel S reaching FRESH oil, first segment [-]
  double sulfur_share_to_oil_average = -1;  //!< the same averaged over the first charge to its first limit [-]; −1 without S
  double initial_tbn_rate = 0;         //!< d(TBN)/dt of the FRESH charge [mg KOH/g per h]
  double tbn_fall_rate_average = 0;    //!< (fresh TBN − TBN at the first limit or the end)/hours, by the limit's method [mg KOH/g per h]
  ChargeSummary charge;                //!< the first charge: limits and drain interval
  double tbn_end = 0, tan_end = 0, san_end = 0;  //!< at the drain interval, or at the end of the record [mg KOH/g]
  std::optional<OilState> steady_state;  //!< where the oil settles if no limit is reached
  ExhaustDewPoints dew_points;         //!< first segment's exhaust
  Emissions emissions;                 //!< first segment's exhaust, engine out
  std::optional<Emissions> emissions_after_catalyst;          //!< after the oxidation catalyst, when fitted
  std::optional<ExhaustDewPoints> dew_points_after_catalyst;  //!< the same: what the heat recovery downstream sees
  std::vector<Warning> warnings;       //!< plausibility warnings on inputs and results, each with its reason
  double so3_share = 0;                //!< ε used [-]
  double so3_share_bound = 0;          //!< equilibrium bound on ε at the exhaust temperature [-]
  RunResult run;                       //!< the full run (trajectories)
};

//! Runs a case and summarises it.
VariantSummary summarize(const EngineCase& c);

}  // namespace acidload
