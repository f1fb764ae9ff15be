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

std::string summary_json(const CaseFile& c, const std::vector<VariantSummary>& rows, const EconomicsResults* economics) {
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
    j << "      \"initial-tbn-rate-mg-koh-per-g-per-h\": " << num(v.initial_tbn_rate) << ",\n";
    j << "      \"drain-interval-h\": " << (ch.first ? num(ch.drain_interval) : "null") << ",\n";
    j << "      \"limit-reached\": " << (ch.first ? quote(std::string(name(*ch.first))) : "null") << ",\n";
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
        << ", \"drain-interval-h\": " << (x.first ? num(x.drain_interval) : "null") << ", \"limit-reached\": "
        << (x.first ? quote(std::string(name(*x.first))) : "null") << "}";
    }
    j << "],\n";
    j << "      \"floor-reached-at-h\": " << (ch.floor_reached_at >= 0 ? num(ch.floor_reached_at) : "null") << ",\n";
    if (v.steady_state) {
      const OilState& s = *v.steady_state;
      j << "      \"steady-state\": {\"base-mg-koh-per-g\": " << num(s.base) << ", \"san-mg-koh-per-g\": " << num(s.strong_acid)
        << ", \"oxidation-a-per-cm\": " << num(s.oxidation) << ", \"nitration-a-per-cm\": " << num(s.nitration) << "},\n";
    } else {
      j << "      \"steady-state\": null,\n";
    }
    const auto c_of = [](double k) { return k > 0 ? num(k - constants::zero_celsius) : std::string("null"); };
    j << "      \"exhaust-dew-points-degc\": {\"water\": " << c_of(v.dew_points.water) << ", \"sulfuric\": "
      << c_of(v.dew_points.sulfuric) << ", \"sulfuric-zarenezhad\": " << c_of(v.dew_points.sulfuric_zarenezhad)
      << ", \"sulfuric-okkes\": " << c_of(v.dew_points.sulfuric_okkes) << ", \"hydrochloric\": "
      << c_of(v.dew_points.hydrochloric) << ", \"minimum-wall\": " << c_of(v.dew_points.minimum_wall_temperature) << "},\n";
    j << "      \"so3-share\": " << num(v.so3_share) << ",\n      \"so3-share-equilibrium-bound\": " << num(v.so3_share_bound)
      << ",\n      \"engine-hours\": " << num(v.run.engine_hours) << "\n    }";
  }
  j << "\n  ]";
  if (economics) j << ",\n  \"economics\": " << economics_json(*economics, 2);
  j << "\n}\n";
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

void write_results(const std::string& folder, const CaseFile& c, const std::vector<VariantSummary>& rows,
                   const EconomicsResults* economics) {
  namespace fs = std::filesystem;
  const std::string json = summary_json(c, rows, economics), csv = trajectories_csv(rows);  // everything before touching disk
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
