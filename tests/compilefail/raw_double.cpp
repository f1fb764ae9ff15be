// Compile-fail case: a raw double passed where a quantity (the fuel flow) is expected.
// Without ACIDLOAD_SHOULD_FAIL the twin gives the flow its unit and must compile.
#include "acidload/units.hpp"

namespace u = acidload::units;

acidload::Operation make() {
#ifdef ACIDLOAD_SHOULD_FAIL
  return u::operation(503.0, 1000.0 * u::kilowatts, u::celsius(92.0));
#else
  return u::operation(503.0 * u::normal_m3_per_hour, 1000.0 * u::kilowatts, u::celsius(92.0));
#endif
}
