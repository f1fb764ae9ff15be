// Unit tests: the YAML reader (marks, key paths, duplicate keys, limits, refused YAML features),
// closest() and require_keys().
// Every expected line and column below is counted by hand in the literal text of its test.
#include <doctest/doctest.h>

#include <cstdio>
#include <fstream>
#include <string>

#include "acidload/core/error.hpp"
#include "acidload/io/document.hpp"
#include "acidload/io/key_checks.hpp"
#include "acidload/io/suggestions.hpp"

using namespace acidload;
using namespace acidload::io;

namespace {

// The InputError parse_document throws for `text`; fails the test if it does not throw one.
InputError parse_error(const std::string& text, const ReadLimits& limits = {}) {
  try {
    parse_document(text, "t.yaml", limits);
  } catch (const InputError& e) {
    return e;
  }
  FAIL("no InputError for: " << text);
  return InputError("", "", "");
}

bool contains(const std::string& s, const std::string& part) { return s.find(part) != std::string::npos; }

}  // namespace

TEST_CASE("marks are 1-based and exact; key paths name maps and list items") {
  //                       col: 1234567890123
  const std::string text = "case: demo\n"        // line 1
                           "engine:\n"           // line 2
                           "  power: 1.2 MW\n"   // line 3
                           "  oil: [a, \"b c\"]\n"  // line 4
                           "variants:\n"         // line 5
                           "  - name: x\n"       // line 6
                           "  - name: y\n";      // line 7
  const Document d = parse_document(text, "t.yaml");
  REQUIRE(d.root.type == Node::Type::map);
  CHECK(d.root.mark.line == 1);
  CHECK(d.root.mark.column == 1);
  CHECK(d.root.path == "");
  REQUIRE(d.root.entries.size() == 3);
  CHECK(d.root.entries[1].first == "engine");
  CHECK(d.root.key_marks[1].line == 2);
  CHECK(d.root.key_marks[1].column == 1);

  const Node* engine = d.root.find("engine");
  REQUIRE(engine);
  CHECK(engine->type == Node::Type::map);
  CHECK(engine->path == "engine");
  CHECK(engine->mark.line == 3);  // a block map starts at its first key
  CHECK(engine->mark.column == 3);
  const Node* power = engine->find("power");
  REQUIRE(power);
  CHECK(power->scalar == "1.2 MW");
  CHECK_FALSE(power->quoted);
  CHECK(power->path == "engine.power");
  CHECK(power->mark.line == 3);
  CHECK(power->mark.column == 10);
  CHECK(engine->key_marks[0].line == 3);
  CHECK(engine->key_marks[0].column == 3);

  const Node* oil = engine->find("oil");
  REQUIRE(oil);
  CHECK(oil->type == Node::Type::sequence);
  CHECK(oil->mark.line == 4);
  CHECK(oil->mark.column == 8);  // the '['
  REQUIRE(oil->items.size() == 2);
  CHECK(oil->items[1].scalar == "b c");
  CHECK(oil->items[1].quoted);
  CHECK(oil->items[1].path == "engine.oil[1]");  // 0-based index
  CHECK(oil->items[1].mark.column == 12);          // the opening quote

  const Node* variants = d.root.find("variants");
  REQUIRE(variants);
  REQUIRE(variants->items.size() == 2);
  const Node* y = variants->items[1].find("name");
  REQUIRE(y);
  CHECK(y->path == "variants[1].name");
  CHECK(y->mark.line == 7);
  CHECK(y->mark.column == 11);
  CHECK(d.root.find("nothing") == nullptr);
  CHECK(d.lines.size() == 7);
  CHECK(d.lines[2] == "  power: 1.2 MW");
}

TEST_CASE("columns count characters, not bytes; CR LF and a byte-order mark change no mark") {
  // "tempé" is 5 characters and 6 bytes: the value 'x' is at character column 8.
  const Document d = parse_document("tempé: x\n", "t.yaml");
  CHECK(d.root.entries[0].second.mark.column == 8);
  const Document crlf = parse_document("\xEF\xBB\xBF" "a: 1\r\nb: 22\r\n", "t.yaml");
  const Node* b = crlf.root.find("b");
  REQUIRE(b);
  CHECK(b->scalar == "22");
  CHECK(b->mark.line == 2);
  CHECK(b->mark.column == 4);
  CHECK(crlf.lines[0] == "a: 1");  // neither the mark nor the CR stays in the line
}

TEST_CASE("an empty file or one of comments only gives a null root") {
  CHECK(parse_document("", "t.yaml").root.type == Node::Type::null);
  CHECK(parse_document("# nothing here\n\n", "t.yaml").root.type == Node::Type::null);
  CHECK(parse_document("---\n", "t.yaml").root.type == Node::Type::null);
  const Document d = parse_document("a:\nb: ~\n", "t.yaml");
  CHECK(d.root.find("a")->type == Node::Type::null);
  CHECK(d.root.find("b")->type == Node::Type::null);
}

TEST_CASE("a duplicate key is an error at the second key, naming the line of the first") {
  const InputError e = parse_error("a: 1\nb: 2\na: 3\n");
  CHECK(e.where().line == 3);
  CHECK(e.where().column == 1);
  CHECK(e.key() == "a");
  CHECK(contains(e.what(), "duplicate key 'a' (first at line 1)"));
  // nested and in flow style
  const InputError n = parse_error("engine:\n  power: 1 MW\n  oil: 2\n  power: 2 MW\n");
  CHECK(n.where().line == 4);
  CHECK(n.where().column == 3);
  CHECK(n.key() == "engine.power");
  CHECK(contains(n.what(), "(first at line 2)"));
  const InputError f = parse_error("x: {k: 1, k: 2}\n");
  CHECK(f.where().line == 1);
  CHECK(f.where().column == 11);
  // the same key in two different maps is no duplicate
  CHECK_NOTHROW(parse_document("a: {k: 1}\nb: {k: 1}\n", "t.yaml"));
}

TEST_CASE("error text: file:line:col, key, value, expectation and a caret under the column") {
  const InputError e = parse_error("a: 1\nbb: 2\nbb: 3\n");
  CHECK(std::string(e.what()) ==
        "t.yaml:3:1: 'bb' = 'bb': expected each key once: duplicate key 'bb' (first at line 2)\n"
        "  bb: 3\n"
        "  ^");
  const Document d = parse_document("engine:\n  power: lots\n", "c.yaml");
  const Node& power = d.root.find("engine")->entries[0].second;
  const InputError p = d.error(power, power.scalar, "a power with one of the units: W, kW, MW");
  CHECK(std::string(p.what()) ==
        "c.yaml:2:10: 'engine.power' = 'lots': expected a power with one of the units: W, kW, MW\n"
        "    power: lots\n"
        "           ^");
  const InputError top = d.error(d.root, "", "something");
  CHECK(top.key() == "(top level)");
}

TEST_CASE("syntax errors from yaml-cpp carry its position, made 1-based") {
  // yaml-cpp reports a tab-indented key as "illegal map value" at 0-based 1:2.
  const InputError tab = parse_error("a:\n\tb: 1\n");
  CHECK(tab.where().line == 2);
  CHECK(tab.where().column == 3);
  CHECK(contains(tab.what(), "valid YAML (illegal map value)"));
  const InputError flow = parse_error("a: [1, 2\n");
  CHECK(flow.where().line == 2);
  CHECK(contains(flow.what(), "end of sequence flow not found"));
  const InputError unclosed = parse_error("a: \"open\n");
  CHECK(unclosed.where().line == 1);
  CHECK(unclosed.where().column == 4);
  CHECK(contains(unclosed.what(), "a closing \" for the quote opened here"));
  CHECK(contains(parse_error("a: 'it''s\n").what(), "a closing '"));
  CHECK_NOTHROW(parse_document("a: 'it''s'\nb: \"say \\\"x\\\"\"\n", "t.yaml"));
}

TEST_CASE("nesting deeper than the limit is refused at the node, not as 'bad file' at 1:1") {
  ReadLimits lim;
  lim.max_depth = 3;
  CHECK_NOTHROW(parse_document("a:\n b:\n  c: 1\n", "t.yaml", lim));  // three maps deep
  const InputError e = parse_error("a:\n b:\n  c:\n   d: 1\n", lim);
  CHECK(e.where().line == 4);
  CHECK(e.where().column == 4);
  CHECK(e.key() == "a.b.c");
  CHECK(contains(e.what(), "at most 3 levels"));
  // 5000 nested lists: yaml-cpp alone would fail at depth 2000 with "bad file" at 1:1
  const InputError deep = parse_error(std::string(5000, '[') + std::string(5000, ']'));
  CHECK(contains(deep.what(), "at most 24 levels"));
  CHECK(deep.where().line == 1);
  CHECK(deep.where().column == 25);  // the 25th '['
  CHECK(deep.key() == "[0][0][0][0][0][0][0][0][0][0][0][0][0][0][0][0][0][0][0][0][0][0][0][0]");
  // unclosed, yaml-cpp takes the first '[' for the start of a key: refused as that
  CHECK(contains(parse_error(std::string(5000, '[')).what(), "a key that is text"));
  std::string block;
  for (int i = 0; i < 100; ++i) block += std::string(static_cast<std::size_t>(i), ' ') + "k:\n";
  CHECK(contains(parse_error(block).what(), "at most 24 levels"));
}

TEST_CASE("size and node limits") {
  ReadLimits lim;
  lim.max_bytes = 10;
  const InputError big = parse_error("a: 12345678\n", lim);  // 12 bytes
  CHECK(big.value() == "12 bytes");
  CHECK(contains(big.what(), "at most 10 bytes"));
  CHECK_NOTHROW(parse_document("a: 1234567", "t.yaml", lim));  // exactly 10 bytes
  ReadLimits few;
  few.max_nodes = 5;
  CHECK_NOTHROW(parse_document("[1, 2, 3, 4]", "t.yaml", few));  // list + 4 items
  CHECK(contains(parse_error("[1, 2, 3, 4, 5]", few).what(), "at most 5 values and keys"));

  // a key path is capped at 512 characters (memory: every node keeps its path)
  CHECK(contains(parse_error(std::string(600, 'k') + ": 1\n").what(), "a key path of at most 512 characters"));
  CHECK_NOTHROW(parse_document(std::string(500, 'k') + ": 1\n", "t.yaml"));

  const std::string path = "test_io_document_big.yaml";
  {
    std::ofstream out(path);
    out << "a: " << std::string(100, 'x') << "\n";
  }
  ReadLimits small;
  small.max_bytes = 50;
  CHECK_THROWS_AS(read_document(path, small), InputError);
  CHECK(read_document(path).root.find("a")->scalar.size() == 100);
  std::remove(path.c_str());
}

TEST_CASE("anchors, aliases, tags, non-text keys and second documents are refused") {
  const InputError anchor = parse_error("a: &x 1\nb: *x\n");
  CHECK(anchor.where().line == 1);
  CHECK(anchor.where().column == 4);
  CHECK(contains(anchor.what(), "anchors and aliases are not accepted"));
  CHECK(contains(parse_error("a: !!str 5\n").what(), "tags"));
  CHECK(contains(parse_error("? [a]\n: 1\n").what(), "a key that is text"));
  CHECK(contains(parse_error("~: 1\n").what(), "a key that is text"));
  const InputError second = parse_error("a: 1\n---\nb: 2\n");
  CHECK(second.where().line == 2);
  CHECK(contains(second.what(), "a single YAML document"));
  // yaml-cpp reads a list followed by a map at the same level as two documents
  CHECK(contains(parse_error("- a\nb: 1\n").what(), "a single YAML document"));
}

TEST_CASE("text that is not clean UTF-8 is refused with its position") {
  const InputError bad = parse_error("a: ok\nb: \xFF\n");
  CHECK(bad.where().line == 2);
  CHECK(bad.where().column == 4);
  CHECK(contains(bad.what(), "UTF-8"));
  CHECK(contains(parse_error("a: 1\rb: 2\n").what(), "lone CR"));
  CHECK(contains(parse_error(std::string("a: 1\0", 5)).what(), "control characters"));
  CHECK(contains(parse_error("a: \xC0\xAF\n").what(), "UTF-8"));  // overlong '/'
}

TEST_CASE("read_document: a missing file is an InputError naming it") {
  try {
    read_document("no/such/file.yaml");
    FAIL("no throw");
  } catch (const InputError& e) {
    CHECK(e.where().file == "no/such/file.yaml");
    CHECK(contains(e.what(), "cannot open"));
  }
}

TEST_CASE("closest: case-insensitive edit distance, nothing when far") {
  const std::vector<std::string> keys = {"blow-by", "oil-volume", "power", "top-up-rate"};
  CHECK(closest("blowby", keys) == "blow-by");     // one deletion
  CHECK(closest("POWER", keys) == "power");        // case only
  CHECK(closest("oil-volumes", keys) == "oil-volume");
  CHECK(closest("topup-rat", keys) == "top-up-rate");  // distance 2, the floor
  CHECK(closest("xyz", keys) == "");
  CHECK(closest("pwr", keys) == "power");  // distance 2 ("o", "e" inserted)
  CHECK(closest("colour", keys) == "");
  CHECK(closest("anything", {}) == "");
}

TEST_CASE("require_keys lists the valid keys and the closest one") {
  const Document d = parse_document("engine:\n  power: 1 MW\n  blowby: 2\noli: x\n", "t.yaml");
  const Node& engine = *d.root.find("engine");
  try {
    require_keys(d, engine, {"power", "blow-by", "oil-volume"});
    FAIL("no throw");
  } catch (const InputError& e) {
    CHECK(std::string(e.what()) ==
          "t.yaml:3:3: 'engine.blowby' = 'blowby': expected one of the keys of engine: power, blow-by, "
          "oil-volume (closest: 'blow-by')\n"
          "    blowby: 2\n"
          "    ^");
  }
  try {
    require_keys(d, d.root, {"engine", "case"});
    FAIL("no throw");
  } catch (const InputError& e) {
    CHECK(e.where().line == 4);
    CHECK(e.key() == "oli");
    CHECK(e.expected() == "one of the keys of (top level): engine, case");  // 'oli' is near neither
  }
  CHECK_NOTHROW(require_keys(d, d.root, {"engine", "oli"}));
  try {
    require_keys(d, engine.entries[0].second, {"a"});
    FAIL("no throw");
  } catch (const InputError& e) {
    CHECK(e.expected() == "a map of the keys of engine.power: a");
  }
}
