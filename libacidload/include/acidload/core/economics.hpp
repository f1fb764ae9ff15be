#pragma once
// What running an engine on sour gas costs: the pure arithmetic of cost items from yearly
// quantities and prices. Money is in the user's currency (a label; no exchange rates); every price is
// per core unit: per m³ of oil, per kg of media, per J of electricity, per sample, per change.
#include <array>
#include <cstddef>
#include <string_view>
#include <vector>

#include "acidload/core/scrubber.hpp"

namespace acidload {

//! The cost items, each tied to exactly one price (so a total is linear in every price).
enum class CostItem {
  oil_changes,          //!< oil for the changes: changes × oil per change × oil price
  makeup_oil,           //!< oil burnt and made up × oil price
  oil_change_labour,    //!< changes × labour per change
  oil_change_downtime,  //!< changes × hours down × power × electricity price
  lab,                  //!< samples × cost per sample
  media,                //!< changeouts × bed mass × media price
  media_disposal,       //!< changeouts × bed mass × disposal price
  changeout_labour,     //!< changeouts × labour per changeout
  changeout_downtime,   //!< changeouts × hours down × power × electricity price
  consumables,          //!< caustic, biological consumables, stage running costs
  capital,              //!< capital of each stage × capital recovery factor
  engine_wear,          //!< overhaul hours brought forward / 1000 × cost per 1000 h
};
inline constexpr std::size_t cost_item_count = 12;
inline constexpr std::array<CostItem, cost_item_count> all_cost_items{
    CostItem::oil_changes, CostItem::makeup_oil, CostItem::oil_change_labour, CostItem::oil_change_downtime,
    CostItem::lab, CostItem::media, CostItem::media_disposal, CostItem::changeout_labour,
    CostItem::changeout_downtime, CostItem::consumables, CostItem::capital, CostItem::engine_wear};
std::string_view name(CostItem i);  //!< "oil-changes", "makeup-oil", …

//! The prices a cost item is proportional to (for sensitivity and Monte Carlo).
enum class Price { oil, oil_change_labour, electricity, lab, media, disposal, changeout_labour, consumables, capital, wear };
inline constexpr std::size_t price_count = 10;
inline constexpr std::array<Price, price_count> all_prices{Price::oil, Price::oil_change_labour, Price::electricity,
    Price::lab, Price::media, Price::disposal, Price::changeout_labour, Price::consumables, Price::capital, Price::wear};
std::string_view name(Price p);   //!< "oil-price", "oil-change-labour", "electricity-price", …
Price price_of(CostItem i);       //!< the one price an item is proportional to

//! Capital recovery factor i(1 + i)ⁿ / ((1 + i)ⁿ − 1), 1/n at i = 0 [1/year]
//! (the annuity factor of engineering economics; e.g. 0.16275 at 10 % over 10 years).
double capital_recovery_factor(double discount_rate, double life_years);

//! Prices of the whole site (per core unit).
struct Prices {
  double oil = 0;                  //!< per m³ of new oil
  double oil_change_labour = 0;    //!< per oil change
  double oil_change_downtime = 0;  //!< engine hours lost per oil change [h]
  double electricity = 0;          //!< value of electricity not generated, per J
  double lab_sample = 0;           //!< per oil sample
  double sampling_interval = 0;    //!< running hours between samples [h]; 0 = none
  double iron_oxide = 0;           //!< per kg of fresh iron-oxide media
  double carbon = 0;               //!< per kg of fresh impregnated carbon
  double disposal = 0;             //!< per kg of spent media
  double changeout_labour = 0;     //!< per media changeout
  double changeout_downtime = 0;   //!< engine hours lost per media changeout [h] (0 with a lead–lag pair)
  double caustic = 0;              //!< per kg of NaOH
  double caustic_excess = 1;       //!< NaOH used over the stoichiometric 2 mol per mol S [-] (≥ 1)
  double biological = 0;           //!< biological consumables per kg of sulfur removed
  double discount_rate = 0.06;     //!< for the capital recovery factor [-]
  double wear_cost = 0;            //!< per 1000 h of overhaul brought forward
  double wear_hours = 0;           //!< overhaul hours brought forward per 1000 running hours per ppmv (dry)
                                   //!< of mean H2S at the engine [h] (user-stated; 0 = no penalty)
};
//! Validates prices; throws InputError naming the field.
void validate(const Prices& p);

//! A stage's own costs.
struct StageCosts {
  double capital = 0;       //!< installed cost
  double life_years = 15;   //!< [year]
  double running = 0;       //!< fixed running cost per year (blower power, water, maintenance)
};

//! What a stage did in a year.
struct StageYear {
  StageKind kind = StageKind::fixed;
  double changeouts = 0;        //!< media changeouts [-] (fractional: the share of the current bed used counts)
  double bed_mass = 0;          //!< media per changeout [kg]
  double sulfur_removed = 0;    //!< [kg S]
};

//! What the engine and the scrubbing did in a year: the quantities the prices multiply.
struct YearQuantities {
  double running_hours = 0;    //!< [h]
  double energy = 0;           //!< electricity generated [J]
  double power = 0;            //!< electrical output while running [W] (for downtime)
  double oil_changes = 0;      //!< [-] (fractional: the share of the last charge's interval used counts)
  double oil_per_change = 0;   //!< new oil per change [m³]
  double makeup_oil = 0;       //!< oil burnt and made up [m³]
  double engine_h2s_ppmv = 0;  //!< mean H2S at the engine [ppmv dry]
  std::vector<StageYear> stages;
  std::vector<StageCosts> stage_costs;  //!< one per stage
};

//! Cost items per year, in the currency.
using CostItems = std::array<double, cost_item_count>;
//! The items for a year's quantities at these prices (each item one product of a quantity and its price).
CostItems cost_items(const YearQuantities& q, const Prices& p);
//! Sum of the items.
double total(const CostItems& items);
//! Per MWh: item / (energy in MWh).
CostItems per_mwh(const CostItems& items, double energy_joule);

}  // namespace acidload
