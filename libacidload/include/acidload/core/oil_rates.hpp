#pragma once
// From what reaches the oil (transfer) to the rates of the oil balance for a segment.
#include "acidload/core/oil.hpp"
#include "acidload/core/transfer.hpp"

namespace acidload {

//! Oil consumption from a specific figure: c = specific [g/kWh] × P [kW] / 1000 → [kg/h].
//! specific [kg/J] (SI), power [W]: c = specific · power · 3600 [kg/h].
double oil_consumption(double specific_consumption, double electrical_power);
//! The inverse: a specific consumption [kg/J] from an oil flow [kg/h] at a power [W] > 0.
double specific_consumption(double oil_flow, double electrical_power);

//! The segment rates: acid inflow from the transfer, oxidation at the ring zone (sump oil
//! temperature [K] + the law's offset), nitration from the NO2 taken up, consumption [kg/h].
//! `check_law` false skips validate(law), for a caller that has validated it once for a whole record.
OilRates oil_rates(const Transfer& t, const OxidationLaw& law, double sump_oil_temperature, double consumption,
                   bool continuous_makeup, bool check_law = true);

}  // namespace acidload
