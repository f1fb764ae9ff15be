#include "acidload/studies/trend.hpp"

#include <algorithm>
#include <cmath>
#include <cstdio>

#include "acidload/core/error.hpp"
#include "acidload/studies/inverse.hpp"

namespace acidload {

namespace {
std::string fmt_level(double v) {
  char b[32];
  std::snprintf(b, sizeof b, "%.3g", v);
  return b;
}

// common practice for gas-engine oils, no source: trend them, and ask the engine maker and the oil
// supplier for their condemning limits, which govern
const std::vector<AlarmLevel>& unbound_levels() {
  static const std::string cp = "common practice, no source";
  static const std::vector<AlarmLevel> t = {
      {"fe", 30, 50, true, cp},   {"cu", 25, 50, true, cp},  {"pb", 10, 20, true, cp},  {"al", 10, 20, true, cp},
      {"cr", 5, 10, true, cp},    {"sn", 5, 10, true, cp},   {"si", 15, 25, true, cp},  {"na", 25, 50, true, cp},
      {"k", 10, 20, true, cp},    {"soot", 0.5, 1.0, true, cp},
  };
  return t;
}
}  // namespace

const std::vector<AlarmLevel>& default_alarm_levels() {
  static const std::vector<AlarmLevel> t = alarm_levels(LimitSettings{});
  return t;
}

std::vector<AlarmLevel> alarm_levels(const LimitSettings& L, const std::vector<AlarmLevel>& user) {
  std::vector<AlarmLevel> levels = unbound_levels();
  // bound to the case's limits: critical is the limit (the forecast's "change the oil now"), caution
  // before it (the proportions: common practice, no source; docs/references.md [LabAlarmLevels])
  const std::string b = "the case's limit; caution before it: common practice, no source";
  const double water = 100 * L.water, visc = 100 * L.viscosity_rise, aox = 100 * L.antioxidant_remaining;
  levels.push_back({"water", 0.2 * water, water, true, "limits.water " + fmt_level(water) + " %: " + b});
  levels.push_back({"viscosity-100", 0.75 * visc, visc, true, "limits.viscosity-change +" + fmt_level(visc) + " %: " + b});
  levels.push_back({"antioxidant-remaining", std::min(100.0, 2 * aox), aox, false,
                    "limits.antioxidant-remaining " + fmt_level(aox) + " %: " + b});
  levels.push_back({"i-ph", L.initial_ph + 0.5, L.initial_ph, false, "limits.initial-ph " + fmt_level(L.initial_ph) + ": " + b});
  for (const AlarmLevel& u : user) {
    auto it = std::find_if(levels.begin(), levels.end(), [&](const AlarmLevel& l) { return l.quantity == u.quantity; });
    if (it != levels.end() && it->basis.rfind("limits.", 0) == 0) {
      const double lim = it->critical;  // the case's limit
      const bool beyond = u.rising ? (u.caution > lim || u.critical > lim) : (u.caution < lim || u.critical < lim);
      if (u.rising != it->rising || beyond)
        throw InputError("alarm level " + u.quantity, fmt_level(u.caution) + " / " + fmt_level(u.critical),
                         std::string("a caution and a critical level at or ") + (it->rising ? "below" : "above") +
                             " the case's limit " + it->basis.substr(0, it->basis.find(':')) +
                             ", which ends the charge: a level is never beyond the limit");
    }
    if (it != levels.end()) *it = u;
    else levels.push_back(u);
  }
  return levels;
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
  if (q == "antioxidant-remaining") return "antioxidant spent: oxidation will speed up — plan the oil change, check the oil temperature";
  if (q == "i-ph") return "strong acid in the oil: check H2S and halogens in the gas and the scrubber, plan the oil change";
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

std::optional<double> fresh_viscosity(const std::vector<LabSample>& s, std::size_t i) {
  const auto own = s[i].trended.find("viscosity-100-fresh");
  if (own != s[i].trended.end()) return own->second;
  for (const LabSample& x : s)
    if (x.charge == s[i].charge)
      if (const auto it = x.trended.find("viscosity-100-fresh"); it != x.trended.end()) return it->second;
  return std::nullopt;
}

std::optional<double> sample_viscosity_change(const std::vector<LabSample>& s, std::size_t i) {
  const auto it = s[i].trended.find("viscosity-100");
  const std::optional<double> fresh = fresh_viscosity(s, i);
  if (it == s[i].trended.end() || !fresh || !(it->second > 0)) return std::nullopt;
  return viscosity_change(it->second, *fresh);
}

TrendResult trend(const FitResult& fit, const std::vector<AlarmLevel>& user) {
  TrendResult out;
  const std::vector<LabSample>& s = fit.samples;
  if (s.empty()) return out;
  const std::vector<AlarmLevel> levels = alarm_levels(fit.fitted.model.limits, user);
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
      if (l.quantity == "viscosity-100" && sample_viscosity_change(s, i)) {  // the change over the fresh oil's
        v = 100 * *sample_viscosity_change(s, i);
        unit = " % over fresh (" + g3(s[i].trended.at("viscosity-100")) + " cSt against " + g3(*fresh_viscosity(s, i)) + " cSt)";
      } else if (l.quantity == "viscosity-100") {  // no fresh oil's figure: the change from the charge's first sample
        const auto it = s[i].trended.find(l.quantity);
        if (it == s[i].trended.end()) continue;
        const LabSample* first = nullptr;
        for (const LabSample& x : s)
          if (x.charge == s[i].charge && x.trended.count(l.quantity) && (!first || x.oil_hours < first->oil_hours)) first = &x;
        if (!first || first == &s[i] || !(first->trended.at(l.quantity) > 0)) continue;
        v = std::fabs(it->second / first->trended.at(l.quantity) - 1) * 100;
        unit = " % change from the charge's first sample (the lab file gives no viscosity-100-fresh)";
      } else if (l.quantity == "tbn") {
        v = s[i].tbn, unit = " mg KOH/g";
      } else if (l.quantity == "tan") {
        v = s[i].tan, unit = " mg KOH/g";
      } else if (l.quantity == "i-ph") {
        v = s[i].initial_ph;
      } else {
        const auto it = s[i].trended.find(l.quantity);
        if (it != s[i].trended.end()) v = it->second;
        unit = l.quantity == "water" || l.quantity == "soot" ? " %" : l.quantity == "antioxidant-remaining" ? " % of fresh" : " ppm";
      }
      if (!v) continue;
      // as the limit reads: water ends the charge above its limit, the others at it (limits.water)
      const bool strict = l.quantity == "water";
      const auto past = [&](double lim) { return l.rising ? (strict ? *v > lim : *v >= lim) : *v <= lim; };
      const char* level = past(l.critical) ? "critical" : past(l.caution) ? "caution" : nullptr;
      if (!level) continue;
      Alarm a{i, l.quantity, level, *v, std::string(level) == "critical" ? l.critical : l.caution, ""};
      a.message = l.quantity + " " + g3(*v) + unit + " in sample " + std::to_string(i + 1) + " (" + s[i].where + ") is " + (strict ? "" : "at or ") +
                  (l.rising ? "above" : "below") + " its " + level + " level " + g3(a.limit) + " (" + l.basis + "): " +
                  what_to_check(l.quantity);
      out.alarms.push_back(a);
    }
  }
  return out;
}

}  // namespace acidload
