#pragma once
// REFERENCE_CHECK: a doctest check against a value from outside the project, which also records
// a row of the validation table (scripts/validation-table) when ACIDLOAD_VALIDATION_TSV names a file.
#include <doctest/doctest.h>

#include <cmath>
#include <cstdio>
#include <cstdlib>
#include <string>

namespace acidload_test {

enum class Tolerance { relative, absolute };

inline bool record_reference(const char* quantity, double computed, double expected, Tolerance kind,
                             double tol, const char* unit, const char* source) {
  const double err = kind == Tolerance::relative ? std::fabs(computed - expected) / std::fabs(expected)
                                                 : std::fabs(computed - expected);
  const bool ok = err <= tol;
  if (const char* path = std::getenv("ACIDLOAD_VALIDATION_TSV")) {
    if (FILE* f = std::fopen(path, "a")) {
      std::fprintf(f, "C++\t%s\t%.12g\t%.12g\t%s %.3g\t%s\t%s\t%s\n", quantity, computed, expected,
                   kind == Tolerance::relative ? "rel" : "abs", tol, unit, source, ok ? "pass" : "FAIL");
      std::fclose(f);
    }
  }
  return ok;
}

}  // namespace acidload_test

//! quantity: what is checked; source: the published origin of `expected` and its mark
//! ("[seen]", "from memory", "common practice, no source", "[derived] from …").
#define REFERENCE_CHECK(quantity, computed, expected, kind, tol, unit, source)                          \
  do {                                                                                                  \
    const double rc_computed_ = (computed);                                                             \
    const double rc_expected_ = (expected);                                                             \
    INFO(quantity << ": computed " << rc_computed_ << ", expected " << rc_expected_ << " (" << source \
                  << ")");                                                                              \
    CHECK(::acidload_test::record_reference(quantity, rc_computed_, rc_expected_,                       \
                                            ::acidload_test::Tolerance::kind, tol, unit, source));     \
  } while (0)
