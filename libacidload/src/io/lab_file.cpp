#include "acidload/io/lab_file.hpp"

#include <algorithm>
#include <cmath>
#include <cstdio>
#include <filesystem>
#include <fstream>
#include <map>
#include <random>

#include "acidload/core/error.hpp"
#include "acidload/core/version.hpp"
#include "acidload/io/csv.hpp"
#include "acidload/io/quantity.hpp"
#include "acidload/io/results.hpp"

namespace acidload::io {

namespace {
const std::vector<std::string> lab_columns = {"charge", "oil-hours", "engine-hours", "date", "lab", "tbn", "tbn-method",
                                              "tan", "san", "i-ph", "oxidation", "nitration", "ftir-unit"};
}

std::vector<LabSample> read_lab_samples(const std::string& path) {
  const CsvTable t = read_csv(path);
  Document d;
  d.file = t.file;
  d.lines = t.text;
  const NamedColumns cols = named_columns(t, lab_columns, "lab column");
  const std::vector<std::string>& names = cols.names;
  const std::vector<std::string>& units = cols.units;
  const auto col = [&](const char* n) -> int {
    for (std::size_t c = 0; c < names.size(); ++c)
      if (names[c] == n) return static_cast<int>(c);
    return -1;
  };
  for (const char* required : {"charge", "oil-hours"})
    if (col(required) < 0)
      throw d.error(Mark{t.lines.empty() ? 1 : t.lines.front() - 1, 1}, "lab columns", "(no " + std::string(required) + ")",
                    std::string("a '") + required + "' column");
  for (const char* ftir : {"oxidation", "nitration"})
    if (col(ftir) >= 0 && units[static_cast<std::size_t>(col(ftir))].empty() && col("ftir-unit") < 0)
      throw d.error(Mark{t.lines.empty() ? 1 : t.lines.front() - 1, 1}, std::string(ftir), "(no unit)",
                    "the FTIR unit in the header, e.g. 'oxidation [A/cm]' or 'oxidation [A/0.1mm]' (1 A/0.1mm is "
                    "100 A/cm: ask the lab which it reports), or an ftir-unit column");
  std::vector<LabSample> out;
  for (std::size_t i = 0; i < t.rows.size(); ++i) {
    const auto node = [&](int c) {
      const auto k = static_cast<std::size_t>(c);
      std::string unit = units[k];
      if ((names[k] == "oxidation" || names[k] == "nitration") && unit.empty())
        unit = t.rows[i][static_cast<std::size_t>(col("ftir-unit"))];
      return cell_node(t, i, k, names[k], unit, "lab");
    };
    const auto cell = [&](const char* name) -> const std::string* {
      const int c = col(name);
      if (c < 0 || t.rows[i][static_cast<std::size_t>(c)].empty()) return nullptr;
      return &t.rows[i][static_cast<std::size_t>(c)];
    };
    LabSample s;
    s.where = std::filesystem::path(t.file).filename().string() + ":" + std::to_string(t.lines[i]);
    {
      const Node n = node(col("charge"));
      const double k = quantity(d, n, Kind::count);
      if (!(k >= 1 && k == std::floor(k) && k < 1e6)) throw d.error(n, n.scalar, "a charge number 1, 2, …");
      s.charge = static_cast<int>(k) - 1;
    }
    {
      Node n = node(col("oil-hours"));
      if (n.scalar.find_first_not_of("+-.0123456789eE") == std::string::npos) n.scalar += " h";
      s.oil_hours = quantity(d, n, Kind::duration);
    }
    if (const auto* v = cell("lab")) s.lab = *v;
    if (cell("tbn-method")) {
      const Node n = node(col("tbn-method"));
      if (n.scalar != "D2896" && n.scalar != "D4739") throw d.error(n, n.scalar, "D2896 or D4739");
      s.tbn_method = n.scalar == "D2896" ? BaseNumberMethod::d2896 : BaseNumberMethod::d4739;
    }
    const auto reading = [&](const char* name, Kind k, std::optional<double>& into) {
      if (!cell(name)) return;
      Node n = node(col(name));
      if (k == Kind::acid_number && n.scalar.find("mg KOH/g") == std::string::npos) n.scalar += " mg KOH/g";
      const double v = quantity(d, n, k);
      if (!(v >= 0 && v < 1e4)) throw d.error(n, n.scalar, std::string("a ") + name + " reading of 0 or more");
      into = v;
    };
    reading("tbn", Kind::acid_number, s.tbn);
    reading("tan", Kind::acid_number, s.tan);
    if (const auto* v = cell("san")) {
      std::string text = *v;
      if (!text.empty() && text[0] == '<') {  // "<0.1": below the reporting limit
        s.san_censored = true;
        text = text.substr(1);
        Node n = node(col("san"));
        n.scalar = text + " mg KOH/g";
        s.san = quantity(d, n, Kind::acid_number);
        if (!(*s.san > 0 && *s.san < 1e4))  // "<-1" or "<0" is no reporting limit
          throw d.error(n, *v, "a reporting limit above 0, such as '<0.1'");
      } else {
        reading("san", Kind::acid_number, s.san);
        if (s.san && *s.san == 0) s.san_censored = true, s.san = 0.1;  // a reported 0 means "below 0.1"
      }
    }
    if (cell("i-ph")) {
      const Node n = node(col("i-ph"));
      s.initial_ph = quantity(d, n, Kind::number);
      if (!(*s.initial_ph >= 0 && *s.initial_ph <= 14)) throw d.error(n, n.scalar, "an initial pH from 0 to 14");
    }
    reading("oxidation", Kind::oxidation, s.oxidation);
    reading("nitration", Kind::oxidation, s.nitration);
    if (!s.tbn && !s.tan && !s.san && !s.oxidation && !s.nitration)
      throw t.error(i, 0, "a sample with at least one reading (tbn, tan, san, oxidation, nitration)");
    out.push_back(s);
  }
  return out;
}

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
