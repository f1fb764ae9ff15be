#pragma once
// Inverse questions: the value of one lever that gives a target drain interval, found by
// bracketing root-finding on the exact forward model. "No answer in the range" is an answer.
#include <atomic>
#include <optional>
#include <string>
#include <string_view>
#include <vector>

#include "acidload/studies/whatif.hpp"

namespace acidload {

//! What an inverse question may vary.
enum class Lever {
  h2s_ppmv_dry,       //!< H2S in the fuel [ppmv, dry], every segment; power and efficiency kept
  fresh_tbn,          //!< fresh-oil base number by the oil's method [mg KOH/g]
  jacket_water_out,   //!< jacket-water outlet temperature, every segment [K]
  oil_volume,         //!< oil in circulation at 15 °C [m³]
};
std::string_view name(Lever l);  //!< "h2s", "fresh-tbn", "jacket-water-out", "oil-volume"
//! The case key a lever sets, as fit and uncertainty name it: "fuel.h2s", "oil.fresh-tbn",
//! "engine.jacket-water-out", "oil.volume" (each a parameter of studies/parameters.hpp).
std::string_view case_key(Lever l);
//! Every lever, in the order solve lists them.
inline constexpr Lever all_levers[] = {Lever::h2s_ppmv_dry, Lever::fresh_tbn, Lever::jacket_water_out, Lever::oil_volume};
//! The lever name() calls `word`; nullopt for any other word.
std::optional<Lever> lever_named(std::string_view word);

//! Where an inverse question searches when no range is given, and to what tolerance, in the lever's
//! unit: the one set of defaults of the program's `solve` and the Python package.
struct LeverSearch {
  double low = 0, high = 0;  //!< the range searched
  double tolerance = 0;      //!< of the answer
};
LeverSearch default_search(const EngineCase& c, Lever l);

//! The case with one lever set to `value` (in the lever's unit).
EngineCase with_lever(const EngineCase& c, Lever l, double value);
//! The lever's value in a case (of its first segment).
double lever_value(const EngineCase& c, Lever l);

//! The drain interval of a case [h]: the oil hours at its first oil-condition limit; none when no such
//! limit is reached within the plant's planned maximum (limits.max-hours, a horizon, docs/model.md §9)
//! or the record — "no limit within N h", never the horizon counted as an interval.
std::optional<double> drain_interval(const EngineCase& c);

//! drain_interval() of the case with the lever at each of `n` values [h], NaN where no limit is reached
//! within the planned maximum ("no limit within N h"), on `threads` threads
//! (0 = every core). Each value is its own run, so the answers are identical whatever the thread
//! count. A refused value throws the InputError of the lowest refused element, naming its index.
//! When `stop` is given and becomes true, the sweep ends early (within one block of values per
//! thread) and throws acidload::Error("sweep interrupted").
std::vector<double> sweep_drain_interval(const EngineCase& c, Lever l, const double* values, std::size_t n, int threads = 0,
                                         const std::atomic<bool>* stop = nullptr);

struct InverseAnswer {
  bool found = false;         //!< a value in [low, high] meets the target
  double value = 0;           //!< that value, in the lever's unit
  std::optional<double> interval_at_value;  //!< the forward model's interval there [h]
  //! at the ends of the range [h]; none: no limit within the planned maximum there
  std::optional<double> interval_at_low, interval_at_high;
  bool jump = false;          //!< no answer because the interval jumps over the target, near `value`
  std::optional<double> jump_from, jump_to;  //!< the interval just below and just above that value [h]; none: no limit
  std::string reason;         //!< why there is no answer, in plain words
  int evaluations = 0;        //!< forward runs used
};

//! The lever value in [low, high] at which the drain interval equals `target_hours`, to `tolerance`
//! in the lever's unit (TOMS 748 bracketing). If the target lies outside what the range gives, the
//! answer says so plainly instead of extrapolating. A target at or beyond the planned maximum, or one
//! the interval jumps over (from a limit straight to "no limit within N h", or from one limit to
//! another), has no answer either, and the reason says which.
InverseAnswer solve_for_interval(const EngineCase& c, Lever lever, double target_hours, double low, double high,
                                 double tolerance);

}  // namespace acidload
