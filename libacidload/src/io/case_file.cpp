#include "acidload/io/case_file.hpp"

#include <algorithm>
#include <cmath>
#include <filesystem>
#include <map>
#include <memory>
#include <set>

#include "acidload/core/constants.hpp"
#include "acidload/core/error.hpp"
#include "acidload/core/halocarbons.hpp"
#include "acidload/core/rates.hpp"
#include "acidload/core/version.hpp"
#include "acidload/core/water.hpp"
#include "acidload/io/csv.hpp"
#include "acidload/io/document.hpp"
#include "acidload/io/quantity.hpp"

namespace acidload::io {

namespace {

// ---- the keys of each section --------------------------------------------------------------
const std::map<std::string, std::vector<std::string>, std::less<>>& keys() {
  static const std::map<std::string, std::vector<std::string>, std::less<>> k = {
      {"", {"format-version", "case", "base-name", "reference-state", "combustion-reference", "fuel", "engine",
            "oil", "model", "limits", "run", "record", "variants", "uncertainty"}},
      {"uncertainty", {"draws", "seed", "inputs"}},
      {"uncertain-input", {"parameter", "distribution", "mean", "sd", "median", "sigma-log", "low", "mode", "high"}},
      {"overlay", {"format-version", "case", "reference-state", "combustion-reference", "fuel", "engine", "oil",
                   "model", "limits", "run", "record"}},
      {"reference-state", {"temperature", "pressure"}},
      {"fuel", {"basis", "composition", "water", "water-dew-point", "gas-pressure", "h2s", "other-sulfur",
                "chlorine", "fluorine", "halocarbons"}},
      {"engine", {"rated-power", "power", "load", "electrical-efficiency", "fuel-flow", "excess-air-ratio",
                  "air-water", "air-humidity", "air-temperature", "air-pressure", "blow-by", "blow-by-flow",
                  "jacket-water-out", "coldest-crankcase-surface", "oil-temperature", "crankcase-pressure",
                  "exhaust-pressure", "exhaust-temperature", "start-every", "nox"}},
      {"oil", {"volume", "density", "fresh-tbn", "tbn-method", "fresh-tan", "consumption", "makeup",
               "residual-share"}},
      {"model", {"so3-share", "liner-uptake", "liner-subcooling-scale", "liner-wall-rise",
                 "liner-wall-rise-load-exponent", "liner-pressure", "cylinder-dew-point-offset",
                 "burnt-share-of-blow-by", "capture-so3", "capture-hcl", "capture-hf", "capture-so2",
                 "capture-no2", "wet-so2-factor", "wetness-scale", "warm-up-time", "oxidation-law",
                 "oxidation-rate", "oxidation-reference-temperature", "oxidation-doubling-interval",
                 "activation-energy", "ring-zone-offset", "organic-acid-yield", "nitration-yield",
                 "weak-base-d2896", "weak-base-d4739", "base-floor", "additive-depletion",
                 "salt-titration-share", "organic-neutralised-share"}},
      {"limits", {"tbn-share-of-fresh", "tbn-method", "tan-rise", "crossover", "san", "oxidation", "nitration",
                  "max-hours", "ignore"}},
      {"run", {"hours", "output-interval", "detection-step"}},
      {"record", {"file", "segments"}},
      {"segment", {"hours", "calendar-hours", "starts", "h2s", "other-sulfur", "chlorine", "fluorine", "power",
                   "load", "jacket-water-out", "oil-temperature", "coldest-crankcase-surface", "blow-by",
                   "excess-air-ratio", "event", "event-amount"}},
      {"variant", {"name", "reference-state", "combustion-reference", "fuel", "engine", "oil", "model", "limits",
                   "run", "record"}},
  };
  return k;
}

// ---- merging trees -----------------------------------------------------------------------
void set_source(Node& n, int source) {
  n.source = source;
  for (auto& i : n.items) set_source(i, source);
  for (auto& e : n.entries) set_source(e.second, source);
}

// Deep merge: maps merge key by key; anything else replaces.
void merge(Node& into, const Node& from) {
  if (into.type != Node::Type::map || from.type != Node::Type::map) {
    into = from;
    return;
  }
  for (std::size_t i = 0; i < from.entries.size(); ++i) {
    const auto& [key, value] = from.entries[i];
    bool found = false;
    for (auto& [k, v] : into.entries)
      if (k == key) {
        merge(v, value);
        found = true;
        break;
      }
    if (!found) {
      into.entries.emplace_back(key, value);
      into.key_marks.push_back(from.key_marks.size() > i ? from.key_marks[i] : value.mark);
    }
  }
}

// ---- reading values ------------------------------------------------------------------------
struct Reader {
  std::vector<std::shared_ptr<Document>> docs;
  std::string base_dir;

  const Document& doc(const Node& n) const { return *docs.at(static_cast<std::size_t>(n.source)); }
  [[noreturn]] void fail(const Node& n, const std::string& value, const std::string& expected) const {
    throw doc(n).error(n, value, expected);
  }
  void require_map(const Node& n, const std::string& section) const {
    require_keys(doc(n), n, keys().find(section)->second);
  }
  double q(const Node& n, Kind k) const { return quantity(doc(n), n, k); }
  double q_in(const Node& n, Kind k, double lo, double hi, const char* unit) const {
    const double v = q(n, k);
    if (!(v >= lo && v <= hi))
      fail(n, n.scalar, std::string("a value from ") + format_value(lo) + " to " + format_value(hi) + " " + unit);
    return v;
  }
  double fraction(const Node& n) const { return q_in(n, Kind::fraction, 0, 1, "(0 to 100 %)"); }
  std::string word(const Node& n, const std::vector<std::string>& allowed) const {
    if (n.type != Node::Type::scalar) fail(n, "(not a word)", "one of: " + join(allowed));
    for (const auto& a : allowed)
      if (a == n.scalar) return a;
    const std::string c = closest(n.scalar, allowed);
    fail(n, n.scalar, "one of: " + join(allowed) + (c.empty() ? "" : " (closest: '" + c + "')"));
  }
  bool boolean(const Node& n) const { return word(n, {"true", "false"}) == "true"; }
  static std::string join(const std::vector<std::string>& v) {
    std::string s;
    for (const auto& x : v) s += (s.empty() ? "" : ", ") + x;
    return s;
  }
  std::string text(const Node& n) const {
    if (n.type != Node::Type::scalar) fail(n, "(not text)", "a text value");
    return n.scalar;
  }
};

BaseNumberMethod method(const Reader& r, const Node& n) {
  return r.word(n, {"D2896", "D4739"}) == "D2896" ? BaseNumberMethod::d2896 : BaseNumberMethod::d4739;
}

// Everything one variant resolves to, before the record is built.
struct Resolved {
  ReferenceState reference = ReferenceState::normal();
  CombustionReference combustion = CombustionReference::t15;
  FuelAnalysis fuel;
  const Node* fuel_node = nullptr;
};

ReferenceState reference_state(const Reader& r, const Node* n) {
  if (!n) return ReferenceState::normal();
  if (n->type == Node::Type::scalar) {
    return r.word(*n, {"normal", "standard"}) == "normal" ? ReferenceState::normal() : ReferenceState::standard();
  }
  r.require_map(*n, "reference-state");
  ReferenceState s = ReferenceState::normal();
  if (const Node* t = n->find("temperature")) s.temperature = r.q_in(*t, Kind::temperature, 200, 400, "K");
  if (const Node* p = n->find("pressure")) s.pressure = r.q_in(*p, Kind::pressure, 5e4, 2e5, "Pa");
  return s;
}

void read_fuel(const Reader& r, const Node& f, FuelAnalysis& a) {
  r.require_map(f, "fuel");
  Basis basis = Basis::dry;
  if (const Node* b = f.find("basis")) basis = r.word(*b, {"dry", "wet"}) == "dry" ? Basis::dry : Basis::wet;
  a.main_basis = basis;
  if (const Node* c = f.find("composition")) {
    static const std::vector<std::string> species = {"CH4", "CO2", "N2", "O2", "H2", "C2H6", "C3H8", "Ar"};
    require_keys(r.doc(*c), *c, species);
    a.main = {};
    double sum = 0;
    for (const auto& [k, v] : c->entries) sum += a.main[static_cast<std::size_t>(gas_from_formula(k))] = r.fraction(v);
    if (basis == Basis::dry && !(sum > 0.9 && sum < 1.1))  // wet figures are checked with the water, in resolve()
      r.fail(*c, format_value(sum * 100) + " % in all", "main components summing to 100 % (within 10 points); they are normalised");
  } else {
    throw r.doc(f).error(f, "(no composition)", "a 'composition' map of the main components (CH4, CO2, …)");
  }
  const Node* w = f.find("water");
  const Node* wd = f.find("water-dew-point");
  if (w && wd) r.fail(*wd, wd->scalar, "either 'water' or 'water-dew-point', not both");
  double p_gas = 101325;
  if (const Node* p = f.find("gas-pressure")) p_gas = r.q_in(*p, Kind::pressure, 5e4, 5e5, "Pa");
  if (w) a.water_fraction = r.q_in(*w, Kind::fraction, 0, 0.3, "(0 to 30 %)");
  if (wd) {
    const double T = r.q_in(*wd, Kind::temperature, 273.15, 353.15, "K (0 to 80 degC)");
    a.water_fraction = water::saturation_pressure(T) / p_gas;
  }
  const auto conc = [&](const char* key, Concentration& out) {
    if (const Node* n = f.find(key)) out = concentration(r.doc(*n), *n, basis);
  };
  conc("h2s", a.h2s);
  conc("other-sulfur", a.other_sulfur);
  conc("chlorine", a.chlorine);
  conc("fluorine", a.fluorine);
  if (const Node* h = f.find("halocarbons")) {
    if (h->type != Node::Type::map) r.fail(*h, "(not a map)", "a map of compound name to figure");
    a.halocarbons.clear();
    for (const auto& [k, v] : h->entries) {
      try {
        find_halocarbon(k);
      } catch (const InputError& e) {
        r.fail(v, k, e.expected());
      }
      a.halocarbons.push_back({k, concentration(r.doc(v), v, basis)});
    }
  }
}

struct EngineInputs {
  double rated_power = 0, power = 0, efficiency = 0, fuel_flow = 0;
  const Node* power_node = nullptr;
  Operation op;
  double oil_temperature = 273.15 + 88;
  double start_every = 0;  // h between starts, 0 = none
  double exhaust_temperature = 723.15;
};

NoxEmission nox(const Reader& r, const Node& n) {
  NoxEmission e;
  const std::string t = r.text(n);
  const auto at = t.find(" at ");
  Node part = n;
  if (at != std::string::npos) {  // "500 mg/Nm3 at 5 % O2"
    part.scalar = t.substr(0, at);
    const Concentration c = concentration(r.doc(n), part, Basis::dry);
    if (c.unit != ConcentrationUnit::mg_per_m3)
      r.fail(n, t, "NOx as '<number> mg/Nm3 at <number> % O2' or '<number> g/kWh'");
    std::string o2 = t.substr(at + 4);
    if (o2.size() < 3 || o2.substr(o2.size() - 3) != " O2")
      r.fail(n, t, "NOx as '<number> mg/Nm3 at <number> % O2' or '<number> g/kWh'");
    part.scalar = o2.substr(0, o2.size() - 3);
    e.value = c.value;
    e.unit = NoxEmission::Unit::mg_per_m3_dry_at_o2_ref;
    e.o2_reference = r.q_in(part, Kind::fraction, 0, 0.2, "(0 to 20 % O2)");
    return e;
  }
  const auto sp = t.find_last_of(' ');
  if (sp == std::string::npos || t.substr(sp + 1) != "g/kWh")
    r.fail(n, t, "NOx as '<number> mg/Nm3 at <number> % O2' or '<number> g/kWh'");
  part.scalar = t.substr(0, sp);
  e.value = number(r.doc(n), part);
  if (!(e.value >= 0 && e.value < 100)) r.fail(n, t, "a NOx figure from 0 to 100 g/kWh");
  e.unit = NoxEmission::Unit::g_per_kWh;
  return e;
}

void read_engine(const Reader& r, const Node& e, EngineInputs& in) {
  r.require_map(e, "engine");
  if (const Node* n = e.find("rated-power")) in.rated_power = r.q_in(*n, Kind::power, 1e3, 1e8, "W");
  const Node* pw = e.find("power");
  const Node* ld = e.find("load");
  if (pw && ld) r.fail(*ld, ld->scalar, "either 'power' or 'load', not both");
  if (pw) in.power = r.q_in(*pw, Kind::power, 0, 1e8, "W"), in.power_node = pw;
  if (ld) {
    if (in.rated_power <= 0) r.fail(*ld, ld->scalar, "a 'rated-power' in the engine section to take the load of");
    in.power = r.q_in(*ld, Kind::fraction, 0.05, 1.2, "(5 to 120 %)") * in.rated_power;
    in.power_node = ld;
  }
  if (in.rated_power <= 0) in.rated_power = in.power;
  if (const Node* n = e.find("electrical-efficiency")) in.efficiency = r.q_in(*n, Kind::fraction, 0.05, 0.6, "(5 to 60 %)");
  if (const Node* n = e.find("fuel-flow")) in.fuel_flow = r.q_in(*n, Kind::molar_flow, 0, 1e8, "mol/h");
  Operation& op = in.op;
  if (const Node* n = e.find("excess-air-ratio")) op.air.excess_air_ratio = r.q_in(*n, Kind::number, 1.0, 4.0, "(lambda)");
  const Node* aw = e.find("air-water");
  const Node* ah = e.find("air-humidity");
  if (aw && ah) r.fail(*ah, ah->scalar, "either 'air-water' or 'air-humidity', not both");
  if (aw) op.air.water_fraction = r.q_in(*aw, Kind::fraction, 0, 0.1, "(0 to 10 %)");
  if (ah) {
    double T = 288.15, p = 101325;
    if (const Node* n = e.find("air-temperature")) T = r.q_in(*n, Kind::temperature, 243.15, 323.15, "K (-30 to 50 degC)");
    if (const Node* n = e.find("air-pressure")) p = r.q_in(*n, Kind::pressure, 6e4, 1.1e5, "Pa");
    op.air.water_fraction = water::water_fraction_at_humidity(r.fraction(*ah), T, p);
  }
  const Node* bb = e.find("blow-by");
  const Node* bf = e.find("blow-by-flow");
  if (bb && bf) r.fail(*bf, bf->scalar, "either 'blow-by' (share of charge) or 'blow-by-flow', not both");
  if (bb) op.blowby_share = r.q_in(*bb, Kind::fraction, 0, 0.1, "(0 to 10 % of the charge)");
  if (bf) op.blowby_flow = r.q_in(*bf, Kind::molar_flow, 0, 1e7, "mol/h");
  if (const Node* n = e.find("jacket-water-out")) op.jacket_water_out = r.q_in(*n, Kind::temperature, 273.15, 423.15, "K (0 to 150 degC)");
  if (const Node* n = e.find("coldest-crankcase-surface")) op.coldest_crankcase_surface = r.q_in(*n, Kind::temperature, 233.15, 423.15, "K (-40 to 150 degC)");
  if (const Node* n = e.find("oil-temperature")) in.oil_temperature = r.q_in(*n, Kind::temperature, 273.15, 423.15, "K (0 to 150 degC)");
  if (const Node* n = e.find("crankcase-pressure")) op.crankcase_pressure = r.q_in(*n, Kind::pressure, 5e4, 2e5, "Pa");
  if (const Node* n = e.find("exhaust-pressure")) op.exhaust_pressure = r.q_in(*n, Kind::pressure, 5e4, 5e5, "Pa");
  if (const Node* n = e.find("exhaust-temperature")) in.exhaust_temperature = r.q_in(*n, Kind::temperature, 400, 1500, "K");
  if (const Node* n = e.find("start-every")) in.start_every = r.q_in(*n, Kind::duration, 0.1, 1e6, "h");
  if (const Node* n = e.find("nox")) op.nox = nox(r, *n);
}

void read_model(const Reader& r, const Node& m, ModelParameters& p, OilProperties& oil) {
  r.require_map(m, "model");
  TransferParameters& t = p.transfer;
  OxidationLaw& o = p.oxidation;
  const auto f = [&](const char* key, double& out) { if (const Node* n = m.find(key)) out = r.fraction(*n); };
  const auto k = [&](const char* key, Kind kind, double& out) { if (const Node* n = m.find(key)) out = r.q(*n, kind); };
  f("so3-share", t.so3_share);
  f("liner-uptake", t.liner_uptake);
  k("liner-subcooling-scale", Kind::temperature_change, t.liner_subcooling_scale);
  k("liner-wall-rise", Kind::temperature_change, t.liner_wall_rise);
  k("liner-wall-rise-load-exponent", Kind::number, t.liner_wall_rise_load_exponent);
  k("liner-pressure", Kind::pressure, t.liner_pressure);
  k("cylinder-dew-point-offset", Kind::temperature_change, t.cylinder_dew_point_offset);
  f("burnt-share-of-blow-by", t.burnt_share_of_blowby);
  f("capture-so3", t.capture_so3);
  f("capture-hcl", t.capture_hcl);
  f("capture-hf", t.capture_hf);
  f("capture-so2", t.capture_so2);
  f("capture-no2", t.capture_no2);
  k("wet-so2-factor", Kind::number, t.wet_so2_factor);
  if (const Node* n = m.find("wetness-scale")) t.wetness_width = 2 * std::log(9.0) * r.q(*n, Kind::temperature_change);  // old form: the logistic scale
  k("warm-up-time", Kind::duration, t.warmup_hours);
  if (const Node* n = m.find("oxidation-law"))
    o.kind = r.word(*n, {"doubling", "arrhenius"}) == "doubling" ? OxidationLaw::Kind::doubling : OxidationLaw::Kind::arrhenius;
  k("oxidation-rate", Kind::oxidation_rate, o.rate_at_reference);
  k("oxidation-reference-temperature", Kind::temperature, o.reference_temperature);
  k("oxidation-doubling-interval", Kind::temperature_change, o.doubling_interval);
  k("activation-energy", Kind::molar_energy, o.activation_energy);
  k("ring-zone-offset", Kind::temperature_change, o.ring_zone_offset);
  k("organic-acid-yield", Kind::number, o.organic_acid_yield);
  k("nitration-yield", Kind::number, o.nitration_yield);
  k("weak-base-d2896", Kind::acid_number, oil.weak_base_d2896);
  k("weak-base-d4739", Kind::acid_number, oil.weak_base_d4739);
  k("base-floor", Kind::acid_number, oil.base_floor);
  k("additive-depletion", Kind::per_hour, oil.additive_depletion);
  f("salt-titration-share", oil.salt_titration_share);
  f("organic-neutralised-share", oil.organic_neutralised_share);
  // range checks with the file position: the core's validators name the field, we add where
  try {
    validate(t);
    validate(o);
  } catch (const InputError& e) {
    for (const auto& [key, node] : m.entries)
      if (e.key() == key || e.key() == "model." + key || e.key().find(key) != std::string::npos)
        r.fail(node, node.scalar, e.expected());
    throw;
  }
}

struct OilInputs {
  double volume = 0;
  double specific_consumption = 0.2e-3 / 3.6e6;  // 0.2 g/kWh [kg/J]
  const Node* volume_node = nullptr;
};

void read_oil(const Reader& r, const Node& o, OilCharge& c, OilInputs& in) {
  r.require_map(o, "oil");
  OilProperties& p = c.oil;
  if (const Node* n = o.find("density")) p.density_15 = r.q_in(*n, Kind::density, 600, 1200, "kg/m3");
  if (const Node* n = o.find("volume")) in.volume = r.q_in(*n, Kind::volume, 1e-3, 100, "m3"), in.volume_node = n;
  else throw r.doc(o).error(o, "(no volume)", "the oil volume in circulation, e.g. 'volume: 600 L'");
  if (const Node* n = o.find("fresh-tbn")) p.fresh_tbn = r.q_in(*n, Kind::acid_number, 0.5, 80, "mg KOH/g");
  if (const Node* n = o.find("tbn-method")) p.fresh_tbn_method = method(r, *n);
  if (const Node* n = o.find("fresh-tan")) p.fresh_tan = r.q_in(*n, Kind::acid_number, 0, 20, "mg KOH/g");
  if (const Node* n = o.find("consumption")) in.specific_consumption = r.q_in(*n, Kind::specific_consumption, 0, 5e-9, "kg/J (0 to 18 g/kWh)");
  if (const Node* n = o.find("makeup")) c.continuous_makeup = r.word(*n, {"continuous", "top-ups"}) == "continuous";
  if (const Node* n = o.find("residual-share")) c.residual_share = r.q_in(*n, Kind::fraction, 0, 0.9, "(0 to 90 %)");
}

void read_limits(const Reader& r, const Node& l, LimitSettings& s) {
  r.require_map(l, "limits");
  if (const Node* n = l.find("tbn-share-of-fresh")) s.tbn_share_of_fresh = r.fraction(*n);
  if (const Node* n = l.find("tbn-method")) s.tbn_method = method(r, *n);
  if (const Node* n = l.find("tan-rise")) s.tan_rise = r.q_in(*n, Kind::acid_number, 0, 50, "mg KOH/g");
  if (const Node* n = l.find("crossover")) s.crossover = r.boolean(*n);
  if (const Node* n = l.find("san")) s.san = r.q_in(*n, Kind::acid_number, 0, 50, "mg KOH/g");
  if (const Node* n = l.find("oxidation")) s.oxidation = r.q_in(*n, Kind::oxidation, 0, 1000, "A/cm");
  if (const Node* n = l.find("nitration")) s.nitration = r.q_in(*n, Kind::oxidation, 0, 1000, "A/cm");
  if (const Node* n = l.find("max-hours")) s.max_hours = r.q_in(*n, Kind::duration, 1, 1e6, "h");
  s.enabled[static_cast<std::size_t>(Limit::crossover)] = s.crossover;
  if (const Node* n = l.find("ignore")) {
    if (n->type != Node::Type::sequence) r.fail(*n, n->scalar, "a list of limit names, e.g. [nitration]");
    std::vector<std::string> names;
    for (Limit x : all_limits) names.emplace_back(name(x));
    for (const Node& item : n->items) {
      const std::string w = r.word(item, names);
      for (Limit x : all_limits)
        if (name(x) == w) s.enabled[static_cast<std::size_t>(x)] = false;
    }
  }
}

// One segment's overrides, from a YAML map or a CSV row turned into nodes.
void apply_segment(const Reader& r, const Node& row, Segment& s, const EngineInputs& eng, const OilCharge& ch,
                   FuelAnalysis fuel, double specific_consumption, double& power_out) {
  r.require_map(row, "segment");
  const Node* h = row.find("hours");
  if (!h) throw r.doc(row).error(row, "(no hours)", "the segment's running hours, e.g. 'hours: 500 h'");
  s.hours = r.q_in(*h, Kind::duration, 0, 1e6, "h");
  if (const Node* n = row.find("calendar-hours")) s.calendar_hours = r.q_in(*n, Kind::duration, 0, 1e7, "h");
  if (const Node* n = row.find("starts")) s.starts = r.q_in(*n, Kind::count, 0, 1e6, "");
  bool fuel_changed = false;
  const auto conc = [&](const char* key, Concentration& out) {
    if (const Node* n = row.find(key)) out = concentration(r.doc(*n), *n, fuel.main_basis), fuel_changed = true;
  };
  conc("h2s", fuel.h2s);
  conc("other-sulfur", fuel.other_sulfur);
  conc("chlorine", fuel.chlorine);
  conc("fluorine", fuel.fluorine);
  if (fuel_changed) s.fuel = resolve(fuel);
  double power = power_out;
  const Node* pw = row.find("power");
  const Node* ld = row.find("load");
  if (pw && ld) r.fail(*ld, ld->scalar, "either 'power' or 'load', not both");
  if (pw) power = r.q_in(*pw, Kind::power, 0, 1e8, "W");
  if (ld) power = r.q_in(*ld, Kind::fraction, 0.05, 1.2, "(5 to 120 %)") * eng.rated_power;
  if (pw || ld || fuel_changed) {
    if (eng.fuel_flow > 0 && (pw || ld))
      r.fail(pw ? *pw : *ld, (pw ? pw : ld)->scalar, "no power change when the engine section gives 'fuel-flow' (give power and electrical-efficiency there)");
    if (eng.fuel_flow <= 0) s.operation.fuel_flow = fuel_flow_from_power(power, eng.efficiency, lower_heating_value(s.fuel));
    s.operation.electrical_power = power;
    s.operation.load = eng.rated_power > 0 ? power / eng.rated_power : 1;
    s.oil_consumption = oil_consumption(specific_consumption, power);
  }
  if (const Node* n = row.find("jacket-water-out")) s.operation.jacket_water_out = r.q_in(*n, Kind::temperature, 273.15, 423.15, "K");
  if (const Node* n = row.find("oil-temperature")) s.oil_temperature = r.q_in(*n, Kind::temperature, 273.15, 423.15, "K");
  if (const Node* n = row.find("coldest-crankcase-surface")) s.operation.coldest_crankcase_surface = r.q_in(*n, Kind::temperature, 233.15, 423.15, "K");
  if (const Node* n = row.find("blow-by")) s.operation.blowby_share = r.q_in(*n, Kind::fraction, 0, 0.1, "(0 to 10 %)");
  if (const Node* n = row.find("excess-air-ratio")) s.operation.air.excess_air_ratio = r.q_in(*n, Kind::number, 1.0, 4.0, "(lambda)");
  const Node* ev = row.find("event");
  const Node* amt = row.find("event-amount");
  if (amt && !ev) r.fail(*amt, amt->scalar, "an 'event' for the amount to belong to");
  if (ev && !(ev->type == Node::Type::scalar && ev->scalar.empty())) {
    OilEvent e;
    const std::string w = r.word(*ev, {"oil-change", "top-up", "partial-drain"});
    if (w == "oil-change") {
      e.kind = OilEvent::Kind::oil_change;
      if (amt && !amt->scalar.empty()) e.amount = r.q_in(*amt, Kind::fraction, 0, 0.9, "(residual share, 0 to 90 %)");
    } else if (w == "top-up") {
      e.kind = OilEvent::Kind::top_up;
      if (amt && !amt->scalar.empty()) e.amount = r.q_in(*amt, Kind::volume, 0, 100, "m3") * ch.oil.density_15;
    } else {
      e.kind = OilEvent::Kind::partial_drain;
      if (!amt || amt->scalar.empty()) r.fail(*ev, ev->scalar, "an 'event-amount' (the share drained) with a partial drain");
      e.amount = r.fraction(*amt);
    }
    s.events.push_back(e);
  }
  power_out = power;
}

// A CSV record as a list of segment nodes; header "name [unit]" gives bare cells a unit.
std::vector<Node> csv_segments(Reader& r, const Node& file_node) {
  namespace fs = std::filesystem;
  fs::path p = r.text(file_node);
  if (p.is_relative()) p = fs::path(r.base_dir) / p;
  CsvTable t;
  try {
    t = read_csv(p.string());
  } catch (const InputError& e) {
    if (e.where().line > 0) throw;
    r.fail(file_node, file_node.scalar, "a readable CSV file (" + e.expected() + ")");
  }
  auto d = std::make_shared<Document>();
  d->file = t.file;
  d->lines = t.text;
  const int source = static_cast<int>(r.docs.size());
  r.docs.push_back(d);
  const NamedColumns cols = named_columns(t, keys().find("segment")->second, "record column");
  std::vector<Node> out;
  for (std::size_t i = 0; i < t.rows.size(); ++i) {
    Node row;
    row.type = Node::Type::map;
    row.mark = {t.lines[i], 1};
    row.path = "record[" + std::to_string(i) + "]";
    row.source = source;
    for (std::size_t c = 0; c < t.header.size(); ++c) {
      if (t.rows[i][c].empty()) continue;
      Node v = cell_node(t, i, c, cols.names[c], cols.units[c], "record");
      v.source = source;
      row.entries.emplace_back(cols.names[c], v);
      row.key_marks.push_back(v.mark);
    }
    out.push_back(std::move(row));
  }
  return out;
}

EngineCase build(Reader& r, const Node& root, const std::string& name) {
  EngineCase c;
  c.name = name;
  const ReferenceState ref = reference_state(r, root.find("reference-state"));
  CombustionReference comb = CombustionReference::t15;
  if (const Node* n = root.find("combustion-reference")) {
    try {
      comb = combustion_reference_at(r.q(*n, Kind::temperature));
    } catch (const InputError& e) {
      if (e.where().line > 0) throw;
      r.fail(*n, n->scalar, "one of the ISO 6976 combustion reference temperatures 0, 15, 20 or 25 degC");
    }
  }
  FuelAnalysis fuel;
  fuel.reference = ref;
  fuel.combustion = comb;
  const Node* fn = root.find("fuel");
  if (!fn) throw r.doc(root).error(root, "(no fuel section)", "a 'fuel' section with the gas analysis");
  read_fuel(r, *fn, fuel);
  EngineInputs eng;
  const Node* en = root.find("engine");
  if (!en) throw r.doc(root).error(root, "(no engine section)", "an 'engine' section");
  read_engine(r, *en, eng);
  OilInputs oin;
  const Node* on = root.find("oil");
  if (!on) throw r.doc(root).error(root, "(no oil section)", "an 'oil' section");
  read_oil(r, *on, c.charge, oin);
  if (const Node* m = root.find("model")) read_model(r, *m, c.model, c.charge.oil);
  if (const Node* l = root.find("limits")) read_limits(r, *l, c.model.limits);
  try {
    validate(c.charge.oil);
  } catch (const InputError& e) {
    const Node* at = on->find("fresh-tbn") ? on->find("fresh-tbn") : on;
    r.fail(*at, at->type == Node::Type::scalar ? at->scalar : "", e.expected());
  }
  c.charge.mass = oin.volume * c.charge.oil.density_15;
  c.exhaust_temperature = eng.exhaust_temperature;

  // the base segment
  Segment base;
  try {
    base.fuel = resolve(fuel);
  } catch (const InputError& e) {
    r.fail(*fn, "", e.what());
  }
  base.operation = eng.op;
  if (eng.fuel_flow > 0) {
    if (eng.efficiency > 0) r.fail(*en->find("fuel-flow"), en->find("fuel-flow")->scalar, "either 'fuel-flow' or 'electrical-efficiency', not both");
    base.operation.fuel_flow = eng.fuel_flow;
  } else {
    if (eng.power <= 0) throw r.doc(*en).error(*en, "(no power)", "'power' (or 'load' and 'rated-power') with 'electrical-efficiency', or 'fuel-flow'");
    if (eng.efficiency <= 0) throw r.doc(*en).error(*en, "(no efficiency)", "'electrical-efficiency' to go with the power, or 'fuel-flow'");
    base.operation.fuel_flow = fuel_flow_from_power(eng.power, eng.efficiency, lower_heating_value(base.fuel));
  }
  base.operation.electrical_power = eng.power;
  base.operation.load = eng.rated_power > 0 && eng.power > 0 ? eng.power / eng.rated_power : 1;
  base.oil_temperature = eng.oil_temperature;
  base.oil_consumption = oil_consumption(oin.specific_consumption, eng.power);
  if (base.oil_consumption <= 0 && c.charge.continuous_makeup && eng.power <= 0)
    throw r.doc(*on).error(*on, "(no consumption)", "an engine 'power' so that the oil consumption in g/kWh can be applied");

  // run settings
  double horizon = c.model.limits.max_hours;
  if (const Node* rn = root.find("run")) {
    r.require_map(*rn, "run");
    if (const Node* n = rn->find("hours")) horizon = r.q_in(*n, Kind::duration, 1, 1e7, "h");
    if (const Node* n = rn->find("output-interval")) c.options.output_interval = r.q_in(*n, Kind::duration, 0, 1e6, "h");
    if (const Node* n = rn->find("detection-step")) c.options.detection_step = r.q_in(*n, Kind::duration, 0.01, 1e6, "h");
  }
  if (c.options.output_interval == 0) c.options.output_interval = std::fmax(1.0, horizon / 400);

  // the record: one segment of the base operation, or the listed segments
  std::vector<Node> rows;
  if (const Node* rec = root.find("record")) {
    r.require_map(*rec, "record");
    const Node* file = rec->find("file");
    const Node* segs = rec->find("segments");
    if (file && segs) r.fail(*segs, "", "either a record 'file' or inline 'segments', not both");
    if (file) rows = csv_segments(r, *file);
    if (segs) {
      if (segs->type != Node::Type::sequence || segs->items.empty())
        r.fail(*segs, "", "a list of segments, each with its 'hours'");
      rows = segs->items;
    }
    if (rows.empty()) r.fail(*rec, "", "at least one segment");
  }
  if (rows.empty()) {
    base.hours = horizon;
    base.starts = eng.start_every > 0 ? horizon / eng.start_every : 0;
    c.record = {base};
  } else {
    double power = eng.power;
    Segment prev = base;
    for (const Node& row : rows) {
      Segment s = prev;  // each segment carries the last values forward
      s.events.clear();
      s.calendar_hours = -1;
      s.starts = 0;
      apply_segment(r, row, s, eng, c.charge, fuel, oin.specific_consumption, power);
      if (!row.find("starts") && eng.start_every > 0) s.starts = s.hours / eng.start_every;
      c.record.push_back(s);
      prev = s;
    }
  }
  // validate the operation of every segment here, so that a range error names the place
  for (std::size_t i = 0; i < c.record.size(); ++i) {
    try {
      Transfer t;
      segment_rates(c.record[i], c.charge, c.model, &t);
    } catch (const InputError& e) {
      const Node& at = rows.empty() ? *en : rows[i];
      r.fail(at, e.value(), e.key() + ": " + e.expected());
    } catch (const NotModelledError& e) {
      const Node& at = rows.empty() ? *en : rows[i];
      r.fail(at, "", std::string("an operation the model covers: ") + e.what());
    }
  }
  return c;
}

// The kind a parameter's values are written in, and the kind of a spread of it.
std::pair<Kind, Kind> kinds_of(const std::string& key) {
  static const std::map<std::string, std::pair<Kind, Kind>, std::less<>> k = {
      {"model.liner-wall-rise", {Kind::temperature_change, Kind::temperature_change}},
      {"model.wet-so2-factor", {Kind::number, Kind::number}},
      {"model.oxidation-rate", {Kind::oxidation_rate, Kind::oxidation_rate}},
      {"model.ring-zone-offset", {Kind::temperature_change, Kind::temperature_change}},
      {"model.organic-acid-yield", {Kind::number, Kind::number}},
      {"model.nitration-yield", {Kind::number, Kind::number}},
      {"model.weak-base-d2896", {Kind::acid_number, Kind::acid_number}},
      {"model.weak-base-d4739", {Kind::acid_number, Kind::acid_number}},
      {"model.base-floor", {Kind::acid_number, Kind::acid_number}},
      {"model.additive-depletion", {Kind::per_hour, Kind::per_hour}},
      {"engine.jacket-water-out", {Kind::temperature, Kind::temperature_change}},
      {"oil.fresh-tbn", {Kind::acid_number, Kind::acid_number}},
      {"oil.volume", {Kind::volume, Kind::volume}},
  };
  const auto it = k.find(key);
  if (it != k.end()) return it->second;
  return {Kind::fraction, Kind::fraction};  // the shares
}

UncertaintySettings read_uncertainty(const Reader& r, const Node& u) {
  r.require_map(u, "uncertainty");
  UncertaintySettings out;
  if (const Node* n = u.find("draws")) out.draws = static_cast<int>(r.q_in(*n, Kind::count, 1, 1e7, ""));
  if (const Node* n = u.find("seed")) out.seed = static_cast<std::uint64_t>(r.q_in(*n, Kind::count, 0, 9e15, ""));
  const Node* in = u.find("inputs");
  if (!in || in->type != Node::Type::sequence || in->items.empty())
    throw r.doc(u).error(u, "(no inputs)", "an 'inputs' list of uncertain parameters");
  std::vector<std::string> names;
  for (const auto& p : parameter_table())
    if (p.key != "oil.consumption") names.push_back(p.key);
  for (const Node& item : in->items) {
    r.require_map(item, "uncertain-input");
    const Node* pn = item.find("parameter");
    if (!pn) throw r.doc(item).error(item, "(no parameter)", "a 'parameter', one of: " + Reader::join(names));
    const std::string key = r.word(*pn, names);
    const Node* dn = item.find("distribution");
    if (!dn) throw r.doc(item).error(item, "(no distribution)", "a 'distribution': normal, lognormal, uniform or triangular");
    const std::string dist = r.word(*dn, {"normal", "lognormal", "uniform", "triangular"});
    const auto [kind, spread] = kinds_of(key);
    const auto value = [&](const char* field, Kind k) -> double {
      const Node* n = item.find(field);
      if (!n) throw r.doc(item).error(item, "(no " + std::string(field) + ")", std::string("a '") + field + "' for a " + dist + " distribution");
      if (key == "fuel.h2s" && k != Kind::number) {  // written as a contaminant figure in ppmv
        const Concentration c = concentration(r.doc(*n), *n, Basis::dry);
        if (c.unit != ConcentrationUnit::ppmv || c.basis != Basis::dry) r.fail(*n, n->scalar, "an H2S figure in ppmv (dry)");
        return c.value;
      }
      return r.q(*n, k);
    };
    UncertainInput x;
    x.key = key;
    if (dist == "normal") x.distribution = {Distribution::Kind::normal, value("mean", kind), value("sd", spread), 0};
    else if (dist == "lognormal") x.distribution = {Distribution::Kind::lognormal, value("median", kind), value("sigma-log", Kind::number), 0};
    else if (dist == "uniform") x.distribution = {Distribution::Kind::uniform, value("low", kind), value("high", kind), 0};
    else x.distribution = {Distribution::Kind::triangular, value("low", kind), value("mode", kind), value("high", kind)};
    const Distribution& d = x.distribution;
    const bool ok = d.kind == Distribution::Kind::normal      ? d.b >= 0
                    : d.kind == Distribution::Kind::lognormal ? d.a > 0 && d.b >= 0
                    : d.kind == Distribution::Kind::uniform   ? d.a < d.b
                                                              : d.a <= d.b && d.b <= d.c && d.a < d.c;
    if (!ok) r.fail(*dn, dist, "parameters in order (low < high, low <= mode <= high, sd >= 0, median > 0)");
    out.inputs.push_back(x);
  }
  return out;
}

std::shared_ptr<Document> parse_into(Reader& r, std::string_view text, const std::string& file) {
  auto d = std::make_shared<Document>(parse_document(text, file));
  set_source(d->root, static_cast<int>(r.docs.size()));
  r.docs.push_back(d);
  return d;
}

int format_version(const Reader& r, const Node& root) {
  const Node* v = root.find("format-version");
  if (!v) throw r.doc(root).error(Mark{1, 1}, "format-version", "(missing)",
                                   "a 'format-version: 1' line (this acidload reads versions 1 to " +
                                       std::to_string(case_format_version) + ")");
  const double x = r.q(*v, Kind::count);
  if (!(x >= 1 && x <= case_format_version && x == std::floor(x)))
    r.fail(*v, v->scalar, "a format version from 1 to " + std::to_string(case_format_version) + " (this acidload " +
                              version() + " reads those; a newer file needs a newer acidload)");
  return static_cast<int>(x);
}

CaseFile load(Reader& r, std::shared_ptr<Document> main, const std::vector<std::string>& overlays) {
  const Node& root0 = main->root;
  if (root0.type != Node::Type::map)
    throw main->error(Mark{1, 1}, "(top level)", root0.type == Node::Type::null ? "(empty file)" : "(not a map)",
                      "a case: a map with format-version, fuel, engine, oil and optional sections");
  require_keys(*main, root0, keys().find("")->second);
  CaseFile out;
  out.file = main->file;
  out.format_version = format_version(r, root0);
  Node root = root0;
  for (const std::string& path : overlays) {
    auto od = std::make_shared<Document>(read_document(path));
    set_source(od->root, static_cast<int>(r.docs.size()));
    r.docs.push_back(od);
    if (od->root.type != Node::Type::map)
      throw od->error(Mark{1, 1}, "(top level)", "(not a map)", "an overlay: a map of case sections");
    require_keys(*od, od->root, keys().find("overlay")->second);
    format_version(r, od->root);
    Node layer = od->root;
    layer.entries.erase(std::remove_if(layer.entries.begin(), layer.entries.end(),
                                       [](const auto& e) { return e.first == "format-version" || e.first == "case"; }),
                        layer.entries.end());
    merge(root, layer);
    out.overlays.push_back(path);
  }
  if (const Node* t = root.find("case")) out.title = r.text(*t);
  if (const Node* u = root.find("uncertainty")) out.uncertainty = read_uncertainty(r, *u);
  std::string base_name = "base";
  if (const Node* b = root.find("base-name")) base_name = r.text(*b);
  out.variants.push_back(build(r, root, base_name));
  if (const Node* vs = root.find("variants")) {
    if (vs->type != Node::Type::sequence) r.fail(*vs, "", "a list of variants, each with a 'name'");
    std::set<std::string> names{base_name};
    for (const Node& v : vs->items) {
      r.require_map(v, "variant");
      const Node* n = v.find("name");
      if (!n) throw r.doc(v).error(v, "(no name)", "a 'name' for the variant");
      const std::string name = r.text(*n);
      if (!names.insert(name).second) r.fail(*n, name, "a variant name not used before");
      Node merged = root;
      Node layer = v;
      layer.entries.erase(std::remove_if(layer.entries.begin(), layer.entries.end(),
                                         [](const auto& e) { return e.first == "name"; }),
                          layer.entries.end());
      merge(merged, layer);
      out.variants.push_back(build(r, merged, name));
    }
  }
  return out;
}

}  // namespace

const std::vector<std::string>& section_keys(std::string_view section) {
  const auto it = keys().find(section);
  if (it == keys().end()) throw InputError("section", std::string(section), "a section of the case format");
  return it->second;
}

CaseFile load_case_text(std::string_view text, const std::string& file_name, const std::string& base_dir,
                        const std::vector<std::string>& overlays) {
  Reader r;
  r.base_dir = base_dir;
  auto d = parse_into(r, text, file_name);
  return load(r, d, overlays);
}

CaseFile load_case(const std::string& path, const std::vector<std::string>& overlays) {
  Reader r;
  r.base_dir = std::filesystem::path(path).parent_path().string();
  if (r.base_dir.empty()) r.base_dir = ".";
  auto d = std::make_shared<Document>(read_document(path));
  set_source(d->root, 0);
  r.docs.push_back(d);
  return load(r, d, overlays);
}

}  // namespace acidload::io
