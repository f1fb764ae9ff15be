// The section readers of the case format: each takes its keys' kinds and ranges from the key
// registry (keys.cpp) and fills the core's structs; no physics here (studies/operation.hpp turns a
// power into a fuel flow).
#include <cstdio>
#include <algorithm>
#include <cmath>
#include <cstdint>
#include <cstring>
#include <filesystem>

#include "acidload/core/halocarbons.hpp"
#include "acidload/core/species.hpp"
#include "acidload/core/oil_rates.hpp"
#include "acidload/core/water.hpp"
#include "acidload/studies/economics.hpp"
#include "case_reader.hpp"
#include "text.hpp"

namespace acidload::io::detail {

// ---- the reader's primitives ------------------------------------------------------------------

std::string Reader::dir_of(const Node& n) const {
  if (n.source == 0) return base_dir;
  const std::string d = std::filesystem::path(doc(n).file).parent_path().string();
  return d.empty() ? "." : d;
}

void Reader::fail(const Node& n, const std::string& value, const std::string& expected) const {
  throw doc(n).error(n, value, expected);
}

const Node* Reader::at(const Node& map, std::string_view path) const {
  const auto dot = path.rfind('.');
  return map.find(dot == std::string_view::npos ? path : path.substr(dot + 1));
}

void Reader::require_section(const Node& n, std::string_view section) const {
  require_keys(doc(n), n, section_keys(section));
}

bool snapped_in_range(const CaseKey& k, double& v) {
  // an end written in another unit ("-40 degC" for 233.15 K) is the end, not a rounding error past it
  const auto snap = [&](double end) {
    if (std::isfinite(end) && end != 0 && std::fabs(v - end) <= 1e-12 * std::fabs(end)) v = end;
  };
  snap(k.low);
  snap(k.high);
  return k.in_range(v);
}

double Reader::value(const Node& n, const CaseKey& k) const {
  double v = quantity(doc(n), n, k.kind);
  if (!snapped_in_range(k, v)) fail(n, n.scalar, "a value " + k.range_text(unit_written(n.scalar)));
  seen[k.path] = &n;
  return v;
}

bool Reader::get(const Node& map, std::string_view path, double& out) const {
  const Node* n = at(map, path);
  if (!n) return false;
  out = value(*n, case_key(path));
  return true;
}

std::string Reader::word(const Node& n, const std::vector<std::string>& allowed) const {
  if (n.type != Node::Type::scalar) fail(n, describe(n), "one of: " + join(allowed));
  for (const auto& a : allowed)
    if (a == n.scalar) return a;
  const std::string c = closest(n.scalar, allowed);
  fail(n, n.scalar, "one of: " + join(allowed) + (c.empty() ? "" : " (closest: '" + c + "')"));
}

std::string Reader::word(const Node& n, const CaseKey& k) const {
  seen[k.path] = &n;
  return word(n, k.words);
}

std::string Reader::text(const Node& n) const {
  if (n.type != Node::Type::scalar) fail(n, describe(n), "a text value");
  return n.scalar;
}

Concentration Reader::contaminant(const Node& n, Basis basis) const { return concentration(doc(n), n, basis); }

void Reader::relocate(const InputError& e, const Node& fallback, const Node* row) const {
  const CaseKey* k = find_case_key(e.key());
  const Node* n = nullptr;
  if (k && row) n = row->find(k->key());
  if (!n) {
    const auto it = seen.find(e.key());
    if (it != seen.end()) n = it->second;
  }
  if (n) {
    double v = 0;
    std::string why;
    const bool out_of_range = k && k->type == KeyType::quantity && n->type == Node::Type::scalar &&
                              parse_quantity_text(n->scalar, k->kind, v, why) && !k->in_range(v);
    fail(*n, describe(*n), out_of_range ? "a value " + k->range_text(unit_written(n->scalar)) : e.expected());
  }
  fail(fallback, e.value(), e.key() + ": " + e.expected());
}

// ---- sections ---------------------------------------------------------------------------------

ReferenceState read_reference_state(const Reader& r, const Node* n) {
  if (!n) return ReferenceState::normal();
  if (n->type == Node::Type::scalar)
    return r.word(*n, {"normal", "standard"}) == "normal" ? ReferenceState::normal() : ReferenceState::standard();
  r.require_section(*n, "reference-state");
  ReferenceState s = ReferenceState::normal();
  r.get(*n, "reference-state.temperature", s.temperature);
  r.get(*n, "reference-state.pressure", s.pressure);
  return s;
}

CombustionReference read_combustion_reference(const Reader& r, const Node* n) {
  if (!n) return CombustionReference::t15;
  const double T = quantity(r.doc(*n), *n, Kind::temperature);
  try {
    return combustion_reference_at(T);
  } catch (const InputError&) {
    r.fail(*n, n->scalar, "one of the ISO 6976 combustion reference temperatures 0, 15, 20 or 25 degC");
  }
}

void read_fuel(const Reader& r, const Node& f, FuelAnalysis& a) {
  r.require_section(f, "fuel");
  Basis basis = Basis::dry;
  if (const Node* b = r.at(f, "fuel.basis")) basis = r.word(*b, case_key("fuel.basis")) == "dry" ? Basis::dry : Basis::wet;
  a.main_basis = basis;
  if (const Node* c = f.find("composition")) {
    static const std::vector<std::string> species = {"CH4", "CO2", "N2", "O2", "H2", "C2H6", "C3H8", "Ar"};
    require_keys(r.doc(*c), *c, species);
    a.main = {};
    double sum = 0;
    for (const auto& [k, v] : c->entries) {
      const double x = quantity(r.doc(v), v, Kind::fraction);
      if (!(x >= 0 && x <= 1)) r.fail(v, v.scalar, "a fraction from 0 to 100 %");
      sum += a.main[static_cast<std::size_t>(gas_from_formula(k))] = x;
    }
    r.seen["fuel.composition"] = c;
    if (basis == Basis::dry && !(sum > 0.9 && sum < 1.1))  // wet figures are checked with the water, in resolve()
      r.fail(*c, [&] { char b[32]; std::snprintf(b, sizeof b, "%.6g", sum * 100); return std::string(b); }() + " % in all",  // 85 %, not 85.00000000000001 %
             "main components summing to 100 % (within 10 points); they are normalised");
  } else {
    r.fail(f, "(no composition)", "a 'composition' map of the main components (CH4, CO2, …)");
  }
  const Node* w = f.find("water");
  const Node* wd = f.find("water-dew-point");
  if (w && wd) r.fail(*wd, wd->scalar, "either 'water' or 'water-dew-point', not both");
  double p_gas = 101325;
  r.get(f, "fuel.gas-pressure", p_gas);
  if (w) a.water_fraction = r.value(*w, case_key("fuel.water"));
  if (wd) {
    a.water_fraction = water::saturation_pressure(r.value(*wd, case_key("fuel.water-dew-point"))) / p_gas;
    r.seen["fuel.water"] = wd;
  }
  const auto conc = [&](const char* path, Concentration& out) {
    if (const Node* n = r.at(f, path)) out = r.contaminant(*n, basis), r.seen[path] = n;
  };
  conc("fuel.h2s", a.h2s);
  conc("fuel.other-sulfur", a.other_sulfur);
  conc("fuel.chlorine", a.chlorine);
  conc("fuel.fluorine", a.fluorine);
  if (const Node* h = f.find("halocarbons")) {
    if (h->type != Node::Type::map) r.fail(*h, describe(*h), "a map of compound name to figure");
    a.halocarbons.clear();
    for (const auto& [k, v] : h->entries) {
      try {
        find_halocarbon(k);
      } catch (const InputError& e) {
        r.fail(v, k, e.expected());
      }
      a.halocarbons.push_back({k, r.contaminant(v, basis)});
    }
  }
}

namespace {
const char* const nox_forms =
    "NOx as '<number> mg/Nm3 at <number> % O2', '<number> ppm at <number> % O2' (dry, as NO2) or '<number> g/kWh'";

// "500 mg/Nm3 @ 5% O2" → "500 mg/Nm3 at 5 % O2": '@' for 'at', a glued '%' in the O2 part.
std::string nox_spelling(std::string t) {
  std::string out;
  for (char ch : t) {
    if (ch == '@') out += " at ";
    else if (ch == '%') out += " %";
    else out += ch;
  }
  std::string squeezed;  // runs of spaces become one
  for (char ch : out)
    if (!(ch == ' ' && (squeezed.empty() || squeezed.back() == ' '))) squeezed += ch;
  while (!squeezed.empty() && squeezed.back() == ' ') squeezed.pop_back();
  return squeezed;
}

NoxEmission read_nox(const Reader& r, const Node& n) {
  NoxEmission e;
  const std::string t = nox_spelling(r.text(n));
  const auto at = t.find(" at ");
  Node part = n;
  if (at != std::string::npos) {  // "500 mg/Nm3 at 5 % O2", "250 ppm at 5 % O2"
    part.scalar = t.substr(0, at);
    const Concentration c = r.contaminant(part, Basis::dry);
    if (c.unit != ConcentrationUnit::mg_per_m3 && c.unit != ConcentrationUnit::ppmv) r.fail(n, n.scalar, nox_forms);
    if (c.unit == ConcentrationUnit::ppmv && c.basis != Basis::dry) r.fail(n, n.scalar, "NOx in ppm on the dry basis (as analysers report it)");
    std::string o2 = t.substr(at + 4);
    if (o2.size() < 3 || o2.substr(o2.size() - 3) != " O2") r.fail(n, n.scalar, nox_forms);
    part.scalar = o2.substr(0, o2.size() - 3);
    // ppm (dry, as NO2) to mg/Nm3: x / V_m(0 degC, 101.325 kPa) · M(NO2)
    e.value = c.unit == ConcentrationUnit::ppmv
                  ? c.value * 1e-6 / molar_volume(ReferenceState::normal()) * molar_mass(Gas::NO2) * 1e6
                  : c.value;
    e.unit = NoxEmission::Unit::mg_per_m3_dry_at_o2_ref;
    e.o2_reference = quantity(r.doc(n), part, Kind::fraction);
    if (!(e.o2_reference >= 0 && e.o2_reference <= 0.2)) r.fail(n, t, "an O2 reference from 0 to 20 % O2");
    r.seen["engine.nox"] = &n;
    return e;
  }
  const auto sp = t.find_last_of(' ');
  if (sp == std::string::npos || t.substr(sp + 1) != "g/kWh") r.fail(n, t, nox_forms);
  part.scalar = t.substr(0, sp);
  e.value = number(r.doc(n), part);
  if (!(e.value >= 0 && e.value < 100)) r.fail(n, t, "a NOx figure from 0 to 100 g/kWh");
  e.unit = NoxEmission::Unit::g_per_kWh;
  r.seen["engine.nox"] = &n;
  return e;
}

// Refuses both keys of an either-or pair in one map.
void one_of(const Reader& r, const Node& map, const char* a, const char* b, const char* what = nullptr) {
  const Node* na = map.find(a);
  const Node* nb = map.find(b);
  if (na && nb)
    r.fail(*nb, describe(*nb),
           std::string("either '") + a + "' or '" + b + "'" + (what ? what : "") + ", not both");
}
// The number of "<number> <unit>" and its unit, or false when the text has no number first.
bool number_and_unit(const Reader& r, const Node& n, double& v, std::string& unit) {
  if (n.type != Node::Type::scalar) return false;
  unit = unit_written(n.scalar);
  Node part = n;
  part.scalar = n.scalar.substr(0, n.scalar.find_first_of(" \t"));
  std::string why;
  return parse_quantity_text(part.scalar, Kind::number, v, why) && (void(r), true);
}

// A volume flow as a meter shows it ("60 L/min", "3.6 m3/h"), taken at the case's reference state
// like every m3 figure of the format, in mol/h; false when the unit is none of these.
bool volume_flow(const Reader& r, const Node& n, const ReferenceState& ref, double& mol_per_h) {
  double v = 0;
  std::string unit;
  if (!number_and_unit(r, n, v, unit)) return false;
  static const std::vector<std::pair<std::string, double>> per = {  // → m3/h
      {"L/min", 60e-3}, {"l/min", 60e-3}, {"L/h", 1e-3}, {"l/h", 1e-3}, {"m3/h", 1}, {"m3/min", 60}};
  for (const auto& [u, f] : per)
    if (u == unit) {
      mol_per_h = v * f / molar_volume(ref);
      return true;
    }
  return false;
}
}  // namespace

void read_engine(const Reader& r, const Node& e, EngineInputs& in) {
  r.require_section(e, "engine");
  r.get(e, "engine.rated-power", in.rating.rated_power);
  one_of(r, e, "power", "load");
  if (r.get(e, "engine.power", in.power)) {
  } else if (const Node* ld = e.find("load")) {
    if (in.rating.rated_power <= 0) r.fail(*ld, ld->scalar, "a 'rated-power' in the engine section to take the load of");
    in.power = r.value(*ld, case_key("engine.load")) * in.rating.rated_power;
  }
  if (in.rating.rated_power <= 0) in.rating.rated_power = in.power;
  one_of(r, e, "electrical-efficiency", "fuel-flow");
  r.get(e, "engine.electrical-efficiency", in.rating.electrical_efficiency);
  r.get(e, "engine.fuel-flow", in.rating.fixed_fuel_flow);
  Operation& op = in.op;
  r.get(e, "engine.excess-air-ratio", op.air.excess_air_ratio);
  one_of(r, e, "air-water", "air-humidity");
  r.get(e, "engine.air-water", op.air.water_fraction);
  double T = 288.15, p = 101325;  // read (and checked) even when no humidity is given
  r.get(e, "engine.air-temperature", T);
  r.get(e, "engine.air-pressure", p);
  if (const Node* ah = e.find("air-humidity")) {
    op.air.water_fraction = water::water_fraction_at_humidity(r.value(*ah, case_key("engine.air-humidity")), T, p);
  }
  one_of(r, e, "blow-by", "blow-by-flow", " (share of charge or flow)");
  for (const char* key : {"blow-by", "blow-by-flow"}) {  // as measured: "60 L/min", "3.6 m3/h"
    const Node* n = e.find(key);
    double flow = 0;
    if (n && volume_flow(r, *n, in.reference, flow)) {
      const CaseKey& k = case_key("engine.blow-by-flow");
      if (!k.in_range(flow)) r.fail(*n, n->scalar, "a blow-by flow " + k.range_text());
      op.blowby_flow = flow;
      r.seen["engine.blow-by-flow"] = n;
    } else if (n) {
      r.get(e, std::string("engine.") + key, key == std::string("blow-by") ? op.blowby_share : op.blowby_flow);
    }
  }
  r.get(e, "engine.jacket-water-out", op.jacket_water_out);
  r.get(e, "engine.coldest-crankcase-surface", op.coldest_crankcase_surface);
  r.get(e, "engine.oil-temperature", in.oil_temperature);
  r.get(e, "engine.crankcase-pressure", op.crankcase_pressure);
  r.get(e, "engine.exhaust-pressure", op.exhaust_pressure);
  r.get(e, "engine.exhaust-temperature", in.exhaust_temperature);
  if (const Node* n = e.find("start-every")) {  // also "3 per week", "2 per day", "3/week", "2/d"
    double v = 0;
    std::string unit;
    static const std::vector<std::pair<std::string, double>> periods = {
        {"per week", 168}, {"/week", 168}, {"per day", 24}, {"/day", 24}, {"/d", 24}};
    double period = 0;
    Node spaced = *n;  // "3/week" as "3 /week": a rate is often written without the space
    if (spaced.type == Node::Type::scalar && spaced.scalar.find_first_of(" \t") == std::string::npos)
      if (const auto slash = spaced.scalar.find('/'); slash != std::string::npos && slash > 0) spaced.scalar.insert(slash, " ");
    if (number_and_unit(r, spaced, v, unit))
      for (const auto& [u, h] : periods)
        if (u == unit) period = h;
    if (period > 0) {
      if (!(v > 0)) r.fail(*n, n->scalar, "a number of starts above 0");
      in.start_every = period / v;  // running around the clock between starts
      const CaseKey& k = case_key("engine.start-every");
      if (!k.in_range(in.start_every)) r.fail(*n, n->scalar, "starts every " + k.range_text() + " of running");
    } else {
      r.get(e, "engine.start-every", in.start_every);
    }
  }
  r.get(e, "engine.jacket-water-at-start", op.jacket_water_at_start);
  r.get(e, "engine.oxidation-catalyst", in.catalyst_so3_conversion);
  for (const char* which : {"fuel-gas-sulfur-limit", "fuel-gas-halogen-limit"})
    if (const Node* n = e.find(which)) {
      const Concentration c = r.contaminant(*n, Basis::dry);
      const bool sulfur = which[9] == 's';  // "fuel-gas-s…" or "fuel-gas-h…"
      double& per_methane = sulfur ? in.fuel_gas_limits.sulfur_per_methane : in.fuel_gas_limits.halogens_per_methane;
      double& per_energy = sulfur ? in.fuel_gas_limits.sulfur_per_energy : in.fuel_gas_limits.halogens_per_energy;
      if (c.unit == ConcentrationUnit::mg_per_m3_methane) per_methane = c.value * 1e-6;      // mg → kg per Nm³ CH4
      else if (c.unit == ConcentrationUnit::mg_per_MJ) per_energy = c.value * 1e-12;        // mg/MJ (mg/kWh read as such) → kg/J
      else r.fail(*n, n->scalar, "a fuel-gas limit in mg/Nm3 CH4, mg/MJ or mg/kWh (of fuel heat)");
      r.seen[std::string("engine.") + which] = n;
    }
  if (const Node* n = e.find("nox")) op.nox = read_nox(r, *n);
  r.get(e, "engine.o2-of-air", op.nox.o2_air);
}

void read_oil(const Reader& r, const Node& o, OilCharge& c, OilInputs& in, EngineRating& rating, double power) {
  r.require_section(o, "oil");
  OilProperties& p = c.oil;
  r.get(o, "oil.density", p.density_15);
  if (!r.get(o, "oil.volume", in.volume))
    r.fail(o, "(no volume)", "the oil volume in circulation, e.g. 'volume: 600 L'");
  r.get(o, "oil.fresh-tbn", p.fresh_tbn);
  if (const Node* n = o.find("tbn-method"))
    p.fresh_tbn_method = r.word(*n, case_key("oil.tbn-method")) == "D2896" ? BaseNumberMethod::d2896 : BaseNumberMethod::d4739;
  r.get(o, "oil.fresh-tan", p.fresh_tan);
  if (const Node* n = o.find("consumption")) {  // also as a flow from top-up logs: "0.3 L/h", "0.25 kg/h"
    double v = 0;
    std::string unit;
    double kg_per_unit = 0;
    if (number_and_unit(r, *n, v, unit)) {
      if (unit == "L/h" || unit == "l/h") kg_per_unit = p.density_15 * 1e-3;
      if (unit == "kg/h") kg_per_unit = 1;
      if (unit == "g/h") kg_per_unit = 1e-3;
    }
    if (kg_per_unit > 0) {
      if (!(power > 0)) r.fail(*n, n->scalar, "an engine 'power' to turn an oil flow into g/kWh (or the figure in g/kWh)");
      rating.specific_oil_consumption = specific_consumption(v * kg_per_unit, power);
      const CaseKey& k = case_key("oil.consumption");
      if (!k.in_range(rating.specific_oil_consumption))
        r.fail(*n, n->scalar, "an oil consumption " + k.range_text() + " at the engine's power");
      r.seen["oil.consumption"] = n;
    } else {
      r.get(o, "oil.consumption", rating.specific_oil_consumption);
    }
  }
  if (const Node* n = o.find("makeup")) c.continuous_makeup = r.word(*n, case_key("oil.makeup")) == "continuous";
  r.get(o, "oil.residual-share", c.residual_share);
}

void read_model(const Reader& r, const Node& m, ModelParameters& p, OilProperties& oil) {
  r.require_section(m, "model");
  TransferParameters& t = p.transfer;
  OxidationLaw& o = p.oxidation;
  const auto g = [&](const char* key, double& out) { r.get(m, std::string("model.") + key, out); };
  g("so3-share", t.so3_share);
  g("liner-uptake", t.liner_uptake);
  g("liner-subcooling-scale", t.liner_subcooling_scale);
  g("liner-wall-rise", t.liner_wall_rise);
  g("liner-wall-rise-load-exponent", t.liner_wall_rise_load_exponent);
  g("liner-pressure", t.liner_pressure);
  g("cylinder-dew-point-offset", t.cylinder_dew_point_offset);
  g("burnt-share-of-blow-by", t.burnt_share_of_blowby);
  g("capture-so3", t.capture_so3);
  g("capture-hcl", t.capture_hcl);
  g("capture-hf", t.capture_hf);
  g("capture-so2", t.capture_so2);
  g("capture-no2", t.capture_no2);
  g("wet-so2-factor", t.wet_so2_factor);
  g("wetness-width", t.wetness_width);
  double scale = -1;
  if (r.get(m, "model.wetness-scale", scale)) t.wetness_width = 2 * std::log(9.0) * scale;  // the older form
  g("warm-up-time", t.warmup_hours);
  g("warm-up-start-load", t.warmup_start_load);
  g("load-ramp-time", t.load_ramp_hours);
  g("induction-time", o.induction_hours);
  g("depleted-oxidation-factor", o.depleted_factor);
  g("viscosity-per-oxidation", oil.viscosity_per_oxidation);
  g("viscosity-per-nitration", oil.viscosity_per_nitration);
  if (const Node* n = m.find("oxidation-law"))
    o.kind = r.word(*n, case_key("model.oxidation-law")) == "doubling" ? OxidationLaw::Kind::doubling : OxidationLaw::Kind::arrhenius;
  g("oxidation-rate", o.rate_at_reference);
  g("oxidation-reference-temperature", o.reference_temperature);
  g("oxidation-doubling-interval", o.doubling_interval);
  g("activation-energy", o.activation_energy);
  g("ring-zone-offset", o.ring_zone_offset);
  g("organic-acid-yield", o.organic_acid_yield);
  g("nitration-yield", o.nitration_yield);
  g("weak-base-d2896", oil.weak_base_d2896);
  g("weak-base-d4739", oil.weak_base_d4739);
  g("base-floor", oil.base_floor);
  g("additive-depletion", oil.additive_depletion);
  g("salt-titration-share", oil.salt_titration_share);
  g("organic-neutralised-share", oil.organic_neutralised_share);
  try {  // relations between keys, checked by the core, located at the key the core names
    validate(t);
    validate(o);
  } catch (const InputError& e) {
    r.relocate(e, m);
  }
}

void read_limits(const Reader& r, const Node& l, LimitSettings& s) {
  r.require_section(l, "limits");
  r.get(l, "limits.tbn-share-of-fresh", s.tbn_share_of_fresh);
  if (const Node* n = l.find("tbn-method"))
    s.tbn_method = r.word(*n, case_key("limits.tbn-method")) == "D2896" ? BaseNumberMethod::d2896 : BaseNumberMethod::d4739;
  r.get(l, "limits.tan-rise", s.tan_rise);
  if (const Node* n = l.find("crossover")) s.crossover = r.flag(*n);
  r.get(l, "limits.san", s.san);
  r.get(l, "limits.oxidation", s.oxidation);
  r.get(l, "limits.nitration", s.nitration);
  r.get(l, "limits.viscosity-change", s.viscosity_rise);
  r.get(l, "limits.antioxidant-remaining", s.antioxidant_remaining);
  if (r.get(l, "limits.anti-wear-remaining", s.anti_wear_remaining)) s.enabled[static_cast<std::size_t>(Limit::anti_wear)] = true;
  r.get(l, "limits.water", s.water);
  r.get(l, "limits.initial-ph", s.initial_ph);
  r.get(l, "limits.max-hours", s.max_hours);
  s.enabled[static_cast<std::size_t>(Limit::crossover)] = s.crossover;
  if (const Node* n = l.find("ignore")) {
    if (n->type != Node::Type::sequence) r.fail(*n, describe(*n), "a list of limit names, e.g. [nitration]");
    std::vector<std::string> names;
    for (Limit x : all_limits) names.emplace_back(name(x));
    for (const Node& item : n->items) {
      const std::string w = r.word(item, names);
      for (Limit x : all_limits)
        if (name(x) == w) s.enabled[static_cast<std::size_t>(x)] = false;
    }
  }
}

void read_run(const Reader& r, const Node& run, double& horizon, RunOptions& o) {
  r.require_section(run, "run");
  r.get(run, "run.hours", horizon);
  r.get(run, "run.output-interval", o.output_interval);
  r.get(run, "run.detection-step", o.detection_step);
}

const FuelGas& ResolvedGases::of(const FuelAnalysis& fuel) {
  const Concentration key[4] = {fuel.h2s, fuel.other_sulfur, fuel.chlorine, fuel.fluorine};
  static_assert(sizeof(Concentration) == sizeof(double) + 2 * sizeof(int), "no padding: compared byte by byte");
  static_assert(sizeof key % (2 * sizeof(std::uint64_t)) == 0, "hashed in pairs of words");
  const auto same = [&](const Entry& e) {
    return e.used && std::memcmp(&e.h2s, &key[0], sizeof(Concentration)) == 0 &&
           std::memcmp(&e.other_sulfur, &key[1], sizeof(Concentration)) == 0 &&
           std::memcmp(&e.chlorine, &key[2], sizeof(Concentration)) == 0 &&
           std::memcmp(&e.fluorine, &key[3], sizeof(Concentration)) == 0;
  };
  if (same(table[last])) return table[last].gas;  // most rows keep the gas of the row before
  // the slot pair: FNV-1a over the key's 8-byte words in two lanes, then the splitmix64 finaliser
  // (a hash only picks where to look: a miss costs a resolve, never a wrong gas, since the key is
  // compared in full)
  std::uint64_t h0 = 1469598103934665603ull, h1 = 0x9E3779B97F4A7C15ull;
  for (std::size_t b = 0; b < sizeof key; b += 2 * sizeof(std::uint64_t)) {
    std::uint64_t w0, w1;
    std::memcpy(&w0, reinterpret_cast<const unsigned char*>(key) + b, sizeof w0);
    std::memcpy(&w1, reinterpret_cast<const unsigned char*>(key) + b + sizeof w0, sizeof w1);
    h0 = (h0 ^ w0) * 1099511628211ull;
    h1 = (h1 ^ w1) * 1099511628211ull;
  }
  std::uint64_t h = h0 ^ (h1 * 0x9E3779B97F4A7C15ull);
  h = (h ^ (h >> 30)) * 0xBF58476D1CE4E5B9ull;
  h = (h ^ (h >> 27)) * 0x94D049BB133111EBull;
  const std::size_t a = static_cast<std::size_t>((h ^ (h >> 31)) % table.size()), b = a ^ 1;  // two ways
  if (same(table[a])) return table[last = a].gas;
  if (same(table[b])) return table[last = b].gas;
  const FuelGas gas = resolve(fuel);  // may throw: the table is left as it was
  const std::size_t put = !table[a].used ? a : !table[b].used ? b : (table[a].age <= table[b].age ? a : b);
  Entry& e = table[put];
  e.h2s = key[0], e.other_sulfur = key[1], e.chlorine = key[2], e.fluorine = key[3], e.gas = gas, e.used = true;
  e.age = ++clock;
  last = put;
  return e.gas;
}

void read_segment(const Reader& r, const Node& row, Segment& s, const EngineInputs& eng, const OilCharge& ch,
                  FuelAnalysis& fuel, double& power, ResolvedGases* resolved) {
  r.require_section(row, "segment");
  const Node* h = row.find("hours");
  if (!h) r.fail(row, "(no hours)", "the segment's running hours, e.g. 'hours: 500 h'");
  s.hours = r.value(*h, case_key("segment.hours"));
  r.get(row, "segment.calendar-hours", s.calendar_hours);
  r.get(row, "segment.starts", s.starts);
  bool fuel_changed = false;
  const auto conc = [&](const char* key, Concentration& out) {
    if (const Node* n = row.find(key)) out = r.contaminant(*n, fuel.main_basis), fuel_changed = true;
  };
  conc("h2s", fuel.h2s);
  conc("other-sulfur", fuel.other_sulfur);
  conc("chlorine", fuel.chlorine);
  conc("fluorine", fuel.fluorine);
  if (fuel_changed) {
    if (resolved) s.fuel = resolved->of(fuel);
    else s.fuel = resolve(fuel);
  }
  one_of(r, row, "power", "load");
  const Node* pw = row.find("power");
  const Node* ld = row.find("load");
  if (pw) power = r.value(*pw, case_key("segment.power"));
  if (ld) power = r.value(*ld, case_key("segment.load")) * eng.rating.rated_power;
  if ((pw || ld) && eng.rating.fixed_fuel_flow > 0)
    r.fail(pw ? *pw : *ld, (pw ? pw : ld)->scalar,
           "no power change when the engine section gives 'fuel-flow' (give power and electrical-efficiency there)");
  if (pw || ld || fuel_changed) set_power(s, eng.rating, power);
  r.get(row, "segment.jacket-water-out", s.operation.jacket_water_out);
  r.get(row, "segment.oil-temperature", s.oil_temperature);
  r.get(row, "segment.coldest-crankcase-surface", s.operation.coldest_crankcase_surface);
  r.get(row, "segment.blow-by", s.operation.blowby_share);
  r.get(row, "segment.excess-air-ratio", s.operation.air.excess_air_ratio);
  const Node* ev = row.find("event");
  const Node* amt = row.find("event-amount");
  const bool no_event = !ev || (ev->type == Node::Type::scalar && ev->scalar.empty());  // `event: ''` is no event
  if (amt && no_event) r.fail(*amt, amt->scalar, "an 'event' (oil-change, top-up or partial-drain) for the amount to belong to");
  if (ev && !(ev->type == Node::Type::scalar && ev->scalar.empty())) {
    OilEvent e;
    const std::string w = r.word(*ev, case_key("segment.event"));
    const bool amount = amt && !amt->scalar.empty();
    const auto share = [&](double hi) {
      const double v = quantity(r.doc(*amt), *amt, Kind::fraction);
      if (!(v >= 0 && v <= hi)) r.fail(*amt, amt->scalar, "a share from 0 to " + format_value(hi * 100) + " %");
      return v;
    };
    if (w == "oil-change") {
      e.kind = OilEvent::Kind::oil_change;
      if (amount) e.amount = share(0.9);
    } else if (w == "top-up") {
      e.kind = OilEvent::Kind::top_up;
      if (amount) {
        const double v = quantity(r.doc(*amt), *amt, Kind::volume);
        const double system = ch.mass / ch.oil.density_15;  // [m³]
        if (!(v >= 0 && v <= system))
          r.fail(*amt, amt->scalar, "a top-up from 0 to the system's own volume, " + format_value(system * 1e3) + " L");
        e.amount = v * ch.oil.density_15;
      }
    } else {
      e.kind = OilEvent::Kind::partial_drain;
      if (!amount) r.fail(*ev, ev->scalar, "an 'event-amount' (the share drained) with a partial drain");
      e.amount = share(1);
    }
    s.events.push_back(e);
  }
}

UncertaintySettings read_uncertainty(const Reader& r, const Node& u) {
  r.require_section(u, "uncertainty");
  UncertaintySettings out;
  double draws = out.draws, seed = static_cast<double>(out.seed);
  r.get(u, "uncertainty.draws", draws);
  r.get(u, "uncertainty.seed", seed);
  out.draws = static_cast<int>(draws);
  out.seed = static_cast<std::uint64_t>(seed);
  const Node* in = u.find("inputs");
  if (!in || in->type != Node::Type::sequence || in->items.empty())
    r.fail(in ? *in : u, "(no inputs)", "an 'inputs' list of uncertain parameters");
  // the calibratable parameters, and the prices a cost Monte Carlo varies (studies/economics)
  static const std::vector<std::string> names = [] {
    std::vector<std::string> v = calibratable_keys();
    v.insert(v.end(), price_keys().begin(), price_keys().end());
    return v;
  }();
  for (const Node& item : in->items) {
    r.require_section(item, "uncertain-input");
    const Node* pn = item.find("parameter");
    if (!pn) r.fail(item, "(no parameter)", "a 'parameter', one of: " + join(names));
    const std::string key = r.word(*pn, names);
    const CaseKey& pk = case_key(key);
    const Node* dn = item.find("distribution");
    if (!dn) r.fail(item, "(no distribution)", "a 'distribution': normal, lognormal, uniform or triangular");
    const std::string dist = r.word(*dn, case_key("uncertain-input.distribution"));
    // a spread of a temperature is a temperature change; everything else spreads in its own kind
    const Kind kind = pk.kind;
    const Kind spread = kind == Kind::temperature ? Kind::temperature_change : kind;
    constexpr Kind bare = Kind::count;  // marks sigma-log: a bare number whatever the parameter
    const auto value = [&](const char* field, Kind k) -> double {
      const Node* n = item.find(field);
      if (!n) r.fail(item, "(no " + std::string(field) + ")", std::string("a '") + field + "' for a " + dist + " distribution");
      if (k == bare) return quantity(r.doc(*n), *n, Kind::number);
      if (key == "oil.consumption") {  // varied as the fit varies it: kg/h of the first segment
        double v = 0;
        std::string unit;
        const bool ok = number_and_unit(r, *n, v, unit) && (unit == "kg/h" || unit == "g/h");
        if (!ok) r.fail(*n, n->scalar, "an oil flow in kg/h or g/h (oil.consumption varies as the fit varies it)");
        return unit == "g/h" ? v * 1e-3 : v;
      }
      if (pk.type == KeyType::contaminant) {  // written as a contaminant figure in ppmv
        const Concentration c = r.contaminant(*n, Basis::dry);
        if (c.unit != ConcentrationUnit::ppmv || c.basis != Basis::dry) r.fail(*n, n->scalar, "an H2S figure in ppmv (dry)");
        return c.value;
      }
      return quantity(r.doc(*n), *n, k);
    };
    UncertainInput x;
    x.key = key;
    {  // refused draws are shown in the unit the first figure was written in
      const Node* first = item.find(dist == "normal" ? "mean" : dist == "lognormal" ? "median" : "low");
      const std::string u = first ? unit_written(first->scalar) : "";
      if (key == "oil.consumption") {
        x.unit = "kg/h";
      } else if (pk.type == KeyType::contaminant) {
        x.unit = "ppmv";
      } else if (!u.empty() || kind == Kind::fraction) {
        x.unit = u.empty() ? "" : u;
        x.shown_at_zero = from_core_unit(kind, u, 0);
        x.shown_per_core = from_core_unit(kind, u, 1) - x.shown_at_zero;
      }
      const Mark m = item.mark;
      x.where = r.doc(item).file + ":" + std::to_string(m.line) + ":" + std::to_string(m.column);
    }
    if (dist == "normal") x.distribution = {Distribution::Kind::normal, value("mean", kind), value("sd", spread), 0};
    else if (dist == "lognormal") x.distribution = {Distribution::Kind::lognormal, value("median", kind), value("sigma-log", bare), 0};
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

}  // namespace acidload::io::detail
