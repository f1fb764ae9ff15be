#include "acidload/io/report.hpp"

#include <algorithm>
#include <array>
#include <cmath>
#include <cstdint>
#include <cstdio>
#include <ctime>
#include <filesystem>
#include <fstream>
#include <iterator>
#include <map>
#include <random>
#include <set>
#include <sstream>

#include "acidload/acidload.hpp"
#include "acidload/io/document.hpp"
#include "acidload/io/lab_file.hpp"
#include "acidload/io/results.hpp"
#include "acidload/io/svg.hpp"
#include "acidload/studies/inverse.hpp"
#include "acidload/studies/parameters.hpp"
#include "output_text.hpp"

namespace acidload::io {

// ---- SHA-256 (FIPS 180-4) ------------------------------------------------------------------
std::string sha256_hex(std::string_view bytes) {
  static const std::uint32_t k[64] = {
      0x428a2f98, 0x71374491, 0xb5c0fbcf, 0xe9b5dba5, 0x3956c25b, 0x59f111f1, 0x923f82a4, 0xab1c5ed5, 0xd807aa98,
      0x12835b01, 0x243185be, 0x550c7dc3, 0x72be5d74, 0x80deb1fe, 0x9bdc06a7, 0xc19bf174, 0xe49b69c1, 0xefbe4786,
      0x0fc19dc6, 0x240ca1cc, 0x2de92c6f, 0x4a7484aa, 0x5cb0a9dc, 0x76f988da, 0x983e5152, 0xa831c66d, 0xb00327c8,
      0xbf597fc7, 0xc6e00bf3, 0xd5a79147, 0x06ca6351, 0x14292967, 0x27b70a85, 0x2e1b2138, 0x4d2c6dfc, 0x53380d13,
      0x650a7354, 0x766a0abb, 0x81c2c92e, 0x92722c85, 0xa2bfe8a1, 0xa81a664b, 0xc24b8b70, 0xc76c51a3, 0xd192e819,
      0xd6990624, 0xf40e3585, 0x106aa070, 0x19a4c116, 0x1e376c08, 0x2748774c, 0x34b0bcb5, 0x391c0cb3, 0x4ed8aa4a,
      0x5b9cca4f, 0x682e6ff3, 0x748f82ee, 0x78a5636f, 0x84c87814, 0x8cc70208, 0x90befffa, 0xa4506ceb, 0xbef9a3f7,
      0xc67178f2};
  std::uint32_t h[8] = {0x6a09e667, 0xbb67ae85, 0x3c6ef372, 0xa54ff53a, 0x510e527f, 0x9b05688c, 0x1f83d9ab, 0x5be0cd19};
  const auto rotr = [](std::uint32_t x, int n) { return (x >> n) | (x << (32 - n)); };
  std::string m(bytes);
  const std::uint64_t bits = static_cast<std::uint64_t>(bytes.size()) * 8;
  m += static_cast<char>(0x80);
  while (m.size() % 64 != 56) m += '\0';
  for (int i = 7; i >= 0; --i) m += static_cast<char>((bits >> (8 * i)) & 0xff);
  for (std::size_t off = 0; off < m.size(); off += 64) {
    std::uint32_t w[64];
    for (int i = 0; i < 16; ++i)
      w[i] = static_cast<std::uint32_t>(static_cast<unsigned char>(m[off + 4 * i])) << 24 |
             static_cast<std::uint32_t>(static_cast<unsigned char>(m[off + 4 * i + 1])) << 16 |
             static_cast<std::uint32_t>(static_cast<unsigned char>(m[off + 4 * i + 2])) << 8 |
             static_cast<std::uint32_t>(static_cast<unsigned char>(m[off + 4 * i + 3]));
    for (int i = 16; i < 64; ++i) {
      const std::uint32_t s0 = rotr(w[i - 15], 7) ^ rotr(w[i - 15], 18) ^ (w[i - 15] >> 3);
      const std::uint32_t s1 = rotr(w[i - 2], 17) ^ rotr(w[i - 2], 19) ^ (w[i - 2] >> 10);
      w[i] = w[i - 16] + s0 + w[i - 7] + s1;
    }
    std::uint32_t a = h[0], b = h[1], c = h[2], d = h[3], e = h[4], f = h[5], g = h[6], hh = h[7];
    for (int i = 0; i < 64; ++i) {
      const std::uint32_t t1 = hh + (rotr(e, 6) ^ rotr(e, 11) ^ rotr(e, 25)) + ((e & f) ^ (~e & g)) + k[i] + w[i];
      const std::uint32_t t2 = (rotr(a, 2) ^ rotr(a, 13) ^ rotr(a, 22)) + ((a & b) ^ (a & c) ^ (b & c));
      hh = g, g = f, f = e, e = d + t1, d = c, c = b, b = a, a = t1 + t2;
    }
    h[0] += a, h[1] += b, h[2] += c, h[3] += d, h[4] += e, h[5] += f, h[6] += g, h[7] += hh;
  }
  char out[65];
  for (int i = 0; i < 8; ++i) std::snprintf(out + 8 * i, 9, "%08x", h[i]);
  return std::string(out, 64);
}

std::string_view name(Origin o) {
  switch (o) {
    case Origin::given: return "given";
    case Origin::variant: return "variant";
    case Origin::default_value: return "default";
    case Origin::overlay: return "overlay";
    case Origin::fitted: return "fitted";
  }
  return "";
}

namespace {

// A value with `significant` digits, trailing zeros dropped: 300, 12, 0.025, 1.571, 2.5e-07.
std::string fmt(double v, int significant = 4) {
  if (!std::isfinite(v)) return "–";
  char b[48];
  const double a = std::fabs(v);
  if (a != 0 && (a >= 1e6 || a < 1e-3)) {
    std::snprintf(b, sizeof b, "%.*g", significant, v);
    return b;
  }
  const int digits = a == 0 ? 1 : static_cast<int>(std::floor(std::log10(a))) + 1;
  const int decimals = std::clamp(significant - digits, 0, 6);
  std::snprintf(b, sizeof b, "%.*f", decimals, v);
  std::string s = b;
  if (s.find('.') != std::string::npos) {
    while (s.back() == '0') s.pop_back();
    if (s.back() == '.') s.pop_back();
  }
  return s;
}
std::string fixed(double v, int decimals) {
  if (!std::isfinite(v)) return "–";
  char b[48];
  std::snprintf(b, sizeof b, "%.*f", decimals, v);
  return b;
}
std::string hours(double h) { return h >= 0 && std::isfinite(h) ? fixed(h, 0) + " h" : "not reached"; }
double c_of(double kelvin) { return kelvin - constants::zero_celsius; }
const char* method_name(BaseNumberMethod m) { return m == BaseNumberMethod::d2896 ? "D2896" : "D4739"; }
std::string esc(std::string_view s) { return svg::escape(s); }

std::string read_head(const std::string& path, std::size_t bytes) {
  std::ifstream f(path, std::ios::binary);
  std::string s(bytes, '\0');
  f.read(s.data(), static_cast<std::streamsize>(bytes));
  s.resize(static_cast<std::size_t>(std::max<std::streamsize>(0, f.gcount())));
  return s;
}

// The record CSV files the case file names (read again: the loaded case keeps only their segments).
std::vector<std::string> record_files(const CaseFile& c) {
  std::vector<std::string> out;
  std::error_code ec;
  if (!std::filesystem::is_regular_file(c.file, ec)) return out;
  try {
    const Document doc = read_document(c.file);
    const auto record_file = [&](const Node& root) {
      const Node* rec = root.find("record");
      const Node* f = rec ? rec->find("file") : nullptr;
      if (!f || f->type != Node::Type::scalar) return;
      std::filesystem::path p = f->scalar;
      if (p.is_relative()) p = std::filesystem::path(c.file).parent_path() / p;
      if (std::find(out.begin(), out.end(), p.string()) == out.end()) out.push_back(p.string());
    };
    record_file(doc.root);
    if (const Node* vs = doc.root.find("variants"))
      for (const Node& v : vs->items) record_file(v);
  } catch (const Error&) {
    // the case was read once already; a file that changed since is left out
  }
  return out;
}

bool is_fitted_overlay(const std::string& path) { return read_head(path, 64).rfind("# Fitted by acidload", 0) == 0; }

// The resolved value of a segment's gas figure in a unit.
double gas_figure(const Segment& s, double x_wet, ConcentrationUnit u, double molar_mass) {
  return from_wet_mole_fraction(x_wet, u, Basis::dry, molar_mass, context(s.fuel));
}

}  // namespace

// ---- the inputs as understood ----------------------------------------------------------------
std::vector<InputRow> input_rows(const CaseFile& c, std::size_t variant) {
  const EngineCase& v = c.variants.at(variant);
  const Segment& s = first_segment(v);
  const FuelGas& g = s.fuel;
  const std::map<std::string, std::string> none;
  const std::map<std::string, std::string>& src = variant < c.key_sources.size() ? c.key_sources[variant] : none;
  std::map<std::string, bool> fitted;
  for (const std::string& o : c.overlays) fitted[o] = is_fitted_overlay(o);
  std::vector<InputRow> out;
  const auto add = [&](std::vector<std::string> keys, std::string label, std::string value) {
    InputRow r;
    r.key = keys.front();
    r.label = std::move(label);
    r.value = std::move(value);
    for (const std::string& k : keys) {
      const auto it = src.find(k);
      if (it == src.end()) continue;
      r.key = k;
      r.from = it->second;
      const auto f = fitted.find(it->second);
      r.origin = f == fitted.end() ? Origin::given : f->second ? Origin::fitted : Origin::overlay;
      break;
    }
    out.push_back(std::move(r));
  };
  const double S = atomic_weight(Element::S) * 1e-3, Cl = atomic_weight(Element::Cl) * 1e-3,
               F = atomic_weight(Element::F) * 1e-3;
  add({"fuel.composition"}, "methane, CO2 (wet)", fixed(g[Gas::CH4] * 100, 2) + " %, " + fixed(g[Gas::CO2] * 100, 2) + " %");
  add({"fuel.water", "fuel.water-dew-point"}, "water in the gas (wet)", fixed(g[Gas::H2O] * 100, 2) + " %");
  add({"fuel.h2s"}, "hydrogen sulfide (dry)", fmt(gas_figure(s, g[Gas::H2S], ConcentrationUnit::ppmv, molar_mass(Gas::H2S))) + " ppmv");
  add({"fuel.other-sulfur"}, "other sulfur, as S (dry)", fmt(gas_figure(s, g.other_sulfur, ConcentrationUnit::mg_per_m3, S)) + " mg/Nm³");
  add({"fuel.chlorine", "fuel.halocarbons"}, "organic chlorine, as Cl (dry)", fmt(gas_figure(s, g.chlorine, ConcentrationUnit::mg_per_m3, Cl)) + " mg/Nm³");
  add({"fuel.fluorine", "fuel.halocarbons"}, "organic fluorine, as F (dry)", fmt(gas_figure(s, g.fluorine, ConcentrationUnit::mg_per_m3, F)) + " mg/Nm³");
  add({"fuel.composition"}, "lower heating value", fixed(lower_heating_value_volumetric(g) * 1e-6, 2) + " MJ/Nm³");
  add({"engine.power", "engine.load"}, "electrical power", fmt(s.operation.electrical_power * 1e-3) + " kW");
  add({"engine.fuel-flow", "engine.electrical-efficiency"}, "fuel flow",
      fmt(s.operation.fuel_flow * molar_volume(ReferenceState::normal())) + " Nm³/h");
  add({"engine.excess-air-ratio"}, "excess-air ratio λ", fixed(s.operation.air.excess_air_ratio, 2));
  add({"engine.blow-by", "engine.blow-by-flow"}, "blow-by, share of the charge", fixed(s.operation.blowby_share * 100, 2) + " %");
  add({"engine.jacket-water-out"}, "jacket-water outlet", fixed(c_of(s.operation.jacket_water_out), 1) + " °C");
  add({"engine.coldest-crankcase-surface"}, "coldest crankcase surface", fixed(c_of(s.operation.coldest_crankcase_surface), 1) + " °C");
  add({"engine.oil-temperature"}, "sump oil temperature", fixed(c_of(s.oil_temperature), 1) + " °C");
  add({"oil.volume"}, "oil in circulation", fmt(v.charge.mass / v.charge.oil.density_15 * 1e3) + " L (" + fmt(v.charge.mass) + " kg)");
  add({"oil.fresh-tbn", "oil.tbn-method"}, "fresh-oil TBN", fixed(v.charge.oil.fresh_tbn, 2) + " mg KOH/g (" +
                                                              method_name(v.charge.oil.fresh_tbn_method) + ")");
  add({"oil.fresh-tan"}, "fresh-oil TAN", fixed(v.charge.oil.fresh_tan, 2) + " mg KOH/g");
  add({"oil.consumption"}, "oil consumption", fmt(s.oil_consumption * 1e3) + " g/h");
  add({"oil.makeup"}, "makeup", v.charge.continuous_makeup ? "continuous" : "top-ups");
  add({"oil.residual-share"}, "oil left in at a change", fixed(v.charge.residual_share * 100, 1) + " %");
  const LimitSettings& l = v.model.limits;
  add({"limits.tbn-share-of-fresh", "limits.tbn-method"}, "TBN limit", fixed(l.tbn_share_of_fresh * 100, 0) + " % of fresh (" +
                                                                       method_name(l.tbn_method) + ")");
  add({"limits.tan-rise"}, "TAN limit", "fresh + " + fixed(l.tan_rise, 2) + " mg KOH/g");
  add({"limits.crossover"}, "TAN/TBN crossover ends a charge", l.crossover ? "yes" : "no");
  add({"limits.san"}, "SAN limit", l.san > 0 ? "above " + fixed(l.san, 2) + " mg KOH/g" : "any free strong acid");
  add({"limits.oxidation"}, "oxidation limit", fmt(l.oxidation) + " A/cm");
  add({"limits.nitration"}, "nitration limit", fmt(l.nitration) + " A/cm");
  add({"limits.max-hours"}, "planned maximum hours on a charge (horizon)", fixed(l.max_hours, 0) + " h");
  std::string ignored;
  for (Limit x : all_limits)
    if (!l.enabled[static_cast<std::size_t>(x)] && x != Limit::crossover) ignored += (ignored.empty() ? "" : ", ") + std::string(name(x));
  if (!ignored.empty()) add({"limits.ignore"}, "limits not applied", ignored);
  add({"record.segments", "record.file", "run.hours"}, "operating record",
      std::to_string(record_segments(v)) + " segment(s), " + fixed(record_hours(v), 0) + " h");
  for (const ParameterInfo& p : parameter_table()) {
    if (p.key.rfind("model.", 0) != 0) continue;
    double x = get_parameter(v, p.key);
    std::string unit = p.unit;
    if (p.unit == "-" && p.bound == Bound::share) x *= 100, unit = "%";
    add({p.key}, p.key.substr(6), fmt(x) + (unit == "-" ? "" : " " + unit));
  }
  return out;
}

// ---- warnings --------------------------------------------------------------------------------
std::vector<std::string> result_warnings(const CaseFile& c, const std::vector<VariantSummary>& rows) {
  std::vector<std::string> w;
  for (std::size_t i = 0; i < rows.size() && i < c.variants.size(); ++i) {
    const VariantSummary& v = rows[i];
    const std::string who = "'" + v.name + "': ";
    if (!v.charge.first)
      w.push_back(who + "no limit is reached within the record (" + fixed(v.run.engine_hours, 0) +
                  " h); the drain interval is not known from this run.");
    else if (*v.charge.first == Limit::san)
      w.push_back(who + "free strong acid (SAN above its limit) ends the charge at " + hours(v.charge.drain_interval) +
                  ": corrosive wear begins there.");
    else if (*v.charge.first == Limit::crossover)
      w.push_back(who + "TAN crosses TBN at " + hours(v.charge.drain_interval) + ".");
    if (v.charge.first && *v.charge.first == Limit::max_hours)
      w.push_back(who + "no oil-condition limit within the planned maximum (" + hours(v.charge.drain_interval) + ").");
    if (v.charge.first && v.charge.drain_interval < 500)
      w.push_back(who + "a drain interval under 500 h (" + hours(v.charge.drain_interval) + ").");
    if (v.charge.floor_reached_at >= 0 && (!v.charge.first || v.charge.floor_reached_at < v.charge.drain_interval))
      w.push_back(who + "the reactive base reaches its floor at " + hours(v.charge.floor_reached_at) +
                  ", before the drain interval: strong acid then stays free.");
  }
  return w;
}

H2sSweep h2s_sweep(const EngineCase& record_case, double top, int points) {
  // one charge under the first segment's operation, held up to the planned maximum
  EngineCase c = record_case;
  Segment first = first_segment(c);
  c.streamed.reset();
  first.events.clear();
  first.starts = first.hours > 0 ? first.starts / first.hours * c.model.limits.max_hours : 0;
  first.hours = c.model.limits.max_hours;
  first.calendar_hours = -1;
  c.record = {first};
  H2sSweep s;
  s.variant = c.name;
  s.own_h2s_ppmv = lever_value(c, Lever::h2s_ppmv_dry);
  // the curve is drawn at the planned maximum where no limit is reached (the chart's reference line says so)
  s.own_interval_h = drain_interval(c).value_or(c.model.limits.max_hours);
  points = std::clamp(points, 2, 400);
  for (int i = 0; i < points; ++i) {
    const double x = top * i / (points - 1);
    s.h2s_ppmv.push_back(x);
    s.interval_h.push_back(drain_interval(with_lever(c, Lever::h2s_ppmv_dry, x)).value_or(c.model.limits.max_hours));
  }
  return s;
}

ReportData gather_report(const CaseFile& given, const std::vector<VariantSummary>& rows, const ReportOptions& o) {
  // the report's studies (the H2S sweep, the lab fit) index segments: a streamed record is read in
  const CaseFile c = held_records(given);
  ReportData d;
  d.title = c.title.empty() ? c.file : c.title;
  d.case_file = c.file;
  d.version = version();
  if (o.generated.empty()) {
    const std::time_t now = std::time(nullptr);
    char b[40];
    std::tm t{};
    gmtime_r(&now, &t);
    std::strftime(b, sizeof b, "%Y-%m-%d %H:%M UTC", &t);
    d.generated = b;
  } else {
    d.generated = o.generated;
  }
  d.rows = rows;
  for (const EngineCase& v : c.variants) {
    d.variant_names.push_back(v.name);
    d.tbn_methods.push_back(v.model.limits.tbn_method);
  }
  d.tbn_share_limit = c.variants.front().model.limits.tbn_share_of_fresh;
  d.inputs = input_rows(c, 0);
  for (std::size_t i = 1; i < c.variants.size(); ++i) {
    std::vector<InputRow> differ;
    const std::vector<InputRow> all = input_rows(c, i);
    // what the variant's own entry sets (values that follow from it, such as the fuel flow, are left out)
    const std::vector<std::string>& own = i < c.variant_keys.size() ? c.variant_keys[i] : std::vector<std::string>{};
    for (std::size_t k = 0; k < all.size() && k < d.inputs.size(); ++k) {
      if (all[k].value == d.inputs[k].value || std::find(own.begin(), own.end(), all[k].key) == own.end()) continue;
      InputRow r = all[k];
      if (r.origin == Origin::given) r.origin = Origin::variant;
      differ.push_back(r);
    }
    d.variant_inputs.push_back(differ);
  }
  const auto file = [&](const std::string& role, const std::string& path) {
    InputFile f{role, path, "", ""};
    std::error_code ec;
    if (!std::filesystem::is_regular_file(path, ec)) f.note = "not a file on disk (a case from text or built in code)";
    else {
      std::ifstream in(path, std::ios::binary);
      const std::string bytes((std::istreambuf_iterator<char>(in)), std::istreambuf_iterator<char>());
      if (!in.bad()) f.sha256 = sha256_hex(bytes);
      else f.note = "could not be read";
    }
    d.files.push_back(f);
  };
  file("case", c.file);
  for (const std::string& ov : c.overlays) file(is_fitted_overlay(ov) ? "overlay (fitted)" : "overlay", ov);
  for (const std::string& f : record_files(c)) file("record", f);
  const std::string head = read_head(c.file, 2048);
  std::string lower;
  std::transform(head.begin(), head.end(), std::back_inserter(lower), [](unsigned char ch) { return std::tolower(ch); });
  d.invented = lower.find("invented") != std::string::npos;

  double top = 0;
  for (const EngineCase& v : c.variants) top = std::max(top, lever_value(v, Lever::h2s_ppmv_dry));
  top = svg::nice_range(0, std::clamp(1.5 * top, 200.0, 3000.0), 5).high;
  for (const EngineCase& v : c.variants) d.sweeps.push_back(h2s_sweep(v, top, o.sweep_points));

  d.warnings = result_warnings(c, rows);
  if (!c.costs.empty()) d.costs = compare_costs(c.costs);
  if (!o.lab_file.empty()) {
    LabPart lab;
    lab.file = o.lab_file;
    lab.samples = read_lab_samples(o.lab_file);
    apply_lab_baselines(lab.samples, c.lab);  // the case's lab section, as fit reads it
    lab.parameters = o.parameters;
    file("lab", o.lab_file);
    try {
      FitSettings fs;
      fs.parameters = o.parameters;
      resolve_precision(fs, c.lab);
      lab.fit = calibrate(c.variants.front(), lab.samples, fs);
      for (const std::string& f : lab.fit->flags) d.warnings.push_back("lab fit: " + f);
      if (!lab.fit->converged) d.warnings.push_back("lab fit: did not converge; use the fitted curve with care.");
      lab.band = trajectory_band(*lab.fit);
    } catch (const FitRefusedError& e) {
      lab.refused = e.what();
      d.warnings.push_back(std::string("lab fit refused: ") + e.what());
      FitResult none;
      none.fitted = c.variants.front();
      lab.band = trajectory_band(none);  // the case's own curve, no band
    }
    const RunResult& r = lab.fit ? simulate(lab.fit->fitted.charge, lab.fit->fitted.model, lab.fit->fitted.record,
                                            lab.fit->fitted.options)
                                 : rows.front().run;
    for (const ChargeSummary& ch : r.charges) lab.charge_start_h.push_back(ch.start_engine_hours);
    d.lab = std::move(lab);
  }
  return d;
}

// ---- the page --------------------------------------------------------------------------------
namespace {

const char* css = R"(
:root{--ink:#1f1f1f;--rule:#bdbdbd;--soft:#f4f4f2;--warn:#8a6d1a;--stop:#a4431b}
*{box-sizing:border-box}
body{font-family:"DejaVu Sans","Liberation Sans",Arial,sans-serif;color:var(--ink);margin:0 auto;max-width:900px;padding:18px 22px;font-size:13.5px;line-height:1.42;background:#fff}
header{border-bottom:3px solid var(--ink);padding-bottom:8px;margin-bottom:14px}
header .kind{font-size:12px;letter-spacing:.08em;text-transform:uppercase;margin:0}
h1{font-size:23px;margin:2px 0 4px}
h2{font-size:17px;margin:22px 0 8px;padding-top:6px;border-top:1px solid var(--rule);break-after:avoid;page-break-after:avoid}
h3{font-size:14px;margin:14px 0 6px;break-after:avoid;page-break-after:avoid}
.meta{margin:0;font-size:12.5px}
.box{border:1.5px solid var(--ink);border-left-width:7px;padding:8px 12px;margin:10px 0;break-inside:avoid;page-break-inside:avoid}
.box h2{border:0;margin:2px 0 4px;padding:0;font-size:15px}
.box ul{margin:4px 0 2px 18px;padding:0}
.caution{border-color:var(--stop);background:#fbf3ee}
.warnings{border-color:var(--warn);background:#fbf8ec}
.invented{border-color:var(--ink);background:var(--soft)}
table{border-collapse:collapse;margin:6px 0 10px;font-size:12.5px;font-variant-numeric:tabular-nums}
th,td{padding:3px 7px;border-bottom:1px solid #dadada;text-align:left;vertical-align:top}
thead th{border-bottom:2px solid var(--ink);font-weight:bold}
tbody th{font-weight:normal}
td.n{text-align:right;white-space:nowrap}
caption{caption-side:top;text-align:left;font-weight:bold;padding:2px 0 4px}
.origin{font-size:11px;white-space:nowrap}
.origin-default{color:#555}
.origin-given,.origin-variant{font-weight:bold}
.origin-fitted,.origin-overlay{font-weight:bold;text-decoration:underline}
figure{margin:8px 0 14px;break-inside:avoid;page-break-inside:avoid}
figcaption{font-size:12px;margin-top:2px}
svg.chart{max-width:100%;height:auto;display:block}
.small{font-size:11.5px}
code,.hash{font-family:"DejaVu Sans Mono","Liberation Mono",monospace;font-size:11px;word-break:break-all}
.key{font-size:11px;color:#444}
@page{size:A4;margin:13mm 12mm}
@media print{body{max-width:none;padding:0;font-size:11.5px}h2{break-before:auto}.pagebreak{break-before:page;page-break-before:always}a{color:inherit;text-decoration:none}}
)";

std::string origin_cell(const InputRow& r) {
  const std::string n(name(r.origin));
  const std::string cls = r.origin == Origin::default_value ? "default" : n;
  std::string t = n;
  if (!r.from.empty() && r.origin != Origin::given && r.origin != Origin::variant) t += " (" + r.from + ")";
  return "<td class=\"origin origin-" + cls + "\">" + esc(t) + "</td>";
}

std::string figure(const std::string& svg, const std::string& caption) {
  return "<figure>" + svg + "<figcaption>" + caption + "</figcaption></figure>\n";
}

// A reading of every variant's first charge against oil hours, with its limits and each drain interval.
std::string reading_chart(const ReportData& d, const std::string& id, const std::string& what, const std::string& unit,
                          double (*reading)(const TrajectoryPoint&, BaseNumberMethod),
                          const std::vector<std::pair<double, std::string>>& limits) {
  svg::LineChart ch;
  ch.id = id;
  ch.x_label = "oil hours [h]";
  ch.y_label = what + " [" + unit + "]";
  ch.title = what + " against oil hours, first charge of each variant";
  std::string desc;
  for (std::size_t i = 0; i < d.rows.size(); ++i) {
    const VariantSummary& v = d.rows[i];
    svg::Series s;
    s.label = v.name;
    s.look = static_cast<int>(i);
    double last = 0;
    for (const TrajectoryPoint& p : v.run.trajectory) {
      if (p.charge != 0) break;
      s.x.push_back(p.oil_hours);
      s.y.push_back(last = reading(p, i < d.tbn_methods.size() ? d.tbn_methods[i] : BaseNumberMethod::d4739));
    }
    ch.series.push_back(std::move(s));
    if (v.charge.first) {
      svg::ReferenceLine l;
      l.direction = svg::ReferenceLine::Direction::vertical;
      l.at = v.charge.drain_interval;
      l.look = static_cast<int>(i);
      l.label = fixed(v.charge.drain_interval, 0) + " h";
      ch.lines.push_back(l);
    }
    desc += v.name + ": " + fmt(last) + " " + unit + " at the end of the first charge" +
            (v.charge.first ? ", drain interval " + hours(v.charge.drain_interval) : ", no limit reached") + ". ";
  }
  for (const auto& [at, label] : limits) {
    svg::ReferenceLine l;
    l.at = at;
    l.label = label;
    ch.lines.push_back(l);
  }
  ch.description = desc;
  return svg::line_chart(ch);
}

double tbn_of(const TrajectoryPoint& p, BaseNumberMethod m) { return m == BaseNumberMethod::d2896 ? p.tbn_d2896 : p.tbn_d4739; }
double tan_of(const TrajectoryPoint& p, BaseNumberMethod) { return p.tan; }
double san_of(const TrajectoryPoint& p, BaseNumberMethod) { return p.san; }
double ox_of(const TrajectoryPoint& p, BaseNumberMethod) { return p.state.oxidation; }
double viscosity_of(const TrajectoryPoint& p, BaseNumberMethod) { return 100 * p.viscosity_rise; }
double antioxidant_of(const TrajectoryPoint& p, BaseNumberMethod) { return 100 * p.state.antioxidant; }

std::string th_col(const std::string& s) { return "<th scope=\"col\">" + s + "</th>"; }

}  // namespace

std::string report_html(const ReportData& d) {
  std::ostringstream h;
  h << report_signature << " -->\n<html lang=\"en\">\n<head>\n" << report_marker << "\n<meta charset=\"utf-8\"/>\n"
    << "<meta name=\"viewport\" content=\"width=device-width, initial-scale=1\"/>\n"
    << "<title>" << esc(d.title) << " — oil acid load report</title>\n<style>" << css << "</style>\n</head>\n<body>\n";
  h << "<header><p class=\"kind\">Oil acid load report</p><h1>" << esc(d.title) << "</h1><p class=\"meta\">Case file <code>"
    << esc(d.case_file) << "</code> · " << d.rows.size() << " variant(s) · made " << esc(d.generated) << " by acidload "
    << esc(d.version) << "</p></header>\n<main>\n";

  // cautions first, then what this case warns of
  h << "<section class=\"box caution\" aria-labelledby=\"cautions\"><h2 id=\"cautions\">Cautions</h2><ul>"
    << "<li><strong>These are estimates.</strong> They support, and do not replace, the engine maker's and the oil "
       "supplier's limits, lab analysis of the oil, local codes and licensed practice. <strong>Never extend a drain "
       "interval without lab confirmation.</strong></li>"
    << "<li><strong>H2S is toxic and flammable.</strong> The nose stops warning above about 100 ppm; the gas is heavier "
       "than air. Wear a personal H2S monitor at breathers, sample points and oil filler points.</li>"
    << "<li><strong>Used oil with free acid (SAN above 0) or HF is corrosive:</strong> gloves and eye protection. "
       "Halogen-rich used oil may be hazardous waste.</li>"
    << "<li>Do not open crankcase doors on a hot engine (oil-mist explosion). Spent iron-oxide scrubber media can "
       "self-heat and ignite.</li></ul></section>\n";
  if (d.invented)
    h << "<section class=\"box invented\" aria-label=\"Invented data\"><p><strong>Invented data.</strong> The case file "
         "says its figures are invented for illustration: nothing in this report is a measurement.</p></section>\n";
  if (!d.warnings.empty()) {
    h << "<section class=\"box warnings\" aria-labelledby=\"warnings\"><h2 id=\"warnings\">Warnings from this case</h2><ul>";
    for (const std::string& w : d.warnings) h << "<li>" << esc(w) << "</li>";
    h << "</ul></section>\n";
  }

  // the comparison table
  h << "<section aria-labelledby=\"comparison\"><h2 id=\"comparison\">1. Comparison of the variants</h2>\n";
  h << "<table><caption>Drain interval and oil condition at it (first charge of the record)</caption><thead><tr>"
    << th_col("variant") << th_col("drain interval [h]") << th_col("limit reached") << th_col("TBN at end [mg KOH/g]")
    << th_col("TAN at end [mg KOH/g]") << th_col("SAN at end [mg KOH/g]") << th_col("TBN fall, fresh oil [mg KOH/g per 100 h]")
    << th_col("fuel S to oil [%]") << th_col("H2SO4 dew point [°C]") << "</tr></thead><tbody>\n";
  for (const VariantSummary& v : d.rows) {
    h << "<tr><th scope=\"row\">" << esc(v.name) << "</th><td class=\"n\">"
      << (v.charge.first ? fixed(v.charge.drain_interval, 0) : "not reached") << "</td><td>"
      << (v.charge.first ? esc(description(*v.charge.first)) : "none within the record") << "</td><td class=\"n\">"
      << fixed(v.tbn_end, 2) << "</td><td class=\"n\">" << fixed(v.tan_end, 2) << "</td><td class=\"n\">" << fixed(v.san_end, 2)
      << "</td><td class=\"n\">" << fixed(-v.initial_tbn_rate * 100, 3) << "</td><td class=\"n\">"
      << fixed(v.sulfur_share_to_oil * 100, 3) << "</td><td class=\"n\">"
      << (v.dew_points.sulfuric > 0 ? fixed(c_of(v.dew_points.sulfuric), 1) : "–") << "</td></tr>\n";
  }
  h << "</tbody></table>\n";
  bool charges = false;
  for (const VariantSummary& v : d.rows) charges |= v.run.charges.size() > 1;
  if (charges) {
    h << "<table><caption>Every charge of the record (numbered from 1)</caption><thead><tr>" << th_col("variant")
      << th_col("charge") << th_col("from engine hour [h]") << th_col("ran [h]") << th_col("ended by") << th_col("limit reached at [oil h]")
      << "</tr></thead><tbody>\n";
    for (const VariantSummary& v : d.rows)
      for (const ChargeSummary& ch : v.run.charges)
        h << "<tr><th scope=\"row\">" << esc(v.name) << "</th><td class=\"n\">" << ch.index + 1 << "</td><td class=\"n\">"
          << fixed(ch.start_engine_hours, 0) << "</td><td class=\"n\">" << fixed(ch.oil_hours, 0) << "</td><td>"
          << (ch.ended_by_change ? "oil change" : "end of the record") << "</td><td>"
          << (ch.first ? esc(std::string(name(*ch.first))) + " at " + fixed(ch.drain_interval, 0) + " h" : "none") << "</td></tr>\n";
    h << "</tbody></table>\n";
  }
  h << "</section>\n";

  // oil condition over time
  h << "<section aria-labelledby=\"condition\"><h2 id=\"condition\">2. Oil condition against oil hours</h2>\n"
    << "<p class=\"small\">Lines: each variant's first charge (line style and marker tell them apart). Thin vertical "
       "lines: each variant's drain interval. Grey dash-dot lines: limits.</p>\n";
  {
    // limits as lines: one per distinct value among the variants
    std::vector<std::pair<double, std::string>> tbn_l, tan_l, san_l, ox_l, visc_l, aox_l;
    const auto once = [](std::vector<std::pair<double, std::string>>& v, double at, std::string label) {
      for (const auto& x : v)
        if (std::fabs(x.first - at) < 1e-9) return;
      v.emplace_back(at, std::move(label));
    };
    for (const VariantSummary& v : d.rows) {
      const auto& lim = v.charge.at_end;
      const auto on = [&](Limit l) { return lim[static_cast<std::size_t>(l)].limit; };
      once(tbn_l, on(Limit::tbn_fall), "TBN limit " + fixed(on(Limit::tbn_fall), 2));
      once(tan_l, on(Limit::tan_rise), "TAN limit " + fixed(on(Limit::tan_rise), 2));
      once(san_l, on(Limit::san), on(Limit::san) > 0 ? "SAN limit " + fixed(on(Limit::san), 2) : "SAN limit: any above 0");
      once(ox_l, on(Limit::oxidation), "oxidation limit " + fmt(on(Limit::oxidation)));
      once(visc_l, 100 * on(Limit::viscosity), "viscosity limit +" + fixed(100 * on(Limit::viscosity), 0) + " %");
      once(aox_l, 100 * on(Limit::antioxidant), "antioxidant limit " + fixed(100 * on(Limit::antioxidant), 0) + " %");
    }
    // TBN by the limits' method: the reading the TBN limit is judged by
    std::set<BaseNumberMethod> methods(d.tbn_methods.begin(), d.tbn_methods.end());
    const std::string tbn_name =
        methods.size() == 1 ? std::string("TBN (") + method_name(*methods.begin()) + ")" : "TBN (by each limit's method)";
    h << figure(reading_chart(d, "chart-tbn", tbn_name, "mg KOH/g", tbn_of, tbn_l),
                "Figure 1. Base number (TBN) of the oil: it falls as acid arrives; the charge ends at the TBN limit, "
                "TAN crossover or another limit, whichever comes first.");
    h << figure(reading_chart(d, "chart-tan", "TAN (D664)", "mg KOH/g", tan_of, tan_l),
                "Figure 2. Acid number (TAN): additive acidity, organic acids from oxidation and free strong acid.");
    h << figure(reading_chart(d, "chart-san", "SAN", "mg KOH/g", san_of, san_l),
                "Figure 3. Strong acid number (SAN): free strong acid, above zero only once the reactive base is spent.");
    h << figure(reading_chart(d, "chart-oxidation", "oxidation (FTIR)", "A/cm", ox_of, ox_l),
                "Figure 4. Oxidation of the oil (FTIR), driven by the ring-zone temperature.");
    h << figure(reading_chart(d, "chart-viscosity", "viscosity change at 100 °C", "% over fresh", viscosity_of, visc_l),
                "Figure 5. Change of the kinematic viscosity at 100 °C over the fresh oil's, from oxidation and "
                "nitration (docs/model.md).");
    h << figure(reading_chart(d, "chart-antioxidant", "antioxidant remaining", "% of fresh", antioxidant_of, aox_l),
                "Figure 6. Antioxidant reserve left, as a share of the fresh oil's; makeup oil brings some back.");
  }
  h << "</section>\n";

  int fig = 7;
  if (d.lab && d.lab->band) {
    const LabPart& lab = *d.lab;
    const TrajectoryBand& b = *lab.band;
    h << "<section aria-labelledby=\"lab\"><h2 id=\"lab\">3. Lab results and the model</h2>\n<p>"
      << lab.samples.size() << " lab report(s) from <code>" << esc(lab.file) << "</code>. ";
    if (lab.fit) {
      h << "Fitted to them (weighted least squares): ";
      for (std::size_t i = 0; i < lab.fit->parameters.size(); ++i) {
        const FittedParameter& p = lab.fit->parameters[i];
        h << (i ? ", " : "") << "<code>" << esc(p.key) << "</code> = " << esc(fmt(p.estimate)) << " ± "
          << esc(fmt(p.standard_error)) << (parameter(p.key).unit == "-" ? "" : " " + esc(parameter(p.key).unit));
      }
      h << "; reduced chi-square " << fixed(lab.fit->s2, 2) << " on " << lab.fit->degrees_of_freedom
        << " degrees of freedom. The shaded band is the 90 % band of the fitted curve from the parameters' covariance "
           "(linearised).";
    } else {
      h << "No fit could be made (" << esc(lab.refused) << "): the curve is the case's own model, without a band.";
    }
    h << " Error bars: the method's precision (one standard deviation). Hollow markers: SAN below the lab's "
         "reporting limit. Vertical lines: oil changes.</p>\n";
    const Precision prec;
    int tbn_2896 = 0, tbn_4739 = 0;
    for (const LabSample& s : lab.samples)
      if (s.tbn) (s.tbn_method == BaseNumberMethod::d2896 ? tbn_2896 : tbn_4739)++;
    struct Panel {
      std::string id, what, unit;
      const ReadingBand* band;
      std::optional<double> LabSample::*reading;
      double sigma;
      bool tbn;
    };
    const bool use2896 = tbn_2896 > tbn_4739;
    const std::vector<Panel> panels = {
        {"lab-tbn", std::string("TBN (") + (use2896 ? "D2896" : "D4739") + ")", "mg KOH/g", use2896 ? &b.tbn_d2896 : &b.tbn_d4739,
         &LabSample::tbn, use2896 ? prec.tbn_d2896 : prec.tbn_d4739, true},
        {"lab-tan", "TAN (D664)", "mg KOH/g", &b.tan, &LabSample::tan, prec.tan, false},
        {"lab-san", "SAN", "mg KOH/g", &b.san, &LabSample::san, prec.san, false},
        {"lab-oxidation", "oxidation (FTIR)", "A/cm", &b.oxidation, &LabSample::oxidation, prec.oxidation, false},
    };
    for (const Panel& p : panels) {
      svg::Points pts;
      pts.label = "lab reading";
      pts.look = 1;
      for (const LabSample& s : lab.samples) {
        const std::optional<double>& r = s.*(p.reading);
        if (!r) continue;
        if (p.tbn && s.tbn_method != (use2896 ? BaseNumberMethod::d2896 : BaseNumberMethod::d4739)) continue;
        const std::size_t k = static_cast<std::size_t>(s.charge);
        const double start = k < lab.charge_start_h.size() ? lab.charge_start_h[k] : 0;
        pts.x.push_back(start + s.oil_hours);
        pts.y.push_back(*r);
        const bool censored = p.reading == &LabSample::san && s.san_censored;
        pts.low.push_back(censored ? NAN : std::max(0.0, *r - p.sigma));
        pts.high.push_back(censored ? NAN : *r + p.sigma);
        pts.hollow.push_back(censored);
      }
      if (pts.x.empty()) continue;
      svg::LineChart ch;
      ch.id = p.id;
      ch.title = p.what + " from the lab against engine hours, with the " + (lab.fit ? "fitted" : "case's") + " curve";
      ch.x_label = "engine hours since the start of the record [h]";
      ch.y_label = p.what + " [" + p.unit + "]";
      svg::Band band{lab.fit ? "90 % band" : "", b.engine_hours, p.band->low, p.band->high, 0};
      if (lab.fit) ch.bands.push_back(band);
      ch.series.push_back({lab.fit ? "fitted model" : "case model", b.engine_hours, p.band->value, 0, false});
      ch.points.push_back(pts);
      for (std::size_t k = 1; k < lab.charge_start_h.size(); ++k) {
        svg::ReferenceLine l;
        l.direction = svg::ReferenceLine::Direction::vertical;
        l.at = lab.charge_start_h[k];
        l.label = "oil change";
        ch.lines.push_back(l);
      }
      ch.description = std::to_string(pts.x.size()) + " lab readings of " + p.what + " from " + fmt(*std::min_element(pts.y.begin(), pts.y.end())) +
                       " to " + fmt(*std::max_element(pts.y.begin(), pts.y.end())) + " " + p.unit + ", drawn with the model curve.";
      h << figure(svg::line_chart(ch), "Figure " + std::to_string(fig++) + ". " + esc(p.what) + ": lab readings and the " +
                                           (lab.fit ? "fitted model with its 90 % band." : "case's model."));
    }
    h << "</section>\n";
  }

  const int s_h2s = d.lab ? 4 : 3;
  h << "<section aria-labelledby=\"h2s\"><h2 id=\"h2s\">" << s_h2s << ". Drain interval against H2S</h2>\n";
  {
    svg::LineChart ch;
    ch.id = "chart-h2s";
    ch.title = "Drain interval against the H2S in the fuel gas, each variant with all else kept";
    ch.x_label = "H2S in the fuel gas [ppmv, dry]";
    ch.y_label = "drain interval [h]";
    std::string desc;
    double cap = 0;
    for (std::size_t i = 0; i < d.sweeps.size(); ++i) {
      const H2sSweep& s = d.sweeps[i];
      ch.series.push_back({s.variant, s.h2s_ppmv, s.interval_h, static_cast<int>(i), true});
      desc += s.variant + ": " + hours(s.own_interval_h) + " at " + fmt(s.own_h2s_ppmv) + " ppmv. ";
      if (i < d.rows.size()) cap = std::max(cap, d.rows[i].charge.at_end[static_cast<std::size_t>(Limit::max_hours)].limit);
    }
    for (std::size_t i = 0; i < d.sweeps.size(); ++i) {
      svg::Points p;
      p.look = static_cast<int>(i);
      p.x = {d.sweeps[i].own_h2s_ppmv};
      p.y = {d.sweeps[i].own_interval_h};
      p.radius = 6;
      ch.points.push_back(p);
    }
    if (cap > 0) ch.lines.push_back({svg::ReferenceLine::Direction::horizontal, cap, "planned maximum " + fixed(cap, 0) + " h", -1});
    ch.description = desc;
    h << figure(svg::line_chart(ch), "Figure " + std::to_string(fig++) +
                                         ". Drain interval against H2S: each variant's curve with only the H2S changed "
                                         "(power and efficiency kept) for a fresh charge under the operation of the "
                                         "record's first segment; the larger marker on each curve is the variant as it "
                                         "is. Where no limit is reached within the planned maximum the curve sits on it (no limit within that horizon).");
  }
  h << "</section>\n";

  int next = s_h2s + 1;
  if (!d.costs.empty()) {
    const std::string cur = d.costs.front().currency;
    h << "<section aria-labelledby=\"costs\"><h2 id=\"costs\">" << next++ << ". Cost per MWh against the scrubbing level</h2>\n";
    svg::LineChart ch;
    ch.id = "chart-costs";
    ch.title = "Total cost per MWh of each variant against the H2S it leaves in the gas at the engine";
    ch.x_label = "H2S at the engine, running-hours mean [ppmv, dry]";
    ch.y_label = "total cost [" + cur + " per MWh]";
    ch.y_from_zero = true;
    std::string desc;
    for (std::size_t i = 0; i < d.costs.size(); ++i) {
      const VariantCosts& v = d.costs[i];
      svg::Points p;
      p.label = v.name;
      p.look = static_cast<int>(i);
      p.x = {v.scrubbed.mean_engine_h2s_ppmv};
      p.y = {v.total_per_mwh};
      p.radius = 6;
      ch.points.push_back(p);
      desc += v.name + ": " + fixed(v.total_per_mwh, 2) + " " + cur + " per MWh at " + fmt(v.scrubbed.mean_engine_h2s_ppmv) +
              " ppmv (rank " + std::to_string(v.rank) + "). ";
    }
    double top = 0;
    for (const VariantCosts& v : d.costs) top = std::max(top, v.scrubbed.mean_engine_h2s_ppmv);
    ch.x_range = svg::nice_range(0, 1.08 * top + 1, 6);  // from no H2S, with room for the last marker
    ch.description = desc;
    h << figure(svg::line_chart(ch), "Figure " + std::to_string(fig++) + ". Total cost per MWh (oil, oil changes, lab, "
                                         "scrubbing, downtime; invented prices unless the case file gives real ones) of "
                                         "each variant against the H2S its scrubbing leaves at the engine.");
    h << "<table><caption>Cost per MWh [" << esc(cur) << "]</caption><thead><tr>" << th_col("variant")
      << th_col("H2S at the engine [ppmv, dry]") << th_col("total [" + esc(cur) + " per MWh]") << th_col("rank")
      << "</tr></thead><tbody>\n";
    for (const VariantCosts& v : d.costs)
      h << "<tr><th scope=\"row\">" << esc(v.name) << "</th><td class=\"n\">" << fixed(v.scrubbed.mean_engine_h2s_ppmv, 1)
        << "</td><td class=\"n\">" << fixed(v.total_per_mwh, 2) << "</td><td class=\"n\">" << v.rank << "</td></tr>\n";
    h << "</tbody></table>\n</section>\n";
  }
  h << "<section aria-labelledby=\"acids\"><h2 id=\"acids\">" << next++ << ". Acid into the oil by species</h2>\n";
  {
    svg::BarChart bc;
    bc.id = "chart-acids";
    bc.title = "Acid reaching the oil by species, each variant, first segment of the record";
    bc.x_label = "variant";
    bc.y_label = "acid into the oil [g KOH/h]";
    bc.groups = {"H2SO4", "SO2 (fresh oil)", "HCl", "HF", "HNO3"};
    std::string desc;
    for (const VariantSummary& v : d.rows) {
      bc.categories.push_back(v.name);
      const auto& k = v.inflow_koh;
      bc.values.push_back({k.sulfuric, k.sulfurous_fresh, k.hydrochloric, k.hydrofluoric, k.nitric});
      desc += v.name + ": H2SO4 " + fmt(k.sulfuric, 3) + ", SO2 " + fmt(k.sulfurous_fresh, 3) + ", HCl " + fmt(k.hydrochloric, 3) +
              ", HF " + fmt(k.hydrofluoric, 3) + ", HNO3 " + fmt(k.nitric, 3) + " g KOH/h. ";
    }
    bc.description = desc;
    h << figure(svg::bar_chart(bc), "Figure " + std::to_string(fig++) +
                                        ". Acid reaching the oil by species, as the KOH it neutralises (g KOH/h), in the "
                                        "first segment of the record; SO2 as taken up by fresh oil.");
    h << "<table><caption>Acid into the oil [g KOH/h], first segment</caption><thead><tr>" << th_col("variant");
    for (const std::string& g : bc.groups) h << th_col(esc(g));
    h << "</tr></thead><tbody>\n";
    for (std::size_t i = 0; i < bc.categories.size(); ++i) {
      h << "<tr><th scope=\"row\">" << esc(bc.categories[i]) << "</th>";
      for (double v : bc.values[i]) h << "<td class=\"n\">" << fixed(v, 3) << "</td>";
      h << "</tr>\n";
    }
    h << "</tbody></table>\n";
  }
  h << "</section>\n";

  // the case as understood
  h << "<section aria-labelledby=\"case\"><h2 id=\"case\">" << next++ << ". The case as understood</h2>\n"
    << "<p class=\"small\">Each input of the base case as acidload read it, with where it came from: <strong>given</strong> "
       "in the case file, <span class=\"origin-default\">default</span> (not in the file: acidload's default, see "
       "docs/case-format.md), <u><strong>fitted</strong></u> (from an overlay written by a fit) or <u><strong>overlay"
       "</strong></u> (another overlay). Where the record has several segments, the first segment's values.</p>\n";
  h << "<table><caption>Inputs of '" << esc(d.variant_names.empty() ? "" : d.variant_names.front())
    << "'</caption><thead><tr>" << th_col("input") << th_col("value") << th_col("source") << th_col("case-file key")
    << "</tr></thead><tbody>\n";
  for (const InputRow& r : d.inputs)
    h << "<tr><th scope=\"row\">" << esc(r.label) << "</th><td>" << esc(r.value) << "</td>" << origin_cell(r)
      << "<td class=\"key\"><code>" << esc(r.key) << "</code></td></tr>\n";
  h << "</tbody></table>\n";
  if (!d.variant_inputs.empty()) {
    h << "<table><caption>What each variant changes</caption><thead><tr>" << th_col("variant") << th_col("input")
      << th_col("value") << th_col("source") << "</tr></thead><tbody>\n";
    for (std::size_t i = 0; i < d.variant_inputs.size(); ++i) {
      const std::string vn = i + 1 < d.variant_names.size() ? d.variant_names[i + 1] : "";
      if (d.variant_inputs[i].empty())
        h << "<tr><th scope=\"row\">" << esc(vn) << "</th><td colspan=\"3\">the same inputs as the base</td></tr>\n";
      for (const InputRow& r : d.variant_inputs[i])
        h << "<tr><th scope=\"row\">" << esc(vn) << "</th><td>" << esc(r.label) << "</td><td>" << esc(r.value) << "</td>"
          << origin_cell(r) << "</tr>\n";
    }
    h << "</tbody></table>\n";
  }
  h << "</section>\n";

  h << "<section aria-labelledby=\"assumptions\"><h2 id=\"assumptions\">" << next++ << ". What the model assumes</h2>\n"
    << "<p>acidload follows the fuel's sulfur, chlorine, fluorine and the engine's NOx through combustion (an element "
       "balance at the engine's excess air, a fixed share of the sulfur oxidised to SO3) to the two ways acid reaches "
       "the oil: condensation on the cylinder liner where the wall is below the acid dew point (the jacket-water "
       "temperature is the lever) and blow-by into the crankcase. The oil is a well-mixed charge: strong acid is "
       "neutralised by the reactive base until that reaches its floor, oxidation follows the ring-zone temperature and "
       "forms organic acids, makeup oil brings fresh base; each segment of constant operation is solved exactly. The "
       "drain interval is the oil hours at the first limit reached. The model's parameters (liner uptake, SO3 share, "
       "oxidation rate …) are typical values until fitted to the plant's own lab history; every equation and its source "
       "is in the model description, docs/model.md, in acidload's source, and every case key in docs/case-format.md.</p>\n"
    << "</section>\n";

  h << "<section aria-labelledby=\"files\"><h2 id=\"files\">" << next++ << ". Version and input files</h2>\n"
    << "<p>Made by acidload " << esc(d.version) << " on " << esc(d.generated)
    << ". The SHA-256 hash of each input file identifies the exact file this report was made from.</p>\n"
    << "<table><caption>Input files</caption><thead><tr>" << th_col("role") << th_col("file") << th_col("SHA-256")
    << "</tr></thead><tbody>\n";
  for (const InputFile& f : d.files)
    h << "<tr><th scope=\"row\">" << esc(f.role) << "</th><td><code>" << esc(f.path) << "</code></td><td class=\"hash\">"
      << (f.sha256.empty() ? esc(f.note) : f.sha256) << "</td></tr>\n";
  h << "</tbody></table>\n</section>\n</main>\n</body>\n</html>\n";
  return h.str();
}

// ---- CSV ------------------------------------------------------------------------------------
namespace {
using detail::csv_field;
std::string num(double v) { return detail::csv_number(v); }
}  // namespace

std::string summary_csv(const CaseFile& c, const std::vector<VariantSummary>& rows) {
  (void)c;
  std::ostringstream o;
  o << "variant,charge,charge start [h],charge ran [h],ended by oil change,drain interval [h],limit reached,"
       "TBN at end [mg KOH/g],TAN at end [mg KOH/g],SAN at end [mg KOH/g],TBN fall of fresh oil [mg KOH/g per h],"
       "fuel S to oil [%],H2SO4 into oil [g KOH/h],SO2 into fresh oil [g KOH/h],HCl into oil [g KOH/h],"
       "HF into oil [g KOH/h],HNO3 into oil [g KOH/h],H2SO4 dew point [degC]\n";
  for (const VariantSummary& v : rows) {
    for (const ChargeSummary& ch : v.run.charges) {
      const bool first = ch.index == 0;
      const auto only_first = [&](double x) { return first ? num(x) : std::string(); };
      o << csv_field(v.name) << ',' << ch.index + 1 << ',' << num(ch.start_engine_hours) << ',' << num(ch.oil_hours) << ','
        << (ch.ended_by_change ? "yes" : "no") << ',' << (ch.first ? num(ch.drain_interval) : "") << ','
        << (ch.first ? std::string(name(*ch.first)) : "") << ',' << only_first(v.tbn_end) << ',' << only_first(v.tan_end)
        << ',' << only_first(v.san_end) << ',' << only_first(-v.initial_tbn_rate) << ','
        << only_first(v.sulfur_share_to_oil * 100) << ',' << only_first(v.inflow_koh.sulfuric) << ','
        << only_first(v.inflow_koh.sulfurous_fresh) << ',' << only_first(v.inflow_koh.hydrochloric) << ','
        << only_first(v.inflow_koh.hydrofluoric) << ',' << only_first(v.inflow_koh.nitric) << ','
        << (first && v.dew_points.sulfuric > 0 ? num(c_of(v.dew_points.sulfuric)) : "") << '\n';
    }
  }
  return o.str();
}

// ---- writing ----------------------------------------------------------------------------------
void write_report(const std::string& path, const std::string& html, const std::vector<std::string>& inputs) {
  write_owned_file(path, html, std::string(report_signature), inputs);
}

void write_summary_csv(const std::string& path, const std::string& csv, const std::vector<std::string>& inputs) {
  write_owned_file(path, csv, std::string(summary_csv_signature), inputs);
}

std::vector<std::string> report_inputs(const CaseFile& c, const std::string& lab) {
  std::vector<std::string> in{c.file};
  in.insert(in.end(), c.overlays.begin(), c.overlays.end());
  for (const std::string& f : record_files(c)) in.push_back(f);
  if (!lab.empty()) in.push_back(lab);
  return in;
}

}  // namespace acidload::io
