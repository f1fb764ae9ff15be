// Unit tests: the CSV reader. Expected lines and columns are counted by hand in each literal.
#include <doctest/doctest.h>

#include <cstdio>
#include <fstream>
#include <string>

#include "acidload/core/error.hpp"
#include "acidload/io/csv.hpp"

using namespace acidload;
using namespace acidload::io;

namespace {

InputError csv_error(const std::string& text) {
  try {
    parse_csv(text, "r.csv");
  } catch (const InputError& e) {
    return e;
  }
  FAIL("no InputError for: " << text);
  return InputError("", "", "");
}

bool contains(const std::string& s, const std::string& part) { return s.find(part) != std::string::npos; }

}  // namespace

TEST_CASE("header, rows, comments, blank lines, trimming, 1-based lines and columns") {
  const std::string text =
      "# operating record\n"          // line 1
      "time, power ,  note\n"         // line 2
      "\n"                            // line 3
      "0 h, 1.1 MW, start\n"          // line 4
      "   # a comment after spaces\n" // line 5
      "24 h,1.2 MW,\"a, b\"\n";       // line 6
  const CsvTable t = parse_csv(text, "r.csv");
  CHECK(t.header == std::vector<std::string>{"time", "power", "note"});
  REQUIRE(t.rows.size() == 2);
  CHECK(t.rows[0] == std::vector<std::string>{"0 h", "1.1 MW", "start"});
  CHECK(t.rows[1] == std::vector<std::string>{"24 h", "1.2 MW", "a, b"});
  CHECK(t.lines == std::vector<int>{4, 6});
  CHECK(t.columns[0] == std::vector<int>{1, 6, 14});
  CHECK(t.columns[1] == std::vector<int>{1, 6, 13});  // the opening quote
  CHECK(t.column("power") == 1);
  CHECK(t.column("Power") == -1);
  CHECK(t.text.size() == 6);
  const InputError e = t.error(1, 1, "a power below 1 MW");
  CHECK(std::string(e.what()) ==
        "r.csv:6:6: 'power' = '1.2 MW': expected a power below 1 MW\n"
        "  24 h,1.2 MW,\"a, b\"\n"
        "       ^");
}

TEST_CASE("quotes: \"\" escapes, spaces around, CR LF line ends, a byte-order mark") {
  const CsvTable t = parse_csv("\xEF\xBB\xBF" "a,b\r\n\"say \"\"hi\"\"\" , \"\"\r\n", "r.csv");
  CHECK(t.header == std::vector<std::string>{"a", "b"});  // no mark left on "a"
  REQUIRE(t.rows.size() == 1);
  CHECK(t.rows[0] == std::vector<std::string>{"say \"hi\"", ""});
  CHECK(t.lines[0] == 2);
  CHECK(t.text[1] == "\"say \"\"hi\"\"\" , \"\"");
  const CsvTable last = parse_csv("a,b\n1,\n", "r.csv");  // an empty last cell, no line end at EOF ok
  CHECK(last.rows[0] == std::vector<std::string>{"1", ""});
  CHECK(parse_csv("a\n1", "r.csv").rows.size() == 1);
}

TEST_CASE("ragged rows name the line and column") {
  const InputError more = csv_error("a,b\n1,2\n3,4,5\n");
  CHECK(more.where().line == 3);
  CHECK(more.where().column == 5);  // the extra cell
  CHECK(more.value() == "5");
  CHECK(contains(more.what(), "2 cells, as the header has (this row has 3)"));
  const InputError fewer = csv_error("a,b,c\n1,2\n");
  CHECK(fewer.where().line == 2);
  CHECK(fewer.where().column == 4);  // the line's end
  CHECK(fewer.key() == "c");          // the first missing column
}

TEST_CASE("quote errors") {
  const InputError open = csv_error("a,b\n1,\"open\n2,3\n");
  CHECK(open.where().line == 2);
  CHECK(open.where().column == 3);
  CHECK(contains(open.what(), "a closing quote on the same line"));
  const InputError after = csv_error("a,b\n\"x\"y,2\n");
  CHECK(after.where().line == 2);
  CHECK(after.where().column == 4);
  CHECK(contains(after.what(), "a comma or the line end after the closing quote"));
  const InputError inside = csv_error("a,b\n1,x\"y\n");
  CHECK(inside.where().column == 4);
  CHECK(contains(inside.what(), "quoted as a whole"));
  CHECK(contains(csv_error("a,b\n1,2\r3,4\n").what(), "lone CR"));
}

TEST_CASE("header problems, empty files, limits") {
  const InputError dup = csv_error("time, power, time\n1,2,3\n");
  CHECK(dup.where().line == 1);
  CHECK(dup.where().column == 14);
  CHECK(contains(dup.what(), "duplicate column 'time' (first in column 1)"));
  CHECK(contains(csv_error("a,,c\n1,2,3\n").what(), "a column name in every header cell"));
  CHECK(contains(csv_error("").what(), "a header row"));
  CHECK(contains(csv_error("# only a comment\n\n").what(), "a header row"));
  const InputError none = csv_error("\na,b\n");
  CHECK(none.where().line == 2);
  CHECK(contains(none.what(), "at least one data row"));
  const InputError nul = csv_error(std::string("a,b\n1,\0\n", 8));
  CHECK(nul.where().line == 2);
  CHECK(nul.where().column == 3);
  CHECK_THROWS_AS(parse_csv("a,b\n1,2\n", "r.csv", 4), InputError);
}

TEST_CASE("read_csv: a missing file names it; a real file reads") {
  try {
    read_csv("no/such/record.csv");
    FAIL("no throw");
  } catch (const InputError& e) {
    CHECK(e.where().file == "no/such/record.csv");
    CHECK(contains(e.what(), "cannot open"));
  }
  const std::string path = "test_io_csv_record.csv";
  {
    std::ofstream out(path);
    out << "t,p\n0 h,1 MW\n";
  }
  const CsvTable t = read_csv(path);
  CHECK(t.file == path);
  CHECK(t.rows[0][1] == "1 MW");
  CHECK_THROWS_AS(read_csv(path, 5), InputError);
  std::remove(path.c_str());
}

TEST_CASE("a huge cell gives a message of bounded size, its start and length shown, the caret still placed") {
  // a 3 MB cell holding a quote: refused at the quote; the message shows neither the whole cell
  // nor the whole line (a 30 MB cell once gave a 90 MB message)
  const std::string cell(3'000'000, 'x');
  const InputError e = csv_error("hours,h2s\n1," + cell + "\"y\n");
  const std::string m = e.what();
  CHECK(m.size() < 1000);
  CHECK(contains(m, "r.csv:2:3000003"));
  CHECK(contains(m, "bytes in all)"));
  // the caret stands under the quote in the window shown: the window's text ends "x\"y"
  const auto lines_start = m.find("\n  ");
  REQUIRE(lines_start != std::string::npos);
  const std::string shown = m.substr(lines_start + 3, m.find('\n', lines_start + 3) - lines_start - 3);
  const std::string caret = m.substr(m.rfind('\n') + 3);
  REQUIRE(caret.size() >= 1);
  // the caret column in the shown line (count characters: "…" is one)
  std::size_t chars = 0, at = 0;
  for (; at < shown.size() && chars < caret.size() - 1; ++at)
    if ((static_cast<unsigned char>(shown[at]) & 0xC0) != 0x80) ++chars;
  while (at < shown.size() && (static_cast<unsigned char>(shown[at]) & 0xC0) == 0x80) ++at;
  CHECK(shown.substr(at, 1) == "\"");
}

TEST_CASE("one quantity in two columns (other units) is refused at the second header cell") {
  const CsvTable t = parse_csv("hours [h],h2s [ppmv],h2s [mg/Nm3]\n1,2,3\n", "r.csv");
  try {
    named_columns(t, {"hours", "h2s"}, "record column");
    FAIL("two h2s columns accepted");
  } catch (const InputError& e) {
    CHECK(contains(e.what(), "r.csv:1:22"));
    CHECK(contains(e.what(), "also column 2"));
  }
}
