#include "acidload/io/results.hpp"

#include <cmath>
#include <cstdio>
#include <filesystem>
#include <fstream>
#include <random>
#include <sstream>

#include "acidload/core/constants.hpp"
#include "acidload/core/error.hpp"
#include "acidload/core/version.hpp"

namespace acidload::io {

namespace {
std::string num(double v) {
  if (!std::isfinite(v)) return "null";
  char b[32];
  std::snprintf(b, sizeof b, "%.10g", v);
  return b;
}
std::string quote(const std::string& s) {
  std::string o = "\"";
  for (char ch : s) {
    if (ch == '"' || ch == '\\') o += '\\', o += ch;
    else if (static_cast<unsigned char>(ch) < 0x20) {
      char b[8];
      std::snprintf(b, sizeof b, "\\u%04x", ch);
      o += b;
    } else o += ch;
  }
  return o + "\"";
}
std::string csv_field(const std::string& s) {
  if (s.find_first_of(",\"\n") == std::string::npos) return s;
  std::string o = "\"";
  for (char ch : s) o += ch == '"' ? std::string("\"\"") : std::string(1, ch);
  return o + "\"";
}
}  // namespace

std::string summary_json(const CaseFile& c, const std::vector<VariantSummary>& rows) {
  std::ostringstream j;
  j << "{\n  \"acidload-version\": " << quote(version()) << ",\n  \"case-file\": " << quote(c.file)
    << ",\n  \"case\": " << quote(c.title) << ",\n  \"note\": "
    << quote("Estimates that support, not replace, the engine maker's and oil supplier's limits, lab analysis, "
             "local codes and licensed practice.")
    << ",\n  \"variants\": [";
  for (std::size_t i = 0; i < rows.size(); ++i) {
    const VariantSummary& v = rows[i];
    const ChargeSummary& ch = v.charge;
    j << (i ? "," : "") << "\n    {\n      \"name\": " << quote(v.name) << ",\n";
    j << "      \"acid-inflow-g-koh-per-h\": {\"sulfuric\": " << num(v.inflow_koh.sulfuric)
      << ", \"sulfurous-fresh-oil\": " << num(v.inflow_koh.sulfurous_fresh)
      << ", \"hydrochloric\": " << num(v.inflow_koh.hydrochloric) << ", \"hydrofluoric\": " << num(v.inflow_koh.hydrofluoric)
      << ", \"nitric\": " << num(v.inflow_koh.nitric) << "},\n";
    const AcidInflow::PerAcid g = v.inflow.as_mass();
    j << "      \"acid-inflow-g-per-h\": {\"sulfuric\": " << num(g.sulfuric) << ", \"sulfurous-fresh-oil\": "
      << num(g.sulfurous_fresh) << ", \"hydrochloric\": " << num(g.hydrochloric) << ", \"hydrofluoric\": "
      << num(g.hydrofluoric) << ", \"nitric\": " << num(g.nitric) << "},\n";
    j << "      \"acid-inflow-mol-per-h\": {\"sulfuric-liner\": " << num(v.inflow.sulfuric_liner)
      << ", \"sulfuric-blow-by\": " << num(v.inflow.sulfuric_blowby)
      << ", \"sulfurous-fresh-oil\": " << num(v.inflow.sulfurous_fresh) << ", \"hydrochloric\": " << num(v.inflow.hydrochloric)
      << ", \"hydrofluoric\": " << num(v.inflow.hydrofluoric) << ", \"nitric\": " << num(v.inflow.nitric) << "},\n";
    j << "      \"sulfur-share-to-oil\": " << num(v.sulfur_share_to_oil) << ",\n";
    j << "      \"sulfur-share-to-oil-charge-average\": "
      << (v.sulfur_share_to_oil_average >= 0 ? num(v.sulfur_share_to_oil_average) : "null") << ",\n";
    j << "      \"initial-tbn-rate-mg-koh-per-g-per-h\": " << num(v.initial_tbn_rate) << ",\n";
    j << "      \"tbn-rate-charge-average-mg-koh-per-g-per-h\": " << num(v.tbn_fall_rate_average) << ",\n";
    // an oil-condition limit, or none: the planned maximum hours is a horizon, not a result
    j << "      \"drain-interval-h\": " << (ch.oil_limit_reached() ? num(ch.drain_interval) : "null") << ",\n";
    j << "      \"limit-reached\": " << (ch.oil_limit_reached() ? quote(std::string(name(*ch.first))) : "null") << ",\n";
    j << "      \"no-limit-within-h\": "
      << (ch.oil_limit_reached() ? "null" : num(ch.first ? ch.drain_interval : ch.oil_hours)) << ",\n";
    j << "      \"antioxidant-spent-at-h\": " << (ch.antioxidant_spent_at >= 0 ? num(ch.antioxidant_spent_at) : "null") << ",\n";
    j << "      \"at-drain-or-end\": {\"tbn-mg-koh-per-g\": " << num(v.tbn_end) << ", \"tan-mg-koh-per-g\": " << num(v.tan_end)
      << ", \"san-mg-koh-per-g\": " << num(v.san_end) << "},\n";
    j << "      \"limits\": {";
    for (std::size_t k = 0; k < limit_count; ++k) {
      const Limit l = all_limits[k];
      const LimitReading& r = ch.at_end[k];
      j << (k ? ", " : "") << quote(std::string(name(l))) << ": {\"reached-at-h\": "
        << (ch.reached_at[k] >= 0 ? num(ch.reached_at[k]) : "null") << ", \"value\": " << num(r.value)
        << ", \"limit\": " << num(r.limit) << ", \"margin\": " << num(r.margin()) << "}";
    }
    j << "},\n";
    j << "      \"charges\": [";
    for (std::size_t k = 0; k < v.run.charges.size(); ++k) {
      const ChargeSummary& x = v.run.charges[k];
      j << (k ? ", " : "") << "{\"start-engine-hours-h\": " << num(x.start_engine_hours) << ", \"oil-hours-h\": "
        << num(x.oil_hours) << ", \"ended-by-oil-change\": " << (x.ended_by_change ? "true" : "false")
        << ", \"drain-interval-h\": " << (x.oil_limit_reached() ? num(x.drain_interval) : "null") << ", \"limit-reached\": "
        << (x.oil_limit_reached() ? quote(std::string(name(*x.first))) : "null") << "}";
    }
    j << "],\n";
    j << "      \"floor-reached-at-h\": " << (ch.floor_reached_at >= 0 ? num(ch.floor_reached_at) : "null") << ",\n";
    if (v.steady_state) {
      const OilState& s = *v.steady_state;
      const OilProperties& oil = c.variants[i].charge.oil;
      j << "      \"steady-state\": {\"base-mg-koh-per-g\": " << num(s.base) << ", \"tbn-d4739-mg-koh-per-g\": "
        << num(tbn(s, oil, BaseNumberMethod::d4739)) << ", \"tan-mg-koh-per-g\": " << num(acidload::tan(s, oil))
        << ", \"san-mg-koh-per-g\": " << num(s.strong_acid)
        << ", \"oxidation-a-per-cm\": " << num(s.oxidation) << ", \"nitration-a-per-cm\": " << num(s.nitration)
        << ", \"viscosity-rise\": " << num(viscosity_rise(s, oil)) << ", \"antioxidant-remaining\": " << num(s.antioxidant)
        << ", \"anti-wear-remaining\": " << num(anti_wear_remaining(s, oil)) << "},\n";
    } else {
      j << "      \"steady-state\": null,\n";
    }
    const auto c_of = [](double k) { return k > 0 ? num(k - constants::zero_celsius) : std::string("null"); };
    j << "      \"exhaust-dew-points-degc\": {\"water\": " << c_of(v.dew_points.water) << ", \"sulfuric\": "
      << c_of(v.dew_points.sulfuric) << ", \"sulfuric-zarenezhad\": " << c_of(v.dew_points.sulfuric_zarenezhad)
      << ", \"sulfuric-okkes\": " << c_of(v.dew_points.sulfuric_okkes) << ", \"hydrochloric\": "
      << c_of(v.dew_points.hydrochloric) << ", \"minimum-wall\": " << c_of(v.dew_points.minimum_wall_temperature) << "},\n";
    {
      const Transfer& t = v.run.first_transfer;
      j << "      \"temperatures-degc\": {\"blow-by-water-dew-point\": " << c_of(t.blowby_water_dew_point)
        << ", \"in-cylinder-acid-dew-point\": " << c_of(t.cylinder_acid_dew_point) << ", \"liner-wall-running\": "
        << c_of(t.liner_temperature) << ", \"liner-wall-at-start\": " << c_of(t.liner_temperature_at_start) << "},\n";
      j << "      \"crankcase-wetness\": " << num(t.wetness) << ",\n";
      j << "      \"warm-up-liner-acid-mol-s-per-h\": " << num(t.inflow.sulfuric_warmup) << ",\n";
    }
    const auto figures = [&](const Emissions& e) {
      std::ostringstream o;
      const auto one = [&](const char* key, const EmissionFigure& f, bool last) {
        o << quote(key) << ": {\"ppmv-wet\": " << num(f.ppmv_wet) << ", \"ppmv-dry\": " << num(f.ppmv_dry)
          << ", \"mg-per-nm3-wet\": " << num(f.mg_per_m3_wet) << ", \"mg-per-nm3-dry\": " << num(f.mg_per_m3_dry)
          << ", \"ppmv-dry-at-o2-reference\": " << num(f.ppmv_dry_at_ref) << ", \"mg-per-nm3-dry-at-o2-reference\": "
          << num(f.mg_per_m3_dry_at_ref) << "}" << (last ? "" : ", ");
      };
      o << "{\"o2-reference\": " << num(e.o2_reference) << ", \"o2-of-air\": " << num(e.o2_air) << ", \"o2-dry\": "
        << num(e.o2_dry) << ", \"h2o-wet\": " << num(e.water_wet) << ", \"flow-wet-nm3-per-h\": " << num(e.flow_wet)
        << ", \"flow-dry-nm3-per-h\": " << num(e.flow_dry) << ", \"so2-kg-per-h\": " << num(e.so2_mass_flow) << ", ";
      one("so2", e.so2, false), one("so3", e.so3, false), one("hcl", e.hcl, false), one("hf", e.hf, false);
      one("nox-as-no2", e.nox, false), one("h2o", e.h2o, false), one("o2", e.o2, true);
      o << "}";
      return o.str();
    };
    j << "      \"exhaust\": " << figures(v.emissions) << ",\n";
    j << "      \"exhaust-after-catalyst\": " << (v.emissions_after_catalyst ? figures(*v.emissions_after_catalyst) : "null")
      << ",\n";
    if (v.dew_points_after_catalyst) {
      const ExhaustDewPoints& d = *v.dew_points_after_catalyst;
      j << "      \"exhaust-dew-points-after-catalyst-degc\": {\"water\": " << c_of(d.water) << ", \"sulfuric\": "
        << c_of(d.sulfuric) << ", \"hydrochloric\": " << c_of(d.hydrochloric) << ", \"minimum-wall\": "
        << c_of(d.minimum_wall_temperature) << "},\n";
    } else {
      j << "      \"exhaust-dew-points-after-catalyst-degc\": null,\n";
    }
    j << "      \"warnings\": [";
    for (std::size_t w = 0; w < v.warnings.size(); ++w)
      j << (w ? ", " : "") << "{\"key\": " << quote(v.warnings[w].key) << ", \"value\": " << quote(v.warnings[w].value)
        << ", \"reason\": " << quote(v.warnings[w].reason) << "}";
    j << "],\n";
    j << "      \"so3-share\": " << num(v.so3_share) << ",\n      \"so3-share-equilibrium-bound\": " << num(v.so3_share_bound)
      << ",\n      \"engine-hours\": " << num(v.run.engine_hours) << "\n    }";
  }
  j << "\n  ]\n}\n";
  return j.str();
}

std::string trajectories_csv(const std::vector<VariantSummary>& rows) {
  std::ostringstream o;
  o << "variant,charge,engine_hours_h,oil_hours_h,calendar_hours_h,tbn_d2896_mg_koh_per_g,tbn_d4739_mg_koh_per_g,"
       "tan_mg_koh_per_g,san_mg_koh_per_g,oxidation_a_per_cm,nitration_a_per_cm,oil_mass_kg\n";
  for (const VariantSummary& v : rows)
    for (const TrajectoryPoint& p : v.run.trajectory)
      o << csv_field(v.name) << ',' << p.charge << ',' << num(p.engine_hours) << ',' << num(p.oil_hours) << ','
        << num(p.calendar_hours) << ',' << num(p.tbn_d2896) << ',' << num(p.tbn_d4739) << ',' << num(p.tan) << ','
        << num(p.san) << ',' << num(p.state.oxidation) << ',' << num(p.state.nitration) << ',' << num(p.state.mass) << '\n';
  return o.str();
}

void write_results(const std::string& folder, const CaseFile& c, const std::vector<VariantSummary>& rows) {
  namespace fs = std::filesystem;
  const std::string json = summary_json(c, rows), csv = trajectories_csv(rows);  // everything before touching disk
  const fs::path target = fs::absolute(folder);
  std::random_device rd;
  const std::string tag = std::to_string(rd() % 1000000);
  const fs::path fresh = target.parent_path() / ("." + target.filename().string() + ".new-" + tag);
  const fs::path old = target.parent_path() / ("." + target.filename().string() + ".old-" + tag);
  std::error_code ec;
  fs::create_directories(target.parent_path(), ec);
  if (!fs::create_directory(fresh, ec))
    throw Error("cannot create the output folder " + fresh.string() + ": " + ec.message());
  const auto put = [&](const char* name, const std::string& text) {
    std::ofstream f(fresh / name, std::ios::binary);
    f << text;
    f.close();
    if (!f) {
      fs::remove_all(fresh, ec);
      throw Error("cannot write " + (fresh / name).string());
    }
  };
  put("summary.json", json);
  put("trajectories.csv", csv);
  const bool existed = fs::exists(target);
  if (existed && !fs::is_directory(target)) {
    fs::remove_all(fresh, ec);
    throw Error("the output path " + target.string() + " exists and is not a folder; nothing was written");
  }
  if (existed) {
    fs::rename(target, old, ec);
    if (ec) {
      fs::remove_all(fresh, ec);
      throw Error("cannot replace " + target.string() + ": " + ec.message());
    }
  }
  fs::rename(fresh, target, ec);
  if (ec) {
    if (existed) fs::rename(old, target, ec);  // put the previous result back
    fs::remove_all(fresh, ec);
    throw Error("cannot move the results into " + target.string());
  }
  if (existed) fs::remove_all(old, ec);
}

}  // namespace acidload::io
