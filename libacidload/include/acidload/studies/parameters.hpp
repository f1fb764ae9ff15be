#pragma once
// Named parameters of an engine case, by their case-file keys: what calibration fits and what
// Monte Carlo varies. Values in the core's units (a share as a fraction, temperatures in K …).
#include <string>
#include <string_view>
#include <vector>

#include "acidload/studies/whatif.hpp"

namespace acidload {

//! How a parameter is bounded, which sets the transform a fit works in.
enum class Bound {
  positive,  //!< (0, ∞): fitted as log(x)
  share,     //!< (0, 1): fitted as logit(x)
  free,      //!< (−∞, ∞): fitted as x
  interval,  //!< (low, high): fitted as logit((x − low)/(high − low))
};

struct ParameterInfo {
  std::string key;   //!< case-file key, e.g. "model.so3-share"
  std::string unit;  //!< unit of the value in the core, e.g. "-", "K", "A/cm per h"
  Bound bound;
  double low = 0, high = 0;  //!< the range the model accepts (Bound::interval), core unit
  //! Weak prior of a fit: one standard deviation in fit space around the case's value
  //! (ln 10 for a log-fitted parameter: a factor of 10 either way; 2 in logit). Ours; the key
  //! registry (io/keys.hpp) carries it with the key, and docs/case-format.md and the lab-results
  //! table are written from there. It keeps flat or confounded directions defined, not the estimate.
  double prior_sd = 2.302585092994046;
  std::string prior_basis;  //!< where σ comes from, in plain words ("chosen: …")
};

//! Every parameter that can be fitted or varied.
const std::vector<ParameterInfo>& parameter_table();
//! Looks a parameter up by key; throws InputError listing the keys.
const ParameterInfo& parameter(std::string_view key);
//! The parameter's value in a case (its first segment where it varies by segment).
double get_parameter(const EngineCase& c, std::string_view key);
//! Sets a parameter in a case (in every segment where it varies by segment).
void set_parameter(EngineCase& c, std::string_view key, double value);

//! The fit transform and its inverse and derivative dx/dφ. Every φ maps inside the range, so a
//! fit's step can never leave it; from_fit_space keeps x strictly inside (φ is capped at ±40).
double to_fit_space(const ParameterInfo& p, double x);
double from_fit_space(const ParameterInfo& p, double phi);
double dx_dphi(const ParameterInfo& p, double phi);
//! x moved strictly inside the parameter's range (by 0.1 % of the range, or to 1e-9 above 0), so
//! that a value on a bound (a weak base of 0) can start a fit.
double inside_range(const ParameterInfo& p, double x);
//! The range in words, e.g. "from 1 to 100" or "above 0".
std::string range_text(const ParameterInfo& p);
//! The fit space in words: "log", "logit" or "logit of the range" (or "linear").
std::string fit_space_text(const ParameterInfo& p);

}  // namespace acidload
