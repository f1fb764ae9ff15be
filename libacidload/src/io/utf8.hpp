#pragma once
// UTF-8 checks on input text (internal to acidload::io; not installed): decoding one sequence,
// counting code points, and finding the first byte a reader must refuse.
#include <cstddef>
#include <cstdint>
#include <string>
#include <string_view>

namespace acidload::io::detail {

//! Decodes one UTF-8 sequence at s[i] into `cp`; returns its length, or 0 if it is not valid UTF-8
//! (overlong forms, surrogates and code points beyond U+10FFFF are invalid).
std::size_t utf8_length(std::string_view s, std::size_t i, std::uint32_t& cp);

//! Number of UTF-8 code points in s (continuation bytes are not counted).
int code_points(std::string_view s);

//! The first byte of text that a line-counting reader must refuse, and what was expected there.
struct TextFault {
  std::size_t offset = 0;  //!< byte offset of the fault
  std::string expected;    //!< e.g. "UTF-8 text (this byte is not valid UTF-8)"
};
//! Finds invalid UTF-8, control characters (other than tab, LF and CR before LF), C1 controls, the
//! Unicode line and paragraph separators, and a byte-order mark anywhere (the caller removes one at
//! the start first). Returns false when the text is clean.
bool first_text_fault(std::string_view text, TextFault& fault);

}  // namespace acidload::io::detail
