#pragma once
// A site: several engines on one gas supply and one scrubbing train (docs/model.md §18.4). The bed
// loads with the sum of the engines' gas flows on a merged timeline; every engine then burns the one
// gas behind the train with its own oil, load and record. Shared costs (the train's media, disposal,
// changeout labour, consumables and capital) are split by each engine's share of the raw gas; an
// engine's own items (oil, oil changes, lab, downtime, wear) stay its own.
#include <string>
#include <vector>

#include "acidload/studies/economics.hpp"

namespace acidload {

struct SiteCase {
  std::string name;
  std::vector<CostCase> engines;  //!< each engine's case; its record's fuel is the site's raw gas (the train of each is ignored)
  std::vector<TrainStage> train;  //!< the shared train, in gas-flow order
  Prices prices;                  //!< prices of the shared items (media, disposal, changeout labour, consumables, capital)
  double hours_per_year = 0;      //!< running hours of the train a year [h]; 0 = the merged record's hours
  double step = 24;               //!< longest stretch of constant outlet [h]
};

//! One engine of a site.
struct SiteEngine {
  std::string name;
  std::vector<Segment> record;  //!< its record behind the train (the site's outlet gas, its own flow)
  OilOverRecord oil;            //!< its oil changes on that gas
  double gas_share = 0;         //!< its share of the site's raw gas over the record (running-hours integral of fuel flow) [-]
  double sulfur_burnt = 0;      //!< sulfur in the gas it burns, to exhaust and oil [mol S]
  double mean_h2s_ppmv = 0;     //!< running-hours mean H2S at the engine [ppmv dry]
  VariantCosts costs;           //!< its own items plus its gas share of the shared ones
};

struct SiteResult {
  std::string name;
  std::vector<Segment> raw;         //!< the merged timeline: the raw gas, fuel flows summed
  ScrubbedRecord scrubbed;          //!< the train over the summed flow (stages, sulfur ledger of the site)
  std::vector<SiteEngine> engines;
  YearQuantities shared_quantities; //!< the train's quantities a year
  CostItems shared_per_year{};      //!< the shared items a year (the other items zero) [currency/year]
  double total_per_year = 0;        //!< Σ engines' totals = own items + shared items [currency/year]
  double sulfur_balance_error = 0;  //!< |raw − Σ stages − Σ engines burnt| / raw [-]
};

//! The merged timeline of the engines' records: a segment wherever any engine's segment changes,
//! the fuel flows summed. Throws InputError where the engines' gas differs at the same time.
std::vector<Segment> site_gas_record(const std::vector<const EngineCase*>& engines);

//! The items shared by the engines of a site (split by gas share).
bool is_shared_item(CostItem i);

//! Runs the site: the train over the summed flow, then each engine on the gas behind it; the engines'
//! oil balances on `threads` threads (0: one per core; the result is the same on any number).
SiteResult run_site(const SiteCase& site, int threads = 0);

}  // namespace acidload
