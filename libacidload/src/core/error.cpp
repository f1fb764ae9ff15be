#include "acidload/core/error.hpp"

#include <charconv>
#include <cmath>
#include <system_error>

namespace acidload {

namespace {
std::string compose(const std::string& key, const std::string& value, const std::string& expected,
                    const InputWhere& w) {
  std::string m;
  if (!w.file.empty()) {
    m += w.file;
    if (w.line > 0) m += ":" + std::to_string(w.line) + ":" + std::to_string(w.column);
    m += ": ";
  }
  m += "'" + key + "' = '" + value + "': expected " + expected;
  if (!w.line_text.empty()) {
    m += "\n  " + w.line_text + "\n  ";
    m += std::string(w.column > 1 ? static_cast<std::size_t>(w.column - 1) : 0, ' ') + "^";
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

namespace check {
double finite(const char* field, double v) {
  if (!std::isfinite(v)) throw InputError(field, format_value(v), "a finite number");
  return v;
}
double non_negative(const char* field, double v) {
  if (!(std::isfinite(v) && v >= 0)) throw InputError(field, format_value(v), "a finite number >= 0");
  return v;
}
double positive(const char* field, double v) {
  if (!(std::isfinite(v) && v > 0)) throw InputError(field, format_value(v), "a finite number > 0");
  return v;
}
double fraction(const char* field, double v) {
  if (!(std::isfinite(v) && v >= 0 && v <= 1))
    throw InputError(field, format_value(v), "a fraction from 0 to 1");
  return v;
}
double in_range(const char* field, double v, double lo, double hi, const char* unit) {
  if (!(std::isfinite(v) && v >= lo && v <= hi))
    throw InputError(field, format_value(v),
                     "a value from " + format_value(lo) + " to " + format_value(hi) + " " + unit);
  return v;
}
double temperature(const char* field, double v) {
  if (!(std::isfinite(v) && v > 0))
    throw InputError(field, format_value(v), "a temperature above absolute zero (0 K)");
  return v;
}
}  // namespace check

}  // namespace acidload
