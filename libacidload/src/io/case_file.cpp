// Loading a case: the main file, its overlays and variants merged (case_merge.cpp), each variant
// built from its sections (case_sections.cpp) into an EngineCase, and a record read from YAML or
// CSV. Keys, kinds and ranges come from the registry (keys.cpp).
#include "acidload/io/case_file.hpp"

#include <algorithm>
#include <array>
#include <cmath>
#include <cstdint>
#include <iterator>
#include <cstring>
#include <filesystem>
#include <functional>
#include <map>
#include <exception>
#include <memory>
#include <optional>
#include <set>

#include "acidload/core/error.hpp"
#include "acidload/core/version.hpp"
#include "acidload/io/csv.hpp"
#include "case_reader.hpp"
#include "csv_stream.hpp"
#include "file_read.hpp"
#include "text.hpp"

namespace acidload::io {

namespace {
using detail::EngineInputs;
using detail::ResolvedGases;
using detail::OilInputs;
using detail::describe;
using detail::Reader;

// A CSV record as a list of segment nodes; header "name [unit]" gives bare cells a unit. A relative
// file name resolves next to the file that names it (the case, or the overlay or variant's file).
std::vector<Node> csv_rows_of(Reader& r, const Node& file_node, const char* section, const std::string& path) {
  namespace fs = std::filesystem;
  fs::path p = r.text(file_node);
  if (p.is_relative()) p = fs::path(r.dir_of(file_node)) / p;
  CsvTable t;
  try {
    t = read_csv(p.string());
  } catch (const InputError& e) {
    if (e.where().line > 0) throw;
    r.fail(file_node, file_node.scalar, "a readable CSV file (" + e.expected() + ")");
  }
  auto d = std::make_shared<Document>();
  d->file = t.file;
  d->lines = t.text;
  const int source = static_cast<int>(r.docs.size());
  r.docs.push_back(d);
  const NamedColumns cols = named_columns(t, section_keys(section), path + " column");
  std::vector<Node> out;
  for (std::size_t i = 0; i < t.rows.size(); ++i) {
    Node row;
    row.type = Node::Type::map;
    row.mark = {t.lines[i], 1};
    row.path = path + "[" + std::to_string(i) + "]";
    row.source = source;
    for (std::size_t c = 0; c < t.header.size(); ++c) {
      if (t.rows[i][c].empty()) continue;
      Node v = cell_node(t, i, c, cols.names[c], cols.units[c], path);
      v.source = source;
      row.entries.emplace_back(cols.names[c], v);
      row.key_marks.push_back(v.mark);
    }
    out.push_back(std::move(row));
  }
  return out;
}

// A record CSV read row by row into segments (the record of `acidload run`, `check` and Python):
// one map node is filled per row, reused for the next, and no copy of the file's lines is kept —
// only a window document holding the current row's line for a caret — and the file is read in
// pieces of about 1 MB. Every check is the reader's own (read_segment on that node), so values,
// messages and positions are those of a tree of the whole file; a mistake in the file's form is
// found first, wherever it is, as read_csv finds it (a pass over the file before any value is read).
struct CsvRecord {
  std::string file;                  //!< its path, as resolved
  detail::CsvFileFacts facts;        //!< size, time and digest when it was read
  NamedColumns cols;
  std::size_t rows = 0;              //!< data rows
  int source = 0;                    //!< the window document's index in the reader's documents
  std::shared_ptr<Document> window;  //!< the current row's line; its root is the row node
};

std::shared_ptr<Document> new_window(const std::string& file, std::size_t columns) {
  auto w = std::make_shared<Document>();
  w->file = file;
  w->lines.assign(1, std::string());
  w->root.entries.reserve(columns);  // never moves: the reader's `seen` points into it
  w->root.key_marks.reserve(columns);
  return w;
}

CsvRecord open_csv_record(Reader& r, const Node& file_node) {
  namespace fs = std::filesystem;
  fs::path p = r.text(file_node);
  if (p.is_relative()) p = fs::path(r.dir_of(file_node)) / p;
  CsvRecord rec;
  rec.file = p.string();
  CsvTable header;
  try {
    rec.facts = detail::scan_csv_file(rec.file, max_record_file_bytes);
    const detail::CsvRowSink count = [](const std::vector<std::string>&, const std::vector<int>&, int, std::string_view) {};
    rec.rows = detail::stream_csv_file(rec.file, rec.facts, header, count, true);  // the form pass: no cells made
  } catch (const InputError& e) {
    if (e.where().line > 0) throw;
    r.fail(file_node, file_node.scalar, "a readable CSV file (" + e.expected() + ")");
  }
  rec.cols = named_columns(header, section_keys("segment"), "record column");
  rec.window = new_window(header.file, rec.cols.names.size());
  rec.source = static_cast<int>(r.docs.size());
  r.docs.push_back(rec.window);
  return rec;
}

// Fills the record's row node with data row `i` (as csv_rows_of builds it) and shows its line.
const Node& fill_row(Document& d, const NamedColumns& cols, int source, std::size_t i, const std::vector<std::string>& cells,
                     const std::vector<int>& columns, int line, std::string_view line_text) {
  d.first_line = line;
  d.lines[0].assign(line_text);
  Node& row = d.root;
  row.type = Node::Type::map;
  row.mark = {line, 1};
  row.path.assign("record[").append(std::to_string(i)).append("]");
  row.source = source;
  std::size_t k = 0;
  for (std::size_t c = 0; c < cells.size(); ++c) {
    if (cells[c].empty()) continue;
    if (k == row.entries.size()) {
      row.entries.emplace_back();
      row.key_marks.emplace_back();
    }
    auto& [name, v] = row.entries[k];
    name = cols.names[c];
    v.type = Node::Type::scalar;
    detail::cell_scalar(cells[c], cols.units[c], v.scalar);
    v.mark = {line, columns[c]};
    v.path.assign(row.path).append(".").append(name);
    v.source = source;
    row.key_marks[k] = v.mark;
    ++k;
  }
  row.entries.resize(k);
  row.key_marks.resize(k);
  return row;
}


// Row `i` of the record again (for a refusal found after the rows were read).
const Node& csv_row_at(CsvRecord& rec, std::size_t i) {
  std::size_t n = 0;
  CsvTable header;
  const Node* found = nullptr;
  const detail::CsvRowSink sink = [&](const std::vector<std::string>& c, const std::vector<int>& cols, int l,
                                      std::string_view t) {
    if (n++ == i) found = &fill_row(*rec.window, rec.cols, rec.source, i, c, cols, l, t);
  };
  detail::CsvFileReader reader(rec.file, rec.facts, header, sink);
  while (!found && reader.next()) {
  }
  return *found;
}

// What one record row needs to become a segment: the variant's engine, oil and gas before the
// record, and the reader (for its checks and messages).
struct RowContext {
  EngineInputs eng;
  OilCharge charge;
  FuelAnalysis fuel;  //!< the gas analysis; each row's figures change it for the rows after
  double power = 0;   //!< [W], likewise
};

// Record row `row` as a segment: the previous one with the row's changes.
Segment next_segment(const Reader& r, const Node& row, const Segment& prev, RowContext& x, ResolvedGases& gases) {
  Segment s = prev;  // each segment carries the last values forward
  s.events.clear();
  s.calendar_hours = -1;
  s.starts = 0;
  try {
    detail::read_segment(r, row, s, x.eng, x.charge, x.fuel, x.power, &gases);
  } catch (const InputError& e) {
    if (e.where().line > 0) throw;
    r.relocate(e, row, &row);
  }
  if (!row.find("starts") && x.eng.start_every > 0) s.starts = s.hours / x.eng.start_every;
  return s;
}

// The fast path for a CSV record's rows: the header's units resolved once per column (factor,
// offset, the contaminant's unit and basis), each cell read straight into the segment (a plain
// line's numbers from the line's own bytes, no cells made: line_values; other rows from their
// cells: cell_values), nothing allocated and no node filled, and a row repeating one made before
// taking that one's segment (FastRows::Made). It takes a row only when every cell is a plain
// number that the generic reader would take as it stands (in range, converted, the gas resolved,
// the power set); anything else — an empty cell, a unit or quotes in the cell, a value out of range,
// a refusal from the core — leaves the row to the generic reader (fill_row and next_segment), which
// then gives today's value or today's message at today's line and column. A column the fast path
// does not read (event, event-amount) leaves every row to the generic reader. Its segments are bit
// for bit the generic reader's (tested on generated rows, tests/unit/test_record_fast.cpp).
}  // namespace

bool detail::csv_generic_rows_only = false;

namespace {

struct FastColumn {
  enum class Field { hours, calendar_hours, starts, h2s, other_sulfur, chlorine, fluorine, power, load, jacket_water_out,
                     oil_temperature, coldest_crankcase_surface, blowby, excess_air_ratio };
  Field field = Field::hours;
  const CaseKey* key = nullptr;  //!< a quantity's registry key (null: a contaminant)
  double factor = 1, offset = 0;
  ConcentrationUnit unit = ConcentrationUnit::ppmv;  //!< a contaminant's
  bool basis_given = false;
  Basis basis = Basis::dry;
};

struct FastRows {
  bool usable = false;
  std::vector<FastColumn> cols;
  std::vector<double> values;  //!< per column, the row being read: its numbers as written
  std::vector<double> core;    //!< and in core units, range-checked
  bool seen_set = false;       //!< the reader's `seen` points where the last fast row's cells would be
  //! set_power's outcome (the four fields it sets, studies/operation.cpp) for a gas and a power: the
  //! gas by its entry in the record's ResolvedGases (its `age`, never reused), 0 for a gas not known
  //! to the table. Two ways of 32 slots; a miss calls set_power.
  struct Powered {
    std::uint64_t gas = 0;
    double power = 0;
    double fuel_flow = 0, electrical_power = 0, load = 0, oil_consumption = 0;
  };
  std::vector<Powered> powered = std::vector<Powered>(64);
  std::uint64_t gas = 0;  //!< the gas of the segment last made by the fast path (0: unknown)
  unsigned flip = 0;
  //! Rows made before, by their numbers as written: within one generation (the stretch of rows since the last
  //! row the generic reader made, or since the record's start) a fast row's segment, and what it
  //! leaves in the row context, depend on its values alone — every column is set by every fast row
  //! and everything else is carried unchanged from the segment the generation started from — so a
  //! row whose values have the same bits as one made before in the same generation gets that one's
  //! segment (the same bits the fast path would compute again) and, when that state passed the
  //! operation checks, is not checked again. 128 pairs of slots (two ways); a miss makes the row. (As
  //! the columns stand, a generic row changes nothing the next fast row does not set again, so the
  //! generation is a safeguard for whatever a later column may carry.)
  struct Made {
    std::uint64_t generation = 0;  //!< 0: empty
    std::array<double, 16> values{};
    Segment segment;
    Concentration conc[4];  //!< the context's H2S, other sulfur, chlorine and fluorine after it
    double power = 0;       //!< the context's power after it
    std::uint64_t gas = 0;  //!< `gas` after it
    bool checked = false;   //!< its state passed the operation checks
    Made* next = nullptr;   //!< the entry of the row that followed it last time (a guess, compared in full)
  };
  std::vector<Made> made;
  std::uint64_t generation = 1;
  Made* last_made = nullptr;  //!< the entry of the row made last (null: the row was not kept)
  Made* previous = nullptr;   //!< last_made before the row being made
  unsigned made_flip = 0;
  Segment scratch;  //!< a row being made
};

FastRows fast_rows(const NamedColumns& cols, const EngineInputs& eng) {
  using F = FastColumn::Field;
  static const std::pair<const char*, F> fields[] = {
      {"hours", F::hours}, {"calendar-hours", F::calendar_hours}, {"starts", F::starts}, {"h2s", F::h2s},
      {"other-sulfur", F::other_sulfur}, {"chlorine", F::chlorine}, {"fluorine", F::fluorine}, {"power", F::power},
      {"load", F::load}, {"jacket-water-out", F::jacket_water_out}, {"oil-temperature", F::oil_temperature},
      {"coldest-crankcase-surface", F::coldest_crankcase_surface}, {"blow-by", F::blowby},
      {"excess-air-ratio", F::excess_air_ratio}};
  FastRows f;
  bool hours = false, power = false, load = false;
  for (std::size_t c = 0; c < cols.names.size(); ++c) {
    const std::string& name = cols.names[c];
    FastColumn fc;
    bool known = false;
    for (const auto& [n, field] : fields)
      if (name == n) fc.field = field, known = true;
    if (!known) return f;  // event, event-amount: the generic reader's
    const CaseKey& k = case_key("segment." + name);
    if (k.type == KeyType::quantity) {
      fc.key = &k;
      if (!detail::unit_conversion(k.kind, cols.units[c], fc.factor, fc.offset)) return f;
    } else if (k.type == KeyType::contaminant) {
      // the header's unit as the reader takes it, on the figure 1 (the factor exactly), its basis
      // told apart from the default by reading it with either default
      Document none;
      Node one;
      one.type = Node::Type::scalar;
      one.scalar = "1 " + cols.units[c];
      one.path = "record[0]." + name;
      try {
        const Concentration dry = concentration(none, one, Basis::dry), wet = concentration(none, one, Basis::wet);
        fc.factor = dry.value;
        fc.unit = dry.unit;
        fc.basis_given = dry.basis == wet.basis;
        fc.basis = dry.basis;
      } catch (const InputError&) {
        return f;
      }
    } else {
      return f;
    }
    hours = hours || fc.field == F::hours;
    power = power || fc.field == F::power;
    load = load || fc.field == F::load;
    f.cols.push_back(fc);
  }
  // no hours, both power and load, or a power change where the engine's fuel flow is fixed: refused
  // on every row, by the generic reader
  if (!hours || (power && load) || ((power || load) && eng.rating.fixed_fuel_flow > 0)) return f;
  f.values.resize(f.cols.size());
  f.core.resize(f.cols.size());
  f.made.resize(256);  // a power of two (made_before)
  f.usable = true;
  return f;
}

// A cell's number `v` (as written) in the column's core unit, checked against its key's range (a
// contaminant: not negative); false where the generic reader would refuse it.
bool column_value(const FastColumn& fc, double& v) {
  if (fc.key) return detail::converted(fc.key->kind, v, fc.factor, fc.offset, v) && detail::snapped_in_range(*fc.key, v);
  if (v < 0) return false;
  v *= fc.factor;
  return true;
}

// The row's cells as the fast path's numbers (f.values); false when it leaves the row to the generic reader.
bool cell_values(FastRows& f, const std::vector<std::string>& cells) {
  if (!f.usable || cells.size() != f.cols.size()) return false;
  for (std::size_t c = 0; c < cells.size(); ++c)
    if (!detail::plain_number(cells[c], f.values[c])) return false;
  return true;
}

// One cell of a plain line, from `p` to the next comma or the line's end (where `p` is left): its
// number as detail::plain_number reads it. A plain decimal of at most 15 digits ("85.0", "-3",
// "+12.75") is read here in one pass: its digits as an integer m (exact: below 2^53) over 10^f
// (exact for f <= 22), one IEEE division, rounded correctly as from_chars rounds, so the same bits;
// any other cell (an exponent, more digits, no digit before or after the point, anything but a
// number) goes to plain_number, which reads it or refuses it as the generic reader does.
bool cell_number(const char*& p, const char* e, double& out) {
  static const double tens[16] = {1e0, 1e1, 1e2, 1e3, 1e4, 1e5, 1e6, 1e7, 1e8, 1e9, 1e10, 1e11, 1e12, 1e13, 1e14, 1e15};
  const char* const start = p;
  const char* q = p;
  const bool negative = q < e && *q == '-';
  if (q < e && (*q == '-' || *q == '+')) ++q;
  std::uint64_t m = 0;
  const char* const first = q;
  while (q < e && static_cast<unsigned>(*q - '0') < 10) m = m * 10 + static_cast<unsigned>(*q++ - '0');
  bool plain = q > first;
  std::ptrdiff_t fraction = 0;
  if (plain && q < e && *q == '.') {
    const char* const point = ++q;
    while (q < e && static_cast<unsigned>(*q - '0') < 10) m = m * 10 + static_cast<unsigned>(*q++ - '0');
    fraction = q - point;
    plain = fraction > 0;
  }
  if (plain && (q == e || *q == ',') && (q - first) - (fraction > 0 ? 1 : 0) <= 15) {
    const double v = static_cast<double>(m) / tens[fraction];
    out = m == 0 ? 0.0 : negative ? -v : v;  // no negative zero, as plain_number
    p = q;
    return true;
  }
  const void* comma = std::memchr(start, ',', static_cast<std::size_t>(e - start));
  p = comma ? static_cast<const char*>(comma) : e;
  return detail::plain_number(std::string_view(start, static_cast<std::size_t>(p - start)), out);
}

// A plain line's cells as the fast path's numbers (f.values), read straight from its bytes; false
// when it leaves the row to the parser and the generic reader (a cell that is no plain number,
// quotes, spaces, the wrong number of cells).
bool line_values(FastRows& f, std::string_view line) {
  const char* p = line.data();
  const char* const e = p + line.size();
  const std::size_t n = f.cols.size();
  for (std::size_t c = 0; c < n; ++c) {
    if (c > 0) {
      if (p == e) return false;  // fewer cells than the header has
      ++p;                       // the comma
    }
    if (!cell_number(p, e, f.values[c])) return false;
  }
  return p == e;  // else more cells than the header has
}

// The row of numbers f.values as the segment after `prev`, or false (nothing changed) when the fast
// path leaves the row to the generic reader.
bool fast_segment(FastRows& f, const Segment& prev, RowContext& x, ResolvedGases& gases, Segment& s) {
  using F = FastColumn::Field;
  const std::size_t n = f.cols.size();
  for (std::size_t c = 0; c < n; ++c) {
    f.core[c] = f.values[c];
    if (!column_value(f.cols[c], f.core[c])) return false;
  }
  // the row's changes, in read_segment's order, on copies of what a refusal must leave as it was
  Concentration conc[4] = {x.fuel.h2s, x.fuel.other_sulfur, x.fuel.chlorine, x.fuel.fluorine};
  double power = x.power;
  bool fuel_changed = false, power_given = false, starts_given = false;
  s = prev;
  s.events.clear();
  s.calendar_hours = -1;
  s.starts = 0;
  for (std::size_t c = 0; c < n; ++c) {
    const FastColumn& fc = f.cols[c];
    const double v = f.core[c];
    switch (fc.field) {
      case F::hours: s.hours = v; break;
      case F::calendar_hours: s.calendar_hours = v; break;
      case F::starts: s.starts = v, starts_given = true; break;
      case F::h2s:
      case F::other_sulfur:
      case F::chlorine:
      case F::fluorine: {
        Concentration& k = conc[static_cast<int>(fc.field) - static_cast<int>(F::h2s)];
        k.value = v;
        k.unit = fc.unit;
        k.basis = fc.basis_given ? fc.basis : x.fuel.main_basis;
        fuel_changed = true;
        break;
      }
      case F::power: power = v, power_given = true; break;
      case F::load: power = v * x.eng.rating.rated_power, power_given = true; break;
      default: break;
    }
  }
  const Concentration held[4] = {x.fuel.h2s, x.fuel.other_sulfur, x.fuel.chlorine, x.fuel.fluorine};
  const auto put = [&](const Concentration* k) {
    x.fuel.h2s = k[0], x.fuel.other_sulfur = k[1], x.fuel.chlorine = k[2], x.fuel.fluorine = k[3];
  };
  try {
    std::uint64_t gas = f.gas;
    if (fuel_changed) {
      put(conc);
      s.fuel = gases.of(x.fuel);
      gas = gases.table[gases.last].age;
    }
    if (power_given || fuel_changed) {
      std::uint64_t pb;
      std::memcpy(&pb, &power, sizeof pb);
      const std::size_t a = static_cast<std::size_t>(((gas * 0x9E3779B97F4A7C15ull) ^ (pb * 0xBF58476D1CE4E5B9ull)) >> 58) & ~std::size_t{1};
      FastRows::Powered* hit = nullptr;
      for (std::size_t k = a; k < a + 2 && gas != 0; ++k)
        if (f.powered[k].gas == gas && std::memcmp(&f.powered[k].power, &power, sizeof power) == 0) hit = &f.powered[k];
      if (hit) {
        s.operation.fuel_flow = hit->fuel_flow;
        s.operation.electrical_power = hit->electrical_power;
        s.operation.load = hit->load;
        s.oil_consumption = hit->oil_consumption;
      } else {
        set_power(s, x.eng.rating, power);
        if (gas != 0) {
          FastRows::Powered& e = f.powered[a + ((f.flip ^= 1u) & 1u)];
          e = {gas, power, s.operation.fuel_flow, s.operation.electrical_power, s.operation.load, s.oil_consumption};
        }
      }
    }
    f.gas = gas;
  } catch (const InputError&) {
    put(held);
    return false;
  } catch (const NotModelledError&) {
    put(held);
    return false;
  }
  x.power = power;
  for (std::size_t c = 0; c < n; ++c) {
    const double v = f.core[c];
    switch (f.cols[c].field) {
      case F::jacket_water_out: s.operation.jacket_water_out = v; break;
      case F::oil_temperature: s.oil_temperature = v; break;
      case F::coldest_crankcase_surface: s.operation.coldest_crankcase_surface = v; break;
      case F::blowby: s.operation.blowby_share = v; break;
      case F::excess_air_ratio: s.operation.air.excess_air_ratio = v; break;
      default: break;
    }
  }
  if (!starts_given && x.eng.start_every > 0) s.starts = s.hours / x.eng.start_every;
  return true;
}

// Rows made before (FastRows::Made): the entry made from the numbers f.values in this generation,
// with what it leaves in the row context restored, or null, with `slot` where a new one would go.
// The numbers as written are the key: their conversion and range checks are a function of them.
FastRows::Made* made_before(FastRows& f, RowContext& x, std::size_t& slot) {
  const std::size_t n = f.cols.size();
  const auto same = [&](const FastRows::Made& e) {  // bit for bit (memcmp of a length not known here is a call)
    if (e.generation != f.generation) return false;
    for (std::size_t c = 0; c < n; ++c) {
      std::uint64_t u, w;
      std::memcpy(&u, &e.values[c], sizeof u);
      std::memcpy(&w, &f.values[c], sizeof w);
      if (u != w) return false;
    }
    return true;
  };
  const auto found = [&](FastRows::Made& e) {
    x.fuel.h2s = e.conc[0], x.fuel.other_sulfur = e.conc[1], x.fuel.chlorine = e.conc[2], x.fuel.fluorine = e.conc[3];
    x.power = e.power;
    f.gas = e.gas;
    if (f.previous) f.previous->next = &e;
    f.last_made = &e;
    return &e;
  };
  f.previous = f.last_made;
  // a record that repeats mostly repeats in the same order: first the row that followed last time
  if (f.previous && f.previous->next && same(*f.previous->next)) return found(*f.previous->next);
  // each number multiplied by its own constant, side by side (not a chain), then the splitmix64
  // finaliser: every bit to every bit
  static const std::uint64_t odd[4] = {0xBF58476D1CE4E5B9ull, 0x94D049BB133111EBull, 0xC2B2AE3D27D4EB4Full, 0x165667B19E3779F9ull};
  std::uint64_t h = f.generation * 0x9E3779B97F4A7C15ull;
  for (std::size_t c = 0; c < n; ++c) {
    std::uint64_t w;
    std::memcpy(&w, &f.values[c], sizeof w);
    h += (w ^ (w >> 32)) * odd[c % 4] + c;
  }
  h = (h ^ (h >> 30)) * 0xBF58476D1CE4E5B9ull;
  h = (h ^ (h >> 27)) * 0x94D049BB133111EBull;
  slot = static_cast<std::size_t>(h ^ (h >> 29)) & (f.made.size() - 2);  // a power of two: a mask, not a division
  for (std::size_t k = slot; k < slot + 2; ++k)
    if (same(f.made[k])) return found(f.made[k]);
  f.last_made = nullptr;
  return nullptr;
}

// The row of numbers f.values made by fast_segment after `prev` and kept at slot pair `slot`: its
// entry, or null (nothing changed) when the fast path leaves the row to the generic reader.
FastRows::Made* make_segment(FastRows& f, std::size_t slot, const Segment& prev, RowContext& x, ResolvedGases& gases) {
  if (!fast_segment(f, prev, x, gases, f.scratch)) return nullptr;
  FastRows::Made& e = f.made[f.made[slot].generation != f.generation       ? slot
                             : f.made[slot + 1].generation != f.generation ? slot + 1
                                                                           : slot + ((f.made_flip ^= 1u) & 1u)];
  e.generation = f.generation;
  std::copy(f.values.begin(), f.values.end(), e.values.begin());
  e.segment = f.scratch;
  e.conc[0] = x.fuel.h2s, e.conc[1] = x.fuel.other_sulfur, e.conc[2] = x.fuel.chlorine, e.conc[3] = x.fuel.fluorine;
  e.power = x.power;
  e.gas = f.gas;
  e.checked = false;
  e.next = nullptr;
  if (f.previous) f.previous->next = &e;
  f.last_made = &e;
  return &e;
}

// The row of numbers f.values as the segment after `prev`, into `s`: the one made before, else
// made now. False, nothing changed, when the fast path leaves the row to the generic reader.
bool made_segment(FastRows& f, const Segment& prev, RowContext& x, ResolvedGases& gases, Segment& s) {
  std::size_t slot = 0;
  const FastRows::Made* e = made_before(f, x, slot);
  if (!e) e = make_segment(f, slot, prev, x, gases);
  if (!e) return false;
  s = e->segment;
  return true;
}

// A row with fewer filled cells than the one before ends the trailing entries of the row node, and
// the reader's `seen` may still point at them (an earlier row's cell of a key this row leaves empty):
// a refusal relocated through `seen` would then read a destroyed node. Those pointers are dropped, so
// such a refusal names the row or its fallback instead. The entries never move (room is reserved).
void forget_dropped_cells(const Reader& r, const Node& row) {
  const auto* data = row.entries.data();
  const auto live = reinterpret_cast<std::uintptr_t>(data + row.entries.size());
  const auto room = reinterpret_cast<std::uintptr_t>(data + row.entries.capacity());
  for (auto it = r.seen.begin(); it != r.seen.end();) {
    const auto at = reinterpret_cast<std::uintptr_t>(it->second);
    it = at >= live && at < room ? r.seen.erase(it) : std::next(it);
  }
}

// After a row the fast path made: the reader's `seen` as the generic reader leaves it.
void fast_seen(const Reader& r, FastRows& f, Document& window) {
  if (f.seen_set) return;
  Node& row = window.root;  // every cell is set, so column c is the row node's entry c (room for them is reserved)
  if (row.entries.size() < f.cols.size()) row.entries.resize(f.cols.size()), row.key_marks.resize(f.cols.size());
  for (std::size_t c = 0; c < f.cols.size(); ++c)
    if (f.cols[c].key) r.seen[f.cols[c].key->path] = &row.entries[c].second;
  f.seen_set = true;
}

// The next segment from a CSV row: the fast path's when it takes the row, else the generic reader's
// (the row filled into the window node and read by read_segment). The reader's `seen` is left as
// the generic reader would leave it: its quantity keys pointing at the window's nodes of the row.
Segment csv_segment(const Reader& r, FastRows& f, Document& window, const NamedColumns& cols, int source, std::size_t i,
                    const std::vector<std::string>& cells, const std::vector<int>& columns, int line,
                    std::string_view text, const Segment& prev, RowContext& x, ResolvedGases& gases) {
  Segment s;
  if (!detail::csv_generic_rows_only && cell_values(f, cells) && made_segment(f, prev, x, gases, s)) {
    fast_seen(r, f, window);
    return s;
  }
  f.seen_set = false;
  f.last_made = nullptr;
  ++f.generation;  // what the rows after carry from is the generic reader's
  f.gas = 0;  // the generic reader's gas is not known to the fast path's table of powers
  const std::size_t cells_before = window.root.entries.size();
  const Node& row = fill_row(window, cols, source, i, cells, columns, line, text);
  if (row.entries.size() < cells_before) forget_dropped_cells(r, row);
  return next_segment(r, row, prev, x, gases);
}

//! Takes segment i: `known_good` when its state is known to pass the operation checks; returns true
//! when it is known to pass them now (checked, or known before), false when not (refused, or not checked).
using SegmentTaker = std::function<bool(std::size_t, const Segment&, bool known_good)>;

// Streams the record's rows as segments to `take`, each after `prev` (updated). A plain line goes
// straight from its bytes to the fast path (line_values, made_segment: no cells made); any other
// line, and any the fast path leaves, is read by the parser and made by csv_segment.
void stream_rows(const Reader& r, CsvRecord& rec, Segment& prev, RowContext& x, ResolvedGases& gases,
                 const SegmentTaker& take) {
  std::size_t i = 0;
  CsvTable header;
  FastRows fast = fast_rows(rec.cols, x.eng);
  const auto taken = [&](std::size_t at, const Segment& s) {
    FastRows::Made* m = fast.last_made;
    if (take(at, s, m && m->checked) && m) m->checked = true;
  };
  // a plain line's segment is left in its entry of the rows made (no copy): `prev` is then that
  // one's, copied only when a row is made from it
  const FastRows::Made* lazy = nullptr;
  const auto settle = [&] {
    if (lazy) prev = lazy->segment, lazy = nullptr;
  };
  const detail::CsvRowSink sink = [&](const std::vector<std::string>& cells, const std::vector<int>& columns, int line,
                                      std::string_view text) {
    settle();
    const std::size_t at = i++;
    prev = csv_segment(r, fast, *rec.window, rec.cols, rec.source, at, cells, columns, line, text, prev, x, gases);
    taken(at, prev);
  };
  struct Plain {
    const Reader& r;
    CsvRecord& rec;
    Segment& prev;
    RowContext& x;
    ResolvedGases& gases;
    FastRows& fast;
    std::size_t& i;
    const FastRows::Made*& lazy;
    const decltype(settle)& settled;
    const decltype(taken)& took;
  } plain{r, rec, prev, x, gases, fast, i, lazy, settle, taken};
  detail::CsvLineHook hook;
  if (fast.usable && !detail::csv_generic_rows_only) {
    hook.context = &plain;
    hook.take = [](void* context, std::string_view line, int) {
      Plain& p = *static_cast<Plain*>(context);
      FastRows& f = p.fast;
      if (!line_values(f, line)) return false;  // the parser's and csv_segment's (which settles `prev` first)
      std::size_t slot = 0;
      const FastRows::Made* e = made_before(f, p.x, slot);
      if (!e) {
        p.settled();  // before a row is made from it (whose entry may take the place of its own)
        e = make_segment(f, slot, p.prev, p.x, p.gases);
        if (!e) return false;
      }
      p.lazy = e;
      fast_seen(p.r, f, *p.rec.window);
      p.took(p.i++, e->segment);
      return true;
    };
  }
  detail::stream_csv_file(rec.file, rec.facts, header, sink, false, hook);
  settle();
}

// A CSV record read again for each run (EngineCase::streamed): rows made into segments exactly as
// when the case was loaded (the same reader code on the same context), after checking that the
// file is still the one that was read (size, modification time and digest of every byte).
class CsvRecordStream final : public RecordStream {
 public:
  CsvRecordStream(const Reader& r, const CsvRecord& rec, const RowContext& context, const Segment& base, double hours,
                  const Segment& first)
      : reader_(r), file_(rec.file), facts_(rec.facts), cols_(rec.cols), source_(rec.source), rows_(rec.rows),
        context_(context), base_(base), hours_(hours), first_(first) {
    reader_.seen.clear();
    std::error_code ec;  // opened by its absolute path: a later change of working folder does not matter
    const std::filesystem::path abs = std::filesystem::absolute(file_, ec);
    open_path_ = ec ? file_ : abs.string();
  }
  std::size_t segments() const override { return rows_; }
  double hours() const override { return hours_; }
  const Segment& first() const override { return first_; }

  SegmentSource open() const override {
    const auto changed = [file = file_](const std::string& how) {
      return InputError("record.file", file,
                        "the record file as it was when the case was loaded (" + how + "); load the case again",
                        detail::file_only(file));
    };
    detail::CsvFileFacts now;
    try {
      now = detail::scan_csv_file(open_path_, max_record_file_bytes);
    } catch (const InputError& e) {
      throw changed("it can no longer be read: " + e.expected());
    }
    if (!(now == facts_)) throw changed("it has changed since");
    struct State {
      Reader r;
      std::shared_ptr<Document> window;
      RowContext x;
      ResolvedGases gases;
      Segment prev, cur;
      FastRows fast;
      CsvTable header;
      std::unique_ptr<detail::CsvFileReader> rows;
      NamedColumns cols;
      int source = 0;
      std::size_t i = 0;
      const FastRows::Made* lazy = nullptr;  //!< as in stream_rows: `prev` is this row's segment
      const Segment* out = nullptr;          //!< the row read last
      void settle() {
        if (lazy) prev = lazy->segment, lazy = nullptr;
      }
    };
    auto st = std::make_shared<State>();
    st->r = reader_;
    st->window = new_window(file_, cols_.names.size());
    st->r.docs.at(static_cast<std::size_t>(source_)) = st->window;
    st->x = context_;
    st->prev = base_;
    st->cols = cols_;
    st->source = source_;
    st->fast = fast_rows(cols_, context_.eng);
    const detail::CsvRowSink sink = [p = st.get()](const std::vector<std::string>& c, const std::vector<int>& cols, int l,
                                                   std::string_view t) {
      p->settle();
      p->cur = csv_segment(p->r, p->fast, *p->window, p->cols, p->source, p->i, c, cols, l, t, p->prev, p->x, p->gases);
      p->prev = p->cur;
      p->out = &p->cur;
      ++p->i;
    };
    // plain lines as when loading (stream_rows): the segment handed on is the one in its slot of the
    // rows made, valid until the next call (as a SegmentSource's need be)
    detail::CsvLineHook hook;
    if (st->fast.usable && !detail::csv_generic_rows_only) {
      hook.context = st.get();
      hook.take = [](void* context, std::string_view line, int) {
        State& p = *static_cast<State*>(context);
        FastRows& f = p.fast;
        if (!line_values(f, line)) return false;
        std::size_t slot = 0;
        const FastRows::Made* e = made_before(f, p.x, slot);
        if (!e) {
          p.settle();
          e = make_segment(f, slot, p.prev, p.x, p.gases);
          if (!e) return false;
        }
        p.lazy = e;
        fast_seen(p.r, f, *p.window);
        p.out = &e->segment;
        ++p.i;
        return true;
      };
    }
    st->rows = std::make_unique<detail::CsvFileReader>(open_path_, facts_, st->header, sink, false, hook);
    // the stream holds all it reads with (the reading outlives nothing it points into)
    return [st, changed]() -> const Segment* {
      try {
        if (!st->rows->next()) return nullptr;
      } catch (const InputError& e) {
        throw changed("it changed while it was read: " + std::string(e.what()));
      }
      return st->out;
    };
  }

 private:
  Reader reader_;
  std::string file_, open_path_;  // as named in messages; as opened
  detail::CsvFileFacts facts_;
  NamedColumns cols_;
  int source_ = 0;
  std::size_t rows_ = 0;
  RowContext context_;
  Segment base_;
  double hours_ = 0;
  Segment first_;
};

// The caps on work (case_file.hpp), checked before anything runs; each refusal names the key that
// sets the work: the row where the hours pass the cap, the output interval, the detection step.
// `hours`: the record's in all; `over`: the row where they passed the cap (none: the record is within
// it); `row_at` gives record row i (null: the record is the base segment).
void check_work(const Reader& r, const Node& root, const EngineCase& c, double hours, std::optional<std::size_t> over,
                double over_hours, const std::function<const Node&(std::size_t)>* row_at) {
  if (over) {
    const Node& at = !row_at ? (root.find("run") ? *root.find("run") : root) : (*row_at)(*over);
    const Node* h = at.find("hours");
    r.fail(h ? *h : at, format_value(over_hours) + " h in all",
           "a record of at most " + format_value(max_simulated_hours) + " running hours (a cap on work; docs/case-format.md)");
  }
  const auto where = [&](const char* path, const char* fallback) -> const Node& {
    const auto it = r.seen.find(path);
    if (it != r.seen.end()) return *it->second;
    if (const Node* n = root.find(fallback)) return *n;
    return root;
  };
  const double points = hours / c.options.output_interval;
  if (points > max_trajectory_points) {
    const Node& at = where("run.output-interval", "run");
    r.fail(at, describe(at), "an output interval of at least " + format_value(hours / max_trajectory_points) + " h: " +
                                 format_value(std::ceil(points)) + " trajectory points over " + format_value(hours) +
                                 " h is more than the cap of " + format_value(max_trajectory_points) + " (docs/case-format.md)");
  }
  const double steps = hours / c.options.detection_step;
  if (steps > max_detection_steps) {
    const Node& at = where("run.detection-step", "run");
    r.fail(at, describe(at), "a detection step of at least " + format_value(hours / max_detection_steps) + " h: " +
                                 format_value(std::ceil(steps)) + " detection steps over " + format_value(hours) +
                                 " h is more than the cap of " + format_value(max_detection_steps) + " (docs/case-format.md)");
  }
}

const Node& section(const Reader& r, const Node& root, const char* key, const char* what) {
  const Node* n = root.find(key);
  if (!n) r.fail(root, std::string("(no ") + key + " section)", what);
  return *n;
}

}  // namespace

std::vector<Node> detail::csv_rows(Reader& r, const Node& file_node, const char* section, const std::string& path) {
  return csv_rows_of(r, file_node, section, path);
}

EngineCase detail::build_engine_case(Reader& r, const Node& root, const std::string& name) {
  r.seen.clear();
  EngineCase c;
  c.name = name;
  FuelAnalysis fuel;
  fuel.reference = detail::read_reference_state(r, root.find("reference-state"));
  fuel.combustion = detail::read_combustion_reference(r, root.find("combustion-reference"));
  const Node& fn = section(r, root, "fuel", "a 'fuel' section with the gas analysis");
  detail::read_fuel(r, fn, fuel);
  EngineInputs eng;
  eng.rating.specific_oil_consumption = 0.2e-3 / 3.6e6;  // 0.2 g/kWh [kg/J], the registry's default
  const Node& en = section(r, root, "engine", "an 'engine' section");
  eng.reference = fuel.reference;
  detail::read_engine(r, en, eng);
  OilInputs oin;
  const Node& on = section(r, root, "oil", "an 'oil' section");
  detail::read_oil(r, on, c.charge, oin, eng.rating, eng.power);
  if (const Node* m = root.find("model")) detail::read_model(r, *m, c.model, c.charge.oil);
  if (const Node* l = root.find("limits")) detail::read_limits(r, *l, c.model.limits);
  try {
    validate(c.charge.oil);
  } catch (const InputError& e) {
    r.relocate(e, on);
  }
  c.charge.mass = oin.volume * c.charge.oil.density_15;
  c.exhaust_temperature = eng.exhaust_temperature;
  c.catalyst_so3_conversion = eng.catalyst_so3_conversion;
  c.fuel_gas_limits = eng.fuel_gas_limits;

  // the base segment
  Segment base;
  try {
    base.fuel = resolve(fuel);
  } catch (const InputError& e) {
    r.relocate(e, fn);
  }
  base.operation = eng.op;
  if (eng.rating.fixed_fuel_flow <= 0) {
    if (eng.power <= 0) r.fail(en, "(no power)", "'power' (or 'load' and 'rated-power') with 'electrical-efficiency', or 'fuel-flow'");
    if (eng.rating.electrical_efficiency <= 0) r.fail(en, "(no efficiency)", "'electrical-efficiency' to go with the power, or 'fuel-flow'");
  }
  try {
    set_power(base, eng.rating, eng.power);
  } catch (const InputError& e) {
    r.relocate(e, en);
  }
  if (base.oil_consumption <= 0 && c.charge.continuous_makeup && eng.power <= 0)
    r.fail(on, "(no consumption)", "an engine 'power' so that the oil consumption in g/kWh can be applied");
  base.oil_temperature = eng.oil_temperature;

  // run settings
  double horizon = c.model.limits.max_hours;
  if (const Node* rn = root.find("run")) detail::read_run(r, *rn, horizon, c.options);
  if (c.options.output_interval == 0) c.options.output_interval = std::fmax(1.0, horizon / 400);

  // the record: one segment of the base operation, or the listed segments (inline, or a CSV file
  // streamed row by row). With `r.stream_records` a CSV record is checked in one pass and kept as
  // its description (EngineCase::streamed), not as segments, unless a scrubbing train or prices
  // need the segments themselves.
  std::vector<Node> rows;
  CsvRecord csv;
  bool from_csv = false;
  const bool may_stream = r.stream_records && !root.find("scrubbing") && !root.find("economics");
  if (const Node* rec = root.find("record")) {
    r.require_section(*rec, "record");
    const Node* file = rec->find("file");
    const Node* segs = rec->find("segments");
    if (file && segs) r.fail(*segs, "", "either a record 'file' or inline 'segments', not both");
    if (file) csv = open_csv_record(r, *file), from_csv = true;
    if (segs) {
      if (segs->type != Node::Type::sequence || segs->items.empty())
        r.fail(*segs, "", "a list of segments, each with its 'hours'");
      rows = segs->items;
    }
    const std::size_t n = from_csv ? csv.rows : rows.size();
    const std::size_t cap = from_csv && may_stream ? max_streamed_record_rows : max_record_rows;
    if (n == 0) r.fail(*rec, "", "at least one segment");
    if (n > cap)
      r.fail(file ? *file : *segs, std::to_string(n) + " segments",
             "a record of at most " + std::to_string(cap) + " segments" +
                 (cap == max_record_rows && from_csv ? " when its segments are held (a scrubbing train, prices, or a study that needs them all)" : "") +
                 " (a cap on work; docs/case-format.md)");
  }
  const bool listed = from_csv || !rows.empty();
  const bool streamed = from_csv && may_stream;
  const std::function<const Node&(std::size_t)> row_at = [&](std::size_t i) -> const Node& {
    return from_csv ? csv_row_at(csv, i) : rows[i];
  };
  // Every segment's operation is validated here, so that a range error names the place. The check
  // is a pure function of the segment's operating state (operation with its starts per hour, gas,
  // oil temperature and consumption), so a state with the same bits as one already checked has the
  // same outcome and is not checked again (a table of recent states; a miss only costs a check).
  // The first failure is kept and reported after the caps on work, as a check of the whole record
  // after reading it would.
  struct CheckedState {
    Operation op;
    FuelGas fuel;
    double oil_temperature = 0, oil_consumption = 0;
    bool used = false;
  };
  const std::size_t n_segments = !listed ? 1 : from_csv ? csv.rows : rows.size();
  std::vector<CheckedState> checked(n_segments > 64 ? 1024 : 0);
  const auto state_of = [](const Segment& s) {
    CheckedState k;
    std::memset(static_cast<void*>(&k), 0, sizeof k);  // the padding too, so that equal states have equal bytes
    k.op = s.operation;
    k.op.starts_per_hour = s.hours > 0 ? s.starts / s.hours : 0;  // as segment_rates takes it
    k.fuel = s.fuel;
    k.oil_temperature = s.oil_temperature;
    k.oil_consumption = s.oil_consumption;
    k.used = true;
    return k;
  };
  std::optional<std::size_t> bad_operation;  // the first segment whose operation is refused
  std::exception_ptr bad_operation_error;
  unsigned flip = 0;  // which of a full slot pair a new state replaces, in turn
  // true when the state is known to pass (checked now, or before), false when refused or not checked
  const auto check_operation = [&](std::size_t i, const Segment& s, bool known_good) {
    if (bad_operation) return false;
    if (known_good) return true;
    CheckedState* slot = nullptr;
    if (!checked.empty()) {
      const CheckedState k = state_of(s);
      static_assert(sizeof k % sizeof(std::uint64_t) == 0, "hashed in words");
      // FNV-1a over the state's 8-byte words in four lanes (the slot only: the state is compared in full)
      std::uint64_t h[4] = {1469598103934665603ull, 0x9E3779B97F4A7C15ull, 0xC2B2AE3D27D4EB4Full, 0x165667B19E3779F9ull};
      std::size_t b = 0;
      const auto* bytes = reinterpret_cast<const unsigned char*>(&k);
      for (; b + 4 * sizeof(std::uint64_t) <= sizeof k; b += 4 * sizeof(std::uint64_t))
        for (int l = 0; l < 4; ++l) {
          std::uint64_t w;
          std::memcpy(&w, bytes + b + l * sizeof w, sizeof w);
          h[l] = (h[l] ^ w) * 1099511628211ull;
        }
      for (int l = 0; b < sizeof k; b += sizeof(std::uint64_t), ++l) {
        std::uint64_t w;
        std::memcpy(&w, bytes + b, sizeof w);
        h[l] = (h[l] ^ w) * 1099511628211ull;
      }
      std::uint64_t m = h[0] ^ (h[1] * 0x9E3779B97F4A7C15ull) ^ (h[2] * 0xC2B2AE3D27D4EB4Full) ^ (h[3] * 0x165667B19E3779F9ull);
      m = (m ^ (m >> 30)) * 0xBF58476D1CE4E5B9ull;  // the splitmix64 finaliser: every bit to every bit
      m = (m ^ (m >> 27)) * 0x94D049BB133111EBull;
      const std::size_t a = static_cast<std::size_t>((m ^ (m >> 31)) % checked.size()), b2 = a ^ 1;  // two ways
      const auto same = [&](const CheckedState& c) {
        return c.used && std::memcmp(static_cast<const void*>(&c), static_cast<const void*>(&k), sizeof k) == 0;
      };
      if (same(checked[a]) || same(checked[b2])) return true;
      slot = !checked[a].used ? &checked[a] : !checked[b2].used ? &checked[b2] : &checked[(flip ^= 1) ? a : b2];
    }
    try {
      check_segment(s, c.charge, c.model);
    } catch (const InputError&) {
      bad_operation = i, bad_operation_error = std::current_exception();
      return false;
    } catch (const NotModelledError&) {
      bad_operation = i, bad_operation_error = std::current_exception();
      return false;
    }
    if (slot) *slot = state_of(s);
    return true;
  };
  double hours = 0, over_hours = 0;
  std::optional<std::size_t> over;  // the row where the hours pass the cap
  if (!listed) {
    base.hours = horizon;
    base.starts = eng.start_every > 0 ? horizon / eng.start_every : 0;
    c.record = {base};
    hours = base.hours;
    if (hours > max_simulated_hours) over = 0, over_hours = hours;
    check_operation(0, base, false);
  } else {
    RowContext x{eng, c.charge, fuel, eng.power};
    const RowContext before = x;
    Segment prev = base, first;
    ResolvedGases gases;
    const auto take = [&](std::size_t i, const Segment& s, bool known_good) {
      hours += s.hours;
      if (hours > max_simulated_hours && !over) over = i, over_hours = hours;
      const bool good = check_operation(i, s, known_good);
      if (i == 0) first = s;
      if (!streamed) c.record.push_back(s);
      return good;
    };
    if (from_csv) {
      if (!streamed) c.record.reserve(csv.rows);
      stream_rows(r, csv, prev, x, gases, take);
    } else {
      for (std::size_t i = 0; i < rows.size(); ++i) {
        prev = next_segment(r, rows[i], prev, x, gases);
        take(i, prev, false);
      }
    }
    if (streamed) {
      c.streamed = std::make_shared<CsvRecordStream>(r, csv, before, base, hours, first);
      // a trajectory point at every segment end would grow with the record past the cap on points:
      // beyond it, points at the output interval, at events and at the end only
      if (static_cast<double>(csv.rows) > max_trajectory_points) c.options.keep_segment_ends = false;
      // and room for them made once (within the cap on points, checked below): a growing vector
      // would hold its old and new copies at once
      const double points = (c.options.keep_segment_ends ? static_cast<double>(csv.rows) : 0) +
                            hours / c.options.output_interval + 16;
      c.options.reserve_points = static_cast<std::size_t>(std::fmin(points, 2 * max_trajectory_points + 16));
    }
  }
  check_work(r, root, c, hours, over, over_hours, listed ? &row_at : nullptr);
  if (bad_operation) {
    try {
      std::rethrow_exception(bad_operation_error);
    } catch (const InputError& e) {
      if (!listed) r.relocate(e, en, nullptr);
      const Node& row = row_at(*bad_operation);
      r.relocate(e, row, &row);
    } catch (const NotModelledError& e) {
      r.fail(listed ? row_at(*bad_operation) : en, "", std::string("an operation the model covers: ") + e.what());
    }
  }
  return c;
}

void detail::train_error(const Reader& r, const Node& sn, const InputError& e) {
  // a changeout level the fresh bed cannot hold: at that stage's changeout-at
  if (const Node* st = sn.find("stages"))
    for (const Node& item : st->items)
      if (const Node* at = item.find("changeout-at"))
        if (const Node* nm = item.find("name"); nm && e.key().find("." + nm->scalar + ".") != std::string::npos)
          r.fail(*at, at->scalar, e.expected());
  r.fail(sn, describe(sn), e.key() + ": " + e.expected());
}

namespace {
using detail::build_engine_case;

EngineCase build(Reader& r, const Node& root, const std::string& name) { return build_engine_case(r, root, name); }

// A variant's scrubbing train and prices, from its merged tree: the engine then runs on the gas behind
// the train; with prices (`priced`: the base has an economics section), its cost case keeps the raw gas.
void scrub_and_price(Reader& r, const Node& tree, EngineCase& c, CaseFile& out, bool priced) {
  std::vector<TrainStage> train;
  double step = 24;
  const Node* sn = tree.find("scrubbing");
  if (sn) train = detail::read_scrubbing(r, *sn, step);
  if (priced) {
    CostCase cc;
    cc.engine = c;
    cc.train = train;
    cc.step = step;
    detail::read_economics(r, *tree.find("economics"), cc, out.sensitivity_step);
    out.costs.push_back(std::move(cc));
  }
  if (train.empty()) return;
  try {
    c.record = scrub(c, train, step).record;
  } catch (const InputError& e) {
    detail::train_error(r, *sn, e);
  }
}

// "section.key" → the file that set it, for the sections of a variant's merged tree (the report's
// given / default / fitted marks).
std::map<std::string, std::string> key_sources(const Reader& r, const Node& root) {
  std::map<std::string, std::string> out;
  for (const auto& [section, node] : root.entries) {
    if (section == "variants" || section == "uncertainty" || section == "lab" || section == "format-version" || section == "case") continue;
    if (node.type != Node::Type::map) {
      out[section] = r.doc(node).file;
      continue;
    }
    for (const auto& [key, value] : node.entries) {
      const Node* first = &value;  // a merged map may mix sources: the first entry's stands for it
      while (first->type == Node::Type::map && !first->entries.empty()) first = &first->entries.front().second;
      out[section + "." + key] = r.doc(*first).file;
    }
  }
  return out;
}

std::shared_ptr<Document> parse_into(Reader& r, std::string_view text, const std::string& file) {
  auto d = std::make_shared<Document>(parse_document(text, file));
  detail::set_source(d->root, static_cast<int>(r.docs.size()));
  r.docs.push_back(d);
  return d;
}

}  // namespace

int detail::format_version(const Reader& r, const Node& root) {
  const Node* v = root.find("format-version");
  if (!v) throw r.doc(root).error(Mark{1, 1}, "format-version", "(missing)",
                                   "a 'format-version: 1' line (this acidload reads versions 1 to " +
                                       std::to_string(case_format_version) + ")");
  const double x = quantity(r.doc(*v), *v, Kind::count);
  if (!(x >= 1 && x <= case_format_version && x == std::floor(x)))
    r.fail(*v, v->scalar, "a format version from 1 to " + std::to_string(case_format_version) + " (this acidload " +
                              version() + " reads those; a newer file needs a newer acidload)");
  return static_cast<int>(x);
}

// A layer without the keys that are not merged (an overlay's format-version and case, a variant's name).
Node detail::without(const Node& n, std::initializer_list<const char*> keys) {
  Node layer = n;
  for (const char* k : keys)
    for (std::size_t i = 0; i < layer.entries.size(); ++i)
      if (layer.entries[i].first == k) {
        layer.entries.erase(layer.entries.begin() + static_cast<std::ptrdiff_t>(i));
        if (i < layer.key_marks.size()) layer.key_marks.erase(layer.key_marks.begin() + static_cast<std::ptrdiff_t>(i));
        break;
      }
  return layer;
}

namespace {
using detail::format_version;
using detail::without;

CaseFile load(Reader& r, std::shared_ptr<Document> main, const std::vector<std::string>& overlays) {
  const Node& root0 = main->root;
  if (root0.type != Node::Type::map)
    throw main->error(Mark{1, 1}, "(top level)", root0.type == Node::Type::null ? "(empty file)" : "(not a map)",
                      "a case: a map with format-version, fuel, engine, oil and optional sections");
  require_keys(*main, root0, section_keys(""));
  if (const Node* s = root0.find("site"))
    r.fail(*s, describe(*s), "a case without 'site': this is a site file, which acidload run, costs and check "
                             "read as a site (Python: acidload.Site)");
  CaseFile out;
  out.file = main->file;
  out.format_version = format_version(r, root0);
  // the base tree without its variants: each variant copies the base, which must not hold them all
  Node root = without(root0, {"variants"});
  for (const std::string& path : overlays) {
    auto od = std::make_shared<Document>(read_document(path));
    detail::set_source(od->root, static_cast<int>(r.docs.size()));
    r.docs.push_back(od);
    if (od->root.type != Node::Type::map)
      throw od->error(Mark{1, 1}, "(top level)", "(not a map)", "an overlay: a map of case sections");
    require_keys(*od, od->root, section_keys("overlay"));
    format_version(r, od->root);
    detail::merge_layer(root, without(od->root, {"format-version", "case"}));
    out.overlays.push_back(path);
  }
  if (const Node* t = root.find("case")) out.title = r.text(*t);
  if (const Node* u = root.find("uncertainty")) out.uncertainty = detail::read_uncertainty(r, *u);
  const Node* lab = root.find("lab");
  if (lab) out.lab = detail::read_lab(r, *lab);
  std::string base_name = "base";
  if (const Node* b = root.find("base-name")) {
    base_name = r.text(*b);
    if (base_name.empty()) r.fail(*b, "", "a name that is not empty");
  }
  const bool priced = root.find("economics") != nullptr;
  out.variants.push_back(build(r, root, base_name));
  scrub_and_price(r, root, out.variants.back(), out, priced);
  out.key_sources.push_back(key_sources(r, root));
  out.variant_keys.emplace_back();
  if (const Node* vs = root0.find("variants")) {
    if (vs->type != Node::Type::sequence) r.fail(*vs, "", "a list of variants, each with a 'name'");
    if (vs->items.size() > max_variants)
      r.fail(*vs, std::to_string(vs->items.size()) + " variants",
             "at most " + std::to_string(max_variants) + " variants (a cap on work; docs/case-format.md)");
    std::set<std::string> names{base_name};
    std::size_t segments = out.variants.front().record.size();
    std::size_t streamed_rows = out.variants.front().streamed ? record_segments(out.variants.front()) : 0;
    out.variants.reserve(vs->items.size() + 1);
    for (const Node& v : vs->items) {
      r.require_section(v, "variant");
      const Node* n = v.find("name");
      if (!n) r.fail(v, "(no name)", "a 'name' for the variant");
      const std::string name = r.text(*n);
      if (name.empty()) r.fail(*n, "", "a variant name that is not empty");
      if (!names.insert(name).second) r.fail(*n, name, "a variant name not used before");
      if (const Node* e = v.find("economics"); e && !priced)
        r.fail(*e, describe(*e), "an 'economics' section in the base case first (a variant may change its prices)");
      Node merged = root;
      const Node layer = without(v, {"name"});
      detail::merge_layer(merged, layer);
      out.variants.push_back(build(r, merged, name));
      scrub_and_price(r, merged, out.variants.back(), out, priced);
      out.key_sources.push_back(key_sources(r, merged));
      std::vector<std::string> own;
      for (const auto& [key, file] : key_sources(r, layer)) own.push_back(key);
      out.variant_keys.push_back(std::move(own));
      segments += out.variants.back().record.size();
      if (segments > max_segments_in_all)
        r.fail(*n, name, "variants whose records hold at most " + std::to_string(max_segments_in_all) +
                             " segments in all (a cap on memory; docs/case-format.md)");
      // each variant reads its streamed record when loading and again for each run
      if (out.variants.back().streamed) streamed_rows += record_segments(out.variants.back());
      if (streamed_rows > max_streamed_record_rows)
        r.fail(*n, name, "variants whose streamed records have at most " + std::to_string(max_streamed_record_rows) +
                             " rows in all (a cap on work; docs/case-format.md)");
    }
  }
  if (lab)  // a level past the limit of any variant is refused at its line
    for (const EngineCase& v : out.variants) detail::check_lab_levels(r, *lab, out.lab, v.model.limits);
  return out;
}

}  // namespace

CaseFile load_case_text(std::string_view text, const std::string& file_name, const std::string& base_dir,
                        const std::vector<std::string>& overlays, RecordReading records) {
  Reader r;
  r.base_dir = base_dir;
  r.stream_records = records == RecordReading::stream;
  auto d = parse_into(r, text, file_name);
  return load(r, d, overlays);
}

CaseFile load_case(const std::string& path, const std::vector<std::string>& overlays, RecordReading records) {
  Reader r;
  r.stream_records = records == RecordReading::stream;
  r.base_dir = std::filesystem::path(path).parent_path().string();
  if (r.base_dir.empty()) r.base_dir = ".";
  auto d = std::make_shared<Document>(read_document(path));
  detail::set_source(d->root, 0);
  r.docs.push_back(d);
  return load(r, d, overlays);
}

CaseFile held_records(const CaseFile& c) {
  CaseFile out = c;
  for (EngineCase& v : out.variants) v = held_record(v, max_record_rows);
  return out;
}

}  // namespace acidload::io
