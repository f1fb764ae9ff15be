#pragma once
// What-if comparisons: an engine case and its variants, each summarised as a table row.
#include <cstddef>
#include <memory>
#include <optional>
#include <string>
#include <vector>

#include "acidload/core/exhaust.hpp"
#include "acidload/core/plausibility.hpp"
#include "acidload/core/transfer.hpp"
#include "acidload/studies/timeline.hpp"

namespace acidload {

//! A record read again from its source for each run instead of held in memory (a case's CSV
//! record file as `acidload check`, `run` and Python read it): memory does not grow with its length.
class RecordStream {
 public:
  virtual ~RecordStream() = default;
  virtual std::size_t segments() const = 0;  //!< segments in the record
  virtual double hours() const = 0;          //!< running hours in all [h]
  virtual const Segment& first() const = 0;  //!< the first segment
  //! A fresh reading of the record, segment by segment. Refuses (InputError) a source that is no
  //! longer what was read when the case was loaded.
  virtual SegmentSource open() const = 0;
};

//! Everything one run needs.
struct EngineCase {
  std::string name;                //!< the variant's name ("raw gas", "scrubbed to 50 ppmv", …)
  OilCharge charge;                //!< the oil and how it is kept
  ModelParameters model;           //!< calibratable parameters and limits
  std::vector<Segment> record;     //!< the operating record (empty when `streamed`)
  //! Set instead of `record` when the record is streamed from its file; see held_record().
  std::shared_ptr<const RecordStream> streamed;
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

//! Segments in the record, held or streamed.
std::size_t record_segments(const EngineCase& c);
//! Running hours of the record, held or streamed [h].
double record_hours(const EngineCase& c);
//! The record's first segment, held or streamed (the record must not be empty).
const Segment& first_segment(const EngineCase& c);
//! The case with a streamed record read into `record` (for studies that index segments); refused
//! (InputError naming the record) when it holds more than `max_segments`. A held case is returned as it is.
EngineCase held_record(const EngineCase& c, std::size_t max_segments);

//! Runs a case and summarises it (a streamed record is read through once).
VariantSummary summarize(const EngineCase& c);

}  // namespace acidload
