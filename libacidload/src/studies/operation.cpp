#include "acidload/studies/operation.hpp"

#include "acidload/core/error.hpp"
#include "acidload/core/fuel.hpp"
#include "acidload/core/oil_rates.hpp"

namespace acidload {

void set_power(Segment& s, const EngineRating& e, double power) {
  check::non_negative("engine.power", power);
  if (e.fixed_fuel_flow > 0) {
    s.operation.fuel_flow = e.fixed_fuel_flow;
  } else {
    if (!(power > 0)) throw InputError("engine.power", format_value(power) + " W", "a power above 0 with 'electrical-efficiency', or 'fuel-flow'");
    s.operation.fuel_flow = fuel_flow_from_power(power, e.electrical_efficiency, lower_heating_value(s.fuel));
  }
  s.operation.electrical_power = power;
  s.operation.load = e.rated_power > 0 && power > 0 ? power / e.rated_power : 1;
  s.oil_consumption = oil_consumption(e.specific_oil_consumption, power);
}

}  // namespace acidload
