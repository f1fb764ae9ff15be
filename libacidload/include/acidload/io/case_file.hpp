#pragma once
// Case files: the versioned YAML description of an engine, its gas, its oil, the model's
// calibratable parameters, the limits, an operating record, and named variants to compare.
// The format is documented key by key in docs/case-format.md and as a JSON Schema in
// docs/case-format.schema.json.
#include <string>
#include <string_view>
#include <vector>

#include "acidload/studies/calibration.hpp"
#include "acidload/studies/monte_carlo.hpp"
#include "acidload/studies/whatif.hpp"

namespace acidload::io {

//! The newest format version this reader knows. Files of every older version keep loading.
inline constexpr int case_format_version = 1;

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
};

//! Reads a case file. Overlays (files of the same format holding any subset of its sections,
//! typically `model:` from a calibration) are merged over the base in order, before the variants.
//! Every mistake throws InputError naming the file, line, column, key, value and expectation.
CaseFile load_case(const std::string& path, const std::vector<std::string>& overlays = {});
//! The same from text; relative file names (a record CSV) resolve against `base_dir`.
CaseFile load_case_text(std::string_view text, const std::string& file_name, const std::string& base_dir,
                        const std::vector<std::string>& overlays = {});

//! The keys of each section, for the reference page and for tests.
const std::vector<std::string>& section_keys(std::string_view section);

}  // namespace acidload::io
