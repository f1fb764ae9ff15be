#pragma once
// Per-variant economics: the scrubbing train run over the operating record (bed loading,
// changeouts, the outlet H2S the engine sees), the oil changes that follow from it, and the cost
// items per year and per MWh; the cheapest scrubbing level, the price sensitivity and Monte Carlo.
#include <cstdint>
#include <string>
#include <vector>

#include "acidload/core/economics.hpp"
#include "acidload/core/scrubber.hpp"
#include "acidload/studies/monte_carlo.hpp"
#include "acidload/studies/whatif.hpp"

namespace acidload {

//! A named stage with its own costs.
struct TrainStage {
  std::string name;   //!< as the case names it ("iron oxide bed")
  ScrubStage stage;
  StageCosts costs;
};

//! A variant's engine case with its scrubbing and prices.
struct CostCase {
  EngineCase engine;              //!< fuel in the record = the raw gas before the train
  std::vector<TrainStage> train;  //!< in gas-flow order; empty = raw gas
  Prices prices;
  double hours_per_year = 0;      //!< running hours a year [h]; 0 = the record's running hours
  double oil_per_change = -1;     //!< new oil per change [m³]; < 0 = the charge less its residual share
  double step = 24;               //!< longest stretch of constant outlet handed to the oil balance [h]
  std::string currency;           //!< a label
};

//! Sulfur through the train and the engine over the record [mol S].
struct SulfurLedger {
  double raw = 0;                   //!< in the raw gas
  std::vector<double> stages;       //!< taken out by each stage
  double engine = 0;                //!< in the gas the engine burns
};

//! What a stage did over the record.
struct StageRecord {
  int changeouts = 0;          //!< completed changeouts in the record
  double bed_share_used = 0;   //!< of the current bed at the end (φ/φ* or hours/every) [-]
  double first_bed_life = -1;  //!< running hours of the first bed, −1 if it lasted the record [h]
  double sulfur_removed = 0;   //!< [kg S]
  double mean_outlet_ppmv = 0; //!< [ppmv dry], running-hours mean
};

//! The record as the engine sees it behind the train.
struct ScrubbedRecord {
  std::vector<Segment> record;      //!< segments of constant outlet (no longer than `step`)
  std::vector<std::size_t> source;  //!< for each piece of `record`, the index of the segment it came from
  std::vector<StageRecord> stages;
  SulfurLedger sulfur;
  double mean_engine_h2s_ppmv = 0;  //!< running-hours mean at the engine [ppmv dry]
};
//! A piece of a segment: `hours` of it, starts and calendar time in proportion; events only on the first piece.
Segment segment_piece(const Segment& s, double hours, bool first);
//! Runs the train over the case's record. Throws InputError for a changeout level the fresh bed
//! already exceeds.
ScrubbedRecord scrub(const EngineCase& c, const std::vector<TrainStage>& train, double step);

//! Oil changes over a record when each charge is changed at its first limit.
struct OilOverRecord {
  int completed = 0;           //!< charges changed at their limit inside the record
  double last_share = 0;       //!< share of the last charge's interval used at the end [-]
  double changes = 0;          //!< completed + last_share
  std::vector<double> intervals;  //!< drain interval of each charge [h] (the last one projected to its limit)
};
OilOverRecord oil_over_record(const EngineCase& c, const std::vector<Segment>& record);

//! One variant's costs.
struct VariantCosts {
  std::string name;
  std::string currency;
  CostItems per_year{};         //!< [currency / year]
  CostItems per_mwh{};          //!< [currency / MWh]
  double total_per_year = 0, total_per_mwh = 0;
  int rank = 0;                 //!< 1 = cheapest of the comparison
  YearQuantities quantities;    //!< per year
  OilOverRecord oil;            //!< over the record
  ScrubbedRecord scrubbed;      //!< the train over the record
  double record_hours = 0;      //!< running hours of the record [h]
  double year_factor = 1;       //!< hours per year / record hours [-]
};
//! Quantities per year from a scrubbed record and its oil changes.
YearQuantities year_quantities(const CostCase& c, const ScrubbedRecord& s, const OilOverRecord& oil);
VariantCosts costs(const CostCase& c);
//! Costs of every variant, ranked by total per MWh.
std::vector<VariantCosts> compare_costs(const std::vector<CostCase>& cases);

//! The level the cheapest-level question varies: the changeout outlet of a media bed, or the outlet
//! of a fixed-efficiency stage (its removal then set from the raw inlet of the first segment).
CostCase with_outlet_level(const CostCase& c, std::size_t stage, double outlet_ppmv);
//! Total per MWh at a level.
double total_per_mwh_at(const CostCase& c, std::size_t stage, double outlet_ppmv);

//! The range a cheapest-level question searches by default: for a media bed from 1.5 times what the
//! fresh bed lets through (at least 0.5 ppmv) to 0.95 of the stage's mean inlet; for a fixed stage from
//! 0 to its mean inlet [ppmv dry].
struct LevelRange {
  double low = 0, high = 0;
};
LevelRange default_level_range(const CostCase& c, std::size_t stage);

struct CheapestLevel {
  bool found = false;
  std::size_t stage = 0;
  double level_ppmv = 0;        //!< outlet (changeout) level with the lowest total per MWh [ppmv dry]
  double total_per_mwh = 0;     //!< there
  std::vector<double> grid_ppmv, grid_total;   //!< the scan, for plots
  double verified_low = 0, verified_high = 0;  //!< totals a step either side, from forward runs
  std::string reason;
  int evaluations = 0;
};
//! The level in [low, high] with the lowest total per MWh: a scan of `points` levels, then Brent's
//! minimiser inside the best bracket, verified by forward runs either side of the answer.
CheapestLevel cheapest_level(const CostCase& c, std::size_t stage, double low_ppmv, double high_ppmv, int points = 13,
                             double tolerance_ppmv = 0.05);
//! The stage a cheapest-level question varies by default: the last media bed or fixed-efficiency
//! stage of the train. Throws InputError if the train has none.
std::size_t level_stage(const CostCase& c);

//! Price sensitivity: each price scaled by (1 ± step); totals are linear in each price.
struct PriceSensitivity {
  Price price = Price::oil;
  std::vector<double> total_low, total_high;  //!< per variant [currency/MWh] at (1 − step) and (1 + step)
  std::size_t cheapest_low = 0, cheapest_high = 0;  //!< index of the cheapest variant there
  double break_even_factor = -1;   //!< nearest factor on this price (0 to 10) at which the cheapest changes; −1 if none
  std::size_t break_even_to = 0;   //!< the variant cheapest beyond it
  double swing = 0;                //!< largest |change of a variant's total| [currency/MWh]
};
std::vector<PriceSensitivity> price_sensitivity(const std::vector<VariantCosts>& costs, double step = 0.2);

//! Monte Carlo over prices (`economics.*` keys) and the case's parameters (parameter_table()).
struct CostMonteCarlo {
  int draws = 0;
  std::vector<std::vector<double>> total_per_mwh;  //!< [variant][draw]
  std::vector<double> p10, p50, p90;               //!< per variant [currency/MWh]
  std::vector<double> cheapest_share;              //!< share of draws each variant is cheapest [-]
};
//! The economics keys an uncertainty input may vary, in the section's units (prices per core unit).
const std::vector<std::string>& price_keys();
void set_price(CostCase& c, std::string_view key, double value);
//! The inputs that are no prices (what the drain-interval Monte Carlo varies).
std::vector<UncertainInput> without_prices(const std::vector<UncertainInput>& inputs);
CostMonteCarlo cost_monte_carlo(const std::vector<CostCase>& cases, const std::vector<UncertainInput>& inputs,
                                int draws, std::uint64_t seed, int threads = 0);

}  // namespace acidload
