// Fitted parameters written as an overlay: see acidload/io/fitted_overlay.hpp.
#include "acidload/io/fitted_overlay.hpp"

#include <cstdio>
#include <map>

#include "acidload/core/version.hpp"
#include "acidload/io/keys.hpp"
#include "acidload/io/results.hpp"

namespace acidload::io {

namespace {
std::string g(double v) {
  char b[40];
  std::snprintf(b, sizeof b, "%.9g", v);
  return b;
}
// The value as a case file writes it, in the unit the registry (io/keys) shows the key in. The fit's
// values are in the parameter table's units (studies/parameters.cpp), which are the core's units of
// the key's kind, except for the two keys the fit varies in other terms: fuel.h2s (ppmv dry, the
// lever's unit) and oil.consumption (kg/h of the first segment; the case reads kg/h at the engine's
// power). `spread`: a standard error, a difference, so a temperature takes no offset.
std::string written(const std::string& key, double v, bool spread) {
  const CaseKey& k = case_key(key);
  if (k.type == KeyType::contaminant) return g(v) + " ppmv dry";
  if (key == "oil.consumption") return g(v) + " kg/h";
  if (k.unit.empty()) return g(v);
  const double shown = from_core_unit(k.kind, k.unit, v) - (spread ? from_core_unit(k.kind, k.unit, 0) : 0);
  return g(shown) + " " + (spread && k.unit == "degC" ? "K" : k.unit);
}
}  // namespace

std::string overlay_text(const FitResult& fit, const std::string& case_file, const std::string& lab_file) {
  std::map<std::string, std::vector<std::pair<std::string, std::string>>> sections;
  for (const FittedParameter& p : fit.parameters) {
    const auto dot = p.key.find('.');
    sections[p.key.substr(0, dot)].push_back({p.key.substr(dot + 1), written(p.key, p.estimate, false) + "   # ± " +
                                                                      written(p.key, p.standard_error, true) + " (1 standard error)"});
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
