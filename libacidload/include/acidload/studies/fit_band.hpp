#pragma once
// The fitted model's readings over the whole record with a band from the parameter covariance:
// what the report draws through the lab points.
#include <vector>

#include "acidload/studies/calibration.hpp"

namespace acidload {

//! One reading along the record: the fitted curve and its band.
struct ReadingBand {
  std::vector<double> value, low, high;  //!< per trajectory point, in the reading's unit
};

//! The fitted case's trajectory with bands for TBN (both methods), TAN, SAN and oxidation.
struct TrajectoryBand {
  std::vector<double> engine_hours;  //!< since the start of the record [h]
  std::vector<int> charge;           //!< which charge (0 = the first)
  ReadingBand tbn_d2896, tbn_d4739, tan, san, oxidation;  //!< [mg KOH/g], oxidation [A/cm]
  double z = 0;                      //!< the band is ±z standard deviations
};

//! Linearised band: var y(t) = g(t)ᵀ Σ g(t), g the central-difference derivative of the reading in fit
//! space and Σ the fit's covariance (the delta method, as forecast() uses); half-width z·√var, the
//! band's low end clipped at 0. z = 1.645 gives a 90 % two-sided band for a normal error.
TrajectoryBand trajectory_band(const FitResult& fit, double z = 1.6448536269514722);

}  // namespace acidload
