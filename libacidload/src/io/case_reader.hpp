#pragma once
// The case reader's shared state and its section readers (internal to acidload::io; not installed).
// Every value is read through the key registry (keys.hpp): its kind, range and the message that
// names the key as written and its position. Each node keeps the document it came from, so a value
// merged in from an overlay or a variant is still reported at its own file, line and column.
#include <cstdint>
#include <initializer_list>
#include <map>
#include <memory>
#include <string>
#include <string_view>
#include <vector>

#include "acidload/io/case_file.hpp"
#include "acidload/io/document.hpp"
#include "acidload/io/key_checks.hpp"
#include "acidload/io/keys.hpp"
#include "acidload/io/quantity.hpp"
#include "acidload/io/suggestions.hpp"
#include "acidload/studies/operation.hpp"

namespace acidload::io::detail {

//! A value in the core unit snapped to the key's range ends it is within 1e-12 of (relative), and
//! whether it then lies in the range (Reader::value's check).
bool snapped_in_range(const CaseKey& k, double& v);

//! For the tests only: every CSV record row read by the generic reader (fill_row, read_segment), the
//! fast path left out, to compare the two (tests/unit/test_record_fast.cpp). Not set while loading.
extern bool csv_generic_rows_only;

struct Reader {
  std::vector<std::shared_ptr<Document>> docs;
  std::string base_dir;  //!< directory of the main case (relative file names in it resolve here)
  bool stream_records = false;  //!< a CSV record kept as its description (RecordReading::stream)
  //! Where each registry key of the variant being built was read: key path → node (for errors the
  //! core raises later, which name the same key paths).
  mutable std::map<std::string, const Node*, std::less<>> seen;

  const Document& doc(const Node& n) const { return *docs.at(static_cast<std::size_t>(n.source)); }
  //! The directory relative file names in this node's document resolve against.
  std::string dir_of(const Node& n) const;
  [[noreturn]] void fail(const Node& n, const std::string& value, const std::string& expected) const;
  //! The node a map holds for a registry key ("engine.blow-by" looks up "blow-by"), or nullptr.
  const Node* at(const Node& map, std::string_view path) const;
  //! Checks a section's keys against the registry.
  void require_section(const Node& n, std::string_view section) const;
  //! A quantity key's value in the core unit, range-checked against the registry.
  double value(const Node& n, const CaseKey& k) const;
  //! Reads `path` from `map` into `out` when present; returns whether it was.
  bool get(const Node& map, std::string_view path, double& out) const;
  //! A word key: one of the registry's words.
  std::string word(const Node& n, const CaseKey& k) const;
  std::string word(const Node& n, const std::vector<std::string>& allowed) const;
  bool flag(const Node& n) const { return word(n, {"true", "false"}) == "true"; }
  std::string text(const Node& n) const;
  //! A contaminant key's figure.
  Concentration contaminant(const Node& n, Basis basis) const;
  //! Rethrows an InputError of the core at the node its key was read from (or at `fallback`),
  //! with the key as the user wrote it and the registry's range in the unit they wrote.
  [[noreturn]] void relocate(const InputError& e, const Node& fallback, const Node* row = nullptr) const;
};

//! The base operation, as read from the engine section.
struct EngineInputs {
  ReferenceState reference = ReferenceState::normal();  //!< the case's, for m3 figures (set before reading)
  EngineRating rating;
  double power = 0;               //!< [W]
  Operation op;
  double oil_temperature = 273.15 + 88;
  double start_every = 0;         //!< h between starts, 0 = none
  double exhaust_temperature = 723.15;
  double catalyst_so3_conversion = -1;  //!< < 0: no oxidation catalyst
  FuelGasLimits fuel_gas_limits;
};

struct OilInputs {
  double volume = 0;  //!< [m³]
};

ReferenceState read_reference_state(const Reader& r, const Node* n);
CombustionReference read_combustion_reference(const Reader& r, const Node* n);
void read_fuel(const Reader& r, const Node& f, FuelAnalysis& a);
void read_engine(const Reader& r, const Node& e, EngineInputs& in);
//! `power`: the engine's [W], to turn an oil flow ("0.3 L/h") into a specific consumption.
void read_oil(const Reader& r, const Node& o, OilCharge& c, OilInputs& in, EngineRating& rating, double power);
void read_model(const Reader& r, const Node& m, ModelParameters& p, OilProperties& oil);
void read_limits(const Reader& r, const Node& l, LimitSettings& s);
void read_run(const Reader& r, const Node& run, double& horizon, RunOptions& o);
//! The gases resolved for a record's recent contaminant figures. Rows change only the analysis's
//! H2S, other sulfur, chlorine and fluorine, so within one variant's record equal figures resolve
//! to the same gas (resolve is a pure function); a miss only costs a resolve.
struct ResolvedGases {
  struct Entry {
    Concentration h2s, other_sulfur, chlorine, fluorine;
    FuelGas gas;
    bool used = false;
    std::uint64_t age = 0;  //!< when it was put in (the older of a slot pair is replaced)
  };
  std::vector<Entry> table = std::vector<Entry>(256);  //!< in pairs of slots (2i, 2i + 1)
  std::size_t last = 0;                                //!< the slot found or filled last
  std::uint64_t clock = 0;
  //! resolve(fuel), from the table when its four figures were resolved before (valid until the next call).
  const FuelGas& of(const FuelAnalysis& fuel);
};

//! One record row's changes over the previous segment (YAML map or CSV row made into nodes).
//! `resolved`: a table of gases for the record being read (each row's gas is resolved without it).
void read_segment(const Reader& r, const Node& row, Segment& s, const EngineInputs& eng, const OilCharge& ch,
                  FuelAnalysis& fuel, double& power, ResolvedGases* resolved = nullptr);
UncertaintySettings read_uncertainty(const Reader& r, const Node& u);
//! The `lab` section (case_lab.cpp).
LabSettings read_lab(const Reader& r, const Node& lab);
//! Refuses, at its line, an alarm level of the `lab` section past one of `limits` (alarm_levels()).
void check_lab_levels(const Reader& r, const Node& lab, const LabSettings& s, const LimitSettings& limits);
//! The `scrubbing` section: its stages in gas-flow order (case_economics.cpp); `step` [h] if given.
std::vector<TrainStage> read_scrubbing(const Reader& r, const Node& s, double& step);
//! The `economics` section into a cost case's prices and settings (case_economics.cpp).
void read_economics(const Reader& r, const Node& e, CostCase& c, double& sensitivity_step);

//! Merges a layer (overlay or variant) over a case tree: maps merge key by key, anything else
//! replaces; a key of an either-or pair (registry `alternative`) removes its partner. `section` is
//! the registry section of `into` ("" at the top).
void merge_layer(Node& into, const Node& from, const std::string& section = "");
//! One variant's EngineCase from its merged tree (case_file.cpp).
EngineCase build_engine_case(Reader& r, const Node& root, const std::string& name);
//! A CSV file's rows as map nodes of `section`'s keys, paths "path[i]" (case_file.cpp).
std::vector<Node> csv_rows(Reader& r, const Node& file_node, const char* section, const std::string& path);
//! The file's `format-version`, checked (case_file.cpp).
int format_version(const Reader& r, const Node& root);
//! A map without the named keys.
Node without(const Node& n, std::initializer_list<const char*> keys);
//! Rethrows a train's refusal (a changeout level the fresh bed cannot hold) at the stage's key.
[[noreturn]] void train_error(const Reader& r, const Node& scrubbing, const InputError& e);
//! Marks every node of a tree as coming from document `source`.
void set_source(Node& n, int source);

}  // namespace acidload::io::detail
