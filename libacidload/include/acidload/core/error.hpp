#pragma once
// The one exception hierarchy of acidload, rooted at std::runtime_error.
//   acidload::Error                 anything acidload reports
//   ├── acidload::InputError        a value the user gave is wrong (where, key, value, expected)
//   ├── acidload::NotModelledError  a valid request outside what the model covers
//   ├── acidload::NoAnswerError     an inverse question with no answer in the given range
//   └── acidload::FitRefusedError   a calibration that the data cannot identify, with the reason
#include <stdexcept>
#include <cmath>
#include <string>

namespace acidload {

//! Where an input value came from: a file position (1-based) and/or a key path.
struct InputWhere {
  std::string file;       //!< file name, empty for values given through the API
  int line = 0;           //!< 1-based line, 0 when unknown
  int column = 0;         //!< 1-based column, 0 when unknown
  std::string line_text;  //!< the offending line of the file, for the caret display
};

class Error : public std::runtime_error {
 public:
  using std::runtime_error::runtime_error;
};

//! A value given by the user is missing, malformed or outside its accepted range.
class InputError : public Error {
 public:
  //! key: key path ("engine.blow-by") or field name; value: the text given; expected: what is accepted.
  InputError(std::string key, std::string value, std::string expected, InputWhere where = {});
  const std::string& key() const noexcept { return key_; }
  const std::string& value() const noexcept { return value_; }
  const std::string& expected() const noexcept { return expected_; }
  const InputWhere& where() const noexcept { return where_; }

 private:
  std::string key_, value_, expected_;
  InputWhere where_;
};

//! A request that is valid but outside the model (e.g. rich combustion, λ < 1).
class NotModelledError : public Error {
 public:
  using Error::Error;
};

//! An inverse question whose answer does not lie in the range searched.
class NoAnswerError : public Error {
 public:
  using Error::Error;
};

//! A fit the data cannot identify (too few samples, a flat or rank-deficient direction, no signal).
class FitRefusedError : public Error {
 public:
  using Error::Error;
};

//! Formats a double the way messages show it (shortest round-trip form).
std::string format_value(double v);

namespace check {
// The tests inline (they run for every field of every segment); the refusals, which build the
// message, out of line in error.cpp.
namespace detail {
[[noreturn]] void refuse_finite(const char* field, double v);
[[noreturn]] void refuse_non_negative(const char* field, double v);
[[noreturn]] void refuse_positive(const char* field, double v);
[[noreturn]] void refuse_fraction(const char* field, double v);
[[noreturn]] void refuse_in_range(const char* field, double v, double lo, double hi, const char* unit);
[[noreturn]] void refuse_temperature(const char* field, double v);
inline bool finite(double v) { return std::isfinite(v); }
}  // namespace detail
//! Throws InputError unless v is finite. Returns v.
inline double finite(const char* field, double v) {
  if (!detail::finite(v)) detail::refuse_finite(field, v);
  return v;
}
//! Throws unless v is finite and v >= 0.
inline double non_negative(const char* field, double v) {
  if (!(detail::finite(v) && v >= 0)) detail::refuse_non_negative(field, v);
  return v;
}
//! Throws unless v is finite and v > 0.
inline double positive(const char* field, double v) {
  if (!(detail::finite(v) && v > 0)) detail::refuse_positive(field, v);
  return v;
}
//! Throws unless 0 <= v <= 1 (a fraction or share).
inline double fraction(const char* field, double v) {
  if (!(v >= 0 && v <= 1)) detail::refuse_fraction(field, v);  // within [0, 1]: finite
  return v;
}
//! Throws unless lo <= v <= hi; unit names the unit of lo and hi in the message.
inline double in_range(const char* field, double v, double lo, double hi, const char* unit) {
  if (!(detail::finite(v) && v >= lo && v <= hi)) detail::refuse_in_range(field, v, lo, hi, unit);
  return v;
}
//! Throws unless v is a thermodynamic temperature above absolute zero [K].
inline double temperature(const char* field, double v) {
  if (!(detail::finite(v) && v > 0)) detail::refuse_temperature(field, v);
  return v;
}
}  // namespace check

}  // namespace acidload
