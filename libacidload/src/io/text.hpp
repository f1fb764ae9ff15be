#pragma once
// Text helpers shared by the io readers (internal to acidload::io; not installed).
#include <sys/stat.h>

#include <algorithm>
#include <string>
#include <string_view>
#include <vector>

#include "acidload/io/document.hpp"

namespace acidload::io::detail {

//! Where an error lies when only the file is known.
inline InputWhere file_only(const std::string& file) {
  InputWhere w;
  w.file = file;
  return w;
}

//! Splits text into lines without their line ends (LF or CR LF).
inline std::vector<std::string> split_lines(std::string_view text) {
  std::vector<std::string> lines;
  std::size_t start = 0;
  while (start < text.size()) {
    std::size_t end = text.find('\n', start);
    if (end == std::string_view::npos) end = text.size();
    std::string_view line = text.substr(start, end - start);
    if (!line.empty() && line.back() == '\r') line.remove_suffix(1);
    lines.emplace_back(line);
    start = end + 1;
  }
  return lines;
}

//! The 1-based line as shown above a caret: tabs become single spaces so that the caret, placed by
//! character column, stands under the right character; "" outside the text.
inline std::string display_line(const std::vector<std::string>& lines, int line) {
  if (line < 1 || static_cast<std::size_t>(line) > lines.size()) return {};
  std::string s = lines[static_cast<std::size_t>(line - 1)];
  std::replace(s.begin(), s.end(), '\t', ' ');
  return s;
}

//! Items joined with ", " (for "one of: …" lists in messages).
inline std::string join(const std::vector<std::string>& items, std::string_view separator = ", ") {
  std::string s;
  for (std::size_t i = 0; i < items.size(); ++i) {
    if (i) s += separator;
    s += items[i];
  }
  return s;
}

//! A node as an error message shows its value: the scalar's text, or what kind of node it is.
inline std::string describe(const Node& n) {
  switch (n.type) {
    case Node::Type::null: return "";
    case Node::Type::scalar: return n.scalar;
    case Node::Type::sequence: return "(a list)";
    case Node::Type::map: return "(a map)";
  }
  return "";
}

//! Why `path` cannot be read as an input file without blocking or reading without end ("" when it
//! can): a FIFO, a device, a socket or a folder is refused before it is opened.
inline std::string not_a_plain_file(const std::string& path) {
  struct stat st {};
  if (::stat(path.c_str(), &st) != 0) return "";  // the open that follows reports a missing file
  if (S_ISREG(st.st_mode)) return "";
  if (S_ISDIR(st.st_mode)) return "it is a folder";
  if (S_ISFIFO(st.st_mode)) return "it is a named pipe (FIFO), not a file";
  if (S_ISCHR(st.st_mode) || S_ISBLK(st.st_mode)) return "it is a device, not a file";
  if (S_ISSOCK(st.st_mode)) return "it is a socket, not a file";
  return "it is not a plain file";
}

}  // namespace acidload::io::detail
