// Loading a site file (site_file.hpp): the shared gas and train, the gas record, each engine merged
// over the file's sections and built as a variant is (case_file.cpp), then laid on the gas record.
// And the site's result files.
#include "acidload/io/site_file.hpp"

#include <cmath>
#include <cstdio>
#include <filesystem>
#include <memory>
#include <set>
#include <sstream>

#include "acidload/core/economics.hpp"
#include "acidload/core/error.hpp"
#include "acidload/core/version.hpp"
#include "case_reader.hpp"
#include "output_text.hpp"
#include "text.hpp"

namespace acidload::io {

namespace {
using detail::describe;
using detail::Reader;

// The prices of the shared train: the site's own, never an engine's (docs/model.md §18.4).
const char* const shared_price_keys[] = {"currency",      "iron-oxide-price", "carbon-price",   "disposal-price",
                                         "changeout-labour", "caustic-price", "caustic-excess", "biological-consumables",
                                         "discount-rate"};
// Gas figures: the site's one gas supply, never an engine's.
const char* const gas_keys[] = {"h2s", "other-sulfur", "chlorine", "fluorine"};

bool same_gas(const FuelGas& a, const FuelGas& b) {
  for (std::size_t k = 0; k < gas_count; ++k)
    if (a.x[k] != b.x[k]) return false;
  return a.other_sulfur == b.other_sulfur && a.chlorine == b.chlorine && a.fluorine == b.fluorine;
}

double hours_of(const std::vector<Segment>& rec) {
  double h = 0;
  for (const Segment& s : rec) h += s.hours;
  return h;
}

// The gas record's rows: inline segments or a CSV file, each row's figures over the previous row's.
void read_gas_record(Reader& r, const Node& g, const FuelAnalysis& base, SiteFile& out) {
  r.require_section(g, "gas-record");
  const Node* file = g.find("file");
  const Node* segs = g.find("segments");
  if (file && segs) r.fail(*segs, "", "either a gas record 'file' or inline 'segments', not both");
  if (!file && !segs) r.fail(g, describe(g), "a gas record 'file' or inline 'segments', each with its 'hours'");
  std::vector<Node> rows;
  if (file) rows = detail::csv_rows(r, *file, "gas-segment", "site.gas-record");
  if (segs) {
    if (segs->type != Node::Type::sequence || segs->items.empty()) r.fail(*segs, describe(*segs), "a list of gas segments, each with its 'hours'");
    rows = segs->items;
  }
  if (rows.empty()) r.fail(file ? *file : g, "(no rows)", "at least one gas segment");
  if (rows.size() > max_record_rows)
    r.fail(file ? *file : *segs, std::to_string(rows.size()) + " segments",
           "a gas record of at most " + std::to_string(max_record_rows) + " segments (a cap on work; docs/case-format.md)");
  FuelAnalysis f = base;
  double total = 0;
  for (const Node& row : rows) {
    r.require_section(row, "gas-segment");
    const Node* h = row.find("hours");
    if (!h) r.fail(row, "(no hours)", "the gas segment's running hours on the site's clock, e.g. 'hours: 2000 h'");
    const double hours = r.value(*h, case_key("gas-segment.hours"));
    for (const char* k : gas_keys)
      if (const Node* n = row.find(k)) {
        Concentration& c = std::string(k) == "h2s" ? f.h2s : std::string(k) == "other-sulfur" ? f.other_sulfur
                           : std::string(k) == "chlorine"                                      ? f.chlorine
                                                                                               : f.fluorine;
        c = r.contaminant(*n, f.main_basis);
      }
    FuelGas gas;
    try {
      gas = resolve(f);
    } catch (const InputError& e) {
      r.relocate(e, row, &row);
    }
    total += hours;
    if (total > max_simulated_hours)
      r.fail(*h, format_value(total) + " h in all",
             "a gas record of at most " + format_value(max_simulated_hours) + " running hours (a cap on work; docs/case-format.md)");
    if (hours > 0) {
      out.gas_hours.push_back(hours);
      out.gas.push_back(gas);
    }
  }
  if (out.gas_hours.empty()) r.fail(file ? *file : *segs, "0 h in all", "a gas record of some running hours");
}

// An engine's entry: its name, and none of the site's own keys.
std::string check_engine_entry(const Reader& r, const Node& e, std::set<std::string>& names) {
  if (e.type == Node::Type::map)
    for (const char* k : {"fuel", "reference-state", "combustion-reference", "scrubbing"})
      if (const Node* n = e.find(k))
        r.fail(*n, describe(*n), std::string("no '") + k + "' for one engine: the site has one gas supply and one train ('" +
                                     k + "' at the top of the site file)");
  r.require_section(e, "site-engine");
  const Node* n = e.find("name");
  if (!n) r.fail(e, "(no name)", "a 'name' for the engine");
  const std::string name = r.text(*n);
  if (name.empty()) r.fail(*n, "", "an engine name that is not empty");
  if (!names.insert(name).second) r.fail(*n, name, "an engine name not used before on the site");
  if (const Node* ec = e.find("economics"); ec && ec->type == Node::Type::map)
    for (const char* k : shared_price_keys)
      if (const Node* x = ec->find(k))
        r.fail(*x, x->scalar, std::string("no '") + k + "' for one engine: the train's prices and the currency are the site's ('" + k +
                                  "' in the top-level 'economics')");
  if (const Node* rec = e.find("record"); rec && rec->type == Node::Type::map)
    if (const Node* segs = rec->find("segments"); segs && segs->type == Node::Type::sequence)
      for (const Node& row : segs->items)
        for (const char* k : gas_keys)
          if (const Node* x = row.type == Node::Type::map ? row.find(k) : nullptr)
            r.fail(*x, x->scalar, std::string("no gas figures in an engine's record: the site has one gas supply ('") + k +
                                      "' in site.gas-record)");
  return name;
}

SiteFile load(Reader& r, const std::shared_ptr<Document>& main) {
  const Node& root0 = main->root;
  if (root0.type != Node::Type::map)
    throw main->error(Mark{1, 1}, "(top level)", root0.type == Node::Type::null ? "(empty file)" : "(not a map)",
                      "a site: a map with format-version, fuel, site and optional sections");
  require_keys(*main, root0, section_keys(""));
  const Node* sn = root0.find("site");
  if (!sn) throw main->error(Mark{1, 1}, "site", "(missing)", "a 'site' section with the engines (a site file)");
  SiteFile out;
  out.file = main->file;
  out.format_version = detail::format_version(r, root0);
  if (const Node* n = root0.find("record"))
    r.fail(*n, describe(*n), "no top-level 'record' in a site file: each engine's record goes in its entry of site.engines, "
                             "the gas quality in site.gas-record");
  if (const Node* n = root0.find("variants"))
    r.fail(*n, describe(*n), "no 'variants' in a site file (one site a file: compare sites as separate files)");
  if (const Node* n = root0.find("uncertainty")) r.fail(*n, describe(*n), "no 'uncertainty' in a site file (not read for sites)");
  if (const Node* n = root0.find("lab")) r.fail(*n, describe(*n), "no 'lab' in a site file (fit, forecast and predict read a case file)");
  if (const Node* n = root0.find("base-name"))
    r.fail(*n, describe(*n), "no 'base-name' in a site file (the engines are named in site.engines)");
  r.require_section(*sn, "site");
  if (const Node* t = root0.find("case")) out.title = r.text(*t);
  out.site.name = out.title;
  if (const Node* n = sn->find("name")) {
    out.site.name = r.text(*n);
    if (out.site.name.empty()) r.fail(*n, "", "a name that is not empty");
    if (out.title.empty()) out.title = out.site.name;
  }
  if (out.site.name.empty()) out.site.name = std::filesystem::path(out.file).stem().string();

  // the shared gas, as every engine's case reads it
  const Node base = detail::without(root0, {"site", "format-version", "case"});
  const Node* fn = base.find("fuel");
  if (!fn) r.fail(root0, "(no fuel section)", "a 'fuel' section with the site's gas analysis");
  FuelAnalysis fuel;
  fuel.reference = detail::read_reference_state(r, base.find("reference-state"));
  fuel.combustion = detail::read_combustion_reference(r, base.find("combustion-reference"));
  detail::read_fuel(r, *fn, fuel);
  if (const Node* g = sn->find("gas-record")) read_gas_record(r, *g, fuel, out);

  // the shared train and prices
  const Node* scrubbing = base.find("scrubbing");
  if (scrubbing) out.site.train = detail::read_scrubbing(r, *scrubbing, out.site.step);
  const Node* econ = base.find("economics");
  out.priced = econ != nullptr;
  double sensitivity = 0.2;
  if (econ) {
    CostCase shared;
    detail::read_economics(r, *econ, shared, sensitivity);
    out.site.prices = shared.prices;
    out.site.hours_per_year = shared.hours_per_year;
    out.currency = shared.currency;
  }

  // the engines
  const Node* es = sn->find("engines");
  if (!es) r.fail(*sn, describe(*sn), "the site's 'engines': a list, each with a 'name'");
  if (es->type != Node::Type::sequence || es->items.empty())
    r.fail(*es, describe(*es), "a list of engines, each with a 'name' (and its own 'engine', 'oil', 'record' as needed)");
  if (es->items.size() > max_site_engines)
    r.fail(*es, std::to_string(es->items.size()) + " engines",
           "at most " + std::to_string(max_site_engines) + " engines on a site (a cap on work; docs/case-format.md)");
  std::set<std::string> names;
  std::size_t segments = 0;
  const FuelGas base_gas = [&] {
    try {
      return resolve(fuel);
    } catch (const InputError& e) {
      r.relocate(e, *fn);
    }
  }();
  for (std::size_t i = 0; i < es->items.size(); ++i) {
    const Node& e = es->items[i];
    const std::string name = check_engine_entry(r, e, names);
    Node merged = base;
    detail::merge_layer(merged, detail::without(e, {"name"}));
    for (const char* k : {"engine", "oil"})
      if (!merged.find(k))
        r.fail(e, name, std::string("an '") + k + "' section for this engine (or one at the top of the site file for all)");
    CostCase cc;
    try {
      cc.engine = detail::build_engine_case(r, merged, name);
    } catch (const InputError& x) {
      // a mistake in a section the engines share: say which engine it stops
      if (x.key().rfind("site.engines[", 0) == 0) throw;
      throw InputError(x.key(), x.value(), x.expected() + " (for the site's engine '" + name + "')", x.where());
    }
    for (const Segment& s : cc.engine.record)
      if (!same_gas(s.fuel, base_gas)) {
        const Node* rec = e.find("record");
        const Node* at = rec ? rec->find("file") : nullptr;
        r.fail(at ? *at : e, at ? at->scalar : name,
               "no gas columns (h2s, other-sulfur, chlorine, fluorine) in an engine's record: the site has one gas supply "
               "(site.gas-record)");
      }
    if (!out.gas_hours.empty()) {
      try {
        cc.engine.record = on_gas_record(cc.engine.record, out.gas_hours, out.gas, "site.engines[" + std::to_string(i) + "].record");
      } catch (const InputError& x) {
        const Node* rec = e.find("record");
        r.fail(rec ? *rec : e, x.value(), x.expected());
      }
    }
    if (econ) {
      double step = 0.2;
      detail::read_economics(r, *merged.find("economics"), cc, step);
    }
    cc.currency = out.currency;
    segments += cc.engine.record.size();
    if (segments > max_segments_in_all)
      r.fail(e, name, "engines whose records hold at most " + std::to_string(max_segments_in_all) +
                          " segments in all (a cap on memory; docs/case-format.md)");
    out.site.engines.push_back(std::move(cc));
  }
  // the train over the summed flow: a changeout level the fresh bed cannot hold is refused here, at its key
  if (scrubbing && !out.site.train.empty()) {
    std::vector<const EngineCase*> cases;
    for (const CostCase& c : out.site.engines) cases.push_back(&c.engine);
    EngineCase gas;
    gas.record = site_gas_record(cases);
    try {
      scrub(gas, out.site.train, out.site.step);
    } catch (const InputError& x) {
      detail::train_error(r, *scrubbing, x);
    }
  }
  return out;
}

std::string num(double v) { return detail::json_number(v); }
std::string quote(const std::string& s) { return detail::json_string(s); }
using detail::csv_field;
std::string items(const CostItems& c) {
  std::string s = "{";
  for (std::size_t i = 0; i < cost_item_count; ++i)
    s += (i ? ", " : "") + quote(std::string(name(all_cost_items[i]))) + ": " + num(c[i]);
  return s + "}";
}
double dry_ppmv(const FuelGas& g) { return g[Gas::H2S] / (1 - g[Gas::H2O]) * 1e6; }

// Running-hours means of the raw gas over the merged record: fuel flow and H2S flow [mol/h], H2S [ppmv dry].
struct RawMeans {
  double hours = 0, fuel_flow = 0, h2s_flow = 0, h2s_ppmv = 0;
};
RawMeans raw_means(const std::vector<Segment>& raw) {
  RawMeans m;
  for (const Segment& s : raw) {
    m.hours += s.hours;
    m.fuel_flow += s.operation.fuel_flow * s.hours;
    m.h2s_flow += s.operation.fuel_flow * s.fuel[Gas::H2S] * s.hours;
    m.h2s_ppmv += dry_ppmv(s.fuel) * s.hours;
  }
  if (m.hours > 0) m.fuel_flow /= m.hours, m.h2s_flow /= m.hours, m.h2s_ppmv /= m.hours;
  return m;
}
// Running hours per bed over the record: hours / (changeouts + share of the current bed used) [h].
double bed_interval(double hours, const StageRecord& s) {
  const double beds = s.changeouts + s.bed_share_used;
  return beds > 0 ? hours / beds : HUGE_VAL;
}

}  // namespace

std::vector<Segment> on_gas_record(const std::vector<Segment>& record, const std::vector<double>& gas_hours,
                                   const std::vector<FuelGas>& gas, const std::string& key) {
  if (gas_hours.empty()) return record;
  double gas_total = 0;
  for (double h : gas_hours) gas_total += h;
  std::vector<Segment> out;
  out.reserve(record.size() + gas_hours.size());
  std::size_t k = 0;     // the gas stretch the clock is in
  double t = 0;          // the clock [h]
  double end = gas_hours[0];  // the end of stretch k on the clock [h]
  const double tol = 1e-9 * gas_total;
  for (const Segment& s : record) {
    double left = s.hours;
    bool first = true;
    do {
      while (k + 1 < gas_hours.size() && t >= end - tol) end += gas_hours[++k];
      if (left > 0 && t >= gas_total - tol)
        throw InputError(key, format_value(hours_of(record)) + " h of running",
                         "a record no longer than the site's gas record (" + format_value(gas_total) + " h)");
      const double piece = left <= end - t + tol ? left : end - t;
      Segment p = segment_piece(s, piece, first);
      p.fuel = gas[k];
      out.push_back(std::move(p));
      first = false;
      t += piece;
      left = piece == left ? 0 : left - piece;
    } while (left > 0);
  }
  return out;
}

bool is_site_file(const std::string& path) {
  const Document d = read_document(path);
  return d.root.type == Node::Type::map && d.root.find("site") != nullptr;
}

SiteFile load_site(const std::string& path) {
  Reader r;
  r.base_dir = std::filesystem::path(path).parent_path().string();
  if (r.base_dir.empty()) r.base_dir = ".";
  auto d = std::make_shared<Document>(read_document(path));
  detail::set_source(d->root, 0);
  r.docs.push_back(d);
  return load(r, d);
}

SiteFile load_site_text(std::string_view text, const std::string& file_name, const std::string& base_dir) {
  Reader r;
  r.base_dir = base_dir;
  auto d = std::make_shared<Document>(parse_document(text, file_name));
  detail::set_source(d->root, 0);
  r.docs.push_back(d);
  return load(r, d);
}

std::string site_json(const SiteFile& f, const SiteResult& r) {
  std::ostringstream j;
  const RawMeans m = raw_means(r.raw);
  j << "{\n  \"acidload-version\": " << quote(version()) << ",\n  \"site-file\": " << quote(f.file)
    << ",\n  \"site\": " << quote(r.name) << ",\n  \"currency\": " << quote(f.currency) << ",\n  \"note\": "
    << quote("Estimates from the site file's inputs (invented where the file says so); they support, not replace, the engine "
             "maker's and oil supplier's limits, the scrubber supplier's figures and lab analysis.")
    << ",\n";
  j << "  \"running-hours\": " << num(m.hours) << ", \"hours-per-year\": " << num(r.shared_quantities.running_hours) << ",\n";
  j << "  \"raw-gas\": {\"mean-fuel-flow-mol-per-h\": " << num(m.fuel_flow) << ", \"mean-h2s-flow-mol-per-h\": " << num(m.h2s_flow)
    << ", \"mean-h2s-ppmv\": " << num(m.h2s_ppmv) << ", \"merged-segments\": " << r.raw.size() << "},\n";
  j << "  \"stages\": [";
  for (std::size_t k = 0; k < r.scrubbed.stages.size(); ++k) {
    const StageRecord& s = r.scrubbed.stages[k];
    const TrainStage& t = f.site.train[k];
    const bool bed = is_media_bed(t.stage.kind);
    j << (k ? "," : "") << "\n    {\"name\": " << quote(t.name) << ", \"kind\": " << quote(std::string(name(t.stage.kind)))
      << ", \"changeouts\": " << s.changeouts << ", \"bed-share-used\": " << num(s.bed_share_used)
      << ", \"first-bed-life-h\": " << (s.first_bed_life >= 0 ? num(s.first_bed_life) : "null")
      << ", \"bed-interval-h\": " << (bed ? num(bed_interval(m.hours, s)) : "null")
      << ", \"changeouts-per-year\": " << num(r.shared_quantities.stages[k].changeouts)
      << ", \"sulfur-removed-kg\": " << num(s.sulfur_removed) << ", \"mean-outlet-h2s-ppmv\": " << num(s.mean_outlet_ppmv) << "}";
  }
  j << "\n  ],\n";
  j << "  \"sulfur-mol\": {\"raw\": " << num(r.scrubbed.sulfur.raw) << ", \"stages\": [";
  for (std::size_t k = 0; k < r.scrubbed.sulfur.stages.size(); ++k) j << (k ? ", " : "") << num(r.scrubbed.sulfur.stages[k]);
  j << "], \"engines\": " << num(r.scrubbed.sulfur.engine) << ", \"balance-error\": " << num(r.sulfur_balance_error) << "},\n";
  j << "  \"shared-per-year\": " << items(r.shared_per_year) << ",\n";
  j << "  \"total-per-year\": " << num(r.total_per_year) << ",\n";
  j << "  \"items\": [";
  for (std::size_t i = 0; i < cost_item_count; ++i) j << (i ? ", " : "") << quote(std::string(name(all_cost_items[i])));
  j << "],\n  \"engines\": [";
  for (std::size_t e = 0; e < r.engines.size(); ++e) {
    const SiteEngine& x = r.engines[e];
    const VariantCosts& v = x.costs;
    j << (e ? "," : "") << "\n    {\"name\": " << quote(x.name) << ", \"gas-share\": " << num(x.gas_share)
      << ", \"running-hours\": " << num(v.record_hours) << ", \"mean-h2s-ppmv\": " << num(x.mean_h2s_ppmv)
      << ", \"sulfur-burnt-mol\": " << num(x.sulfur_burnt) << ",\n     \"oil-changes\": " << num(x.oil.changes)
      << ", \"completed-charges\": " << x.oil.completed << ", \"drain-intervals-h\": [";
    for (std::size_t i = 0; i < x.oil.intervals.size(); ++i) j << (i ? ", " : "") << num(x.oil.intervals[i]);
    j << "],\n     \"mwh-per-year\": " << num(v.quantities.energy / 3.6e9) << ", \"oil-changes-per-year\": " << num(v.quantities.oil_changes)
      << ", \"total-per-year\": " << num(v.total_per_year) << ", \"total-per-mwh\": " << num(v.total_per_mwh) << ",\n";
    j << "     \"per-year\": " << items(v.per_year) << "}";
  }
  j << "\n  ]\n}\n";
  return j.str();
}

std::string site_engines_csv(const SiteResult& r) {
  std::ostringstream o;
  o << "engine,gas_share,running_hours_h,mean_h2s_ppmv,sulfur_burnt_mol,oil_changes,first_drain_interval_h,"
       "mwh_per_year,total_per_year,total_per_mwh\n";
  for (const SiteEngine& x : r.engines)
    o << csv_field(x.name) << ',' << num(x.gas_share) << ',' << num(x.costs.record_hours) << ',' << num(x.mean_h2s_ppmv) << ','
      << num(x.sulfur_burnt) << ',' << num(x.oil.changes) << ',' << (x.oil.intervals.empty() ? "" : num(x.oil.intervals.front()))
      << ',' << num(x.costs.quantities.energy / 3.6e9) << ',' << num(x.costs.total_per_year) << ',' << num(x.costs.total_per_mwh)
      << '\n';
  return o.str();
}

std::string site_train_csv(const SiteFile& f, const SiteResult& r) {
  std::ostringstream o;
  const RawMeans m = raw_means(r.raw);
  o << "stage,kind,changeouts,bed_share_used,first_bed_life_h,bed_interval_h,changeouts_per_year,sulfur_removed_kg,"
       "mean_outlet_h2s_ppmv\n";
  for (std::size_t k = 0; k < r.scrubbed.stages.size(); ++k) {
    const StageRecord& s = r.scrubbed.stages[k];
    const TrainStage& t = f.site.train[k];
    const bool bed = is_media_bed(t.stage.kind);
    o << csv_field(t.name) << ',' << name(t.stage.kind) << ',' << s.changeouts << ',' << num(s.bed_share_used) << ','
      << (s.first_bed_life >= 0 ? num(s.first_bed_life) : "") << ',' << (bed ? num(bed_interval(m.hours, s)) : "") << ','
      << num(r.shared_quantities.stages[k].changeouts) << ',' << num(s.sulfur_removed) << ',' << num(s.mean_outlet_ppmv) << '\n';
  }
  return o.str();
}

}  // namespace acidload::io
