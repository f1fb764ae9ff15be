#include "acidload/io/lab_file.hpp"

#include <algorithm>
#include <cmath>
#include <cstdlib>
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
#include "acidload/io/suggestions.hpp"

namespace acidload::io {

namespace {
const std::vector<std::string> lab_columns = {"charge", "oil-hours", "engine-hours", "hour-meter", "changed-at", "date", "lab",
                                              "tbn", "tbn-method", "tan", "san", "i-ph", "oxidation", "nitration", "ftir-unit",
                                              "tbn-sd", "tan-sd", "san-sd", "oxidation-sd", "nitration-sd",
                                              "oxidation-baseline", "nitration-baseline"};

// "2026-03-14", "2026-03-14 08:30" or "2026-03-14T08:30": digits in place, month, day, hour and minute in range.
bool iso_date(const std::string& v) {
  const auto digits = [&](std::size_t at, std::size_t n) {
    if (at + n > v.size()) return -1;
    int x = 0;
    for (std::size_t i = at; i < at + n; ++i) {
      if (v[i] < '0' || v[i] > '9') return -1;
      x = 10 * x + (v[i] - '0');
    }
    return x;
  };
  if (v.size() != 10 && v.size() != 16 && v.size() != 19) return false;
  const int y = digits(0, 4), mo = digits(5, 2), da = digits(8, 2);
  if (y < 1900 || v[4] != '-' || v[7] != '-' || mo < 1 || mo > 12 || da < 1 || da > 31) return false;
  if (v.size() == 10) return true;
  const int h = digits(11, 2), mi = digits(14, 2);
  if ((v[10] != ' ' && v[10] != 'T') || v[13] != ':' || h < 0 || h > 23 || mi < 0 || mi > 59) return false;
  return v.size() == 16 || (v[16] == ':' && digits(17, 2) >= 0 && digits(17, 2) <= 59);
}
}  // namespace

const std::vector<TrendColumn>& lab_trend_columns() {
  static const std::vector<TrendColumn> t = [] {
    std::vector<TrendColumn> c;
    const std::vector<std::pair<std::string, double>> ppm = {{"ppm", 1}, {"mg/kg", 1}};
    const struct { const char* name; const char* what; } elements[] = {
        {"fe", "iron (liners, gears, crankshaft)"}, {"cu", "copper (bearings, bushings, coolers)"},
        {"pb", "lead (bearings)"}, {"al", "aluminium (pistons, bearings)"}, {"cr", "chromium (rings)"},
        {"sn", "tin (bearings)"}, {"ni", "nickel"}, {"mo", "molybdenum"},
        {"si", "silicon (dirt, or siloxanes in the gas)"}, {"na", "sodium (coolant leak)"}, {"k", "potassium (coolant leak)"},
        {"zn", "zinc (anti-wear additive)"}, {"p", "phosphorus (anti-wear additive)"}, {"ca", "calcium (detergent)"},
        {"mg", "magnesium (detergent)"}, {"b", "boron (coolant, additive)"}};
    for (const auto& e : elements) c.push_back({e.name, "ppm", ppm, e.what});
    c.push_back({"viscosity-100", "cSt", {{"cSt", 1}, {"mm2/s", 1}}, "kinematic viscosity at 100 degC"});
    c.push_back({"viscosity-40", "cSt", {{"cSt", 1}, {"mm2/s", 1}}, "kinematic viscosity at 40 degC"});
    // the fresh oil's viscosity at 100 degC, for the change in % of a sample's (limits.viscosity-change)
    c.push_back({"viscosity-100-fresh", "cSt", {{"cSt", 1}, {"mm2/s", 1}}, "the fresh oil's kinematic viscosity at 100 degC",
                 1e4, true});
    // ASTM D6971 / D7590 (voltammetry) report the antioxidant left as % of the fresh oil's; a top-up of
    // a stronger oil or the method's scatter can read a little above 100, 200 is beyond any
    c.push_back({"antioxidant-remaining", "%", {{"%", 1}}, "antioxidant remaining, % of the fresh oil's", 200});
    c.push_back({"water", "%", {{"%", 1}, {"ppm", 1e-4}}, "water content", 100});
    c.push_back({"soot", "%", {{"%", 1}}, "soot or insolubles"});
    return c;
  }();
  return t;
}

std::vector<LabSample> read_lab_samples(const std::string& path, std::vector<std::string>* notes) {
  const CsvTable t = read_csv(path);
  Document d;
  d.file = t.file;
  d.lines = t.text;
  // known columns are read; a near miss of one is refused as a typo; the rest are carried with a note
  std::vector<std::string> known = lab_columns;
  for (const TrendColumn& tc : lab_trend_columns()) known.push_back(tc.name);
  CsvTable modelled = t;
  std::vector<std::size_t> trend_col, other_col;
  std::vector<const TrendColumn*> trend_of;
  std::vector<std::string> trend_unit;
  modelled.header.clear();
  std::vector<std::size_t> keep;
  for (std::size_t c = 0; c < t.header.size(); ++c) {
    std::string h = t.header[c], unit;
    const auto br = h.find('[');
    if (br != std::string::npos && h.back() == ']') {
      unit = h.substr(br + 1, h.size() - br - 2);
      h = h.substr(0, br);
      while (!h.empty() && h.back() == ' ') h.pop_back();
    }
    const TrendColumn* tc = nullptr;
    for (const TrendColumn& x : lab_trend_columns())
      if (x.name == h) tc = &x;
    if (tc) {
      trend_col.push_back(c), trend_of.push_back(tc), trend_unit.push_back(unit);
      continue;
    }
    if (std::find(lab_columns.begin(), lab_columns.end(), h) != lab_columns.end()) {
      keep.push_back(c);
      continue;
    }
    std::string near;
    for (const std::string& k : known) {
      const std::size_t e = edit_distance(h, k);
      if (e <= 1 || (h.size() >= 6 && e <= h.size() / 3)) near = k;
    }
    if (!near.empty()) keep.push_back(c);  // named_columns refuses it with the closest name
    else other_col.push_back(c);
  }
  modelled.header_columns.clear();  // where each kept column's name stands in the header, for its errors
  for (std::size_t c : keep) {
    modelled.header.push_back(t.header[c]);
    modelled.header_columns.push_back(c < t.header_columns.size() ? t.header_columns[c] : 1);
  }
  for (std::size_t r = 0; r < t.rows.size(); ++r) {
    std::vector<std::string> cells;
    std::vector<int> at;
    for (std::size_t c : keep) cells.push_back(t.rows[r][c]), at.push_back(t.columns[r][c]);
    modelled.rows[r] = cells;
    modelled.columns[r] = at;
  }
  if (notes)
    for (std::size_t c : other_col)
      notes->push_back(std::filesystem::path(t.file).filename().string() + ": column '" + t.header[c] +
                       "' is not one acidload reads: carried through as text (docs/lab-results.md lists the columns)");
  for (std::size_t k = 0; k < trend_col.size(); ++k) {
    const TrendColumn& tc = *trend_of[k];
    if (trend_unit[k].empty()) continue;
    bool ok = false;
    for (const auto& [u, f] : tc.units) ok |= u == trend_unit[k];
    if (!ok) {
      std::string all;
      for (const auto& [u, f] : tc.units) all += (all.empty() ? "" : ", ") + u;
      const std::size_t c = trend_col[k];
      throw d.error(Mark{t.header_line > 0 ? t.header_line : 1, c < t.header_columns.size() ? t.header_columns[c] : 1},
                    "lab column", t.header[c],
                    "the unit of " + tc.name + " (" + tc.what + ") among: " + all);
    }
  }
  const CsvTable& m = modelled;
  // every column the reader knows is offered as the closest name of a misspelt one (the trended
  // ones were taken out of `m` above, so only a misspelling reaches the refusal)
  const NamedColumns cols = named_columns(m, known, "lab column");
  const std::vector<std::string>& names = cols.names;
  const std::vector<std::string>& units = cols.units;
  const auto col = [&](const char* n) -> int {
    for (std::size_t c = 0; c < names.size(); ++c)
      if (names[c] == n) return static_cast<int>(c);
    return -1;
  };
  const bool hour_meter = col("hour-meter") >= 0 && col("changed-at") >= 0;  // oil hours from the hour meter
  for (const char* required : {"charge", "oil-hours"})
    if (col(required) < 0 && !(hour_meter && std::string(required) == "oil-hours"))
      throw d.error(Mark{t.lines.empty() ? 1 : t.lines.front() - 1, 1}, "lab columns", "(no " + std::string(required) + ")",
                    std::string("a '") + required + "' column" +
                        (std::string(required) == "oil-hours" ? " (or 'hour-meter' with 'changed-at')" : ""));
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
        unit = m.rows[i][static_cast<std::size_t>(col("ftir-unit"))];
      return cell_node(m, i, k, names[k], unit, "lab");
    };
    const auto cell = [&](const char* name) -> const std::string* {
      const int c = col(name);
      if (c < 0 || m.rows[i][static_cast<std::size_t>(c)].empty()) return nullptr;
      return &m.rows[i][static_cast<std::size_t>(c)];
    };
    LabSample s;
    s.where = std::filesystem::path(t.file).filename().string() + ":" + std::to_string(t.lines[i]);
    {
      const Node n = node(col("charge"));
      const double k = quantity(d, n, Kind::count);
      if (!(k >= 1 && k == std::floor(k) && k < 1e6)) throw d.error(n, n.scalar, "a charge number 1, 2, …");
      s.charge = static_cast<int>(k) - 1;
    }
    const auto hours = [&](const char* name) {
      Node n = node(col(name));
      if (n.scalar.find_first_not_of("+-.0123456789eE") == std::string::npos) n.scalar += " h";
      return quantity(d, n, Kind::duration);
    };
    if (cell("oil-hours")) {
      s.oil_hours = hours("oil-hours");
    } else if (cell("hour-meter") && cell("changed-at")) {  // oil hours from the engine's hour meter
      s.oil_hours = hours("hour-meter") - hours("changed-at");
      if (s.oil_hours < 0) throw d.error(node(col("hour-meter")), node(col("hour-meter")).scalar,
                                         "an hour-meter reading at or after the oil change ('changed-at')");
    } else {
      throw m.error(i, 0, "the sample's oil hours: an 'oil-hours' cell, or 'hour-meter' with 'changed-at' (the hour "
                          "meter at the charge's oil change)");
    }
    if (const auto* v = cell("date")) {
      if (!iso_date(*v)) throw d.error(node(col("date")), *v, "a date as YYYY-MM-DD, optionally with the time HH:MM");
      s.date = *v;
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
    const auto positive = [&](const char* name, Kind k, std::optional<double>& into) {
      reading(name, k, into);
      if (into && !(*into > 0)) throw d.error(node(col(name)), node(col(name)).scalar, std::string("a precision (") + name + ") above 0");
    };
    positive("tbn-sd", Kind::acid_number, s.sd_tbn);
    positive("tan-sd", Kind::acid_number, s.sd_tan);
    positive("san-sd", Kind::acid_number, s.sd_san);
    positive("oxidation-sd", Kind::oxidation, s.sd_oxidation);
    positive("nitration-sd", Kind::oxidation, s.sd_nitration);
    std::optional<double> ob, nb;
    reading("oxidation-baseline", Kind::oxidation, ob);
    reading("nitration-baseline", Kind::oxidation, nb);
    s.oxidation_baseline = ob.value_or(0), s.nitration_baseline = nb.value_or(0);
    s.oxidation_baseline_given = ob.has_value(), s.nitration_baseline_given = nb.has_value();
    for (std::size_t k = 0; k < trend_col.size(); ++k) {
      const std::string& cellv = t.rows[i][trend_col[k]];
      if (cellv.empty()) continue;
      const TrendColumn& tc = *trend_of[k];
      double factor = 1;
      for (const auto& [u, f] : tc.units)
        if (u == trend_unit[k]) factor = f;
      char* end = nullptr;
      const double v = std::strtod(cellv.c_str(), &end);
      if (end == cellv.c_str() || *end != '\0' || !std::isfinite(v) || v < 0 || (tc.above_zero && v == 0) ||
          v * factor > tc.high)
        throw t.error(i, trend_col[k], "a " + tc.name + " reading " + (tc.above_zero ? "above 0" : "of 0 or more") +
                                           (tc.high < 1e7 ? " and at most " + format_value(tc.high) + " " + tc.unit : "") +
                                           ", a bare number in " + tc.unit +
                                           (trend_unit[k].empty() ? "" : " (the header's " + trend_unit[k] + ")"));
      s.trended[tc.name] = v * factor;
    }
    for (std::size_t c : other_col)
      if (!t.rows[i][c].empty()) s.other[t.header[c]] = t.rows[i][c];
    if (!s.tbn && !s.tan && !s.san && !s.oxidation && !s.nitration && !s.initial_ph && s.trended.empty())
      throw t.error(i, 0, "a sample with at least one reading (tbn, tan, san, i-ph, oxidation, nitration, or a trended one)");
    out.push_back(s);
  }
  return out;
}

}  // namespace acidload::io
