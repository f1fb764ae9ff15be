// acidload run CASE...: run every variant, print the comparison, optionally write a results folder;
// several cases (or folders of them) are a fleet, run in one process on all cores.
#include <algorithm>
#include <filesystem>
#include <map>
#include <thread>

#include "../cli.hpp"
#include "../report.hpp"
#include "acidload/core/error.hpp"
#include "acidload/io/results.hpp"
#include "acidload/studies/batch.hpp"
#include "../site_report.hpp"
#include "acidload/io/site_file.hpp"
#include "run_case.hpp"

namespace acidload_cli {
namespace {

namespace fs = std::filesystem;

struct RunOptions {
  std::vector<std::string> cases;  // files or folders
  std::string out, threads, summary_csv;
  std::vector<std::string> overlays;
};

RunOptions parse(const std::vector<std::string>& args) {
  RunOptions o;
  Options("run")
      .positionals("CASE", o.cases)
      .values("--overlay", o.overlays, "FILE")
      .value("--out", o.out, "FOLDER")
      .value("--threads", o.threads, "N")
      .value("--summary-csv", o.summary_csv, "FILE")
      .parse(args);
  return o;
}

// The case files named: a folder stands for its *.yaml and *.yml files, sorted by name.
std::vector<std::string> case_files(const std::vector<std::string>& named) {
  std::vector<std::string> files;
  for (const std::string& n : named) {
    std::error_code ec;
    if (!fs::is_directory(n, ec)) {
      files.push_back(n);
      continue;
    }
    std::vector<std::string> in;
    for (fs::directory_iterator it(n, ec); !ec && it != fs::directory_iterator(); it.increment(ec)) {
      const std::string ext = it->path().extension().string();
      if ((ext == ".yaml" || ext == ".yml") && it->is_regular_file(ec)) in.push_back(it->path().string());
    }
    if (ec) throw acidload::Error(n + ": cannot read the folder: " + ec.message());
    if (in.empty()) throw acidload::Error(n + ": the folder holds no case files (*.yaml, *.yml)");
    std::sort(in.begin(), in.end());
    files.insert(files.end(), in.begin(), in.end());
  }
  return files;
}

// A name for each case's result files in the fleet's folder: the file's stem, made unique.
std::vector<std::string> stems(const std::vector<std::string>& files) {
  std::vector<std::string> out;
  std::map<std::string, int> seen;
  for (const std::string& f : files) {
    std::string s = fs::path(f).stem().string();
    if (s.empty() || s[0] == '.') s = "case" + s;
    const int k = ++seen[s];
    out.push_back(k == 1 ? s : s + "-" + std::to_string(k));
  }
  return out;
}

int run_fleet(std::FILE* out, const std::vector<std::string>& files, const RunOptions& o, int threads) {
  // every case read first: a mistake is reported before anything runs
  std::vector<acidload::io::CaseFile> cases;
  cases.reserve(files.size());
  for (const std::string& f : files) cases.push_back(acidload::io::load_case(f, o.overlays, acidload::io::RecordReading::stream));
  std::vector<const acidload::EngineCase*> variants;
  for (const auto& c : cases)
    for (const auto& v : c.variants) variants.push_back(&v);
  const int workers = threads > 0 ? threads : static_cast<int>(std::max(1u, std::thread::hardware_concurrency()));
  std::vector<acidload::VariantSummary> all;
  {
    const ProgressLine progress("running " + std::to_string(cases.size()) + " cases (" +
                                std::to_string(variants.size()) + " variants) on " + std::to_string(workers) +
                                " threads");
    all = acidload::summarize_many(variants, workers);
  }
  std::vector<acidload::io::FleetCase> fleet;
  const std::vector<std::string> names = stems(files);
  std::size_t k = 0;
  for (std::size_t i = 0; i < cases.size(); ++i) {
    acidload::io::FleetCase f{&cases[i], names[i], {}};
    for (std::size_t v = 0; v < cases[i].variants.size(); ++v) f.rows.push_back(std::move(all[k++]));
    fleet.push_back(std::move(f));
  }
  if (!o.out.empty()) {
    std::vector<acidload::io::ResultFile> written{{"fleet-summary.json", acidload::io::fleet_summary_json(fleet)},
                                                  {"fleet-summary.csv", acidload::io::fleet_summary_csv(fleet)}};
    for (const auto& f : fleet) {
      written.push_back({f.stem + ".summary.json", acidload::io::summary_json(*f.file, f.rows)});
      written.push_back({f.stem + ".trajectories.csv", acidload::io::trajectories_csv(f.rows)});
    }
    std::vector<std::string> inputs = files;
    inputs.insert(inputs.end(), o.overlays.begin(), o.overlays.end());
    acidload::io::write_results_folder(o.out, written, inputs);
  }
  for (const auto& f : fleet) {
    std::fprintf(out, "== %s (%s)\n", terminal_safe(f.file->title.empty() ? f.stem : f.file->title).c_str(),
                 terminal_safe(f.file->file).c_str());
    print_comparison(out, *f.file, f.rows);
    std::fprintf(out, "\n");
  }
  print_fleet(out, fleet);
  if (!o.out.empty())
    std::fprintf(out, "\nResults written to %s: fleet-summary.json, fleet-summary.csv and, per case, "
                      "NAME.summary.json and NAME.trajectories.csv\n",
                 terminal_safe(o.out).c_str());
  print_caution(out);
  return exit_ok;
}

int run(const std::vector<std::string>& args, std::FILE* out) {
  const RunOptions o = parse(args);
  const int threads = o.threads.empty() ? 0 : static_cast<int>(count_option(o.threads, "--threads", 1, 1024));
  const std::vector<std::string> files = case_files(o.cases);
  if (files.size() == 1 && o.cases.size() == 1 && files.front() == o.cases.front() && acidload::io::is_site_file(files.front())) {
    if (!o.overlays.empty() || !o.summary_csv.empty())
      throw UsageError("a site file takes no --overlay or --summary-csv (its tables are in the --out folder)");
    return run_site_file(out, files.front(), o.out, false, threads);
  }
  if (files.size() == 1 && o.cases.size() == 1 && files.front() == o.cases.front())
    return run_case(out, acidload::io::load_case(files.front(), o.overlays, acidload::io::RecordReading::stream), o.out,
                    o.summary_csv);
  if (!o.summary_csv.empty())
    throw UsageError("--summary-csv takes one CASE; a fleet's table is fleet-summary.csv in its --out folder");
  return run_fleet(out, files, o, threads);
}

}  // namespace

extern const Command run_command{
    "run", "run CASE...", "run a case (or a fleet of cases) and print the comparison (and write result files)",
    "usage: acidload run CASE... [--overlay FILE]... [--out FOLDER] [--summary-csv FILE] [--threads N]\n\n"
    "Runs every variant of the case file CASE and prints a comparison: acid into the oil by species,\n"
    "the initial TBN fall, the drain interval and the limit that ends it (or 'not reached'), TBN, TAN\n"
    "and SAN there, and the exhaust sulfuric-acid dew point.\n\n"
    "Several CASEs, or a folder (its *.yaml and *.yml files), are a fleet: every case is read first\n"
    "(a mistake in any stops the run before anything is computed), then all variants of all cases run\n"
    "in this one process on N threads (default: one per core), and a fleet table follows the cases'\n"
    "comparisons. Overlays apply to every case.\n\n"
    "  --out FOLDER   also write FOLDER/summary.json (every figure, units in the key names) and\n"
    "                 FOLDER/trajectories.csv (TBN, TAN, SAN, oxidation, nitration against hours per\n"
    "                 variant), and a .acidload-results marker: FOLDER is acidload's own. A new or\n"
    "                 empty folder, or a results folder of an earlier run, is written; any other\n"
    "                 folder, one holding files acidload did not write, and the case's own folder\n"
    "                 are refused (exit code 3) and left as they were. Written to a new folder and\n"
    "                 swapped in: a failed, interrupted or killed run leaves the previous result.\n"
    "                 For a fleet: FOLDER/fleet-summary.json and fleet-summary.csv (one row per case\n"
    "                 and variant) and NAME.summary.json and NAME.trajectories.csv per case (NAME: the\n"
    "                 case file's name), all in the one folder, swapped in whole.\n"
    "  --summary-csv FILE  also write the comparison table as CSV: one row per variant and charge\n"
    "                 (charges numbered from 1), units in the header; written atomically (one CASE).\n"
    "  --threads N    threads for a fleet or a site's engines (default: one per core)\n\n"
    "A site file (a 'site' section: engines sharing one gas supply and one scrubbing train) runs alone:\n"
    "a table per engine (gas share, H2S behind the train, oil changes, costs) and the site's train\n"
    "(changeouts, hours a bed, sulfur balance); --out FOLDER writes site.json, engines.csv and\n"
    "train.csv under the same rules.\n",
    run};

}  // namespace acidload_cli
