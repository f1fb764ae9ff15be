// Compile-fail case: a temperature difference (plain kelvin) passed where an absolute temperature
// (the jacket-water outlet) is expected. Without ACIDLOAD_SHOULD_FAIL the twin passes an absolute
// temperature and must compile.
#include "acidload/units.hpp"

namespace u = acidload::units;

acidload::Operation make() {
#ifdef ACIDLOAD_SHOULD_FAIL
  return u::operation(503.0 * u::normal_m3_per_hour, 1000.0 * u::kilowatts, 365.15 * u::si::kelvin);
#else
  return u::operation(503.0 * u::normal_m3_per_hour, 1000.0 * u::kilowatts, u::kelvin(365.15));
#endif
}
