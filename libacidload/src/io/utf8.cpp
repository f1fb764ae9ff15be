// UTF-8 checks on input text: see utf8.hpp.
#include "utf8.hpp"

namespace acidload::io::detail {

std::size_t utf8_length(std::string_view s, std::size_t i, std::uint32_t& cp) {
  const auto b = [&](std::size_t k) { return static_cast<unsigned char>(s[i + k]); };
  const unsigned char c = b(0);
  std::size_t n;
  if (c < 0x80) {
    cp = c;
    return 1;
  } else if (c >= 0xC2 && c <= 0xDF) {
    n = 2;
    cp = c & 0x1F;
  } else if (c >= 0xE0 && c <= 0xEF) {
    n = 3;
    cp = c & 0x0F;
  } else if (c >= 0xF0 && c <= 0xF4) {
    n = 4;
    cp = c & 0x07;
  } else {
    return 0;
  }
  if (i + n > s.size()) return 0;
  for (std::size_t k = 1; k < n; ++k) {
    if ((b(k) & 0xC0) != 0x80) return 0;
    cp = (cp << 6) | (b(k) & 0x3F);
  }
  if ((n == 3 && cp < 0x800) || (n == 4 && (cp < 0x10000 || cp > 0x10FFFF)) || (cp >= 0xD800 && cp <= 0xDFFF))
    return 0;
  return n;
}

int code_points(std::string_view s) {
  int n = 0;
  for (unsigned char c : s)
    if ((c & 0xC0) != 0x80) ++n;
  return n;
}

bool first_text_fault(std::string_view text, TextFault& fault) {
  for (std::size_t i = 0; i < text.size();) {
    std::uint32_t cp = 0;
    const std::size_t n = utf8_length(text, i, cp);
    std::string what;
    if (n == 0) {
      what = "UTF-8 text (this byte is not valid UTF-8)";
    } else if (cp == '\r') {
      if (i + 1 >= text.size() || text[i + 1] != '\n') what = "line ends LF or CR LF (a lone CR is here)";
    } else if ((cp < 0x20 && cp != '\t' && cp != '\n') || cp == 0x7F || (cp >= 0x80 && cp <= 0x9F)) {
      what = "text without control characters";
    } else if (cp == 0x2028 || cp == 0x2029) {
      what = "line ends LF or CR LF (a Unicode line or paragraph separator is here)";
    } else if (cp == 0xFEFF) {
      what = "text without a byte-order mark after its start";
    }
    if (!what.empty()) {
      fault = {i, std::move(what)};
      return true;
    }
    i += n;
  }
  return false;
}

}  // namespace acidload::io::detail
