#pragma once
// The forecast of the current charge from a fit: hours left to each limit with a band.
#include <vector>

#include "acidload/core/limits.hpp"
#include "acidload/studies/calibration.hpp"

namespace acidload {

//! Remaining hours of the current (last) charge to each limit, running on under the record's last
//! segment, with a 90 % band from the parameter covariance (linearised, ±1.645 σ).
struct LimitForecast {
  Limit limit = Limit::tbn_fall;
  bool reached = false;          //!< reached within the hours cap
  bool already = false;          //!< reached before the end of the record (remaining is then 0)
  double remaining = 0;          //!< hours from the end of the record [h]
  double low = 0, high = 0;      //!< 90 % band [h]
};
std::vector<LimitForecast> forecast(const FitResult& fit);

}  // namespace acidload
