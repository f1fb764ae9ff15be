#pragma once
// The registry of case keys: one row per key of the case format, as the user writes it. The case
// reader takes each key's kind, range and alternatives from here; the allowed keys of every section,
// the parameter names of fit and uncertainty, the key tables of docs/case-format.md and the checks
// of docs/case-format.schema.json are derived from it (tests fail when they disagree).
// How to add a key: DEVELOPERS.md, "Adding a case key".
#include <string>
#include <string_view>
#include <vector>

#include "acidload/io/quantity.hpp"

namespace acidload::io {

//! What a key holds.
enum class KeyType {
  quantity,     //!< "<number> <unit>" of `kind`, checked against [low, high]
  contaminant,  //!< a contaminant figure (quantity.hpp, concentration())
  word,         //!< one of `words`
  flag,         //!< true or false
  text,         //!< free text (a title, a name, a file name)
  section,      //!< a map of further keys (the section named by the key)
  list,         //!< a list (of segments, variants, inputs, limit names)
  map,          //!< a map of names the section reader knows (gas components, halocarbons)
  special,      //!< read by its section reader with its own syntax (NOx, event amounts, format version)
};

//! One key of the case format.
struct CaseKey {
  std::string path;          //!< "engine.blow-by": section and key as written ("format-version" at top level; segment keys as "segment.h2s")
  KeyType type = KeyType::quantity;
  Kind kind = Kind::number;  //!< for quantities
  double low = 0, high = 0;  //!< accepted range in the core unit (core.hpp), both ends included unless `low_open`
  bool low_open = false;     //!< the low end itself is refused (a scale that must be > 0)
  std::string unit;          //!< the unit in which docs and messages write the range and default, e.g. "degC", "%", "kW"
  std::string default_text;  //!< as docs show it; "required" or "–" where there is none
  std::string doc;           //!< one line: what it is
  bool calibratable = false; //!< fit and uncertainty may vary it (studies/parameters.hpp)
  //! Calibratable keys: the fit's weak prior, one standard deviation in fit space (prior_space: "log",
  //! "logit", "logit of the range") around the case's value, and its basis; the fit's range in the
  //! parameter's core unit (fit_range). From the parameter's row (studies/parameters.cpp).
  double prior_sd = 0;
  std::string prior_space, prior_basis, fit_range, fit_unit;
  std::string field;         //!< the field it sets, e.g. "Operation::blowby_share"
  std::string alternative;   //!< the other key of an either-or pair: a variant or overlay setting this one drops that one
  std::vector<std::string> words;  //!< for words
  bool layer = false;        //!< top-level sections only: may appear in overlays and variants
  //! The section ("engine", "" for top level) and the key ("blow-by").
  std::string section() const;
  std::string key() const;
  //! "from 0 to 10 %" in `unit_written` (one of the kind's units) or else in `unit`.
  std::string range_text(std::string_view unit_written = {}) const;
  //! True when a value in the core unit lies in the range.
  bool in_range(double core_value) const;
};

//! Every key, in the order of docs/case-format.md.
const std::vector<CaseKey>& case_keys();
//! The key at a path, or nullptr.
const CaseKey* find_case_key(std::string_view path);
//! The key at a path; throws InputError listing the section's keys when there is none.
const CaseKey& case_key(std::string_view path);
//! The keys of a section as written ("" top level, "segment", "uncertain-input", "overlay" and
//! "variant" for the keys a layer may hold), for the reader's unknown-key check.
const std::vector<std::string>& section_keys(std::string_view section);
//! The keys fit and uncertainty may vary, as "section.key".
const std::vector<std::string>& calibratable_keys();
//! The snake-case name of a kind as the schema's $defs use it ("temperature_change").
std::string_view kind_id(Kind k);

}  // namespace acidload::io
