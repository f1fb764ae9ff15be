#include "acidload/core/error.hpp"

#include <charconv>
#include <utility>
#include <cmath>
#include <system_error>

namespace acidload {

namespace {
constexpr std::size_t shown_value_bytes = 200;  // a longer value is cut, its length said
constexpr std::size_t shown_line_chars = 160;   // a longer line is shown as a window at the column

bool utf8_continuation(char c) { return (static_cast<unsigned char>(c) & 0xC0) == 0x80; }

// The value as a message shows it: whole up to 200 bytes, else its start (cut at a character
// boundary) and its length, so that a 30 MB cell gives a message of a few hundred bytes.
std::string shown_value(const std::string& v) {
  if (v.size() <= shown_value_bytes) return v;
  std::size_t cut = shown_value_bytes - 40;
  while (cut > 0 && utf8_continuation(v[cut])) --cut;
  return v.substr(0, cut) + "… (" + std::to_string(v.size()) + " bytes in all)";
}

// Byte offset of the 0-based character `chars` of s (s.size() beyond its end).
std::size_t byte_of_char(const std::string& s, std::size_t chars) {
  std::size_t b = 0;
  for (std::size_t n = 0; b < s.size(); ++b)
    if (!utf8_continuation(s[b]) && n++ == chars) return b;
  return s.size();
}

// The line above the caret and the caret's offset: a window of 160 characters around the column
// when the line is longer, marked with "…" where it is cut.
std::pair<std::string, std::size_t> shown_line(const std::string& line, int column) {
  const std::size_t at = column > 1 ? static_cast<std::size_t>(column - 1) : 0;
  if (line.size() <= shown_line_chars) return {line, at};
  const std::size_t first = at > 60 ? at - 60 : 0;
  const std::size_t b0 = byte_of_char(line, first), b1 = byte_of_char(line, first + shown_line_chars);
  std::string s = (first > 0 ? "…" : "") + line.substr(b0, b1 - b0) + (b1 < line.size() ? "…" : "");
  return {s, at - first + (first > 0 ? 1 : 0)};
}

std::string compose(const std::string& key, const std::string& value, const std::string& expected,
                    const InputWhere& w) {
  std::string m;
  if (!w.file.empty()) {
    m += w.file;
    if (w.line > 0) m += ":" + std::to_string(w.line) + ":" + std::to_string(w.column);
    m += ": ";
  }
  m += "'" + shown_value(key) + "' = '" + shown_value(value) + "': expected " + expected;
  if (!w.line_text.empty()) {
    const auto [text, caret] = shown_line(w.line_text, w.column);
    m += "\n  " + text + "\n  ";
    m += std::string(caret, ' ') + "^";
  }
  return m;
}
}  // namespace

InputError::InputError(std::string key, std::string value, std::string expected, InputWhere where)
    : Error(compose(key, value, expected, where)),
      key_(std::move(key)),
      value_(std::move(value)),
      expected_(std::move(expected)),
      where_(std::move(where)) {}

std::string format_value(double v) {
  if (std::isnan(v)) return "nan";
  if (std::isinf(v)) return v > 0 ? "inf" : "-inf";
  char buf[64];
  auto r = std::to_chars(buf, buf + sizeof buf, v);
  return r.ec == std::errc() ? std::string(buf, r.ptr) : std::to_string(v);
}

namespace check::detail {
void refuse_finite(const char* field, double v) { throw InputError(field, format_value(v), "a finite number"); }
void refuse_non_negative(const char* field, double v) { throw InputError(field, format_value(v), "a finite number >= 0"); }
void refuse_positive(const char* field, double v) { throw InputError(field, format_value(v), "a finite number > 0"); }
void refuse_fraction(const char* field, double v) { throw InputError(field, format_value(v), "a fraction from 0 to 1"); }
void refuse_in_range(const char* field, double v, double lo, double hi, const char* unit) {
  throw InputError(field, format_value(v), "a value from " + format_value(lo) + " to " + format_value(hi) + " " + unit);
}
void refuse_temperature(const char* field, double v) {
  throw InputError(field, format_value(v), "a temperature above absolute zero (0 K)");
}
}  // namespace check::detail

}  // namespace acidload
