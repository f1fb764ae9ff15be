#pragma once
// Case files: the versioned YAML description of an engine, its gas, its oil, the model's
// calibratable parameters, the limits, an operating record, and named variants to compare.
// The format is documented key by key in docs/case-format.md and as a JSON Schema in
// docs/case-format.schema.json.
#include <map>
#include <string>
#include <string_view>
#include <vector>

#include "acidload/studies/calibration.hpp"
#include "acidload/studies/economics.hpp"
#include "acidload/studies/lab_settings.hpp"
#include "acidload/studies/monte_carlo.hpp"
#include "acidload/studies/whatif.hpp"
#include "acidload/io/keys.hpp"

namespace acidload::io {

//! The newest format version this reader knows. Files of every older version keep loading.
inline constexpr int case_format_version = 1;

//! Caps on the work one case may ask for, each refused up front with the key named (the reasons are
//! in docs/case-format.md, "Limits on work"). Within them a run of one variant stays within about
//! ten seconds of one core and a few hundred MB.
inline constexpr double max_trajectory_points = 1e6;  //!< simulated hours ÷ output interval, per variant (~140 MB)
inline constexpr double max_detection_steps = 5e6;    //!< simulated hours ÷ detection step, per variant
inline constexpr double max_simulated_hours = 1e7;    //!< a record's running hours (1140 years)
inline constexpr std::size_t max_record_rows = 1000000;     //!< segments of one record held in memory (~370 MB)
//! Segments of one record streamed from its CSV file (RecordReading::stream): none are held, so
//! only time bounds it (each row is read once when loading and once per run: about a minute each
//! at the rates in DEVELOPERS.md), besides the running-hours cap below.
//! The same bounds the rows of streamed records over all variants of a case (each reads its own).
inline constexpr std::size_t max_streamed_record_rows = 100000000;
//! Bytes of a record CSV file (2 GiB − 1: every line number fits a 32-bit count).
inline constexpr std::size_t max_record_file_bytes = (std::size_t{1} << 31) - 1;
inline constexpr std::size_t max_variants = 10000;          //!< variants of one case
inline constexpr std::size_t max_segments_in_all = 2000000; //!< record segments over all variants (~600 MB)

//! The `uncertainty` section: inputs for Monte Carlo and its settings.
struct UncertaintySettings {
  std::vector<UncertainInput> inputs;  //!< empty when the case has no such section
  int draws = 10000;                   //!< [-]
  std::uint64_t seed = 1;              //!< the counter-based stream's seed
};

//! A loaded case: the base and its variants, each a complete EngineCase.
struct CaseFile {
  std::string file;                    //!< path as given
  std::string title;                   //!< the `case` key
  std::vector<EngineCase> variants;    //!< [0] is the base case (named "base" unless `base-name` says otherwise)
  std::vector<std::string> overlays;   //!< overlay files applied, in order
  int format_version = case_format_version;  //!< as written in the file
  UncertaintySettings uncertainty;           //!< the `uncertainty` section, if any
  LabSettings lab;                           //!< the `lab` section: precision, per-lab settings, alarm levels
  //! One per variant, in order, when the case has an `economics` section (else empty): the variant's
  //! raw-gas engine case, its scrubbing train and the prices. (`variants` hold the gas behind the train.)
  std::vector<CostCase> costs;
  double sensitivity_step = 0.2;  //!< `economics.sensitivity-step`: each price moved by this share [-]
  //! Per variant (parallel to `variants`): each "section.key" the files set ("fuel.h2s", "oil.volume")
  //! and the file that set it last (the case file or an overlay); a key not listed took its default.
  std::vector<std::map<std::string, std::string>> key_sources;
  //! Per variant: the "section.key"s its own entry under `variants` sets (empty for the base).
  std::vector<std::vector<std::string>> variant_keys;
};

//! How a CSV record file (`record: file:`) is kept. `hold`: read into each variant's segments
//! (EngineCase::record), as every study needs them (at most max_record_rows). `stream`: every row
//! checked in one pass when loading, as with `hold`, and the case keeps only the file's description
//! (EngineCase::streamed: path, columns, row count, hours, first segment, size, time and digest);
//! each run reads the file again segment by segment (refused if the file changed since), so memory
//! does not grow with the record (at most max_streamed_record_rows). A variant with a scrubbing train
//! or prices holds its segments either way. `acidload check`, `acidload run` and Python stream.
enum class RecordReading { hold, stream };

//! Reads a case file. Every key is read through the registry (keys.hpp). Overlays (files of the same format holding any subset of its sections,
//! typically `model:` from a calibration) are merged over the base in order, before the variants;
//! a relative record file in an overlay resolves next to the overlay.
//! Every mistake throws InputError naming the file, line, column, key, value and expectation.
CaseFile load_case(const std::string& path, const std::vector<std::string>& overlays = {},
                   RecordReading records = RecordReading::hold);
//! The same from text; relative file names (a record CSV) resolve against `base_dir`.
CaseFile load_case_text(std::string_view text, const std::string& file_name, const std::string& base_dir,
                        const std::vector<std::string>& overlays = {}, RecordReading records = RecordReading::hold);

//! Every variant with its streamed record read into segments (for studies that index them), each
//! record at most max_record_rows segments (refused otherwise, naming the record).
CaseFile held_records(const CaseFile& c);

}  // namespace acidload::io
