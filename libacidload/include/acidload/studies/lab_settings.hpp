#pragma once
// The lab settings of a case (its `lab` section, docs/lab-results.md "Lab settings in the case"):
// the default precision per reading, per-lab precision and FTIR baselines by the lab's name as the
// lab file writes it, and alarm levels per quantity. Each figure is optional: one not stated falls
// to the layer below. Precedence, highest first: a row's `*-sd` column > the call's precision
// (CLI --precision, Python precision=; Python lab_precision= above it for its lab) > the case's
// per-lab precision > the case's default precision > the built-in defaults (Precision{}).
#include <map>
#include <optional>
#include <string>
#include <vector>

#include "acidload/studies/calibration.hpp"
#include "acidload/studies/trend.hpp"

namespace acidload {

//! Precision figures, each stated or not (one standard deviation, in the reading's unit).
struct PrecisionSetting {
  std::optional<double> tbn_d2896, tbn_d4739, tan, san, oxidation, nitration;  //!< [mg KOH/g], FTIR [A/cm]
  bool empty() const { return !tbn_d2896 && !tbn_d4739 && !tan && !san && !oxidation && !nitration; }
};
//! `p` with the stated figures of `s` put in.
Precision overlay(Precision p, const PrecisionSetting& s);
//! The reading names the settings use ("tbn-d2896", "tbn-d4739", "tan", "san", "oxidation", "nitration").
const std::vector<std::string>& precision_readings();
//! The stated figure of a reading by its name (precision_readings()); throws InputError for another name.
std::optional<double>& precision_field(PrecisionSetting& s, const std::string& reading);

//! One laboratory's settings in the case.
struct LabOverride {
  PrecisionSetting precision;
  //! The lab's FTIR reading of the fresh oil [A/cm]: given to that lab's samples whose row states none.
  std::optional<double> oxidation_baseline, nitration_baseline;
};

struct LabSettings {
  PrecisionSetting precision;                //!< the default for every lab
  std::map<std::string, LabOverride> labs;   //!< by the lab's name as the lab file writes it
  //! Caution and critical levels per quantity (trend and forecast), over the common-practice defaults;
  //! those past the case's limit are refused (alarm_levels()).
  std::vector<AlarmLevel> alarm_levels;
};

//! The precision a fit uses (FitSettings::precision and ::lab_precision) after the precedence above.
//! `call_labs`: per-lab figures of the call (Python lab_precision=), above `call` for their lab.
void resolve_precision(FitSettings& fs, const LabSettings& lab, const PrecisionSetting& call = {},
                       const std::map<std::string, PrecisionSetting>& call_labs = {});

//! The case's per-lab FTIR baselines given to the samples of that lab whose row states none
//! (LabSample::*_baseline_given false): a row's own baseline wins over the case's.
void apply_lab_baselines(std::vector<LabSample>& samples, const LabSettings& lab);

//! The case's alarm levels with `user` (a call's, e.g. Python trend(levels=…)) put over them quantity by quantity.
std::vector<AlarmLevel> merged_levels(const LabSettings& lab, const std::vector<AlarmLevel>& user);

}  // namespace acidload
