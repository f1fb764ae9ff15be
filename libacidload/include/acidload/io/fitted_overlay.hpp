#pragma once
// Fitted parameters written as an overlay (a case fragment, format version 1) that
// `acidload run --overlay` accepts, with each estimate's standard error as a comment.
#include <string>
#include <vector>

#include "acidload/studies/calibration.hpp"

namespace acidload::io {

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
