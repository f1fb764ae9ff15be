// The report's own computations against outside values: SHA-256 of the input files (the FIPS 180-2
// examples) and the plot scale (pixels of data values), for the validation table.
#include <string>

#include "../support/reference_check.hpp"
#include "acidload/io/report.hpp"
#include "acidload/io/svg.hpp"

namespace {
double matching_hex_digits(const std::string& a, const std::string& b) {
  int n = 0;
  for (std::size_t i = 0; i < a.size() && i < b.size(); ++i) n += a[i] == b[i];
  return a.size() == b.size() ? n : -1;
}
}  // namespace

TEST_CASE("SHA-256 of the report's input files: the FIPS 180-2 examples") {
  using acidload::io::sha256_hex;
  REFERENCE_CHECK("SHA-256('abc'), hex digits equal", matching_hex_digits(sha256_hex("abc"),
                  "ba7816bf8f01cfea414140de5dae2223b00361a396177a9cb410ff61f20015ad"), 64, absolute, 0, "digits",
                  "FIPS 180-2 appendix B.1 (from memory)");
  REFERENCE_CHECK("SHA-256(448-bit message), hex digits equal",
                  matching_hex_digits(sha256_hex("abcdbcdecdefdefgefghfghighijhijkijkljklmklmnlmnomnopnopq"),
                                      "248d6a61d20638b8e5c026930c3e6039a33ce45964ff2167f6ecedd419db06c1"),
                  64, absolute, 0, "digits", "FIPS 180-2 appendix B.2 (from memory)");
  REFERENCE_CHECK("SHA-256(one million 'a'), hex digits equal",
                  matching_hex_digits(sha256_hex(std::string(1000000, 'a')),
                                      "cdc76e5c9914fb9281a1c7e284d73e67f1809a48a497200e046d39ccc7112cd0"),
                  64, absolute, 0, "digits", "FIPS 180-2 appendix B.3 (from memory)");
}

TEST_CASE("plot scale: a data value's pixel by the two-point line through the axis ends") {
  const acidload::io::svg::LinearScale x{{0, 8000}, {62, 500}};
  // x(v) = 62 + v/8000·438: the straight line through (0, 62) and (8000, 500), worked by hand
  REFERENCE_CHECK("pixel of 1035 h on a 0-8000 h axis", x(1035), 62 + 1035.0 / 8000 * 438, relative, 1e-12, "px",
                  "[derived] two-point form of a straight line");
  const acidload::io::svg::LinearScale y{{0, 7}, {274, 14}};
  REFERENCE_CHECK("pixel of TBN 3.0 on a 0-7 axis (y downwards)", y(3.0), 274 - 3.0 / 7 * 260, relative, 1e-12, "px",
                  "[derived] two-point form of a straight line");
}
