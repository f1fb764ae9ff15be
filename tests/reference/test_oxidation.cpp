// The oxidation law: the doubling rule (common practice, no source) and the Arrhenius law with the
// activation energy that rule implies (docs/references.md [OxidationDoubling]: ≈ 74 kJ/mol at 80 °C, 82 at 100 °C, 91 at
// 120 °C [derived]) — a check of the Arrhenius implementation against those derived figures.
#include "../support/reference_check.hpp"

#include <cmath>

#include "acidload/core/constants.hpp"
#include "acidload/core/oil.hpp"

using namespace acidload;

TEST_CASE("Arrhenius activation energy that doubles the rate per 10 K") {
  // E_a = R ln 2 / (1/T − 1/(T + 10 K)) at 80, 100 and 120 °C, and the model's ratio k(T+10)/k(T)
  const double expected[] = {74e3, 82e3, 91e3};
  const double celsius[] = {80, 100, 120};
  for (int i = 0; i < 3; ++i) {
    const double T = 273.15 + celsius[i];
    const double ea = constants::molar_gas_constant * std::log(2.0) / (1 / T - 1 / (T + 10));
    REFERENCE_CHECK("E_a doubling per 10 K", ea, expected[i], relative, 0.01, "J/mol",
                    "docs/references.md [OxidationDoubling] [derived], rounded to 1 kJ/mol");
    OxidationLaw law;
    law.kind = OxidationLaw::Kind::arrhenius;
    law.activation_energy = ea;
    CHECK(oxidation_rate(law, T + 10) / oxidation_rate(law, T) == doctest::Approx(2.0).epsilon(1e-12));
    law.kind = OxidationLaw::Kind::doubling;
    CHECK(oxidation_rate(law, T + 10) / oxidation_rate(law, T) == doctest::Approx(2.0).epsilon(1e-14));
  }
  OxidationLaw law;
  law.kind = OxidationLaw::Kind::arrhenius;
  CHECK(oxidation_rate(law, law.reference_temperature) == doctest::Approx(law.rate_at_reference).epsilon(1e-15));
}
