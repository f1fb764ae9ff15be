// The fast path for CSV record rows (io/case_file.cpp: numbers parsed straight into the segment with
// the header's units resolved once per column) against the generic reader (each row filled into a
// node and read by read_segment), on generated records: random columns and units, plain numbers
// in and out of range written in several forms, and now and then a cell the fast path must leave to
// the generic reader (empty, a unit or quotes in the cell, no number, a short or long row). Both
// must give the same segments bit for bit, or the same refusal (key, value, expected, file, line,
// column, the line shown), held and streamed alike. This covers the plain line reader too (a row
// read straight from its line's bytes, its decimals read as digits over a power of ten) and the
// rows made before (a row repeating an earlier row's cells takes that one's segment): numbers are
// written with up to 17 digits and with leading zeros, rows repeat earlier ones with empty cells
// between (whose values the generic reader carries from the row before), blank lines and remarks
// come between rows, and the last line may lack its line end. The generic reader is the reference: it is the
// path every value took before the fast path existed (and test_record_stream.cpp checks it against
// the same rows written inline in YAML).
#include <doctest/doctest.h>

#include <algorithm>
#include <cmath>
#include <cstdio>
#include <cstdlib>
#include <cstring>
#include <filesystem>
#include <fstream>
#include <random>
#include <sstream>
#include <string>
#include <typeinfo>
#include <vector>

#include <unistd.h>

#include "acidload/acidload.hpp"
#include "acidload/io/case_file.hpp"
#include "acidload/io/keys.hpp"
#include "acidload/io/quantity.hpp"

namespace acidload::io::detail {
extern bool csv_generic_rows_only;  // io/case_reader.hpp (internal): the fast path left out
}

using namespace acidload;

namespace {
namespace fs = std::filesystem;

template <class T>
bool same_bits(const T& a, const T& b) {
  return std::memcmp(&a, &b, sizeof(T)) == 0;
}

std::string slurp(const fs::path& p) {
  std::ifstream f(p, std::ios::binary);
  std::ostringstream s;
  s << f.rdbuf();
  return s.str();
}

// The demo site with its record replaced by `csv` (its variants, uncertainty and run dropped).
std::string site_with_record(const std::string& csv) {
  std::istringstream in(slurp(fs::path(ACIDLOAD_SOURCE_DIR) / "cases" / "demo-site.yaml"));
  std::string out, line;
  bool skip = false;
  while (std::getline(in, line)) {
    if (!line.empty() && line[0] != ' ' && line[0] != '#') {
      const std::string key = line.substr(0, line.find(':'));
      skip = key == "record" || key == "variants" || key == "uncertainty" || key == "run";
    }
    if (!skip) out += line + "\n";
  }
  return out + "record:\n  file: " + csv + "\n";
}

// Segments compared field by field (the structs have padding).
void check_same_segment(const Segment& a, const Segment& b) {
  CHECK(same_bits(a.hours, b.hours));
  CHECK(same_bits(a.calendar_hours, b.calendar_hours));
  CHECK(same_bits(a.starts, b.starts));
  CHECK(same_bits(a.fuel.x, b.fuel.x));
  CHECK(same_bits(a.fuel.other_sulfur, b.fuel.other_sulfur));
  CHECK(same_bits(a.fuel.chlorine, b.fuel.chlorine));
  CHECK(same_bits(a.fuel.fluorine, b.fuel.fluorine));
  CHECK(same_bits(a.fuel.reference, b.fuel.reference));
  CHECK(a.fuel.combustion == b.fuel.combustion);
  const Operation &p = a.operation, &q = b.operation;
  CHECK(same_bits(p.fuel_flow, q.fuel_flow));
  CHECK(same_bits(p.electrical_power, q.electrical_power));
  CHECK(same_bits(p.load, q.load));
  CHECK(same_bits(p.air.excess_air_ratio, q.air.excess_air_ratio));
  CHECK(same_bits(p.air.water_fraction, q.air.water_fraction));
  CHECK(same_bits(p.blowby_share, q.blowby_share));
  CHECK(same_bits(p.blowby_flow, q.blowby_flow));
  CHECK(same_bits(p.jacket_water_out, q.jacket_water_out));
  CHECK(same_bits(p.coldest_crankcase_surface, q.coldest_crankcase_surface));
  CHECK(same_bits(p.crankcase_pressure, q.crankcase_pressure));
  CHECK(same_bits(p.exhaust_pressure, q.exhaust_pressure));
  CHECK(same_bits(p.starts_per_hour, q.starts_per_hour));
  CHECK(same_bits(p.jacket_water_at_start, q.jacket_water_at_start));
  CHECK(same_bits(p.nox.value, q.nox.value));
  CHECK(same_bits(a.oil_temperature, b.oil_temperature));
  CHECK(same_bits(a.oil_consumption, b.oil_consumption));
  REQUIRE(a.events.size() == b.events.size());
  for (std::size_t k = 0; k < a.events.size(); ++k) {
    CHECK(a.events[k].kind == b.events[k].kind);
    CHECK(same_bits(a.events[k].amount, b.events[k].amount));
  }
}
static_assert(sizeof(Operation) == 13 * sizeof(double) + sizeof(NoxEmission),
              "a field was added to Operation: compare it in check_same_segment");

// What loading gave: the segments (held, or read from the stream) or the refusal, all of it.
struct Outcome {
  bool ok = false;
  std::vector<Segment> segments;
  std::string type, what, key, value, expected, file, line_text;
  int line = 0, column = 0;
};

Outcome load(const std::string& text, io::RecordReading how, bool generic) {
  io::detail::csv_generic_rows_only = generic;
  Outcome o;
  try {
    const io::CaseFile c = io::load_case_text(text, "site.yaml", ".", {}, how);
    const EngineCase& v = c.variants.front();
    if (v.streamed) {
      const SegmentSource next = v.streamed->open();
      while (const Segment* s = next()) o.segments.push_back(*s);
    } else {
      o.segments = v.record;
    }
    o.ok = true;
  } catch (const InputError& e) {
    o.type = "InputError", o.what = e.what(), o.key = e.key(), o.value = e.value(), o.expected = e.expected();
    o.file = e.where().file, o.line_text = e.where().line_text, o.line = e.where().line, o.column = e.where().column;
  } catch (const std::exception& e) {
    o.type = typeid(e).name(), o.what = e.what();
  }
  io::detail::csv_generic_rows_only = false;
  return o;
}

struct Column {
  std::string name;
  std::vector<std::string> units;  // the header's, the first most often
};

// The segment columns with units the reader takes (and a few it refuses).
const std::vector<Column>& columns() {
  static const std::vector<Column> c = {
      {"calendar-hours", {"h", "d", "min"}},
      {"starts", {"", "h"}},
      {"h2s", {"ppmv", "ppm", "mg/Nm3", "ppmv wet", "mg/m3 dry", "mg H2S/Nm3", "mg/MJ", "mg/kWh", "mg S/Nm3", ""}},
      {"other-sulfur", {"mg/Nm3", "mg S/Nm3", "ppmv", "mg/Nm3 CH4"}},
      {"chlorine", {"mg/Nm3", "mg Cl/Nm3", "mg/m3 CH4"}},
      {"fluorine", {"mg/Nm3", "mg F/Nm3"}},
      {"jacket-water-out", {"degC", "K", "\xC2\xB0" "C", "C", "F"}},
      {"oil-temperature", {"degC", "K"}},
      {"coldest-crankcase-surface", {"degC", "K"}},
      {"blow-by", {"%", ""}},
      {"excess-air-ratio", {"", "%"}},
  };
  return c;
}

std::string pick(std::mt19937_64& g, const std::vector<std::string>& v) {
  // the first most often
  std::uniform_int_distribution<std::size_t> d(0, v.size() * 2 - 1);
  const std::size_t i = d(g);
  return v[i < v.size() ? 0 : i - v.size()];
}

// A number as a user might write it: fixed, general, exponent, integral, with a '+', fixed with 0 to
// 13 decimals (the plain line reader's own digits-over-power-of-ten reading up to 15 digits and
// plain_number's beyond: both must round as from_chars does), with leading zeros.
std::string written(std::mt19937_64& g, double v) {
  char buf[64];
  switch (std::uniform_int_distribution<int>(0, 7)(g)) {
    case 6: std::snprintf(buf, sizeof buf, "%.*f", std::uniform_int_distribution<int>(0, 13)(g), v); return buf;
    case 7: std::snprintf(buf, sizeof buf, "%s%.2f", v < 0 ? "-00" : "00", std::fabs(v)); return buf;
    case 0: std::snprintf(buf, sizeof buf, "%.17g", v); break;
    case 1: std::snprintf(buf, sizeof buf, "%.6g", v); break;
    case 2: std::snprintf(buf, sizeof buf, "%.3f", v); break;
    case 3: std::snprintf(buf, sizeof buf, "%.4e", v); break;
    case 4: std::snprintf(buf, sizeof buf, "%.0f", v); break;
    default: std::snprintf(buf, sizeof buf, "+%.5g", v); break;
  }
  return buf;
}

// A cell of column `name` in header unit `unit`: mostly a plain number in the key's range, at
// times one the fast path must leave to the generic reader.
std::string cell(std::mt19937_64& g, const std::string& name, const std::string& unit, double odd) {
  std::uniform_real_distribution<double> u(0, 1);
  double core = 0;
  std::string out;
  const io::CaseKey& k = io::case_key("segment." + name);
  if (k.type == io::KeyType::contaminant) {
    out = written(g, name == "h2s" ? 3000 * u(g) : 40 * u(g));
  } else {
    // within the key's range, and within what the demo engine (1.2 MW) and the model run
    double lo = k.low, hi = std::fmin(k.high, std::fmax(k.low, 0.0) + 5000);
    if (name == "power") lo = 0.1e6, hi = 1.3e6;
    if (name == "starts") lo = 0, hi = 3;
    if (name == "excess-air-ratio") lo = 1.4, hi = 2.2;
    core = lo + (hi - lo) * u(g);
    if (u(g) < 0.05) core = u(g) < 0.5 ? lo : hi;  // at an end (snapped when written in another unit)
    out = written(g, io::from_core_unit(k.kind, unit, core));
  }
  if (u(g) < odd) {
    switch (std::uniform_int_distribution<int>(0, 12)(g)) {
      case 0: return "";
      case 1: return out + " " + (unit.empty() ? "h" : unit);  // the unit in the cell
      case 2: return "\"" + out + "\"";
      case 3: return "-" + out;
      case 4: return out + "0000";  // far out of range, for most keys
      case 5: return "abc";
      case 6: return "12x";
      case 7: return "1e999";
      case 8: return "-0";
      case 9: return ".5";
      case 10: return "  " + out + " ";
      case 11: return "5.";
      default: {  // a plain-looking cell that is not one: the line reader must leave it
        static const char* const near[] = {"+.5", "1.e2", "1e", "--1", "1..2", "0x10", "1,5e", "+", "-", "\t7", "8\t"};
        return near[std::uniform_int_distribution<int>(0, 10)(g)];
      }
    }
  }
  return out;
}

// A record file of random columns and rows; its path. In some files rows repeat the cells of an
// earlier row (a row's segment is then the one made before, unless a generic row came between),
// blank lines and remarks come between rows, and the last row may have no line end.
fs::path record(std::mt19937_64& g, int n, const std::string& file) {
  std::uniform_real_distribution<double> u(0, 1);
  const double odd = u(g) < 0.3 ? 0 : u(g) < 0.5 ? 0.002 : 0.03;  // a share of cells for the generic reader
  const double repeat = u(g) < 0.4 ? 0 : 0.7;                      // a share of rows repeating an earlier one
  const double between = u(g) < 0.8 ? 0 : 0.05;                    // a share of blank lines and remarks
  const double blank = repeat > 0 && u(g) < 0.5 ? 0.1 : 0;          // a share of rows with an empty cell
  std::vector<std::pair<std::string, std::string>> cols = {{"hours", u(g) < 0.05 ? pick(g, {"", "hr"}) : pick(g, {"h", "d", "min"})}};
  const double pw = u(g);
  if (pw < 0.45) cols.emplace_back("load", pick(g, {"%", ""}));
  else if (pw < 0.85) cols.emplace_back("power", pick(g, {"kW", "MW", "W", "kWe"}));
  else if (pw < 0.88) cols.emplace_back("power", "kW"), cols.emplace_back("load", "%");  // both: refused
  for (const Column& c : columns())
    if (u(g) < 0.35) cols.emplace_back(c.name, pick(g, c.units));
  if (u(g) < 0.05) cols.emplace_back("event", "");
  std::shuffle(cols.begin(), cols.end(), g);
  std::ofstream f(file, std::ios::binary);
  for (std::size_t c = 0; c < cols.size(); ++c)
    f << (c ? "," : "") << cols[c].first << (cols[c].second.empty() ? "" : " [" + cols[c].second + "]");
  f << "\n";
  std::vector<std::vector<std::string>> earlier;
  for (int i = 0; i < n; ++i) {
    std::vector<std::string> cells;
    if (u(g) < between) f << (u(g) < 0.5 ? "\n" : "# a remark, 1,2,3\n");
    if (!earlier.empty() && u(g) < repeat) {
      cells = earlier[std::uniform_int_distribution<std::size_t>(0, earlier.size() - 1)(g)];
    } else {
      for (const auto& [name, unit] : cols) {
        if (name == "event") cells.push_back(u(g) < 0.1 ? "oil-change" : "");
        else if (name == "hours") cells.push_back(written(g, io::from_core_unit(io::Kind::duration, unit, 1 + 200 * u(g))));
        else cells.push_back(cell(g, name, unit, odd));
      }
      if (earlier.size() < 6) earlier.push_back(cells);
    }
    if (u(g) < blank) {  // a cell left empty: its value carried from the row before, by the generic reader
      const std::size_t c = std::uniform_int_distribution<std::size_t>(0, cells.size() - 1)(g);
      if (cols[c].first != "hours") cells[c] = "";
    }
    if (u(g) < odd / 4) cells.pop_back();         // a short row
    if (u(g) < odd / 4) cells.emplace_back("7");  // a long one
    for (std::size_t c = 0; c < cells.size(); ++c) f << (c ? "," : "") << cells[c];
    if (i + 1 < n || u(g) < 0.8) f << (u(g) < 0.1 ? "\r\n" : "\n");
  }
  return file;
}
}  // namespace

TEST_CASE("generated records: the fast path gives the generic reader's segments and refusals, bit for bit") {
  const fs::path file = fs::temp_directory_path() / (std::to_string(::getpid()) + "-acidload-fast-rows.csv");
  std::mt19937_64 g(20261203);
  int accepted = 0, refused = 0;
  for (int round = 0; round < 400; ++round) {
    CAPTURE(round);
    const int n = 1 + static_cast<int>(g() % 100);
    record(g, n, file.string());
    const std::string text = site_with_record(file.string());
    CAPTURE(slurp(file));
    for (const io::RecordReading how : {io::RecordReading::hold, io::RecordReading::stream}) {
      const Outcome fast = load(text, how, false), generic = load(text, how, true);
      REQUIRE(fast.ok == generic.ok);
      if (generic.ok) {
        ++accepted;
        REQUIRE(fast.segments.size() == generic.segments.size());
        for (std::size_t i = 0; i < fast.segments.size(); ++i) {
          CAPTURE(i);
          check_same_segment(fast.segments[i], generic.segments[i]);
        }
      } else {
        ++refused;
        if (std::getenv("FAST_DEBUG")) std::fprintf(stderr, "%s | %s | %s\n", generic.key.c_str(), generic.value.c_str(), generic.expected.substr(0, 90).c_str());
        CHECK(fast.type == generic.type);
        CHECK(fast.what == generic.what);
        CHECK(fast.key == generic.key);
        CHECK(fast.value == generic.value);
        CHECK(fast.expected == generic.expected);
        CHECK(fast.file == generic.file);
        CHECK(fast.line == generic.line);
        CHECK(fast.column == generic.column);
        CHECK(fast.line_text == generic.line_text);
      }
    }
  }
  fs::remove(file);
  MESSAGE("accepted " << accepted << ", refused " << refused);
  CHECK(accepted > 200);  // the generator's point: most records are read, many are refused
  CHECK(refused > 100);
}

#include "../../libacidload/src/io/csv_stream.hpp"  // internal: the form pass against the full one

TEST_CASE("generated CSV files: the form pass (no cells made) refuses what reading every cell refuses, at the same place") {
  const fs::path file = fs::temp_directory_path() / (std::to_string(::getpid()) + "-acidload-form-pass.csv");
  std::mt19937_64 g(3122026);
  const std::vector<std::string> pieces = {"1", "2.5", " 3 ", "\"4\"", "\"a \"\"b\"\"\"", "x\"y", "\"open", "\"c\" d",
                                           "", "\xC3\xA9t\xC3\xA9", "5\r6", "#7", "\"8\"  ",
                                           // long cells: rows past the form pass's 16-byte steps, odd bytes anywhere in them
                                           "123456789.0123456", "1234567\"89012", "0.000000000001\r", "\"12345678901234567\""};
  int refused = 0, read = 0;
  for (int round = 0; round < 2000; ++round) {
    CAPTURE(round);
    std::string text = g() % 10 == 0 ? "\xEF\xBB\xBF" : "";
    const int cols = 1 + static_cast<int>(g() % 4);
    for (int c = 0; c < cols; ++c) text += (c ? "," : "") + std::string("c") + std::to_string(c);
    text += "\n";
    const int rows = static_cast<int>(g() % 8);
    for (int i = 0; i < rows; ++i) {
      if (g() % 12 == 0) text += g() % 2 ? "\n" : "# note\n";
      int n = cols;
      if (g() % 15 == 0) n += g() % 2 ? 1 : -1;
      for (int c = 0; c < n; ++c) {
        const std::size_t k = g() % 40;
        text += (c ? "," : "") + (k < pieces.size() ? pieces[k] : std::to_string(g() % 1000));
      }
      if (i + 1 < rows || g() % 5 != 0) text += g() % 8 == 0 ? "\r\n" : "\n";  // the last line at times without its end
    }
    CAPTURE(text);
    std::ofstream(file, std::ios::binary) << text;
    const io::detail::CsvFileFacts facts = io::detail::scan_csv_file(file.string(), 1u << 20);
    const io::detail::CsvRowSink none = [](const std::vector<std::string>&, const std::vector<int>&, int, std::string_view) {};
    const auto outcome = [&](bool form_only) {
      io::CsvTable header;
      try {
        return "rows " + std::to_string(io::detail::stream_csv_file(file.string(), facts, header, none, form_only));
      } catch (const InputError& e) {
        return std::string(e.what()) + " | " + e.key() + " | " + e.value() + " | " + e.expected() + " | " +
               std::to_string(e.where().line) + ":" + std::to_string(e.where().column) + " | " + e.where().line_text;
      }
    };
    const std::string full = outcome(false), form = outcome(true);
    CHECK(form == full);
    (full.rfind("rows ", 0) == 0 ? read : refused) += 1;
  }
  fs::remove(file);
  CHECK(read > 300);
  CHECK(refused > 300);
}

TEST_CASE("a NUL byte anywhere in a CSV file is refused at its line and column, in any 1 MB block") {
  // the expected place is counted here from the bytes written (line: one plus the LFs before it;
  // column: the bytes since the line's start, less a byte-order mark on the first line)
  const fs::path file = fs::temp_directory_path() / (std::to_string(::getpid()) + "-acidload-nul.csv");
  std::mt19937_64 g(1203);
  for (int round = 0; round < 12; ++round) {
    CAPTURE(round);
    std::string text = round % 3 == 0 ? "\xEF\xBB\xBF" : "";
    text += "hours [h],h2s [ppmv]\n";
    const std::size_t size = round < 4 ? 200 : (1u << 20) * (1 + round % 3) + g() % 5000;
    while (text.size() < size) text += std::to_string(g() % 100) + "," + std::string(g() % 40, '7') + "\n";
    const std::size_t at = round == 0 ? 3 : round == 1 ? 1 : g() % text.size();  // 0: right after the mark
    text[at] = '\0';
    std::ofstream(file, std::ios::binary) << text;
    const std::size_t lf = text.rfind('\n', at == 0 ? 0 : at - 1);
    const std::size_t start = lf == std::string::npos || lf >= at ? 0 : lf + 1;
    const int line = 1 + static_cast<int>(std::count(text.begin(), text.begin() + static_cast<long>(at), '\n'));
    const bool mark = text.compare(0, 3, "\xEF\xBB\xBF") == 0;  // still whole after the change
    const int column = static_cast<int>(at - start) + 1 - (start == 0 && mark ? 3 : 0);
    try {
      io::detail::scan_csv_file(file.string(), 1u << 30);
      FAIL("accepted");
    } catch (const InputError& e) {
      CHECK(e.value() == "byte 0x00");
      CHECK(e.where().line == line);
      CHECK(e.where().column == column);
    }
  }
  fs::remove(file);
}

TEST_CASE("the digest of a CSV file tells any one byte changed, wherever it is") {
  const fs::path file = fs::temp_directory_path() / (std::to_string(::getpid()) + "-acidload-digest.csv");
  std::mt19937_64 g(31203);
  std::string text;
  while (text.size() < (1u << 21) + 77) text += std::to_string(g() % 100000) + ",1\n";  // two blocks and a tail
  std::ofstream(file, std::ios::binary) << text;
  const std::uint64_t digest = io::detail::scan_csv_file(file.string(), 1u << 30).digest;
  CHECK(io::detail::scan_csv_file(file.string(), 1u << 30).digest == digest);  // the same bytes, the same digest
  std::vector<std::size_t> places = {0, 7, 8, 31, 32, 33, (1u << 20) - 1, 1u << 20, text.size() - 1, text.size() - 9};
  for (int k = 0; k < 40; ++k) places.push_back(g() % text.size());
  for (const std::size_t at : places) {
    CAPTURE(at);
    std::string changed = text;
    changed[at] = changed[at] == '5' ? '6' : '5';
    std::ofstream(file, std::ios::binary) << changed;
    CHECK(io::detail::scan_csv_file(file.string(), 1u << 30).digest != digest);
  }
  fs::remove(file);
}

TEST_CASE("a CSV file read in pieces gives the whole-file parser's rows, with a line longer than a piece and a hook taking some rows") {
  // the reference is read_csv (the file parsed whole, no pieces): every row's cells, columns and line
  const fs::path file = fs::temp_directory_path() / (std::to_string(::getpid()) + "-acidload-pieces.csv");
  std::mt19937_64 g(120326);
  for (int round = 0; round < 3; ++round) {
    CAPTURE(round);
    std::string text = "a,b,c\n";
    while (text.size() < (3u << 20) + 1234) {
      const auto r = g() % 1000;
      if (r == 0 && g() % 30 == 0) text += "# " + std::string((1u << 20) + g() % 300000, 'x') + "\n";  // longer than a piece
      else if (r == 1) text += "\n";
      else text += std::to_string(g() % 1000) + "," + (r % 7 == 0 ? " \"q\" " : std::to_string(r)) + "," + std::to_string(g() % 10) + (r % 5 == 0 ? "\r\n" : "\n");
    }
    if (round == 1) text.pop_back();  // no final line end
    std::ofstream(file, std::ios::binary) << text;
    const io::CsvTable whole = io::read_csv(file.string(), 1u << 30);
    const io::detail::CsvFileFacts facts = io::detail::scan_csv_file(file.string(), 1u << 30);
    std::vector<std::vector<std::string>> rows;
    std::vector<int> lines;
    std::vector<std::vector<int>> columns;
    const io::detail::CsvRowSink sink = [&](const std::vector<std::string>& c, const std::vector<int>& cols, int l, std::string_view) {
      rows.push_back(c), columns.push_back(cols), lines.push_back(l);
    };
    struct Taken {
      std::vector<std::vector<std::string>>* rows;
      std::vector<int>* lines;
    } taken{&rows, &lines};
    io::detail::CsvLineHook hook;
    hook.context = &taken;
    hook.take = [](void* c, std::string_view line, int n) {  // rows on even lines without a quote, split by commas
      if (n % 2 != 0 || line.find('"') != std::string_view::npos) return false;
      auto& t = *static_cast<Taken*>(c);
      std::vector<std::string> cells(1);
      for (const char ch : line) {
        if (ch == ',') cells.emplace_back();
        else cells.back().push_back(ch);
      }
      t.rows->push_back(cells), t.lines->push_back(n);
      return true;
    };
    for (const bool with_hook : {false, true}) {
      CAPTURE(with_hook);
      rows.clear(), lines.clear(), columns.clear();
      io::CsvTable header;
      const std::size_t n = io::detail::stream_csv_file(file.string(), facts, header, sink, false, with_hook ? hook : io::detail::CsvLineHook{});
      REQUIRE(n == whole.rows.size());
      REQUIRE(rows.size() == whole.rows.size());
      std::size_t sunk = 0;
      for (std::size_t i = 0; i < rows.size(); ++i) {
        CHECK(lines[i] == whole.lines[i]);
        CHECK(rows[i] == whole.rows[i]);
        if (!with_hook || lines[i] % 2 != 0 || std::find(whole.rows[i].begin(), whole.rows[i].end(), "q") != whole.rows[i].end()) {
          REQUIRE(sunk < columns.size());
          CHECK(columns[sunk++] == whole.columns[i]);
        }
      }
      io::CsvTable form_header;
      CHECK(io::detail::stream_csv_file(file.string(), facts, form_header, sink, true) == whole.rows.size());
    }
  }
  fs::remove(file);
}
