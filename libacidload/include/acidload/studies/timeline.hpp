#pragma once
// An operating record run through the oil balance: segments of constant operation, events between
// them, the limits watched throughout, and the trajectories a user plots.
#include <array>
#include <functional>
#include <optional>
#include <vector>

#include "acidload/core/fuel.hpp"
#include "acidload/core/condemning_limits.hpp"
#include "acidload/core/oil.hpp"
#include "acidload/core/transfer.hpp"

namespace acidload {

//! Something done to the oil at the start of a segment.
struct OilEvent {
  enum class Kind { oil_change, top_up, partial_drain };
  Kind kind = Kind::top_up;
  double amount = -1;  //!< oil_change: residual share [-] (< 0: the charge's default); top_up: mass [kg]
                       //!< (< 0: back to the full charge); partial_drain: share drained [-]
};

//! A stretch of constant operation.
struct Segment {
  double hours = 0;              //!< engine running hours [h]
  double calendar_hours = -1;    //!< calendar time spanned [h]; < 0 means equal to `hours`
  double starts = 0;             //!< engine starts in the segment [-]
  FuelGas fuel;                  //!< gas quality
  Operation operation;           //!< load, flows, temperatures (starts_per_hour is set from `starts`)
  double oil_temperature = 358.15;  //!< sump oil temperature [K]
  double oil_consumption = 0;    //!< oil burnt or lost [kg/h]
  std::vector<OilEvent> events;  //!< applied, in order, before the segment runs
};

//! The oil charge and how it is kept.
struct OilCharge {
  OilProperties oil;              //!< the product
  double mass = 0;                //!< full charge in circulation [kg]
  bool continuous_makeup = true;  //!< makeup equals consumption; else the level falls until a top-up event
  double residual_share = 0.10;   //!< share of the charge left in the system at an oil change [-] (10 %, from memory)
};

//! The calibratable model.
struct ModelParameters {
  TransferParameters transfer;  //!< the two paths into the oil
  OxidationLaw oxidation;       //!< oxidation, organic acids, nitration
  LimitSettings limits;         //!< what ends a charge
};

//! The oil at one instant of the record.
struct TrajectoryPoint {
  double engine_hours = 0;    //!< since the start of the record [h]
  double oil_hours = 0;       //!< since the last oil change [h]
  double calendar_hours = 0;  //!< since the start of the record [h]
  double starts = 0;          //!< since the start of the record [-]
  int charge = 0;             //!< which charge (0 = the one the record starts with)
  OilState state;             //!< the states
  double tbn_d2896 = 0, tbn_d4739 = 0, tan = 0, san = 0;  //!< readings [mg KOH/g]
  double viscosity_rise = 0;  //!< kinematic viscosity at 100 °C over fresh, less 1 [-]
};

//! What happened to one charge.
struct ChargeSummary {
  int index = 0;                        //!< 0 = the charge the record starts with
  double start_engine_hours = 0;        //!< [h]
  double oil_hours = 0;                 //!< hours the charge ran in the record [h]
  bool ended_by_change = false;         //!< an oil change ended it inside the record
  std::array<double, limit_count> reached_at{};  //!< oil hours each limit was first reached, −1 if not [h]
  std::optional<Limit> first;           //!< the limit reached first, if any
  double drain_interval = -1;           //!< oil hours at the first limit, −1 if none reached [h]
  std::array<LimitReading, limit_count> at_end{};  //!< readings at the first limit, or at the end of the charge
  double floor_reached_at = -1;         //!< oil hours the reactive base reached its floor, −1 if not [h]
  double antioxidant_spent_at = -1;     //!< oil hours the antioxidant reserve ran out, −1 if not [h]
  //! Share of the fuel sulfur that reached the oil, averaged over the charge up to its first limit (or its
  //! end): SO2 uptake falls as the base is used, so this is below the fresh-oil share [-]; −1 without sulfur.
  double sulfur_share_to_oil_average = -1;
  //! Whether an oil-condition limit ended the charge (false: none within the planned maximum hours).
  bool oil_limit_reached() const { return first && is_oil_condition(*first); }
};

struct RunOptions {
  double output_interval = 0;   //!< trajectory points at least this often [h]; 0 = segment ends only
  double detection_step = 25;   //!< limits are checked at least this often inside long segments [h]
  bool stop_at_first_limit = false;  //!< end the run when the first charge reaches its first limit
  bool stop_when_interval_and_san_known = false;  //!< end the run when the first charge has reached its
                                     //!< first limit and free strong acid (SAN) too (or the SAN limit is off);
                                     //!< after its first limit, only SAN is watched (other limits' times
                                     //!< are then not located; for Monte Carlo, which reports these two)
  bool keep_segment_ends = true;     //!< a trajectory point at every segment end (off: only every
                                     //!< output_interval, at events and at the end — for long records)
  std::size_t reserve_points = 0;    //!< room made for this many trajectory points up front (a long
                                     //!< streamed record: the trajectory then is not copied as it grows)
};

//! The whole run.
struct RunResult {
  std::vector<TrajectoryPoint> trajectory;  //!< at the start, every output point and every segment end
  std::vector<ChargeSummary> charges;       //!< one per charge
  OilState initial, final_state;            //!< states at the start and the end
  OilLedger ledger;                         //!< totals over the run [g KOH]
  std::optional<OilState> steady_state;     //!< where the last charge settles under the last segment (continuous makeup,
                                            //!< no oil-condition limit reached within the record or the planned maximum)
  Transfer first_transfer;                  //!< what the first segment sends where
  OilRates first_rates;                     //!< the first segment's rates
  double engine_hours = 0, calendar_hours = 0, starts = 0;  //!< totals [h], [h], [-]
};

//! Runs the record from a fresh charge (or from `start`, if given, in its 0th charge at `start_oil_hours`).
RunResult simulate(const OilCharge& charge, const ModelParameters& model, const std::vector<Segment>& record,
                   const RunOptions& options = {}, const std::optional<OilState>& start = std::nullopt,
                   double start_oil_hours = 0);

//! Segments one at a time: returns the next segment, or nullptr at the end of the record. The
//! pointer need only stay valid until the next call. Memory then does not grow with the record.
using SegmentSource = std::function<const Segment*()>;

//! Runs a record read segment by segment from `next` (see simulate above).
RunResult simulate(const OilCharge& charge, const ModelParameters& model, const SegmentSource& next,
                   const RunOptions& options = {}, const std::optional<OilState>& start = std::nullopt,
                   double start_oil_hours = 0);

//! The rates of a segment (its transfer and oil rates).
OilRates segment_rates(const Segment& s, const OilCharge& charge, const ModelParameters& model, Transfer* transfer = nullptr);
//! segment_rates()'s refusals alone (throws where it throws, with the same error; computes no figure it
//! does not need to decide that): a record's check of every row's operation.
void check_segment(const Segment& s, const OilCharge& charge, const ModelParameters& model);

namespace detail {
//! Whether simulate's cache of rates takes b's operating state for a's (and reuses a's transfer and
//! rates for it): every field segment_rates reads, each double by its bits, the starts per hour from
//! the starts and hours. For the tests.
bool same_operating_state(const Segment& a, const Segment& b);
}  // namespace detail

}  // namespace acidload
