// Values with units from case files and CSV cells. The lists of units are closed: a unit not listed
// for a kind is an error that names the accepted ones (and the closest). Alternative spellings: "m³"
// for "m3" (also in Nm³), and the everyday spellings of each kind's `aliases` (°C, C, l, kWe, MWe);
// a contaminant may name what it is counted as ("mg Cl/Nm3" for the chlorine key, which is as Cl).
//
// Number syntax: [+|-] digits [. digits] [(e|E) [+|-] digits], e.g. 12, -0.5, 1.2e-3. No hex, no
// "inf" or "nan", no thousands separators or decimal commas; magnitudes beyond 1e300 (and non-zero
// ones below 1e-300) are refused. The unit follows after one or more spaces or tabs.
//
// Range checks are the caller's (a fraction of 1.4 is read as 1.4), except what no value of a kind
// can be: a temperature at or below absolute zero, a negative absolute pressure, a negative count and
// a negative concentration are refused here.
#include "acidload/io/quantity.hpp"

#include "acidload/core/constants.hpp"

#include "text.hpp"

#include <algorithm>
#include <cctype>
#include <charconv>
#include <cmath>
#include <system_error>
#include <utility>

namespace acidload::io {

namespace {

struct UnitDef {
  std::string name;    // as written
  double factor;       // core value = written value × factor + offset
  double offset;
  UnitDef(std::string n, double f, double o = 0) : name(std::move(n)), factor(f), offset(o) {}
};

struct KindInfo {
  std::string_view name;
  std::vector<UnitDef> units;
  std::vector<std::pair<std::string, std::string>> aliases;  // everyday spelling → accepted unit
  bool bare = false;                 // a bare number is accepted (factor 1)
  std::vector<std::string> names;    // the units' names, for accepted_units()
  KindInfo() = default;
  KindInfo(std::string_view n, std::vector<UnitDef> u, bool b = false) : name(n), units(std::move(u)), bare(b) {}
};

constexpr Kind all_kinds[] = {Kind::temperature, Kind::temperature_change, Kind::power, Kind::volume, Kind::mass,
                              Kind::molar_flow, Kind::fraction, Kind::acid_number, Kind::specific_consumption,
                              Kind::duration, Kind::pressure, Kind::density, Kind::per_hour, Kind::oxidation,
                              Kind::oxidation_rate, Kind::molar_energy, Kind::money, Kind::price_per_volume,
                              Kind::price_per_mass, Kind::price_per_energy, Kind::years, Kind::mass_ratio,
                              Kind::count, Kind::number};

KindInfo make_info(Kind k) {
  // Nm³ is an amount: 1/V_m mol, V_m at 0 °C and 101.325 kPa (the normal state; core/constants.hpp).
  const double per_Nm3 = 1.0 / constants::normal_molar_volume;  // [mol/Nm³]
  KindInfo i;
  switch (k) {
    case Kind::temperature: i = {"temperature", {{"degC", 1, 273.15}, {"K", 1}}}; break;
    case Kind::temperature_change: i = {"temperature change", {{"K", 1}, {"degC", 1}}}; break;
    case Kind::power: i = {"power", {{"W", 1}, {"kW", 1e3}, {"MW", 1e6}}}; break;
    case Kind::volume: i = {"volume", {{"L", 1e-3}, {"m3", 1}}}; break;
    case Kind::mass: i = {"mass", {{"kg", 1}, {"g", 1e-3}, {"t", 1e3}}}; break;
    case Kind::molar_flow:
      i = {"molar flow", {{"Nm3/h", per_Nm3}, {"mol/h", 1}, {"kmol/h", 1e3}, {"Nm3/min", 60 * per_Nm3}}};
      break;
    case Kind::fraction: i = {"fraction", {{"%", 1e-2}}, true}; break;
    case Kind::acid_number: i = {"acid or base number", {{"mg KOH/g", 1}}}; break;
    case Kind::specific_consumption: i = {"specific consumption", {{"g/kWh", 1e-3 / 3.6e6}}}; break;
    case Kind::duration: i = {"duration", {{"h", 1}, {"d", 24}, {"min", 1.0 / 60}}}; break;
    case Kind::pressure: i = {"pressure", {{"Pa", 1}, {"kPa", 1e3}, {"bar", 1e5}, {"mbar", 1e2}, {"MPa", 1e6}}}; break;
    case Kind::density: i = {"density", {{"kg/m3", 1}, {"kg/L", 1e3}, {"g/cm3", 1e3}}}; break;
    case Kind::per_hour: i = {"rate per hour", {{"1/h", 1}}}; break;
    // Absorbance per length: 0.1 mm = 0.01 cm, so 1 A/0.1mm = 100 A/cm.
    case Kind::oxidation: i = {"oxidation", {{"A/cm", 1}, {"A/0.1mm", 100}}}; break;
    case Kind::oxidation_rate: i = {"oxidation rate", {{"A/cm/h", 1}}}; break;
    case Kind::molar_energy: i = {"molar energy", {{"J/mol", 1}, {"kJ/mol", 1e3}}}; break;
    case Kind::money: i = {"amount of money", {}, true}; break;
    case Kind::price_per_volume: i = {"price per volume", {{"per L", 1e3}, {"per m3", 1}}}; break;
    case Kind::price_per_mass: i = {"price per mass", {{"per kg", 1}, {"per t", 1e-3}}}; break;
    case Kind::price_per_energy: i = {"price per energy", {{"per MWh", 1 / 3.6e9}, {"per kWh", 1 / 3.6e6}}}; break;
    case Kind::years: i = {"years", {{"years", 1}, {"year", 1}}}; break;
    case Kind::mass_ratio: i = {"mass ratio", {{"kg/kg", 1}}, true}; break;
    case Kind::count: i = {"count", {}, true}; break;
    case Kind::number: i = {"number", {}, true}; break;
  }
  // Everyday spellings that can mean only one unit of the kind (docs/case-format.md, "Units by kind").
  switch (k) {
    case Kind::temperature: i.aliases = {{"\xC2\xB0" "C", "degC"}, {"C", "degC"}}; break;
    case Kind::temperature_change: i.aliases = {{"\xC2\xB0" "C", "degC"}}; break;
    case Kind::power: i.aliases = {{"kWe", "kW"}, {"MWe", "MW"}, {"We", "W"}}; break;
    case Kind::volume: i.aliases = {{"l", "L"}, {"litre", "L"}, {"liter", "L"}}; break;
    default: break;
  }
  for (const auto& u : i.units) i.names.push_back(u.name);
  return i;
}

const KindInfo& info(Kind k) {
  static const std::vector<KindInfo> table = [] {
    std::vector<KindInfo> t;
    for (Kind kind : all_kinds) t.push_back(make_info(kind));
    return t;
  }();
  return table[static_cast<std::size_t>(k)];
}

bool is_space(char c) { return c == ' ' || c == '\t'; }

std::string_view trim(std::string_view s) {
  while (!s.empty() && is_space(s.front())) s.remove_prefix(1);
  while (!s.empty() && is_space(s.back())) s.remove_suffix(1);
  return s;
}

// Runs of white space become one space; "Nm³" becomes "Nm3".
std::string normalize_unit(std::string_view s) {
  std::string r;
  for (std::size_t i = 0; i < s.size(); ++i) {
    if (is_space(s[i])) {
      if (!r.empty() && r.back() != ' ') r += ' ';
    } else if (s.compare(i, 3, "m\xC2\xB3") == 0) {  // m³, Nm³
      r += "m3";
      i += 2;
    } else {
      r += s[i];
    }
  }
  return r;
}

// Length of the longest prefix of s that follows the number syntax (0 if none).
std::size_t number_prefix(std::string_view s) {
  std::size_t i = 0;
  const auto digits = [&] {
    const std::size_t start = i;
    while (i < s.size() && s[i] >= '0' && s[i] <= '9') ++i;
    return i > start;
  };
  if (i < s.size() && (s[i] == '+' || s[i] == '-')) ++i;
  if (!digits()) return 0;
  std::size_t end = i;
  if (i < s.size() && s[i] == '.') {
    ++i;
    if (digits()) end = i;
    else return end;
  }
  i = end;
  if (i < s.size() && (s[i] == 'e' || s[i] == 'E')) {
    ++i;
    if (i < s.size() && (s[i] == '+' || s[i] == '-')) ++i;
    if (digits()) end = i;
  }
  return end;
}

const char* const number_form = "a number such as 12, -0.5 or 1.2e-3";

// Parses a whole token as a number; `problem` says what is wrong, for the message.
bool parse_number(std::string_view s, double& out, std::string& problem) {
  if (s.empty()) {
    problem = "the value is empty";
    return false;
  }
  if (number_prefix(s) != s.size()) {
    problem = "'" + std::string(s) + "' is not " + number_form;
    return false;
  }
  std::string_view digits = s;
  if (digits.front() == '+') digits.remove_prefix(1);  // from_chars takes no '+'
  double v = 0;
  const auto r = std::from_chars(digits.data(), digits.data() + digits.size(), v, std::chars_format::general);
  const bool bad = r.ec != std::errc() || r.ptr != digits.data() + digits.size() || !std::isfinite(v) ||
                   std::fabs(v) > 1e300 || (v != 0 && std::fabs(v) < 1e-300);
  if (bad) {
    problem = "'" + std::string(s) + "' is out of range: numbers from 1e-300 to 1e300 in magnitude, or 0";
    return false;
  }
  out = v == 0 ? 0.0 : v;  // no negative zero
  return true;
}

std::string join(const std::vector<std::string>& items) {
  std::string s;
  for (std::size_t i = 0; i < items.size(); ++i) s += (i ? ", " : "") + items[i];
  return s;
}

// What a kind accepts, as the "expected" part of a message.
std::string expectation(Kind k) {
  const KindInfo& i = info(k);
  switch (k) {
    case Kind::fraction: return "a fraction: a bare number (0.4) or a percentage with the unit % (40 %)";
    case Kind::count: return "a count: a bare number >= 0";
    case Kind::number: return number_form;
    case Kind::money: return "an amount of money: a bare number in the case's currency (45000)";
    case Kind::mass_ratio: return "a mass ratio: a bare number or with the unit kg/kg (0.2 kg/kg)";
    default: {
      const std::string n(i.name);
      const bool vowel = !n.empty() && std::string("aeiou").find(n[0]) != std::string::npos;
      return (vowel ? "an " : "a ") + n + " with one of the units: " + join(i.names);
    }
  }
}

std::string with_problem(Kind k, const std::string& problem) {
  return problem.empty() ? expectation(k) : expectation(k) + " (" + problem + ")";
}

// Splits "<number> <rest>": the number token and the rest, normalized. False (with `problem`) when
// the number is bad or glued to the unit.
bool split_value(std::string_view text, std::string_view& number_text, std::string& rest, std::string& problem) {
  text = trim(text);
  std::size_t cut = 0;
  while (cut < text.size() && !is_space(text[cut])) ++cut;
  number_text = text.substr(0, cut);
  rest = normalize_unit(trim(text.substr(cut)));
  const std::size_t p = number_prefix(number_text);
  if (p > 0 && p < number_text.size()) {
    const char c = number_text[p];
    const bool unit_like = !(c >= '0' && c <= '9') && c != '.' && c != ',' && c != 'x' && c != 'X' && c != '_';
    if (unit_like && rest.empty()) {
      problem = "put a space between the number and the unit: '" + std::string(number_text.substr(0, p)) + " " +
                std::string(number_text.substr(p)) + "'";
      return false;
    }
  }
  return true;
}


std::string not_scalar(const Node& n) {
  switch (n.type) {
    case Node::Type::null: return "the value is empty";
    case Node::Type::sequence: return "found a list";
    case Node::Type::map: return "found a map";
    default: return "";
  }
}

}  // namespace

const std::vector<std::string>& accepted_units(Kind k) { return info(k).names; }

std::string_view kind_name(Kind k) { return info(k).name; }

bool parse_quantity_text(std::string_view text, Kind k, double& out, std::string& why) {
  const KindInfo& ki = info(k);
  std::string_view number_text;
  std::string unit, problem;
  double v = 0;
  if (!split_value(text, number_text, unit, problem) || !parse_number(number_text, v, problem)) {
    why = with_problem(k, problem);
    return false;
  }
  const UnitDef* def = nullptr;
  static const UnitDef bare("", 1, 0);
  if (unit.empty()) {
    if (!ki.bare) {
      why = with_problem(k, "the unit is missing");
      return false;
    }
    def = &bare;
  } else {
    std::string name = unit;
    for (const auto& [alias, canonical] : ki.aliases)
      if (alias == unit) name = canonical;
    for (const auto& u : ki.units)
      if (u.name == name) def = &u;
    if (!def) {
      std::string c;  // a suggestion only where case alone is wrong ("kw" for "kW"); "GW" is no "W"
      for (const auto& n : ki.names)
        if (n.size() == unit.size() && std::equal(n.begin(), n.end(), unit.begin(), [](char a, char b) {
              return std::tolower(static_cast<unsigned char>(a)) == std::tolower(static_cast<unsigned char>(b));
            }))
          c = n;
      why = with_problem(k, ki.units.empty() ? "no unit is taken: '" + unit + "'"
                                             : "'" + unit + "' is not one of them" +
                                                   (c.empty() ? "" : "; did you mean '" + c + "'?"));
      return false;
    }
  }
  const double value = v * def->factor + def->offset;
  if (k == Kind::temperature && !(value > 0)) {
    why = "a temperature above absolute zero (-273.15 degC, 0 K)";
    return false;
  }
  if (k == Kind::pressure && value < 0) {
    why = "an absolute pressure, not below 0 (" + join(ki.names) + ")";
    return false;
  }
  if (k == Kind::count && value < 0) {
    why = "a count: a bare number >= 0";
    return false;
  }
  if (!std::isfinite(value) || std::fabs(value) > 1e300) {  // e.g. 1e300 MW
    why = with_problem(k, "out of range once converted");
    return false;
  }
  out = value;
  return true;
}

namespace detail {

bool plain_number(std::string_view s, double& out) {
  std::string problem;  // filled only when the text is no number (no allocation otherwise)
  return parse_number(s, out, problem);
}

bool unit_conversion(Kind k, std::string_view unit_text, double& factor, double& offset) {
  const KindInfo& ki = info(k);
  const std::string unit = normalize_unit(trim(unit_text));  // as split_value leaves the rest
  if (unit.empty()) {
    if (!ki.bare) return false;
    factor = 1, offset = 0;
    return true;
  }
  std::string name = unit;
  for (const auto& [alias, canonical] : ki.aliases)
    if (alias == unit) name = canonical;
  for (const auto& u : ki.units)
    if (u.name == name) {
      factor = u.factor, offset = u.offset;
      return true;
    }
  return false;
}

bool converted(Kind k, double v, double factor, double offset, double& out) {
  const double value = v * factor + offset;  // as parse_quantity_text converts, with its checks
  if (k == Kind::temperature && !(value > 0)) return false;
  if (k == Kind::pressure && value < 0) return false;
  if (k == Kind::count && value < 0) return false;
  if (!std::isfinite(value) || std::fabs(value) > 1e300) return false;
  out = value;
  return true;
}

}  // namespace detail

double from_core_unit(Kind k, std::string_view unit, double core_value) {
  std::string u = normalize_unit(unit);
  for (const auto& [alias, canonical] : info(k).aliases)
    if (alias == u) u = canonical;
  for (const auto& d : info(k).units)
    if (d.name == u) return (core_value - d.offset) / d.factor;
  return core_value;
}

std::string unit_written(std::string_view text) {
  std::string_view number_text;
  std::string rest, problem;
  if (!split_value(text, number_text, rest, problem)) return {};
  return rest;
}

double quantity(const Document& doc, const Node& node, Kind k) {
  if (node.type != Node::Type::scalar) throw doc.error(node, detail::describe(node), with_problem(k, not_scalar(node)));
  double v = 0;
  std::string why;
  if (!parse_quantity_text(node.scalar, k, v, why)) throw doc.error(node, node.scalar, why);
  return v;
}

double number(const Document& doc, const Node& node) { return quantity(doc, node, Kind::number); }

Concentration concentration(const Document& doc, const Node& node, Basis default_basis) {
  struct ConcUnit {
    const char* name;
    ConcentrationUnit unit;
    bool has_basis;
    double factor;  // to `unit`
  };
  // mg/kWh (per kWh of fuel heat, LHV) is read as mg/MJ: 1 kWh = 1e3 W × 3600 s = 3.6 MJ exactly (SI Brochure, 9th ed., Table 8: 1 h = 3600 s)
  static const ConcUnit units[] = {
      {"ppmv", ConcentrationUnit::ppmv, true, 1},       {"ppm", ConcentrationUnit::ppmv, true, 1},
      {"mg/Nm3", ConcentrationUnit::mg_per_m3, true, 1}, {"mg/m3", ConcentrationUnit::mg_per_m3, true, 1},
      {"mg/MJ", ConcentrationUnit::mg_per_MJ, false, 1}, {"mg/kWh", ConcentrationUnit::mg_per_MJ, false, 1 / 3.6},
      {"mg/Nm3 CH4", ConcentrationUnit::mg_per_m3_methane, false, 1}, {"mg/m3 CH4", ConcentrationUnit::mg_per_m3_methane, false, 1},
      {"mol/h", ConcentrationUnit::mol_per_h, false, 1},
  };
  const std::string expected =
      "a concentration with one of the units: ppmv, ppm, mg/Nm3, mg/m3, mg/MJ, mg/kWh, mg/Nm3 CH4, mg/m3 CH4, mol/h, "
      "then optionally dry or wet";
  const auto fail = [&](const std::string& problem) {
    return doc.error(node, detail::describe(node), problem.empty() ? expected : expected + " (" + problem + ")");
  };
  if (node.type != Node::Type::scalar) throw fail(not_scalar(node));

  std::string_view number_text;
  std::string rest, problem;
  double v = 0;
  if (!split_value(node.scalar, number_text, rest, problem) || !parse_number(number_text, v, problem))
    throw fail(problem);
  if (rest.empty()) throw fail("the unit is missing");

  Concentration c;
  c.basis = default_basis;
  bool basis_given = false;
  const std::size_t sp = rest.rfind(' ');
  if (sp != std::string::npos && (rest.compare(sp + 1, std::string::npos, "dry") == 0 ||
                                  rest.compare(sp + 1, std::string::npos, "wet") == 0)) {
    c.basis = rest.compare(sp + 1, std::string::npos, "dry") == 0 ? Basis::dry : Basis::wet;
    basis_given = true;
    rest.resize(sp);
  }
  // "mg Cl/Nm3 CH4": the figure names what it is counted as; only the key's own basis is taken
  if (rest.compare(0, 3, "mg ") == 0 && rest.find('/') != std::string::npos && rest.find('/') > 3) {
    const std::string what = rest.substr(3, rest.find('/') - 3);
    const std::string key = node.path.substr(node.path.find_last_of('.') + 1);
    static const std::vector<std::pair<std::string, std::string>> as = {
        {"h2s", "H2S"}, {"other-sulfur", "S"}, {"chlorine", "Cl"}, {"fluorine", "F"}};
    std::string own;
    for (const auto& [k, w] : as)
      if (k == key) own = w;
    if (what != own)
      throw fail(own.empty() ? "'" + what + "' names no basis here: write mg/Nm3"
                             : "the '" + key + "' key counts as " + own + ": write 'mg " + own + "/…' or 'mg/…', not 'mg " + what + "/…'");
    rest = "mg" + rest.substr(3 + what.size());
  }
  const ConcUnit* found = nullptr;
  for (const auto& u : units)
    if (rest == u.name) found = &u;
  if (!found) throw fail("'" + rest + "' is not one of them");
  if (basis_given && !found->has_basis)
    throw fail("dry or wet applies to ppmv and mg/Nm3 only; " + rest + " has no basis");
  if (v < 0) throw fail("a concentration is not negative");
  c.value = v * found->factor;
  c.unit = found->unit;
  return c;
}

}  // namespace acidload::io
