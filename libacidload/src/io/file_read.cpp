// The capped file read: see file_read.hpp.
#include "file_read.hpp"

#include <fstream>

#include "acidload/core/error.hpp"
#include "text.hpp"

namespace acidload::io::detail {

std::string read_capped_file(const std::string& path, std::size_t max_bytes, const std::string& kind,
                             const std::string& size_key) {
  const std::string readable = "a readable " + kind + " file";
  if (const std::string why = not_a_plain_file(path); !why.empty())
    throw InputError("file", path, readable + " (" + why + ")", file_only(path));
  std::ifstream in(path, std::ios::binary);
  if (!in) throw InputError("file", path, readable + " (cannot open it)", file_only(path));
  std::string text;
  char buf[65536];
  while (in.read(buf, sizeof buf) || in.gcount() > 0) {
    text.append(buf, static_cast<std::size_t>(in.gcount()));
    if (text.size() > max_bytes)
      throw InputError(size_key, "more than " + std::to_string(max_bytes) + " bytes",
                       "a file of at most " + std::to_string(max_bytes) + " bytes", file_only(path));
    if (!in) break;
  }
  if (in.bad()) throw InputError("file", path, readable + " (reading it failed)", file_only(path));
  return text;
}

}  // namespace acidload::io::detail
