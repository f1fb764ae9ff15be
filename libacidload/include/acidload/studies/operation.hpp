#pragma once
// An engine's power and what follows from it in a segment: the fuel flow, the load and the oil
// consumption. The case reader calls these for the base operation and for every record row that
// changes the power or the gas, so the rule lives in one place.
#include "acidload/studies/timeline.hpp"

namespace acidload {

//! What turns an electrical power into a fuel flow and an oil consumption.
struct EngineRating {
  double rated_power = 0;            //!< electrical rating [W]; 0: the power itself
  double electrical_efficiency = 0;  //!< on the LHV [-]; used when `fixed_fuel_flow` is 0
  double fixed_fuel_flow = 0;        //!< wet fuel gas [mol/h]; > 0: given, not derived from the power
  double specific_oil_consumption = 0;  //!< oil burnt per unit of electrical energy [kg/J]
};

//! Sets a segment's electrical power [W] and what follows from it and from the segment's gas:
//! fuel flow ṅ = P / (η · LHV) unless fixed, load P / P_rated (1 without a rating), oil consumption
//! c = specific · P · 3600 [kg/h]. Throws InputError when neither a fixed flow nor η and P > 0 give a flow.
void set_power(Segment& s, const EngineRating& e, double power);

}  // namespace acidload
