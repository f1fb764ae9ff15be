#pragma once
// Result files of a run: trajectories as CSV and a summary as JSON, written atomically into an
// output folder (a failed run leaves an existing folder as it was).
#include <string>
#include <vector>

#include "acidload/io/case_file.hpp"
#include "acidload/io/economics_results.hpp"
#include "acidload/studies/whatif.hpp"

namespace acidload::io {

//! The summary as JSON text: every figure of the comparison table, units in the key names; with
//! `economics`, its block under "economics" (economics_results.hpp).
std::string summary_json(const CaseFile& c, const std::vector<VariantSummary>& rows,
                         const EconomicsResults* economics = nullptr);
//! The trajectories of every variant as CSV text (one row per trajectory point).
std::string trajectories_csv(const std::vector<VariantSummary>& rows);

//! One case of a fleet run: its file, the name its result files carry in the fleet's folder
//! (`STEM.summary.json`, `STEM.trajectories.csv`) and its variants' summaries.
struct FleetCase {
  const CaseFile* file = nullptr;
  std::string stem;
  std::vector<VariantSummary> rows;
};
//! The fleet summary as JSON: per case its file, title, result files and, per variant, the drain
//! interval, the limit that ends it and the readings there (units in the key names).
std::string fleet_summary_json(const std::vector<FleetCase>& cases);
//! The same as CSV: one row per case and variant, units in the header.
std::string fleet_summary_csv(const std::vector<FleetCase>& cases);

//! Writes summary.json and trajectories.csv into the results folder `folder` (write_results_folder:
//! the case file and its overlays are the run's inputs).
void write_results(const std::string& folder, const CaseFile& c, const std::vector<VariantSummary>& rows,
                   const EconomicsResults* economics = nullptr);

//! The marker file inside every results folder: it says the folder is acidload's and lists the
//! files acidload wrote there.
inline constexpr const char* results_marker = ".acidload-results";

//! One file of a results folder: a plain name (no '/') and its text.
struct ResultFile {
  std::string name, text;
};

//! Writes `files` as the folder `folder`, which is acidload's own (results_marker inside):
//! - a new folder, an empty one, or a results folder holding only what acidload wrote there is
//!   replaced whole; any other existing folder or file is refused (acidload::Error) and left as it
//!   was, as is a folder holding one of `inputs` (the files the run read) or the folder one of them
//!   is in;
//! - the files are written into a temporary sibling (.acidload-tmp-PID-N) and swapped in with one
//!   atomic exchange (renameat2 RENAME_EXCHANGE; two renames where the file system lacks it), so a
//!   reader, a failure or a kill leaves either the old folder or the new one; SIGINT, SIGTERM,
//!   SIGHUP and SIGQUIT are held back while the temporary exists; temporaries of a killed writer
//!   are removed by the next write into the same parent folder;
//! - writers into one parent folder take turns (flock on the parent; a wait over 120 s is refused);
//! - a symbolic link as `folder` is written through (the link is kept); trailing '/', '.' and '..'
//!   are resolved first; a name over 255 bytes is refused.
void write_results_folder(const std::string& folder, const std::vector<ResultFile>& files,
                          const std::vector<std::string>& inputs);

//! Writes one file atomically (a temporary sibling renamed into place, under the same lock and
//! signal rules). Refused (acidload::Error, the file left as it was): a path that is one of `inputs`
//! (the same file by any name), a folder or other non-regular file, and an existing file whose
//! first line does not start with `signature` (a file acidload did not write). A symbolic link is
//! written through.
void write_owned_file(const std::string& path, const std::string& text, const std::string& signature,
                      const std::vector<std::string>& inputs);

}  // namespace acidload::io
