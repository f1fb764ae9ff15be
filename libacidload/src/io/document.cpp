// The YAML reader: yaml-cpp's event parser drives our own tree builder, so that every node keeps
// its exact position and the checks yaml-cpp does not make are made here:
//   - the text is UTF-8 without control characters (tab, LF and CR LF are the only ones allowed)
//     and at most ReadLimits::max_bytes long, checked before parsing;
//   - duplicate keys in any map are an error at the second key (yaml-cpp lets the first win);
//   - anchors, aliases and explicit tags are refused (a case file needs none of them, and aliases
//     are the way to make a small file expand into a huge tree);
//   - map keys are plain text (no null, sequence or map keys);
//   - nesting deeper than ReadLimits::max_depth and more than ReadLimits::max_nodes nodes are
//     refused while the events arrive (yaml-cpp alone fails deep nesting as "bad file" at 1:1);
//   - one document per file; an unterminated quoted scalar at the end of the text is an error
//     (yaml-cpp 0.7 accepts it).
// yaml-cpp marks are 0-based, with byte columns; people get 1-based lines and 1-based columns
// counted in characters (UTF-8 code points).
// An empty text, or one holding only comments, gives a root of Type::null: the caller decides
// whether that is an error.
#include "acidload/io/document.hpp"

#include "file_read.hpp"
#include "text.hpp"
#include "utf8.hpp"

#include <yaml-cpp/eventhandler.h>
#include <yaml-cpp/exceptions.h>
#include <yaml-cpp/mark.h>
#include <yaml-cpp/parser.h>

#include <algorithm>
#include <cstdint>
#include <cstdio>
#include <sstream>
#include <unordered_map>

namespace acidload::io {

namespace {
using detail::code_points;
using detail::describe;
using detail::file_only;
using detail::display_line;
using detail::split_lines;

const std::string top_level = "(top level)";

std::string shown_key(const std::string& path) { return path.empty() ? top_level : path; }

// A 1-based line and byte column → 1-based character column.
int char_column(const std::vector<std::string>& lines, int line, int byte_column0) {
  if (byte_column0 < 0) return 0;
  if (line < 1 || static_cast<std::size_t>(line) > lines.size()) return byte_column0 + 1;
  const std::string& l = lines[static_cast<std::size_t>(line - 1)];
  const std::size_t b = static_cast<std::size_t>(byte_column0);
  if (b >= l.size()) return code_points(l) + static_cast<int>(b - l.size()) + 1;
  return code_points(std::string_view(l).substr(0, b)) + 1;
}

// yaml-cpp's marks → 1-based character columns, counting on from the last mark on the same line
// (events arrive in text order), so that a long line with many values costs linear time.
class Columns {
 public:
  explicit Columns(const std::vector<std::string>& lines) : lines_(lines) {}
  Mark operator()(const YAML::Mark& m) {
    if (m.is_null() || m.line < 0 || m.column < 0) return {};
    const std::size_t line = static_cast<std::size_t>(m.line);
    const std::size_t byte = static_cast<std::size_t>(m.column);
    if (line >= lines_.size()) return {m.line + 1, m.column + 1};
    const std::string& l = lines_[line];
    if (line != line_ || byte < byte_) {
      line_ = line;
      byte_ = 0;
      chars_ = 0;
    }
    for (; byte_ < byte && byte_ < l.size(); ++byte_)
      if ((static_cast<unsigned char>(l[byte_]) & 0xC0) != 0x80) ++chars_;
    const int beyond = byte > l.size() ? static_cast<int>(byte - l.size()) : 0;
    return {m.line + 1, chars_ + beyond + 1};
  }

 private:
  const std::vector<std::string>& lines_;
  std::size_t line_ = static_cast<std::size_t>(-1), byte_ = 0;
  int chars_ = 0;
};

Mark to_mark(const std::vector<std::string>& lines, const YAML::Mark& m) {
  if (m.is_null() || m.line < 0) return {};
  Mark r;
  r.line = m.line + 1;
  r.column = char_column(lines, r.line, m.column);
  return r;
}

// The 1-based position of byte offset `pos` in `text`.
Mark mark_of_offset(std::string_view text, const std::vector<std::string>& lines, std::size_t pos) {
  int line = 1;
  std::size_t line_start = 0;
  for (std::size_t i = 0; i < pos && i < text.size(); ++i)
    if (text[i] == '\n') {
      ++line;
      line_start = i + 1;
    }
  return {line, char_column(lines, line, static_cast<int>(pos - line_start))};
}

// A short piece of the text from byte `pos` on, for the value shown in a message.
std::string excerpt(std::string_view text, std::size_t pos, std::size_t max_chars = 40) {
  if (pos >= text.size()) return {};
  std::size_t end = text.find_first_of("\r\n", pos);
  if (end == std::string_view::npos) end = text.size();
  std::string s(text.substr(pos, end - pos));
  while (!s.empty() && (s.back() == ' ' || s.back() == '\t')) s.pop_back();
  if (s.size() > max_chars) {
    std::size_t cut = max_chars;
    while (cut > 0 && (static_cast<unsigned char>(s[cut]) & 0xC0) == 0x80) --cut;  // whole characters
    s = s.substr(0, cut) + "...";
  }
  return s;
}

// The token at byte `pos` (up to white space or a flow indicator), e.g. "&x" or "*x".
std::string token_at(std::string_view text, std::size_t pos) {
  if (pos >= text.size()) return {};
  std::size_t end = text.find_first_of(" \t\r\n,[]{}", pos + 1);
  if (end == std::string_view::npos) end = text.size();
  return std::string(text.substr(pos, std::min<std::size_t>(end - pos, 40)));
}

// Refuses text yaml-cpp would read differently from how we count lines (detail::first_text_fault),
// at the faulty byte.
void check_text(std::string_view text, const std::vector<std::string>& lines, const std::string& file) {
  detail::TextFault f;
  if (!detail::first_text_fault(text, f)) return;
  const Mark m = mark_of_offset(text, lines, f.offset);
  char code[8];
  std::snprintf(code, sizeof code, "0x%02X", static_cast<unsigned char>(text[f.offset]));
  throw InputError(top_level, std::string("byte ") + code, f.expected,
                   InputWhere{file, m.line, m.column, display_line(lines, m.line)});
}

// Thrown through yaml-cpp by the handler; the InputError inside is rethrown by parse_document.
struct Stop {
  InputError error;
};

class TreeBuilder : public YAML::EventHandler {
 public:
  TreeBuilder(std::string_view text, const Document& doc, const ReadLimits& limits)
      : text_(text), doc_(doc), limits_(limits) {}

  Node root;
  bool have_root = false;
  int documents = 0;

  // The key path of the next node to arrive, for messages about it.
  std::string context_path() const {
    if (stack_.empty()) return {};
    const Frame& f = stack_.back();
    if (f.node.type == Node::Type::sequence)
      return f.node.path + "[" + std::to_string(f.node.items.size()) + "]";
    if (f.have_key) return join(f.node.path, f.key);
    return f.node.path;
  }

  void OnDocumentStart(const YAML::Mark& m) override {
    if (++documents > 1)
      fail(m, context_path(), excerpt(text_, pos(m)),
           "a single YAML document (a second one starts here: a '---' line, or a block at the "
           "wrong indentation)");
  }
  void OnDocumentEnd() override {}

  void OnNull(const YAML::Mark& m, YAML::anchor_t anchor) override {
    refuse_anchor(m, anchor);
    if (key_position())
      fail(m, stack_.back().node.path, excerpt(text_, pos(m)),
           "a key that is text (an empty or null key is not one; quote it if the word null is meant)");
    Node n = make(Node::Type::null, m);
    add(std::move(n));
  }

  void OnAlias(const YAML::Mark& m, YAML::anchor_t) override {
    fail(m, context_path(), token_at(text_, pos(m)), "a value written out (YAML aliases are not accepted)");
  }

  void OnScalar(const YAML::Mark& m, const std::string& tag, YAML::anchor_t anchor,
                const std::string& value) override {
    refuse_anchor(m, anchor);
    refuse_tag(m, tag);
    const bool non_plain = tag == "!";  // quoted, or a literal/folded block scalar
    if (non_plain) check_closed_quote(m);
    if (key_position()) {
      Frame& f = stack_.back();
      count(m);
      const Mark km = columns_(m);
      const auto [it, inserted] = f.key_lines.emplace(value, km.line);
      if (!inserted)
        fail(m, join(f.node.path, value), value,
             "each key once: duplicate key '" + value + "' (first at line " + std::to_string(it->second) + ")");
      f.key = value;
      f.key_mark = km;
      f.have_key = true;
      return;
    }
    Node n = make(Node::Type::scalar, m);
    n.scalar = value;
    n.quoted = non_plain;
    add(std::move(n));
  }

  void OnSequenceStart(const YAML::Mark& m, const std::string& tag, YAML::anchor_t anchor,
                       YAML::EmitterStyle::value) override {
    open(m, tag, anchor, Node::Type::sequence);
  }
  void OnSequenceEnd() override { close(); }
  void OnMapStart(const YAML::Mark& m, const std::string& tag, YAML::anchor_t anchor,
                  YAML::EmitterStyle::value) override {
    open(m, tag, anchor, Node::Type::map);
  }
  void OnMapEnd() override { close(); }

  void OnAnchor(const YAML::Mark& m, const std::string& name) override {
    fail(m, context_path(), "&" + name, "a value without an anchor (YAML anchors and aliases are not accepted)");
  }

 private:
  struct Frame {
    Node node;
    bool have_key = false;  // maps: a key has been read and awaits its value
    std::string key;
    Mark key_mark;
    std::unordered_map<std::string, int> key_lines;  // maps: line of each key, for duplicates
  };

  static std::string join(const std::string& path, const std::string& key) {
    return path.empty() ? key : path + "." + key;
  }

  std::size_t pos(const YAML::Mark& m) const { return m.pos < 0 ? text_.size() : static_cast<std::size_t>(m.pos); }

  [[noreturn]] void fail(const YAML::Mark& m, const std::string& key, std::string value, std::string expected) const {
    throw Stop{doc_.error(to_mark(doc_.lines, m), key, std::move(value), std::move(expected))};
  }

  bool key_position() const {
    return !stack_.empty() && stack_.back().node.type == Node::Type::map && !stack_.back().have_key;
  }

  void refuse_anchor(const YAML::Mark& m, YAML::anchor_t anchor) const {
    if (anchor != YAML::NullAnchor)
      fail(m, context_path(), token_at(text_, pos(m)), "a value without an anchor (YAML anchors and aliases are not accepted)");
  }

  void refuse_tag(const YAML::Mark& m, const std::string& tag) const {
    if (tag != "?" && tag != "!")
      fail(m, context_path(), token_at(text_, pos(m)), "a value without a tag (YAML tags such as '!!str' are not accepted)");
  }

  // yaml-cpp 0.7 accepts a quoted scalar left open at the end of the text; find its closing quote.
  void check_closed_quote(const YAML::Mark& m) const {
    const std::size_t p = pos(m);
    if (p >= text_.size()) return;
    const char q = text_[p];
    if (q != '"' && q != '\'') return;  // a block scalar
    for (std::size_t i = p + 1; i < text_.size(); ++i) {
      if (q == '"' && text_[i] == '\\') {
        ++i;
      } else if (text_[i] == q) {
        if (q == '\'' && i + 1 < text_.size() && text_[i + 1] == '\'') {
          ++i;  // '' inside single quotes
          continue;
        }
        return;
      }
    }
    fail(m, context_path(), excerpt(text_, p), std::string("a closing ") + q + " for the quote opened here");
  }

  void count(const YAML::Mark& m) {
    if (++nodes_ > limits_.max_nodes)
      fail(m, context_path(), excerpt(text_, pos(m)),
           "a file of at most " + std::to_string(limits_.max_nodes) + " values and keys");
  }

  Node make(Node::Type type, const YAML::Mark& m) {
    count(m);
    Node n;
    n.type = type;
    n.mark = columns_(m);
    n.path = context_path();
    if (n.path.size() > max_path)
      fail(m, n.path.substr(0, 60) + "...", excerpt(text_, pos(m)),
           "a key path of at most " + std::to_string(max_path) + " characters (shorter keys, or less nesting)");
    return n;
  }

  void open(const YAML::Mark& m, const std::string& tag, YAML::anchor_t anchor, Node::Type type) {
    refuse_anchor(m, anchor);
    refuse_tag(m, tag);
    if (key_position())
      fail(m, stack_.back().node.path, excerpt(text_, pos(m)),
           std::string("a key that is text (not a ") + (type == Node::Type::map ? "map" : "list") + ")");
    if (static_cast<long>(stack_.size()) + 1 > static_cast<long>(limits_.max_depth))
      fail(m, context_path(), excerpt(text_, pos(m)),
           "at most " + std::to_string(limits_.max_depth) + " levels of nested lists and maps");
    Frame f;
    f.node = make(type, m);
    stack_.push_back(std::move(f));
  }

  void close() {
    if (stack_.empty()) return;
    Node n = std::move(stack_.back().node);
    stack_.pop_back();
    add(std::move(n));
  }

  void add(Node n) {
    if (stack_.empty()) {
      root = std::move(n);
      have_root = true;
      return;
    }
    Frame& f = stack_.back();
    if (f.node.type == Node::Type::sequence) {
      f.node.items.push_back(std::move(n));
    } else {
      f.node.entries.emplace_back(std::move(f.key), std::move(n));
      f.node.key_marks.push_back(f.key_mark);
      f.key.clear();
      f.have_key = false;
    }
  }

  std::string_view text_;
  const Document& doc_;
  const ReadLimits& limits_;
  std::vector<Frame> stack_;
  std::size_t nodes_ = 0;
  Columns columns_{doc_.lines};
  // Every node stores its key path: capping its length caps the memory a file of long keys over
  // many nodes could take (max_nodes × max_path bytes).
  static constexpr std::size_t max_path = 512;
};

}  // namespace

const Node* Node::find(std::string_view key) const {
  for (const auto& e : entries)
    if (e.first == key) return &e.second;
  return nullptr;
}

InputError Document::error(const Node& at, std::string value, std::string expected) const {
  return error(at.mark, at.path, std::move(value), std::move(expected));
}

InputError Document::error(Mark at, std::string key, std::string value, std::string expected) const {
  InputWhere w{file, at.line, at.line > 0 ? at.column : 0, display_line(lines, at.line - first_line + 1)};
  return InputError(shown_key(key), std::move(value), std::move(expected), std::move(w));
}

Document parse_document(std::string_view text, std::string file_name, const ReadLimits& limits) {
  Document doc;
  doc.file = std::move(file_name);
  if (text.size() > limits.max_bytes)
    throw InputError(top_level, std::to_string(text.size()) + " bytes",
                     "a file of at most " + std::to_string(limits.max_bytes) + " bytes", file_only(doc.file));
  if (text.size() >= 3 && text.substr(0, 3) == "\xEF\xBB\xBF") text.remove_prefix(3);  // UTF-8 byte-order mark
  doc.lines = split_lines(text);
  check_text(text, doc.lines, doc.file);

  // yaml-cpp reads from a stream; the copy is bounded by max_bytes.
  std::istringstream in{std::string(text)};
  TreeBuilder builder(text, doc, limits);
  try {
    YAML::Parser parser(in);
    while (parser.HandleNextDocument(builder)) {
    }
  } catch (Stop& s) {
    throw std::move(s.error);
  } catch (const YAML::Exception& e) {
    const Mark m = to_mark(doc.lines, e.mark);
    const std::size_t p = e.mark.is_null() || e.mark.pos < 0 ? text.size() : static_cast<std::size_t>(e.mark.pos);
    throw doc.error(m, builder.context_path(), excerpt(text, p), "valid YAML (" + e.msg + ")");
  }
  if (builder.have_root) doc.root = std::move(builder.root);
  doc.root.path.clear();
  return doc;
}

Document read_document(const std::string& path, const ReadLimits& limits) {
  const std::string text = detail::read_capped_file(path, limits.max_bytes, "YAML", top_level);
  return parse_document(text, path, limits);
}

}  // namespace acidload::io
