#pragma once
// Site files: one file for a site whose engines share one gas supply and one scrubbing train
// (docs/model.md §18.4). The file's `fuel`, `reference-state`, `combustion-reference` and
// `scrubbing` are the site's own; `site.gas-record` is the gas quality on the site's running-hours
// clock; every entry of `site.engines` is merged over the file's other sections (`engine`, `oil`,
// `model`, `limits`, `run`, `economics`) as a variant is merged over its base. The form is
// documented in docs/case-format.md ("Sites").
#include <string>
#include <string_view>
#include <vector>

#include "acidload/studies/site.hpp"

namespace acidload::io {

//! Caps on a site's work (docs/case-format.md, "Limits on work").
inline constexpr std::size_t max_site_engines = 1000;

//! A loaded site file.
struct SiteFile {
  std::string file;                     //!< path as given
  std::string title;                    //!< the `case` key (or the site's name)
  int format_version = 1;
  SiteCase site;                        //!< engines (raw gas behind no train), the shared train and prices
  std::vector<double> gas_hours;        //!< the gas record's stretches [h] (empty: the `fuel` gas throughout)
  std::vector<FuelGas> gas;             //!< the raw gas of each stretch
  bool priced = false;                  //!< the file has an `economics` section
  std::string currency;                 //!< the site's `economics.currency`
};

//! True when the file's top level holds `site` (a quick look: the file is parsed, nothing is read).
bool is_site_file(const std::string& path);
//! Reads a site file. Every key is read through the registry; every mistake throws InputError with
//! the file, line, column, key as written, value and expectation.
SiteFile load_site(const std::string& path);
//! The same from text; relative file names resolve against `base_dir`.
SiteFile load_site_text(std::string_view text, const std::string& file_name, const std::string& base_dir);

//! Each engine's record laid on the gas record: engine running hour t meets the gas of the site
//! clock's hour t (the limitation documented in docs/case-format.md, "Sites"); a segment crossing
//! a gas change is split there (starts and calendar time in proportion, events on the first piece).
//! Throws InputError (key `key`) when a record runs past the gas record's end.
std::vector<Segment> on_gas_record(const std::vector<Segment>& record, const std::vector<double>& gas_hours,
                                   const std::vector<FuelGas>& gas, const std::string& key);

//! The site's results as JSON (site.json; the layout is in docs/case-format.md, "Site results").
std::string site_json(const SiteFile& f, const SiteResult& r);
//! One row per engine (engines.csv), units in the header.
std::string site_engines_csv(const SiteResult& r);
//! One row per stage of the shared train (train.csv), units in the header.
std::string site_train_csv(const SiteFile& f, const SiteResult& r);

}  // namespace acidload::io
