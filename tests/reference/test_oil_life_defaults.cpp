// The defaults of the oil-life terms against where they come from (docs/model.md §15–§17): trade
// practice and second-hand standard guidance for the limits, chosen values for the calibratable terms.
#include "../support/reference_check.hpp"

#include "acidload/core/combustion.hpp"
#include "acidload/core/condemning_limits.hpp"
#include "acidload/core/oil.hpp"
#include "acidload/core/transfer.hpp"

using namespace acidload;

TEST_CASE("oil-life limit defaults") {
  const LimitSettings l;
  REFERENCE_CHECK("viscosity change limit", l.viscosity_rise, 0.20, absolute, 1e-12, "-",
                  "+20 to +25 % at 100 degC, common practice, no source");
  REFERENCE_CHECK("antioxidant remaining limit", l.antioxidant_remaining, 0.25, absolute, 1e-12, "-",
                  "25 % remaining: ASTM D7590 guidance (industrial oils), seen second-hand");
  REFERENCE_CHECK("water limit (lab only)", l.water, 0.005, absolute, 1e-12, "-", "0.5 %, common practice, no source");
  REFERENCE_CHECK("i-pH limit (lab only)", l.initial_ph, 4.5, absolute, 1e-12, "-",
                  "4-4.5 for biogas engines (ASTM D7946 method), common practice, no source");
  CHECK(!l.enabled[static_cast<std::size_t>(Limit::anti_wear)]);  // off unless the lab reports the additive
}

TEST_CASE("oil-life term defaults: chosen values and the O2 of air") {
  const OxidationLaw o;
  const OilProperties p;
  const TransferParameters t;
  const Operation op;
  REFERENCE_CHECK("induction time", o.induction_hours, 1500, absolute, 1e-12, "h", "chosen (docs/model.md §16), calibratable");
  REFERENCE_CHECK("depleted oxidation factor", o.depleted_factor, 5, absolute, 1e-12, "-", "5-20, from memory; calibratable");
  REFERENCE_CHECK("viscosity per oxidation", p.viscosity_per_oxidation, 0.008, absolute, 1e-15, "per A/cm",
                  "from memory (about +16 % at 20 A/cm); calibratable");
  REFERENCE_CHECK("viscosity per nitration", p.viscosity_per_nitration, 0.004, absolute, 1e-15, "per A/cm",
                  "from memory; calibratable");
  REFERENCE_CHECK("wetness width", t.wetness_width, 15, absolute, 1e-12, "K", "chosen (docs/model.md §5.3)");
  REFERENCE_CHECK("warm-up start load", t.warmup_start_load, 0.3, absolute, 1e-12, "-", "chosen (docs/model.md §5.2)");
  REFERENCE_CHECK("load ramp time", t.load_ramp_hours, 0.1, absolute, 1e-12, "h", "minutes, from memory");
  REFERENCE_CHECK("jacket water at start", op.jacket_water_at_start, 323.15, absolute, 1e-9, "K",
                  "preheated standby 40-60 degC, common practice, no source");
  REFERENCE_CHECK("O2 of air in the correction", op.nox.o2_air, 0.21, absolute, 1e-12, "mol/mol",
                  "21 % in EU permits and TA Luft, from memory");
}
