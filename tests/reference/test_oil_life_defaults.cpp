// The defaults of the oil-life terms against where they come from (docs/model.md §15–§17): trade
// practice and second-hand standard guidance for the limits, chosen values for the calibratable terms.
#include "../support/reference_check.hpp"

#include "acidload/core/combustion.hpp"
#include "acidload/core/error.hpp"
#include "acidload/core/condemning_limits.hpp"
#include "acidload/core/oil.hpp"
#include "acidload/core/transfer.hpp"
#include "acidload/studies/trend.hpp"

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

TEST_CASE("alarm levels of the readings with limits: critical at the limit, caution before it") {
  const auto level = [](const std::vector<AlarmLevel>& v, const char* q) {
    for (const AlarmLevel& l : v)
      if (l.quantity == q) return l;
    FAIL("no level for " << q);
    return AlarmLevel{};
  };
  const std::vector<AlarmLevel> d = default_alarm_levels();
  // the critical levels are the default limits (docs/references.md [CondemningLimits], [ASTM-D7590], [ASTM-D7946])
  REFERENCE_CHECK("water critical level", level(d, "water").critical, 0.5, absolute, 1e-12, "%", "0.5 %, common practice, no source");
  REFERENCE_CHECK("water caution level", level(d, "water").caution, 0.1, absolute, 1e-12, "%",
                  "0.1 %, common practice, no source ([LabAlarmLevels])");
  REFERENCE_CHECK("viscosity change caution level", level(d, "viscosity-100").caution, 15, absolute, 1e-12, "% over fresh",
                  "+15 % before the +20 % limit, common practice, no source ([LabAlarmLevels])");
  REFERENCE_CHECK("antioxidant caution level", level(d, "antioxidant-remaining").caution, 50, absolute, 1e-12, "% of fresh",
                  "twice the 25 % limit, common practice, no source ([LabAlarmLevels])");
  REFERENCE_CHECK("i-pH caution level", level(d, "i-ph").caution, 5.0, absolute, 1e-12, "-",
                  "0.5 above the 4.5 limit, common practice, no source ([LabAlarmLevels])");
  // a case's own limits move both levels; the caution never passes the limit
  LimitSettings l;
  l.water = 0.002, l.viscosity_rise = 0.10, l.antioxidant_remaining = 0.60, l.initial_ph = 4.0;
  const std::vector<AlarmLevel> c = alarm_levels(l);
  CHECK(level(c, "water").critical == doctest::Approx(0.2));
  CHECK(level(c, "water").caution == doctest::Approx(0.04));
  CHECK(level(c, "viscosity-100").critical == doctest::Approx(10));
  CHECK(level(c, "viscosity-100").caution == doctest::Approx(7.5));
  CHECK(level(c, "antioxidant-remaining").critical == doctest::Approx(60));
  CHECK(level(c, "antioxidant-remaining").caution == doctest::Approx(100));  // twice 60, at most all of it
  CHECK(level(c, "i-ph").critical == doctest::Approx(4.0));
  CHECK(level(c, "i-ph").caution == doctest::Approx(4.5));
  CHECK_THROWS_AS(alarm_levels(l, {{"water", 0.1, 0.3, true, "user"}}), InputError);   // critical past 0.2 %
  CHECK_THROWS_AS(alarm_levels(l, {{"i-ph", 4.5, 3.9, false, "user"}}), InputError);  // below the 4.0 limit
  CHECK_THROWS_AS(alarm_levels(l, {{"antioxidant-remaining", 70, 50, false, "user"}}), InputError);
  CHECK_THROWS_AS(alarm_levels(l, {{"viscosity-100", 12, 15, true, "user"}}), InputError);
  CHECK(level(alarm_levels(l, {{"water", 0.05, 0.1, true, "user"}}), "water").critical == doctest::Approx(0.1));
  // the change over fresh, by hand from its definition: (16.0 − 13.2)/13.2 = 0.21212…
  REFERENCE_CHECK("viscosity change over fresh", viscosity_change(16.0, 13.2), 2.8 / 13.2, relative, 1e-14, "-",
                  "(nu - nu_fresh)/nu_fresh, worked by hand ([derived])");
  CHECK_THROWS_AS(viscosity_change(16.0, 0), InputError);
}
