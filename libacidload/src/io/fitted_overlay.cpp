// Fitted parameters written as an overlay: see acidload/io/fitted_overlay.hpp.
#include "acidload/io/fitted_overlay.hpp"

#include <algorithm>
#include <cstdio>
#include <map>

#include "acidload/core/version.hpp"
#include "acidload/io/results.hpp"

namespace acidload::io {

namespace {
std::string g(double v) {
  char b[40];
  std::snprintf(b, sizeof b, "%.9g", v);
  return b;
}
// The value as a case file writes it.
std::string written(const std::string& key, double v) {
  static const std::map<std::string, std::string> unit = {
      {"model.liner-wall-rise", "K"},           {"model.oxidation-rate", "A/cm/h"},
      {"model.ring-zone-offset", "K"},          {"model.weak-base-d2896", "mg KOH/g"},
      {"model.weak-base-d4739", "mg KOH/g"},    {"model.base-floor", "mg KOH/g"},
      {"model.additive-depletion", "1/h"},      {"engine.jacket-water-out", "K"},
      {"oil.fresh-tbn", "mg KOH/g"},            {"oil.volume", "m3"},
      {"fuel.h2s", "ppmv"},                     {"model.induction-time", "h"}};
  static const std::vector<std::string> bare = {"model.wet-so2-factor", "model.organic-acid-yield", "model.nitration-yield",
                                                "model.depleted-oxidation-factor", "model.viscosity-per-oxidation",
                                                "model.viscosity-per-nitration"};
  const auto it = unit.find(key);
  if (it != unit.end()) return g(v) + " " + it->second;
  if (std::find(bare.begin(), bare.end(), key) != bare.end()) return g(v);
  return g(v * 100) + " %";  // the shares
}
}  // namespace

std::string overlay_text(const FitResult& fit, const std::string& case_file, const std::string& lab_file) {
  std::map<std::string, std::vector<std::pair<std::string, std::string>>> sections;
  for (const FittedParameter& p : fit.parameters) {
    const auto dot = p.key.find('.');
    sections[p.key.substr(0, dot)].push_back({p.key.substr(dot + 1), written(p.key, p.estimate) + "   # ± " +
                                                                      written(p.key, p.standard_error) + " (1 standard error)"});
  }
  std::string o = overlay_signature + std::string(version()) + " to " + lab_file + " for " + case_file + ".\n" +
                  "# Apply with: acidload run " + case_file + " --overlay <this file>\n" +
                  "# Reduced chi-square " + g(fit.s2) + " on " + std::to_string(fit.degrees_of_freedom) +
                  " degrees of freedom. Estimates support, not replace, lab analysis and the engine maker's limits.\n" +
                  "format-version: 1\n";
  for (const auto& [section, entries] : sections) {
    o += section + ":\n";
    for (const auto& [k, v] : entries) o += "  " + k + ": " + v + "\n";
  }
  return o;
}

void write_overlay(const std::string& path, const FitResult& fit, const std::string& case_file, const std::string& lab_file,
                   const std::vector<std::string>& other_inputs) {
  std::vector<std::string> inputs{case_file, lab_file};
  inputs.insert(inputs.end(), other_inputs.begin(), other_inputs.end());
  write_owned_file(path, overlay_text(fit, case_file, lab_file), overlay_signature, inputs);
}

}  // namespace acidload::io
