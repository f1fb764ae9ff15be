// Compile-fail case: Nm³ (an amount of substance) passed where m³ of actual gas (a volume) is meant.
// Without ACIDLOAD_SHOULD_FAIL the twin passes an actual volume and must compile.
#include "acidload/units.hpp"

namespace u = acidload::units;

double make() {
#ifdef ACIDLOAD_SHOULD_FAIL
  return u::amount_of_gas(2.5 * u::normal_m3, u::celsius(35.0), 1.05 * u::bar);
#else
  return u::amount_of_gas(2.5 * u::si::cubic_meters, u::celsius(35.0), 1.05 * u::bar);
#endif
}
