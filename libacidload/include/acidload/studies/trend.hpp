#pragma once
// Trending and alarms on the lab history after a fit: each modelled reading against the model's band,
// the current charge's TBN slope against the model's (with the H2S it implies), and every reading
// with alarm levels (wear metals, silicon, water, viscosity, TAN, …) against its caution and critical
// levels. The rules are in docs/lab-results.md.
#include <optional>
#include <string>
#include <vector>

#include "acidload/studies/calibration.hpp"

namespace acidload {

//! Caution and critical levels of one quantity.
struct AlarmLevel {
  std::string quantity;      //!< a lab column: "fe", "si", "water", "viscosity-100", "tan", "tbn" …
  double caution = 0, critical = 0;  //!< in the column's unit; for viscosity-100 the change over fresh [%] (over the
                                     //!< charge's first sample where the lab file gives no viscosity-100-fresh)
  bool rising = true;        //!< alarms at or above the levels (false: at or below, e.g. TBN)
  std::string basis;         //!< where the figures come from ("common practice, no source" for the defaults)
};
//! The default levels (common practice for gas-engine oils, no source; the engine maker's and the
//! oil supplier's condemning limits govern), for the default limits (LimitSettings{}).
const std::vector<AlarmLevel>& default_alarm_levels();

//! The levels a case's trend uses: the defaults, the four readings the case has limits for bound to
//! them (critical = the limit; caution: water 20 % of its limit, viscosity change 75 % of its limit,
//! antioxidant remaining twice its limit, at most 100 %, i-pH 0.5 above its limit; docs/lab-results.md),
//! then `user` quantity by quantity. A user level beyond the case's limit is refused (InputError): a
//! caution or critical level never lies past the limit that ends the charge.
std::vector<AlarmLevel> alarm_levels(const LimitSettings& limits, const std::vector<AlarmLevel>& user = {});

//! The fresh oil's kinematic viscosity at 100 °C for sample i [cSt]: its own viscosity-100-fresh cell,
//! else the first one given in another sample of the same charge; none when no sample of it gives one.
std::optional<double> fresh_viscosity(const std::vector<LabSample>& s, std::size_t i);
//! Sample i's viscosity change at 100 °C over the fresh oil's [-] (viscosity_change()), when it has a
//! viscosity-100 reading and fresh_viscosity() gives the fresh oil's.
std::optional<double> sample_viscosity_change(const std::vector<LabSample>& s, std::size_t i);

struct Alarm {
  std::size_t sample = 0;    //!< index into the fit's samples
  std::string quantity;
  std::string level;         //!< "caution", "critical", or "model" (outside the model's band)
  double value = 0, limit = 0;
  std::string message;       //!< plain words, with what to check
};

struct TrendResult {
  std::vector<Alarm> alarms;
  //! The current charge's TBN slope [mg KOH/g per h], measured (least squares over its samples) and
  //! as the model has it at the same times, with the measured slope's standard error.
  std::optional<double> tbn_slope, tbn_slope_model, tbn_slope_error;
  std::optional<double> implied_h2s;  //!< the H2S the measured slope implies [ppmv dry] (first order: the
                                      //!< TBN fall scales with the gas's sulfur)
};

//! The trend of the fit's samples against alarm_levels(the fitted case's limits, `levels`).
TrendResult trend(const FitResult& fit, const std::vector<AlarmLevel>& levels = {});

}  // namespace acidload
