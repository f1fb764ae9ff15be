#pragma once
// From a fit to the oil change: the lab-first forecast of the current charge (the model state
// updated by the latest sample, limits the sample has passed reached now) and the prediction of
// the next charge's drain interval (or the current one's) with one honest band. The model is in
// docs/lab-results.md.
#include <array>
#include <cstdint>
#include <optional>
#include <string>
#include <vector>

#include "acidload/core/condemning_limits.hpp"
#include "acidload/studies/calibration.hpp"

namespace acidload {

//! What the forecast takes beside the case. The lab-only limits (water, i-pH) are the case's
//! (`limits.water`, `limits.initial-ph`, in LimitSettings) like every other limit.
struct LabLimits {
  std::optional<double> initial_ph;  //!< overrides limits.initial-ph when set [-]; empty: the case's
  double sample_interval = 250;  //!< regular sampling interval [h] (common practice, no source)
};

//! One limit of the current charge.
struct LimitForecast {
  Limit limit = Limit::tbn_fall;
  std::string key;               //!< name(limit), or "i-ph" / "water" for the lab-only limits
  bool reached = false;          //!< reached within the planned maximum (the horizon)
  bool already = false;          //!< the latest sample (or the record) has passed it: change the oil now
  double remaining = 0;          //!< hours from the end of the record [h]; +∞ if not reached
  double low = 0, high = 0;      //!< 90 % band [h] (linearised from the covariance and the priors below)
  std::string why;               //!< for an `already` limit: the reading against the limit, in words
  //! The parameters not fitted that move this limit (prior_band_parameters()), each carrying its
  //! prior's spread into the band; prior_driven when they make up most of its variance (the band
  //! then says what the priors allow, not what the lab measured).
  std::vector<std::string> prior_from;
  bool prior_driven = false;
};

//! The model's oil-ageing parameters no modelled reading of a lab report pins (the antioxidant's
//! induction time, the oxidation after it, the viscosity rises, the anti-wear additive's loss): not
//! fitted, each carries its weak prior (ParameterInfo::prior_sd, ±1.645 σ in fit space) into the
//! forecast's band of the limits it drives (prior_band_drivers), so that no limit gets a zero-width band.
const std::vector<std::string>& prior_band_parameters();
//! The limits a parameter of prior_band_parameters() drives (antioxidant, oxidation and viscosity by
//! the induction time; oxidation and viscosity by the depleted factor; viscosity by its rises; anti-wear).
std::vector<Limit> prior_band_drivers(const std::string& key);

//! The lab-first update at the latest sample, per reading.
struct StateUpdate {
  std::string reading;           //!< "tbn", "tan", "san", "oxidation", "nitration"
  double model = 0, measured = 0, updated = 0;  //!< the reading as the model has it, as measured, after the update
  double gain = 0;               //!< the reading's own share of its innovation, (H·K)ᵢᵢ [-]
};

//! The joint (Kalman-type) lab-first update, docs/model.md §13.1: the state vector v (`state`, in
//! mg KOH/g and A/cm), y = H·v, P = J·C·Jᵀ + H⁺·D·H⁺ᵀ, K = P·Hᵀ·(H·P·Hᵀ + R)⁻¹, v⁺ = v + K·(y − H·v).
struct KalmanUpdate {
  std::vector<std::string> state;               //!< names of v's components
  std::vector<double> prior, posterior;         //!< v at the sample as the model has it, and after the update (before the ≥ 0 clamps)
  std::vector<std::vector<double>> sensitivity; //!< J = ∂v/∂φ (state × fitted parameters)
  std::vector<std::vector<double>> covariance;  //!< P (state × state), cross-terms included
  std::vector<std::vector<double>> reading_matrix;  //!< H (readings × state)
  std::vector<std::vector<double>> gain;        //!< K (state × readings)
  std::vector<std::string> readings;            //!< the readings used, in H's row order
  std::vector<double> measured, sigma;          //!< y (FTIR less the lab's baseline) and the precisions σ
  double extra_variance_factor = 0;             //!< (χ²ᵣ − 1)₊: D = this · diag(σ²)
};

struct Forecast {
  std::vector<LimitForecast> limits;  //!< every enabled modelled limit, then i-pH and water when the latest sample has them
  bool change_now = false;            //!< some limit is already passed
  bool lab_first = false;             //!< the state was updated by a sample of the current charge
  std::size_t latest_sample = 0;      //!< index of the sample the update used
  double start_oil_hours = 0;         //!< oil hours of that sample [h]
  double end_oil_hours = 0;           //!< oil hours at the end of the record [h]
  std::vector<StateUpdate> update;
  KalmanUpdate kalman;                //!< the update's matrices
  OilState start;                     //!< the updated state at the sample
  double next_sample_in = 0;          //!< hours from the end of the record to the next sample due [h]
  std::vector<std::string> warnings;  //!< the fit's (χ²) and the forecast's
};

//! The lab-first forecast of the current (last) charge, running on under the record's last segment.
Forecast forecast_current(const FitResult& fit, const LabLimits& lab = {});
//! The same, its limits only (kept for callers of the first version).
std::vector<LimitForecast> forecast(const FitResult& fit);

//! What predict_charge runs.
struct PredictSettings {
  bool next_charge = true;        //!< the next charge (after an oil change at the end of the record), else the current one continued
  std::vector<Segment> conditions;  //!< planned operation, in order, the last continued to the planned maximum; empty: the record's last segment
  int draws = 400;                //!< parameter draws from the fit's covariance
  std::uint64_t seed = 1;
  bool model_form = true;         //!< add the spread of predicting each past charge from the others
  bool lab_first = true;          //!< start the current charge from the lab-first state
  LabLimits lab;
};

//! A past charge predicted from the others (leave-one-charge-out).
struct HeldOutCharge {
  int charge = 0;                 //!< 0-based
  double own = 0;                 //!< its interval fitted on its own samples [h]
  double from_others = 0;         //!< its interval predicted from the other charges' samples [h]
};

struct Prediction {
  bool next_charge = true;
  double interval = 0;            //!< drain interval at the fit's estimates [h] (oil hours of the charge)
  std::optional<Limit> limit;     //!< the limit that ends it there (none: no limit within the planned maximum)
  double p5 = 0, p50 = 0, p95 = 0;  //!< the interval's band [h]; P5 is the pessimistic end (the earlier change)
  double remaining_p5 = 0, remaining_p50 = 0, remaining_p95 = 0;  //!< current charge: hours from the end of the record [h]
  std::array<int, limit_count> ending{};  //!< how many draws end by each limit
  double parameter_spread = 0;    //!< σ of ln(interval) from the parameters [-]
  double model_form_spread = 0;   //!< σ of ln(interval) from the held-out charges [-]
  double model_form_excess = 0;   //!< what of it exceeds the parameter spread, √(σ_m² − σ_p²)₊: the model-form error drawn [-]
  std::vector<HeldOutCharge> held_out;
  int draws = 0;
  std::vector<double> intervals;  //!< per draw [h]
  Forecast current;               //!< the lab-first forecast of the current charge
  std::vector<std::string> notes, warnings;
};

//! The drain interval of the next charge (or the current one continued) with one band for it:
//! draws from the joint covariance in fit space (always within range), each widened by a
//! model-form error of ln(interval) drawn from a Student t whose scale is the leave-one-charge-out
//! spread of the past charges.
Prediction predict_charge(const FitResult& fit, const PredictSettings& s = {});

}  // namespace acidload
