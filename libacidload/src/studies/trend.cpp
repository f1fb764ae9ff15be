#include "acidload/studies/trend.hpp"

#include <algorithm>
#include <cmath>
#include <cstdio>

#include "acidload/studies/inverse.hpp"

namespace acidload {

const std::vector<AlarmLevel>& default_alarm_levels() {
  // common practice for gas-engine oils, no source: trend them, and ask the engine maker and the oil
  // supplier for their condemning limits, which govern
  static const std::string cp = "common practice, no source";
  static const std::vector<AlarmLevel> t = {
      {"fe", 30, 50, true, cp},   {"cu", 25, 50, true, cp},  {"pb", 10, 20, true, cp},  {"al", 10, 20, true, cp},
      {"cr", 5, 10, true, cp},    {"sn", 5, 10, true, cp},   {"si", 15, 25, true, cp},  {"na", 25, 50, true, cp},
      {"k", 10, 20, true, cp},    {"water", 0.1, 0.2, true, cp}, {"viscosity-100", 15, 25, true, cp},
      {"soot", 0.5, 1.0, true, cp},
  };
  return t;
}

namespace {

std::string g3(double v) {
  char b[32];
  std::snprintf(b, sizeof b, "%.3g", v);
  return b;
}

const char* what_to_check(const std::string& q) {
  if (q == "fe" || q == "cr") return "liner, ring and gear wear: check with the engine maker";
  if (q == "cu" || q == "pb" || q == "sn") return "bearing or cooler wear, or corrosion by acids: check the acid load and the bearings";
  if (q == "al") return "piston or bearing wear";
  if (q == "si") return "dirt through the air filter, or siloxanes in the gas: check the filter and the gas treatment";
  if (q == "na" || q == "k") return "coolant in the oil: check the jacket-water circuit and the oil cooler";
  if (q == "water") return "water in the oil: check for coolant leaks and condensation (cold running)";
  if (q == "viscosity-100") return "viscosity change: oxidation, nitration, soot or dilution — check with the oil supplier";
  if (q == "soot") return "combustion: check the air-fuel ratio and the ignition";
  return "check with the oil supplier";
}

// Least-squares slope of y on t.
std::optional<double> slope(const std::vector<double>& t, const std::vector<double>& y, double* sxx) {
  if (t.size() < 2) return std::nullopt;
  double mt = 0, my = 0;
  for (std::size_t i = 0; i < t.size(); ++i) mt += t[i] / static_cast<double>(t.size()), my += y[i] / static_cast<double>(t.size());
  double sxy = 0, s = 0;
  for (std::size_t i = 0; i < t.size(); ++i) sxy += (t[i] - mt) * (y[i] - my), s += (t[i] - mt) * (t[i] - mt);
  if (!(s > 0)) return std::nullopt;
  if (sxx) *sxx = s;
  return sxy / s;
}

}  // namespace

TrendResult trend(const FitResult& fit, const std::vector<AlarmLevel>& user) {
  TrendResult out;
  const std::vector<LabSample>& s = fit.samples;
  if (s.empty()) return out;
  std::vector<AlarmLevel> levels = default_alarm_levels();
  for (const AlarmLevel& u : user) {
    auto it = std::find_if(levels.begin(), levels.end(), [&](const AlarmLevel& l) { return l.quantity == u.quantity; });
    if (it != levels.end()) *it = u;
    else levels.push_back(u);
  }
  int current = 0;
  for (const LabSample& x : s) current = std::max(current, x.charge);
  std::size_t latest = s.size();  // the latest sample of the latest charge with samples
  for (std::size_t i = 0; i < s.size(); ++i)
    if (s[i].charge == current && (latest == s.size() || s[i].oil_hours >= s[latest].oil_hours)) latest = i;

  // 1. the latest sample's modelled readings against the model's 90 % band, σ·√max(1, χ²ᵣ) wide
  const double widen = std::sqrt(std::max(1.0, fit.s2));
  for (const SampleResidual& r : fit.residuals) {
    if (r.sample != latest || r.censored) continue;
    if (std::fabs(r.standardized) > 1.6448536269514722 * widen) {
      Alarm a{r.sample, r.reading, "model", r.measured, r.predicted, ""};
      a.message = r.reading + " " + g3(r.measured) + " of the latest sample lies outside the model's 90 % band around " +
                  g3(r.predicted) + " (" + g3(r.standardized) + " sigma)";
      out.alarms.push_back(a);
    }
  }

  // 2. the current charge's TBN slope against the model's at the same times
  std::vector<double> t, y, ym;
  double sigma = 0;
  for (const SampleResidual& r : fit.residuals)
    if (r.reading == "tbn" && s[r.sample].charge == current) {
      t.push_back(s[r.sample].oil_hours), y.push_back(r.measured), ym.push_back(r.predicted);
      sigma = std::max(sigma, r.sigma);
    }
  double sxx = 0;
  out.tbn_slope = slope(t, y, &sxx);
  out.tbn_slope_model = slope(t, ym, nullptr);
  if (out.tbn_slope && out.tbn_slope_model && t.size() >= 3) {
    out.tbn_slope_error = sigma * widen / std::sqrt(sxx);
    const double m = *out.tbn_slope, mm = *out.tbn_slope_model, se = *out.tbn_slope_error;
    EngineCase last = fit.fitted;
    last.record = {fit.fitted.record.back()};
    const double h2s = lever_value(last, Lever::h2s_ppmv_dry);
    if (mm < 0) out.implied_h2s = h2s * m / mm;  // first order: the fall scales with the gas's sulfur
    const std::string implied = out.implied_h2s ? " (the slope implies about " + g3(*out.implied_h2s) + " ppmv H2S against " + g3(h2s) +
                                                      " ppmv in the record, to first order)"
                                                : "";
    if (m < mm - 1.6448536269514722 * se) {
      Alarm a{latest, "tbn", "model", m, mm, ""};
      a.message = "TBN is falling faster than the model's band (" + g3(m * 1000) + " against " + g3(mm * 1000) +
                  " mg KOH/g per 1000 h): acid load above the model: check H2S and scrubber breakthrough" + implied;
      out.alarms.push_back(a);
    } else if (m > mm + 1.6448536269514722 * se) {
      Alarm a{latest, "tbn", "model", m, mm, ""};
      a.message = "TBN is falling slower than the model's band (" + g3(m * 1000) + " against " + g3(mm * 1000) +
                  " mg KOH/g per 1000 h): acid load below the model" + implied + "; do not extend the drain interval without lab confirmation";
      out.alarms.push_back(a);
    }
  }

  // 3. readings with alarm levels
  for (std::size_t i = 0; i < s.size(); ++i) {
    for (const AlarmLevel& l : levels) {
      std::optional<double> v;
      std::string unit;
      if (l.quantity == "viscosity-100") {  // the change from the charge's first sample with a reading
        const auto it = s[i].trended.find(l.quantity);
        if (it == s[i].trended.end()) continue;
        const LabSample* first = nullptr;
        for (const LabSample& x : s)
          if (x.charge == s[i].charge && x.trended.count(l.quantity) && (!first || x.oil_hours < first->oil_hours)) first = &x;
        if (!first || first == &s[i] || !(first->trended.at(l.quantity) > 0)) continue;
        v = std::fabs(it->second / first->trended.at(l.quantity) - 1) * 100;
        unit = " % change";
      } else if (l.quantity == "tbn") {
        v = s[i].tbn, unit = " mg KOH/g";
      } else if (l.quantity == "tan") {
        v = s[i].tan, unit = " mg KOH/g";
      } else if (l.quantity == "i-ph") {
        v = s[i].initial_ph;
      } else {
        const auto it = s[i].trended.find(l.quantity);
        if (it != s[i].trended.end()) v = it->second;
        unit = l.quantity == "water" || l.quantity == "soot" ? " %" : " ppm";
      }
      if (!v) continue;
      const auto past = [&](double lim) { return l.rising ? *v >= lim : *v <= lim; };
      const char* level = past(l.critical) ? "critical" : past(l.caution) ? "caution" : nullptr;
      if (!level) continue;
      Alarm a{i, l.quantity, level, *v, std::string(level) == "critical" ? l.critical : l.caution, ""};
      a.message = l.quantity + " " + g3(*v) + unit + " in sample " + std::to_string(i + 1) + " (" + s[i].where + ") is at or " +
                  (l.rising ? "above" : "below") + " its " + level + " level " + g3(a.limit) + " (" + l.basis + "): " +
                  what_to_check(l.quantity);
      out.alarms.push_back(a);
    }
  }
  return out;
}

}  // namespace acidload
