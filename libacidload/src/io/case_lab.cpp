// The case's `lab` section (docs/lab-results.md "Lab settings in the case"): default precision per
// reading, per-lab precision and FTIR baselines, alarm levels per quantity. Every key is read through
// the registry (keys.cpp); the alarm levels' units depend on their quantity and are checked here.
#include <cmath>

#include "acidload/io/lab_file.hpp"
#include "case_reader.hpp"
#include "text.hpp"

namespace acidload::io::detail {

namespace {

void read_precision(const Reader& r, const Node& n, PrecisionSetting& out) {
  if (n.type != Node::Type::map) r.fail(n, describe(n), "a map of readings (tbn-d2896, tbn-d4739, tan, san, oxidation, nitration) to one standard deviation");
  r.require_section(n, "precision");
  for (const std::string& reading : precision_readings()) {
    double v = 0;
    if (r.get(n, "precision." + reading, v)) precision_field(out, reading) = v;
  }
}

// An alarm quantity: its unit(s) and factor to the column's unit, its range there, and whether it alarms falling.
struct AlarmQuantity {
  std::vector<std::pair<std::string, double>> units;  // "" is a bare number
  double low = 0, high = 0;
  bool falling = false;
};

const AlarmQuantity* alarm_quantity(const std::string& q, std::vector<std::string>* names) {
  static const std::vector<std::pair<std::string, AlarmQuantity>> table = [] {
    std::vector<std::pair<std::string, AlarmQuantity>> t;
    for (const TrendColumn& c : lab_trend_columns())
      if (c.unit == "ppm") t.push_back({c.name, {{{"ppm", 1}, {"mg/kg", 1}}, 0, 1e6, false}});
    t.push_back({"water", {{{"%", 1}, {"ppm", 1e-4}}, 0, 100, false}});
    t.push_back({"soot", {{{"%", 1}}, 0, 100, false}});
    t.push_back({"viscosity-100", {{{"%", 1}}, 0, 500, false}});  // the change over fresh
    t.push_back({"antioxidant-remaining", {{{"%", 1}}, 0, 200, true}});
    t.push_back({"i-ph", {{{"", 1}}, 0, 14, true}});
    t.push_back({"tan", {{{"mg KOH/g", 1}}, 0, 80, false}});
    t.push_back({"tbn", {{{"mg KOH/g", 1}}, 0, 80, true}});
    return t;
  }();
  for (const auto& [name, a] : table) {
    if (names) names->push_back(name);
    if (name == q) return &a;
  }
  return nullptr;
}

std::string units_text(const AlarmQuantity& a) {
  std::string s;
  for (const auto& [u, f] : a.units) s += (s.empty() ? "" : " or ") + (u.empty() ? std::string("a bare number") : "'" + u + "'");
  return s;
}

double alarm_value(const Reader& r, const Node& n, const std::string& q, const AlarmQuantity& a) {
  char lo[32], hi[32];
  std::snprintf(lo, sizeof lo, "%g", a.low);
  std::snprintf(hi, sizeof hi, "%g", a.high);
  const std::string main_unit = a.units.front().first;
  const std::string expected = "a " + q + " level from " + lo + " to " + hi + (main_unit.empty() ? "" : " " + main_unit) +
                               " (the unit " + units_text(a) + ")";
  if (n.type != Node::Type::scalar) r.fail(n, describe(n), expected);
  double v = 0;
  std::string unit = unit_written(n.scalar), why;
  const std::string number = n.scalar.substr(0, n.scalar.find_first_of(" \t"));
  if (!parse_quantity_text(number, Kind::number, v, why) || !std::isfinite(v)) r.fail(n, n.scalar, expected);
  if (number == n.scalar) unit.clear();
  for (const auto& [u, f] : a.units)
    if (u == unit) {
      v *= f;
      if (!(v >= a.low && v <= a.high)) r.fail(n, n.scalar, expected);
      return v;
    }
  r.fail(n, n.scalar, expected);
}

}  // namespace

LabSettings read_lab(const Reader& r, const Node& lab) {
  r.require_section(lab, "lab");
  LabSettings out;
  if (const Node* p = lab.find("precision")) read_precision(r, *p, out.precision);
  if (const Node* labs = lab.find("labs")) {
    if (labs->type != Node::Type::map || labs->entries.empty())
      r.fail(*labs, describe(*labs), "a map of lab names (as the lab file's `lab` column writes them) to their settings");
    for (const auto& [name, entry] : labs->entries) {
      if (entry.type != Node::Type::map || entry.entries.empty())
        r.fail(entry, describe(entry), "the lab's settings: precision, oxidation-baseline, nitration-baseline");
      r.require_section(entry, "lab-entry");
      LabOverride o;
      if (const Node* p = entry.find("precision")) read_precision(r, *p, o.precision);
      double b = 0;
      if (r.get(entry, "lab-entry.oxidation-baseline", b)) o.oxidation_baseline = b;
      if (r.get(entry, "lab-entry.nitration-baseline", b)) o.nitration_baseline = b;
      out.labs[name] = o;
    }
  }
  if (const Node* levels = lab.find("alarm-levels")) {
    if (levels->type != Node::Type::map || levels->entries.empty())
      r.fail(*levels, describe(*levels), "a map of quantities (fe, si, water, viscosity-100, …) to their caution and critical levels");
    for (std::size_t i = 0; i < levels->entries.size(); ++i) {
      const auto& [q, entry] = levels->entries[i];
      std::vector<std::string> names;
      const AlarmQuantity* a = alarm_quantity(q, &names);
      if (!a) {
        const std::string c = closest(q, names);
        throw r.doc(*levels).error(levels->key_marks.at(i), levels->path.empty() ? q : levels->path + "." + q, q,
                                   "a quantity with alarm levels, one of: " + join(names) + (c.empty() ? "" : " (closest: '" + c + "')"));
      }
      if (entry.type != Node::Type::map) r.fail(entry, describe(entry), "a map of `caution` and `critical`");
      r.require_section(entry, "alarm-level");
      const Node* cn = entry.find("caution");
      const Node* kn = entry.find("critical");
      if (!cn || !kn) r.fail(entry, "(no " + std::string(cn ? "critical" : "caution") + ")", "both a `caution` and a `critical` level");
      AlarmLevel l;
      l.quantity = q;
      l.caution = alarm_value(r, *cn, q, *a);
      l.critical = alarm_value(r, *kn, q, *a);
      l.rising = !a->falling;
      l.basis = "the case's lab.alarm-levels";
      if (l.rising ? l.critical < l.caution : l.critical > l.caution)
        r.fail(*kn, kn->scalar, std::string("a critical level at or ") + (l.rising ? "above" : "below") + " the caution level " +
                                    cn->scalar + " (" + q + " alarms " + (l.rising ? "rising" : "falling") + ")");
      out.alarm_levels.push_back(l);
    }
  }
  return out;
}

void check_lab_levels(const Reader& r, const Node& lab, const LabSettings& s, const LimitSettings& limits) {
  const Node* levels = lab.find("alarm-levels");
  if (!levels) return;
  for (const AlarmLevel& l : s.alarm_levels) {
    try {
      alarm_levels(limits, {l});
    } catch (const InputError& e) {
      const Node* n = levels->find(l.quantity);  // read_lab put every level's entry there
      const Node* c = n ? n->find("caution") : nullptr;
      const Node* k = n ? n->find("critical") : nullptr;
      if (!n || !c || !k) r.fail(*levels, describe(*levels), e.expected());
      r.fail(*n, "caution " + c->scalar + ", critical " + k->scalar, e.expected());
    }
  }
}

}  // namespace acidload::io::detail
