// A record CSV is read row by row into segments (no tree of the whole file): the segments must be
// those of the same rows written as inline YAML segments (a second, independent path through the
// YAML parser), and a mistake deep in a long file must be found at its own line and column.
#include <doctest/doctest.h>

#include <cstring>
#include <filesystem>
#include <fstream>
#include <sstream>
#include <string>

#include <unistd.h>

#include "acidload/acidload.hpp"
#include "acidload/io/case_file.hpp"
#include "acidload/io/csv.hpp"

using namespace acidload;

namespace {
namespace fs = std::filesystem;

// A scratch file name of this process (engineers share the machine's /tmp).
fs::path scratch(const std::string& name) {
  return fs::temp_directory_path() / (std::to_string(::getpid()) + "-" + name);
}

std::string slurp(const fs::path& p) {
  std::ifstream f(p, std::ios::binary);
  std::ostringstream s;
  s << f.rdbuf();
  return s.str();
}

template <class T>
bool same_bits(const T& a, const T& b) {
  return std::memcmp(&a, &b, sizeof(T)) == 0;
}

// The CSV's rows as an inline `segments:` list at `indent` spaces: every cell as written, a bare
// number followed by its header's unit (as the record's header gives it), empty cells left out.
std::string inline_segments(const fs::path& csv, int indent) {
  const io::CsvTable t = io::read_csv(csv.string());
  const std::string pad(static_cast<std::size_t>(indent), ' ');
  std::string out = pad + "segments:\n";
  for (const auto& row : t.rows) {
    bool first = true;
    for (std::size_t c = 0; c < row.size(); ++c) {
      if (row[c].empty()) continue;
      std::string name = t.header[c], unit;
      if (const auto br = name.find('['); br != std::string::npos) {
        unit = name.substr(br + 1, name.size() - br - 2);
        name = name.substr(0, name.find_last_not_of(' ', br - 1) + 1);
      }
      const bool bare = row[c].find_first_not_of("+-.0123456789eE") == std::string::npos;
      out += pad + (first ? "  - " : "    ") + name + ": " + row[c] + (bare && !unit.empty() ? " " + unit : "") + "\n";
      first = false;
    }
  }
  return out;
}

// Field by field: Operation holds NoxEmission, whose enum leaves padding that memcmp would read (it
// differs between builds, e.g. under the sanitizers).
bool same_operation(const Operation& a, const Operation& b) {
  return same_bits(a.fuel_flow, b.fuel_flow) && same_bits(a.electrical_power, b.electrical_power) &&
         same_bits(a.load, b.load) && same_bits(a.air.excess_air_ratio, b.air.excess_air_ratio) &&
         same_bits(a.air.water_fraction, b.air.water_fraction) && same_bits(a.blowby_share, b.blowby_share) &&
         same_bits(a.blowby_flow, b.blowby_flow) && same_bits(a.jacket_water_out, b.jacket_water_out) &&
         same_bits(a.coldest_crankcase_surface, b.coldest_crankcase_surface) &&
         same_bits(a.crankcase_pressure, b.crankcase_pressure) && same_bits(a.exhaust_pressure, b.exhaust_pressure) &&
         same_bits(a.starts_per_hour, b.starts_per_hour) && same_bits(a.jacket_water_at_start, b.jacket_water_at_start) &&
         same_bits(a.nox.value, b.nox.value) && a.nox.unit == b.nox.unit && same_bits(a.nox.o2_reference, b.nox.o2_reference) &&
         same_bits(a.nox.o2_air, b.nox.o2_air);
}
static_assert(sizeof(Operation) == 13 * sizeof(double) + sizeof(NoxEmission),
              "a field was added to Operation: compare it in same_operation");

void check_same_record(const std::vector<Segment>& a, const std::vector<Segment>& b) {
  REQUIRE(a.size() == b.size());
  for (std::size_t i = 0; i < a.size(); ++i) {
    CAPTURE(i);
    CHECK(same_bits(a[i].hours, b[i].hours));
    CHECK(same_bits(a[i].calendar_hours, b[i].calendar_hours));
    CHECK(same_bits(a[i].starts, b[i].starts));
    CHECK(same_bits(a[i].fuel.x, b[i].fuel.x));  // field by field: the struct has padding
    CHECK(same_bits(a[i].fuel.other_sulfur, b[i].fuel.other_sulfur));
    CHECK(same_bits(a[i].fuel.chlorine, b[i].fuel.chlorine));
    CHECK(same_bits(a[i].fuel.fluorine, b[i].fuel.fluorine));
    CHECK(same_bits(a[i].fuel.reference, b[i].fuel.reference));
    CHECK(a[i].fuel.combustion == b[i].fuel.combustion);
    CHECK(same_operation(a[i].operation, b[i].operation));
    CHECK(same_bits(a[i].oil_temperature, b[i].oil_temperature));
    CHECK(same_bits(a[i].oil_consumption, b[i].oil_consumption));
    REQUIRE(a[i].events.size() == b[i].events.size());
    for (std::size_t k = 0; k < a[i].events.size(); ++k) {
      CHECK(a[i].events[k].kind == b[i].events[k].kind);
      CHECK(same_bits(a[i].events[k].amount, b[i].events[k].amount));
    }
  }
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

// A record of `rows` hourly rows (hours, H2S, load) with row `bad` (0-based) replaced.
fs::path long_record(const std::string& name, int rows, int bad, const std::string& bad_row) {
  const fs::path p = scratch(name);
  std::ofstream f(p);
  f << "hours [h],h2s [ppmv],load [%]\n";
  for (int i = 0; i < rows; ++i) {
    if (i == bad)
      f << bad_row << "\n";
    else
      f << "1," << 300 + i % 97 << "," << 80 + i % 13 << "\n";
  }
  return p;
}
}  // namespace

TEST_CASE("the bundled CSV records give the segments of the same rows written inline") {
  const fs::path cases = fs::path(ACIDLOAD_SOURCE_DIR) / "cases";
  const std::string text = slurp(cases / "drifting-gas.yaml");
  // the record's file and the variant's, replaced by the same rows inline
  std::string inlined;
  std::istringstream in(text);
  std::string line;
  int replaced = 0;
  while (std::getline(in, line)) {
    const auto at = line.find("file: ");
    if (at != std::string::npos && line.find(".csv") != std::string::npos) {
      const std::string name = line.substr(at + 6, line.find(".csv") + 4 - at - 6);
      inlined += inline_segments(cases / name, static_cast<int>(at));
      ++replaced;
      continue;
    }
    inlined += line + "\n";
  }
  REQUIRE(replaced == 2);
  const io::CaseFile streamed = io::load_case((cases / "drifting-gas.yaml").string());
  const io::CaseFile inline_ = io::load_case_text(inlined, "inline.yaml", cases.string());
  REQUIRE(streamed.variants.size() == inline_.variants.size());
  for (std::size_t v = 0; v < streamed.variants.size(); ++v) {
    CAPTURE(v);
    CHECK(streamed.variants[v].record.size() > 20);
    check_same_record(streamed.variants[v].record, inline_.variants[v].record);
  }
}

TEST_CASE("a bad cell deep in a long record is found at its own line, column and key") {
  const int rows = 200000, bad = 187654;
  const fs::path csv = long_record("acidload-deep-bad.csv", rows, bad, "1, 12x ,85");
  try {
    io::load_case_text(site_with_record(csv.string()), "site.yaml", ".");
    FAIL("the bad cell was accepted");
  } catch (const InputError& e) {
    CHECK(e.where().file == csv.string());
    CHECK(e.where().line == bad + 2);  // the header is line 1
    CHECK(e.where().column == 4);      // the cell's first character, after the comma and a space
    CHECK(e.key() == "record[" + std::to_string(bad) + "].h2s");
    CHECK(e.value() == "12x");
    CHECK(e.where().line_text == "1, 12x ,85");
  }
  // a value out of range, near the end: the registry's range in the unit written
  const fs::path csv2 = long_record("acidload-deep-range.csv", rows, rows - 3, "1,300,150");
  try {
    io::load_case_text(site_with_record(csv2.string()), "site.yaml", ".");
    FAIL("the load of 150 % was accepted");
  } catch (const InputError& e) {
    CHECK(e.where().line == rows - 3 + 2);
    CHECK(e.where().column == 7);
    CHECK(e.key() == "record[" + std::to_string(rows - 3) + "].load");
    CHECK(e.value() == "150 %");
    CHECK(e.expected().find("from 5 to 120 %") != std::string::npos);
  }
  fs::remove(csv);
  fs::remove(csv2);
}

TEST_CASE("a mistake in the file's form is reported before an earlier bad value, as the whole-table reader does") {
  const int rows = 50000;
  fs::path csv = long_record("acidload-form-late.csv", rows, rows - 10, "1,300,85,7");  // an extra cell
  // and a bad value early on
  std::string text = slurp(csv);
  text.replace(text.find("\n1,") + 1, 1, "x");
  std::ofstream(csv, std::ios::binary) << text;
  try {
    io::load_case_text(site_with_record(csv.string()), "site.yaml", ".");
    FAIL("accepted");
  } catch (const InputError& e) {
    CHECK(e.where().line == rows - 10 + 2);
    CHECK(e.key() == "(extra cell)");
    CHECK(e.value() == "7");
    CHECK(e.where().line_text == "1,300,85,7");
  }
  fs::remove(csv);
}

TEST_CASE("a gas resolved again for a repeated H2S figure is the gas resolved afresh") {
  // rows alternate between two figures (the second and later rows take the reader's table of gases);
  // a one-row record of each figure resolves it with an empty table
  const auto one = [&](const std::string& name, const std::string& rows) {
    const fs::path p = scratch(name);
    std::ofstream(p) << "hours [h],h2s [ppmv],load [%]\n" << rows;
    auto record = io::load_case_text(site_with_record(p.string()), "site.yaml", ".").variants.front().record;
    fs::remove(p);
    return record;
  };
  std::string alternating;
  for (int i = 0; i < 400; ++i) alternating += i % 2 ? "1,450.5,85\n" : "1,300,85\n";
  const auto rec = one("acidload-alternating.csv", alternating);
  const auto a = one("acidload-only-300.csv", "1,300,85\n");
  const auto b = one("acidload-only-450.csv", "1,450.5,85\n");
  REQUIRE(rec.size() == 400);
  for (std::size_t i = 0; i < rec.size(); ++i) {
    CAPTURE(i);
    const FuelGas& want = (i % 2 ? b : a).front().fuel;
    CHECK(same_bits(rec[i].fuel.x, want.x));
    CHECK(same_bits(rec[i].fuel.other_sulfur, want.other_sulfur));
    CHECK(same_bits(rec[i].operation, (i % 2 ? b : a).front().operation));
  }
}

TEST_CASE("an operation the model refuses is found after many rows of one accepted state") {
  // the operation check skips states it has checked; a new state deep in the record is checked
  const int rows = 150000;
  const fs::path p = scratch("acidload-deep-operation.csv");
  {
    std::ofstream f(p);
    f << "hours [h],h2s [ppmv],load [%],excess-air-ratio\n";
    for (int i = 0; i < rows; ++i) f << (i == rows - 7 ? "1,300,85,1.0\n" : "1,300,85,1.7\n");
  }
  // λ = 1 leaves no excess O2 for the engine's NOx figure: refused, as by a tree of the whole file
  try {
    io::load_case_text(site_with_record(p.string()), "site.yaml", ".");
    FAIL("λ = 1 with NOx was accepted");
  } catch (const InputError& e) {
    CHECK(e.expected().find("less NO2 than the excess O2 can form") != std::string::npos);
  }
  fs::remove(p);
}

// ---- a record streamed from its file (RecordReading::stream: `acidload check`, `run`, Python) ----

namespace {
// The segments a streamed record hands out, read through once.
std::vector<Segment> read_through(const EngineCase& c) {
  REQUIRE(c.streamed);
  std::vector<Segment> out;
  const SegmentSource next = c.streamed->open();
  while (const Segment* s = next()) out.push_back(*s);
  return out;
}

void load_streamed_expecting(const fs::path& csv, int line, int column, const std::string& key, const std::string& value) {
  try {
    io::load_case_text(site_with_record(csv.string()), "site.yaml", ".", {}, io::RecordReading::stream);
    FAIL("accepted");
  } catch (const InputError& e) {
    CHECK(e.where().file == csv.string());
    CHECK(e.where().line == line);
    CHECK(e.where().column == column);
    CHECK(e.key() == key);
    CHECK(e.value() == value);
  }
}
}  // namespace

TEST_CASE("a streamed record hands out the very segments of the held record and of the same rows inline") {
  // the inline YAML rows are the independent path (the YAML parser, no CSV reader)
  const fs::path cases = fs::path(ACIDLOAD_SOURCE_DIR) / "cases";
  const std::string text = slurp(cases / "drifting-gas.yaml");
  std::string inlined;
  std::istringstream in(text);
  std::string line;
  while (std::getline(in, line)) {
    const auto at = line.find("file: ");
    if (at != std::string::npos && line.find(".csv") != std::string::npos) {
      inlined += inline_segments(cases / line.substr(at + 6, line.find(".csv") + 4 - at - 6), static_cast<int>(at));
      continue;
    }
    inlined += line + "\n";
  }
  const std::string path = (cases / "drifting-gas.yaml").string();
  const io::CaseFile streamed = io::load_case(path, {}, io::RecordReading::stream);
  const io::CaseFile held = io::load_case(path);
  const io::CaseFile inline_ = io::load_case_text(inlined, "inline.yaml", cases.string());
  REQUIRE(streamed.variants.size() == held.variants.size());
  for (std::size_t v = 0; v < streamed.variants.size(); ++v) {
    CAPTURE(v);
    const EngineCase& s = streamed.variants[v];
    CHECK(s.record.empty());  // nothing held
    const std::vector<Segment> a = read_through(s);
    check_same_record(a, inline_.variants[v].record);
    check_same_record(a, held.variants[v].record);
    check_same_record(read_through(s), a);  // a second reading is the same
    CHECK(record_segments(s) == held.variants[v].record.size());
    CHECK(same_bits(record_hours(s), record_hours(held.variants[v])));
    check_same_record({first_segment(s)}, {held.variants[v].record.front()});
    // the run over the stream is the run over the held segments, point for point
    const VariantSummary rs = summarize(s), rh = summarize(held.variants[v]);
    REQUIRE(rs.run.trajectory.size() == rh.run.trajectory.size());
    for (std::size_t i = 0; i < rs.run.trajectory.size(); ++i) {
      CHECK(same_bits(rs.run.trajectory[i].engine_hours, rh.run.trajectory[i].engine_hours));
      CHECK(same_bits(rs.run.trajectory[i].tbn_d2896, rh.run.trajectory[i].tbn_d2896));
      CHECK(same_bits(rs.run.trajectory[i].san, rh.run.trajectory[i].san));
    }
    CHECK(same_bits(rs.charge.drain_interval, rh.charge.drain_interval));
    // a study that indexes segments gets them read in
    check_same_record(held_record(s, io::max_record_rows).record, held.variants[v].record);
  }
}

TEST_CASE("a bad cell deep in a streamed record longer than the held cap is found at its line and column") {
  const int rows = static_cast<int>(io::max_record_rows) + 200000, bad = static_cast<int>(io::max_record_rows) + 123456;
  const fs::path csv = long_record("acidload-streamed-deep.csv", rows, bad, "1,300, 8o5");
  load_streamed_expecting(csv, bad + 2, 8, "record[" + std::to_string(bad) + "].load", "8o5");
  // the same file without the bad row: accepted when streamed; refused when its segments would be held
  {
    std::string text = slurp(csv);
    text.replace(text.find("1,300, 8o5"), 10, "1,300, 805");  // a load of 805 %: over the range, same length
    std::ofstream(csv, std::ios::binary) << text;
  }
  load_streamed_expecting(csv, bad + 2, 8, "record[" + std::to_string(bad) + "].load", "805 %");
  {
    std::string text = slurp(csv);
    text.replace(text.find("1,300, 805"), 10, "1,300,  85");
    std::ofstream(csv, std::ios::binary) << text;
  }
  const io::CaseFile c = io::load_case_text(site_with_record(csv.string()), "site.yaml", ".", {}, io::RecordReading::stream);
  CHECK(record_segments(c.variants.front()) == static_cast<std::size_t>(rows));
  CHECK(record_hours(c.variants.front()) == rows);  // every row 1 h: exact in binary
  try {
    io::load_case_text(site_with_record(csv.string()), "site.yaml", ".");
    FAIL("a record over the held cap was held");
  } catch (const InputError& e) {
    CHECK(e.value() == std::to_string(rows) + " segments");
    CHECK(e.expected().find("at most 1000000 segments when its segments are held") != std::string::npos);
  }
  try {
    (void)held_record(c.variants.front(), io::max_record_rows);
    FAIL("read in past the cap");
  } catch (const InputError& e) {
    CHECK(e.key() == "record");
  }
  fs::remove(csv);
}

TEST_CASE("a form mistake late in a streamed record comes before an earlier bad value, with its caret line") {
  const int rows = 300000;
  fs::path csv = long_record("acidload-streamed-form.csv", rows, rows - 5, "1,\"300,85");  // a quote left open
  std::string text = slurp(csv);
  text.replace(text.find("\n1,") + 1, 1, "x");  // and a bad value in the first row
  std::ofstream(csv, std::ios::binary) << text;
  try {
    io::load_case_text(site_with_record(csv.string()), "site.yaml", ".", {}, io::RecordReading::stream);
    FAIL("accepted");
  } catch (const InputError& e) {
    CHECK(e.where().line == rows - 5 + 2);
    CHECK(e.where().column == 3);  // the opening quote
    CHECK(e.where().line_text == "1,\"300,85");
    CHECK(e.expected().find("closing quote") != std::string::npos);
  }
  fs::remove(csv);
}

TEST_CASE("a streamed record whose file changed since loading is refused, before anything runs") {
  const fs::path csv = long_record("acidload-streamed-changed.csv", 5000, -1, "");
  const io::CaseFile c = io::load_case_text(site_with_record(csv.string()), "site.yaml", ".", {}, io::RecordReading::stream);
  const EngineCase& v = c.variants.front();
  const io::CaseFile held = io::load_case_text(site_with_record(csv.string()), "site.yaml", ".");
  CHECK(same_bits(summarize(v).run.engine_hours, summarize(held.variants.front()).run.engine_hours));  // unchanged: runs
  const auto refused = [&](const std::string& how) {
    try {
      (void)summarize(v);
      FAIL("a changed record was run");
    } catch (const InputError& e) {
      CHECK(e.key() == "record.file");
      CHECK(e.where().file == csv.string());
      CHECK(e.expected().find(how) != std::string::npos);
    }
  };
  // one figure changed, the same size and the same modification time: only the digest tells
  const auto when = fs::last_write_time(csv);
  std::string text = slurp(csv);
  const std::size_t at = text.rfind(",300,");
  text[at + 1] = '4';
  std::ofstream(csv, std::ios::binary) << text;
  fs::last_write_time(csv, when);
  refused("it has changed since");
  // appended to
  std::ofstream(csv, std::ios::app) << "1,300,85\n";
  refused("it has changed since");
  fs::remove(csv);
  refused("can no longer be read");
}
