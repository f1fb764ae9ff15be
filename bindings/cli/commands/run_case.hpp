#pragma once
// Running every variant of a case and printing the comparison: shared by `run` and `demo`.
#include <cstdio>
#include <string>

#include "acidload/io/case_file.hpp"

namespace acidload_cli {
//! Runs the variants (a progress line on a terminal), writes the results folder `out_folder` when
//! not empty (before printing: a failed write prints no table) and the comparison table as CSV to
//! `summary_csv` when not empty (atomically), prints the comparison to `out`.
int run_case(std::FILE* out, const acidload::io::CaseFile& c, const std::string& out_folder,
             const std::string& summary_csv = "");
}  // namespace acidload_cli
