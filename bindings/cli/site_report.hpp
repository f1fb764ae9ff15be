#pragma once
// A site file through the program: `run`, `costs` and `check` of a file with a `site` section
// (docs/case-format.md, "Sites"): the per-engine and per-site tables and the results folder.
#include <cstdio>
#include <string>

namespace acidload_cli {
//! Runs the site, writes `out_folder` (site.json, engines.csv, train.csv) when not empty, prints the
//! engines' and the site's tables; `costs`: the cost items of every engine as well. The engines run
//! on `threads` threads (0: one per core).
int run_site_file(std::FILE* out, const std::string& file, const std::string& out_folder, bool costs, int threads = 0);
//! Reads the site and prints what was read.
int check_site_file(std::FILE* out, const std::string& file);
}  // namespace acidload_cli
