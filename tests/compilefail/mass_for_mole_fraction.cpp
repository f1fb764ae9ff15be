// Compile-fail case: a mass fraction (ppmw) passed where a mole fraction (ppmv) is meant.
// Without ACIDLOAD_SHOULD_FAIL the twin passes a mole fraction and must compile.
#include "acidload/units.hpp"

namespace u = acidload::units;

acidload::Concentration make() {
#ifdef ACIDLOAD_SHOULD_FAIL
  return u::concentration(450.0 * u::ppmw, acidload::Basis::dry);
#else
  return u::concentration(450.0 * u::ppmv, acidload::Basis::dry);
#endif
}
