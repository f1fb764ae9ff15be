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
};

struct ParameterInfo {
  std::string key;   //!< case-file key, e.g. "model.so3-share"
  std::string unit;  //!< unit of the value in the core, e.g. "-", "K", "A/cm per h"
  Bound bound;
};

//! Every parameter that can be fitted or varied.
const std::vector<ParameterInfo>& parameter_table();
//! Looks a parameter up by key; throws InputError listing the keys.
const ParameterInfo& parameter(std::string_view key);
//! The parameter's value in a case (its first segment where it varies by segment).
double get_parameter(const EngineCase& c, std::string_view key);
//! Sets a parameter in a case (in every segment where it varies by segment).
void set_parameter(EngineCase& c, std::string_view key, double value);

//! The fit transform and its inverse and derivative dx/dφ.
double to_fit_space(Bound b, double x);
double from_fit_space(Bound b, double phi);
double dx_dphi(Bound b, double phi);

}  // namespace acidload
