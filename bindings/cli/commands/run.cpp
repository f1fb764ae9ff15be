// acidload run CASE: run every variant, print the comparison, optionally write a results folder.
#include "../cli.hpp"
#include "../report.hpp"
#include "run_case.hpp"

namespace acidload_cli {
namespace {

struct RunOptions {
  std::string case_file, out, summary_csv;
  std::vector<std::string> overlays;
};

RunOptions parse(const std::vector<std::string>& args) {
  RunOptions o;
  Options("run")
      .positional("CASE", o.case_file)
      .values("--overlay", o.overlays, "FILE")
      .value("--out", o.out, "FOLDER")
      .value("--summary-csv", o.summary_csv, "FILE")
      .parse(args);
  return o;
}

int run(const std::vector<std::string>& args, std::FILE* out) {
  const RunOptions o = parse(args);
  return run_case(out, acidload::io::load_case(o.case_file, o.overlays), o.out, o.summary_csv);
}

}  // namespace

extern const Command run_command{
    "run", "run CASE", "run a case and print the comparison of its variants (and write result files)",
    "usage: acidload run CASE [--overlay FILE]... [--out FOLDER] [--summary-csv FILE]\n\n"
    "Runs every variant of the case file CASE and prints a comparison: acid into the oil by species,\n"
    "the initial TBN fall, the drain interval and the limit that ends it (or 'not reached'), TBN, TAN\n"
    "and SAN there, and the exhaust sulfuric-acid dew point.\n\n"
    "  --out FOLDER   also write FOLDER/summary.json (every figure, units in the key names) and\n"
    "                 FOLDER/trajectories.csv (TBN, TAN, SAN, oxidation, nitration against hours per\n"
    "                 variant), and a .acidload-results marker: FOLDER is acidload's own. A new or\n"
    "                 empty folder, or a results folder of an earlier run, is written; any other\n"
    "                 folder, one holding files acidload did not write, and the case's own folder\n"
    "                 are refused (exit code 3) and left as they were. Written to a new folder and\n"
    "                 swapped in: a failed, interrupted or killed run leaves the previous result.\n"
    "  --summary-csv FILE  also write the comparison table as CSV: one row per variant and charge\n"
    "                 (charges numbered from 1), units in the header; written atomically.\n",
    run};

}  // namespace acidload_cli
