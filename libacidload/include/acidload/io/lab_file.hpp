#pragma once
// Lab results as a CSV file, the uncertainty section of a case, and fitted parameters written
// as an overlay that `acidload run --overlay` accepts.
//
// Lab CSV columns (names ours; a header "tbn [mg KOH/g]" gives bare cells that unit):
//   charge        which oil charge of the case's record, 1 = the first      (required)
//   oil-hours     hours on that charge when sampled, e.g. 400 or "400 h"    (required)
//   engine-hours, date   kept for the reader's eye; not used by the fit
//   lab           the laboratory: a change between samples is flagged
//   tbn, tbn-method   base number [mg KOH/g] and its method (D2896 or D4739; default D4739)
//   tan           acid number, D664 [mg KOH/g]
//   san           strong acid number [mg KOH/g]; "<0.1" or "0" is censored (below 0.1, or below
//                 the figure after '<'), not an exact zero
//   i-ph          initial pH (ASTM D7946): read and reported, not modelled
//   oxidation, nitration   FTIR [A/cm] or [A/0.1mm]: the unit must be stated in the header or in
//                 an ftir-unit column (1 A/0.1mm = 100 A/cm: ask the lab)
#include <string>
#include <vector>

#include "acidload/io/case_file.hpp"
#include "acidload/studies/calibration.hpp"

namespace acidload::io {

//! Reads lab samples; every mistake names the file, line, column, the column and the cell.
std::vector<LabSample> read_lab_samples(const std::string& path);

//! How an overlay acidload wrote begins (its first line, followed by the version).
inline constexpr const char* overlay_signature = "# Fitted by acidload ";
//! The fitted parameters as overlay text (format version 1), in case-file units.
std::string overlay_text(const FitResult& fit, const std::string& case_file, const std::string& lab_file);
//! Writes the overlay atomically (io::write_owned_file): refused for the case, the lab file and
//! `other_inputs` (overlays, any file the command read), and for an existing file that is not an
//! overlay acidload wrote.
void write_overlay(const std::string& path, const FitResult& fit, const std::string& case_file,
                   const std::string& lab_file, const std::vector<std::string>& other_inputs = {});

}  // namespace acidload::io
