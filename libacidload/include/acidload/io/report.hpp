#pragma once
// The report: one self-contained HTML page (inline CSS and SVG, no scripts, no network) that a plant
// engineer hands to a manager, an insurer or the oil supplier, and the comparison table as CSV.
// Building the page is a pure function of its data (report_html); gathering the data runs the
// studies (gather_report); writing is atomic and never replaces a file acidload did not write.
#include <optional>
#include <string>
#include <string_view>
#include <vector>

#include "acidload/io/case_file.hpp"
#include "acidload/studies/calibration.hpp"
#include "acidload/studies/fit_band.hpp"
#include "acidload/studies/whatif.hpp"

namespace acidload::io {

//! SHA-256 of bytes as 64 lowercase hex digits (FIPS 180-4).
std::string sha256_hex(std::string_view bytes);

//! The first line of every acidload report starts with this; write_report replaces only files that do.
inline constexpr std::string_view report_signature = "<!DOCTYPE html><!-- acidload report";
//! The generator tag in the report's head.
inline constexpr std::string_view report_marker = "<meta name=\"generator\" content=\"acidload report\"/>";
//! The summary CSV's header starts with this; --summary-csv replaces only files that do.
inline constexpr std::string_view summary_csv_signature = "variant,charge,charge start [h],";

//! Where an input's value came from.
enum class Origin { given, variant, default_value, overlay, fitted };
std::string_view name(Origin o);  //!< "given", "variant", "default", "overlay", "fitted"

//! One input as the reader understood it.
struct InputRow {
  std::string key;    //!< case-file key path, "fuel.h2s"
  std::string label;  //!< plain words
  std::string value;  //!< with its unit, as resolved
  Origin origin = Origin::default_value;
  std::string from;   //!< the file that set it ("" for a default)
};

//! An input file of the report and its hash.
struct InputFile {
  std::string role;  //!< "case", "overlay", "lab", "record"
  std::string path;
  std::string sha256;  //!< "" when the file could not be read (then `note` says why)
  std::string note;
};

//! Drain interval against H2S for one variant.
struct H2sSweep {
  std::string variant;
  std::vector<double> h2s_ppmv, interval_h;  //!< [ppmv dry], [h] (the planned maximum where no limit is reached)
  double own_h2s_ppmv = 0, own_interval_h = 0;  //!< the variant as it is
};

//! The lab part: readings, the fit (when it could be made) and the fitted curve with its band.
struct LabPart {
  std::string file;
  std::vector<LabSample> samples;
  std::vector<std::string> parameters;  //!< asked to fit
  std::optional<FitResult> fit;
  std::string refused;                  //!< why no fit, when it was refused
  std::optional<TrajectoryBand> band;   //!< of the fit, or the case's own curve (zero band) without one
  std::vector<double> charge_start_h;   //!< engine hours at which each charge of the record starts
};

//! Everything the page shows.
struct ReportData {
  std::string title, case_file, version, generated;  //!< generated: date and time as text (UTC)
  bool invented = false;                 //!< the case file says its data are invented
  std::vector<std::string> variant_names;
  std::vector<BaseNumberMethod> tbn_methods;  //!< per variant: the method its TBN limit is judged by
  std::vector<VariantSummary> rows;
  std::vector<InputRow> inputs;          //!< the base case
  std::vector<std::vector<InputRow>> variant_inputs;  //!< per variant after the base: what differs
  std::vector<InputFile> files;
  std::vector<H2sSweep> sweeps;
  std::optional<LabPart> lab;
  std::vector<VariantCosts> costs;       //!< per variant when the case has an economics section (else empty)
  std::vector<std::string> warnings;     //!< from the results and the fit, in plain words
  double tbn_share_limit = 0.5;          //!< for labels
};

//! The inputs of one variant as understood, each marked with its origin.
std::vector<InputRow> input_rows(const CaseFile& c, std::size_t variant);
//! Warnings drawn from the results (free strong acid, crossover, no limit within the record …).
std::vector<std::string> result_warnings(const CaseFile& c, const std::vector<VariantSummary>& rows);
//! Drain interval against H2S from 0 to `top_ppmv` in `points` steps for a variant: a fresh charge
//! under the operation of the record's first segment, held up to the planned maximum (events dropped).
H2sSweep h2s_sweep(const EngineCase& c, double top_ppmv, int points);

struct ReportOptions {
  std::string lab_file;                 //!< "" for none
  std::vector<std::string> parameters = {"model.liner-uptake", "model.oxidation-rate"};  //!< fitted with a lab file
  int sweep_points = 25;
  std::string generated;                //!< shown as the report's date; "" for now (UTC)
};

//! Runs what the page needs (the variants, the sweep, the fit) and hashes the input files.
ReportData gather_report(const CaseFile& c, const std::vector<VariantSummary>& rows, const ReportOptions& o);

//! The page as HTML text.
std::string report_html(const ReportData& d);

//! The comparison table as CSV: one row per variant and charge (charges numbered from 1), units in
//! the header, "" where a value does not exist (no limit reached).
std::string summary_csv(const CaseFile& c, const std::vector<VariantSummary>& rows);

//! Writes the page atomically by write_owned_file (results.hpp): an existing file is replaced only if
//! its first line carries report_signature, never one of `inputs` (the files the report read).
void write_report(const std::string& path, const std::string& html, const std::vector<std::string>& inputs = {});
//! Writes summary_csv's text the same way, replacing only a file whose header carries summary_csv_signature.
void write_summary_csv(const std::string& path, const std::string& csv, const std::vector<std::string>& inputs = {});
//! The files a report of `c` reads (the case file, overlays, record files, and `lab` unless empty).
std::vector<std::string> report_inputs(const CaseFile& c, const std::string& lab);

}  // namespace acidload::io
