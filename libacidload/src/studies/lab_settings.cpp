#include "acidload/studies/lab_settings.hpp"

#include <algorithm>

#include "acidload/core/error.hpp"

namespace acidload {

Precision overlay(Precision p, const PrecisionSetting& s) {
  if (s.tbn_d2896) p.tbn_d2896 = *s.tbn_d2896;
  if (s.tbn_d4739) p.tbn_d4739 = *s.tbn_d4739;
  if (s.tan) p.tan = *s.tan;
  if (s.san) p.san = *s.san;
  if (s.oxidation) p.oxidation = *s.oxidation;
  if (s.nitration) p.nitration = *s.nitration;
  return p;
}

const std::vector<std::string>& precision_readings() {
  static const std::vector<std::string> r = {"tbn-d2896", "tbn-d4739", "tan", "san", "oxidation", "nitration"};
  return r;
}

std::optional<double>& precision_field(PrecisionSetting& s, const std::string& reading) {
  if (reading == "tbn-d2896") return s.tbn_d2896;
  if (reading == "tbn-d4739") return s.tbn_d4739;
  if (reading == "tan") return s.tan;
  if (reading == "san") return s.san;
  if (reading == "oxidation") return s.oxidation;
  if (reading == "nitration") return s.nitration;
  throw InputError("precision", reading, "one of tbn-d2896, tbn-d4739, tan, san, oxidation, nitration");
}

void resolve_precision(FitSettings& fs, const LabSettings& lab, const PrecisionSetting& call,
                       const std::map<std::string, PrecisionSetting>& call_labs) {
  const Precision case_default = overlay(Precision{}, lab.precision);
  fs.precision = overlay(case_default, call);
  fs.lab_precision.clear();
  for (const auto& [name, o] : lab.labs)
    if (!o.precision.empty()) fs.lab_precision[name] = overlay(overlay(case_default, o.precision), call);
  for (const auto& [name, s] : call_labs) {
    const auto it = lab.labs.find(name);
    const Precision below = it == lab.labs.end() ? case_default : overlay(case_default, it->second.precision);
    fs.lab_precision[name] = overlay(overlay(below, call), s);
  }
}

void apply_lab_baselines(std::vector<LabSample>& samples, const LabSettings& lab) {
  for (LabSample& s : samples) {
    const auto it = lab.labs.find(s.lab);
    if (it == lab.labs.end()) continue;
    if (it->second.oxidation_baseline && !s.oxidation_baseline_given)
      s.oxidation_baseline = *it->second.oxidation_baseline, s.oxidation_baseline_given = true;
    if (it->second.nitration_baseline && !s.nitration_baseline_given)
      s.nitration_baseline = *it->second.nitration_baseline, s.nitration_baseline_given = true;
  }
}

std::vector<AlarmLevel> merged_levels(const LabSettings& lab, const std::vector<AlarmLevel>& user) {
  std::vector<AlarmLevel> out = lab.alarm_levels;
  for (const AlarmLevel& u : user) {
    auto it = std::find_if(out.begin(), out.end(), [&](const AlarmLevel& l) { return l.quantity == u.quantity; });
    if (it != out.end()) *it = u;
    else out.push_back(u);
  }
  return out;
}

}  // namespace acidload
