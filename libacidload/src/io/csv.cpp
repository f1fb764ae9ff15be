// CSV reader, close to RFC 4180:
//   - cells are separated by commas; a cell may be quoted with double quotes, and "" inside quotes
//     stands for one quote; a quote inside an unquoted cell is an error, and so is anything but
//     spaces between a closing quote and the next comma;
//   - a quoted cell ends on its own line (cells spanning lines are refused, so that every cell has
//     an exact line and column);
//   - line ends LF or CR LF; a UTF-8 byte-order mark at the start is dropped;
//   - blank lines and lines whose first non-blank character is '#' are skipped;
//   - every cell, and every column name, is trimmed of spaces and tabs;
//   - the first row is the header: names non-empty and unique.
// Columns are 1-based and counted in characters (UTF-8 code points).
#include "acidload/io/csv.hpp"
#include "acidload/io/suggestions.hpp"

#include "csv_stream.hpp"
#include "file_read.hpp"
#include "text.hpp"

#include <fcntl.h>
#include <sys/stat.h>
#include <unistd.h>

#include <algorithm>
#include <array>
#include <cstring>
#ifdef __SSE2__
#include <emmintrin.h>
#endif
#include <string_view>
#include <unordered_map>

namespace acidload::io {

namespace {
using detail::file_only;

bool is_space(char c) { return c == ' ' || c == '\t'; }

std::string trim(std::string_view s) {
  while (!s.empty() && is_space(s.front())) s.remove_prefix(1);
  while (!s.empty() && is_space(s.back())) s.remove_suffix(1);
  return std::string(s);
}

class Parser {
 public:
  Parser(std::string_view text, CsvTable& table, const detail::CsvRowSink* sink = nullptr, bool form_only = false,
         detail::CsvLineHook hook = {})
      : s_(text), t_(table), sink_(sink), form_only_(form_only), hook_(hook) {}
  std::size_t data_rows() const { return data_rows_; }

  void run() {
    while (step()) {
    }
    finish();
  }
  //! Reads on to the next data row (handed to the sink): false when the text is used up.
  bool step() {
    while (pos_ < s_.size()) {
      if (skip_blank_or_comment()) continue;
      if (!t_.header.empty() && (form_only_ ? plain_form() : offered())) return true;
      if (read_record()) return true;
    }
    return false;
  }
  //! A further piece of the file: whole lines following the text read so far (the parser stands at
  //! a line start after every row), so that a file is read in pieces of bounded size.
  void rebase(std::string_view next) {
    s_ = next;
    pos_ = line_start_ = 0;
    col_line_start_ = static_cast<std::size_t>(-1);
    col_pos_ = 0;
  }
  int line() const { return line_; }
  //! The checks at the end of the file.
  void finish() const {
    if (t_.header.empty())
      throw InputError("header", "", "a header row, then data rows (the file has none)", file_only(t_.file));
    if (data_rows_ == 0)
      throw error(header_line_, 1, "header", t_.header.front(), "at least one data row after the header");
  }

 private:
  // 1-based character column of byte offset p on the current line.
  // Counts on from the last position asked for on the same line, so that a long line with many
  // cells costs linear time.
  int column(std::size_t p) const {
    if (col_line_start_ != line_start_ || p < col_pos_) {
      col_line_start_ = col_pos_ = line_start_;
      col_ = 1;
    }
    for (; col_pos_ < p && col_pos_ < s_.size(); ++col_pos_)
      if ((static_cast<unsigned char>(s_[col_pos_]) & 0xC0) != 0x80) ++col_;
    return col_;
  }

  InputError error(int line, int col, std::string key, std::string value, std::string expected) const {
    return InputError(std::move(key), std::move(value), std::move(expected), InputWhere{t_.file, line, col, shown_line(line)});
  }
  // The line above a caret: from the text in hand when streaming (no copy of the file's lines is kept).
  std::string shown_line(int line) const {
    if (!sink_ || (line != line_ && line != rec_line_)) return detail::display_line(t_.text, line);
    std::size_t start = line == line_ ? line_start_ : rec_start_;
    if (start > s_.size()) return {};
    std::size_t end = s_.find('\n', start);
    if (end == std::string_view::npos) end = s_.size();
    std::string out(s_.substr(start, end - start));
    if (!out.empty() && out.back() == '\r') out.pop_back();
    std::replace(out.begin(), out.end(), '\t', ' ');
    return out;
  }
  InputError error_here(std::size_t p, std::string key, std::string value, std::string expected) const {
    return error(line_, column(p), std::move(key), std::move(value), std::move(expected));
  }

  bool at_line_end(std::size_t p) const {
    return p >= s_.size() || s_[p] == '\n' || (s_[p] == '\r' && p + 1 < s_.size() && s_[p + 1] == '\n');
  }
  // Consumes the line end at pos_ (if any) and starts the next line.
  void next_line() {
    if (pos_ < s_.size() && s_[pos_] == '\r') ++pos_;
    if (pos_ < s_.size() && s_[pos_] == '\n') ++pos_;
    ++line_;
    line_start_ = pos_;
  }

  bool skip_blank_or_comment() {
    std::size_t p = pos_;
    while (p < s_.size() && is_space(s_[p])) ++p;
    if (at_line_end(p) || s_[p] == '#') {
      while (!at_line_end(p)) ++p;
      if (sink_ && t_.header.empty()) t_.text.emplace_back(s_.substr(line_start_, p - line_start_));
      pos_ = p;
      next_line();
      return true;
    }
    return false;
  }

  std::string key_for(std::size_t cell) const {
    if (t_.header.empty()) return "header";
    return cell < t_.header.size() ? t_.header[cell] : "(extra cell)";
  }

  // A data row whose form is plainly right, passed over (form_only_) in one look at each byte: no
  // quote, no CR but a CR LF line end's, the header's number of cells. False, nothing consumed, for
  // any other line, which pass_form and read_record then see as before (they take every line this
  // takes, the same way: it is only quicker on the lines most files are made of).
  bool plain_form() {
    // 0: any other byte; 1: comma; 2: LF; 3: a quote or CR
    static const auto kinds = [] {
      std::array<unsigned char, 256> k{};
      k[static_cast<unsigned char>(',')] = 1;
      k[static_cast<unsigned char>('\n')] = 2;
      k[static_cast<unsigned char>('"')] = 3;
      k[static_cast<unsigned char>('\r')] = 3;
      return k;
    }();
    const char* const e = s_.data() + s_.size();
    const char* p = s_.data() + pos_;
    std::size_t commas = 0;
#ifdef __SSE2__
    // 16 bytes at a time while they hold no quote or CR (the byte loop below takes any other case)
    const __m128i lf = _mm_set1_epi8('\n'), comma = _mm_set1_epi8(','), quote = _mm_set1_epi8('"'), cr = _mm_set1_epi8('\r');
    while (e - p >= 16) {
      const __m128i v = _mm_loadu_si128(reinterpret_cast<const __m128i*>(p));
      const unsigned ends = static_cast<unsigned>(_mm_movemask_epi8(_mm_cmpeq_epi8(v, lf)));
      const unsigned commas_here = static_cast<unsigned>(_mm_movemask_epi8(_mm_cmpeq_epi8(v, comma)));
      const unsigned odd = static_cast<unsigned>(_mm_movemask_epi8(_mm_or_si128(_mm_cmpeq_epi8(v, quote), _mm_cmpeq_epi8(v, cr))));
      const unsigned before = ends ? (ends & (0u - ends)) - 1 : 0xFFFFu;  // the bytes before the line end
      if (odd & before) break;
      unsigned k = commas_here & before;  // its bits counted (x86-64's baseline has no popcnt)
      k = k - ((k >> 1) & 0x5555u);
      k = (k & 0x3333u) + ((k >> 2) & 0x3333u);
      k = (k + (k >> 4)) & 0x0F0Fu;
      commas += (k + (k >> 8)) & 0x1Fu;
      if (ends) {
        p += __builtin_ctz(ends);
        return plain_form_end(p, commas);
      }
      p += 16;
    }
#endif
    for (; p < e; ++p) {
      const unsigned char k = kinds[static_cast<unsigned char>(*p)];
      if (k == 0) continue;
      if (k == 1) {
        ++commas;
        continue;
      }
      if (k == 2) break;
      if (*p == '\r' && p + 1 < e && p[1] == '\n') break;  // the line end
      return false;
    }
    return plain_form_end(p, commas);
  }
  // The end of a plain row at `p` (its line end, or the text's end) with `commas` before it.
  bool plain_form_end(const char* p, std::size_t commas) {
    if (commas + 1 != t_.header.size()) return false;
    pos_ = static_cast<std::size_t>(p - s_.data());
    next_line();
    ++data_rows_;
    return true;
  }

  // A data row offered to the hook as its line's bytes (without the line end); true when the hook
  // took it (the sink is not called), false, with nothing consumed, to read it as always.
  bool offered() {
    if (!hook_.take) return false;
    const char* const b = s_.data() + pos_;
    const std::size_t left = s_.size() - pos_;
    const void* nl = std::memchr(b, '\n', left);
    const std::size_t len = nl ? static_cast<std::size_t>(static_cast<const char*>(nl) - b) : left;
    std::size_t text = len;
    if (nl && text > 0 && b[text - 1] == '\r') --text;
    if (!hook_.take(hook_.context, std::string_view(b, text), line_)) return false;
    pos_ += len;
    next_line();
    ++data_rows_;
    return true;
  }

  // A data row's form checked without its cells (form_only_): the row's line passed when it is as
  // read_record would take it (quotes closed, no quote inside an unquoted cell, no lone CR, the
  // header's number of cells); false, with nothing consumed, when read_record must read it (and
  // refuse it, with its message).
  bool pass_form() {
    std::size_t p = pos_, n = 0;
    for (;;) {
      while (p < s_.size() && is_space(s_[p])) ++p;
      if (p < s_.size() && s_[p] == '"') {
        ++p;
        for (;;) {
          if (at_line_end(p)) return false;
          if (s_[p] == '"') {
            if (p + 1 < s_.size() && s_[p + 1] == '"') {
              p += 2;
              continue;
            }
            ++p;
            break;
          }
          ++p;
        }
        while (p < s_.size() && is_space(s_[p])) ++p;
        if (!at_line_end(p) && s_[p] != ',') return false;
      } else {
        while (!at_line_end(p) && s_[p] != ',') {
          if (s_[p] == '"' || s_[p] == '\r') return false;
          ++p;
        }
      }
      ++n;
      if (p < s_.size() && s_[p] == ',') {
        ++p;
        continue;
      }
      break;
    }
    if (n != t_.header.size()) return false;
    pos_ = p;
    next_line();
    ++data_rows_;
    return true;
  }

  // Reads one line's cells; true when they were a data row handed to the sink.
  bool read_record() {
    if (form_only_ && !t_.header.empty() && pass_form()) return true;
    std::vector<std::string>& cells = cells_;  // kept from row to row: no allocation per row
    std::vector<int>& cols = cols_;
    std::size_t k = 0;  // the row's cells so far (cells_ keeps its strings from row to row: their room is reused)
    cols.clear();
    rec_start_ = line_start_;
    rec_line_ = line_;
    for (;;) {
      while (pos_ < s_.size() && is_space(s_[pos_])) ++pos_;
      const int col = column(pos_);
      std::string& cell = quoted_;
      std::string_view text;
      if (pos_ < s_.size() && s_[pos_] == '"') {
        cell.clear();
        const std::size_t open = pos_++;
        for (;;) {
          if (at_line_end(pos_))
            throw error_here(open, key_for(k), std::string(s_.substr(open, pos_ - open)),
                             "a closing quote on the same line for the quote opened here");
          if (s_[pos_] == '"') {
            if (pos_ + 1 < s_.size() && s_[pos_ + 1] == '"') {
              cell += '"';
              pos_ += 2;
              continue;
            }
            ++pos_;
            break;
          }
          cell += s_[pos_++];
        }
        while (pos_ < s_.size() && is_space(s_[pos_])) ++pos_;
        if (!at_line_end(pos_) && s_[pos_] != ',')
          throw error_here(pos_, key_for(k), cell, "a comma or the line end after the closing quote");
        text = cell;
      } else {
        const std::size_t start = pos_;
        while (!at_line_end(pos_) && s_[pos_] != ',') {
          if (s_[pos_] == '"')
            throw error_here(pos_, key_for(k), trim(s_.substr(start, pos_ - start + 1)),
                             "a cell quoted as a whole when it holds a quote (\"say \"\"x\"\"\")");
          if (s_[pos_] == '\r')
            throw error_here(pos_, key_for(k), trim(s_.substr(start, pos_ - start)),
                             "line ends LF or CR LF (a lone CR is here)");
          ++pos_;
        }
        text = s_.substr(start, pos_ - start);
      }
      while (!text.empty() && is_space(text.front())) text.remove_prefix(1);  // trimmed, as trim() does
      while (!text.empty() && is_space(text.back())) text.remove_suffix(1);
      if (k == cells.size()) cells.emplace_back();
      cells[k++].assign(text);
      cols.push_back(col);
      if (pos_ < s_.size() && s_[pos_] == ',') {
        ++pos_;
        continue;
      }
      break;
    }
    cells.resize(k);
    const int end_col = column(pos_);
    const int line = line_;
    const std::string_view line_text = s_.substr(line_start_, pos_ - line_start_);
    next_line();
    if (t_.header.empty()) {
      if (sink_) t_.text.emplace_back(line_text);
      take_header(cells, cols, line);
      return false;
    }
    const std::size_t n = t_.header.size();
    if (cells.size() > n)
      throw error(line, cols[n], "(extra cell)", cells[n],
                  std::to_string(n) + " cells, as the header has (this row has " + std::to_string(cells.size()) + ")");
    if (cells.size() < n)
      throw error(line, end_col, t_.header[cells.size()], "",
                  std::to_string(n) + " cells, as the header has (this row has " + std::to_string(cells.size()) + ")");
    ++data_rows_;
    if (sink_) {
      (*sink_)(cells, cols, line, line_text);
      return true;
    }
    t_.rows.push_back(std::move(cells));
    t_.columns.push_back(std::move(cols));
    t_.lines.push_back(line);
    return true;
  }

  void take_header(const std::vector<std::string>& cells, const std::vector<int>& cols, int line) {
    std::unordered_map<std::string, int> first_column;
    for (std::size_t i = 0; i < cells.size(); ++i) {
      if (cells[i].empty()) throw error(line, cols[i], "header", "", "a column name in every header cell");
      const auto [it, inserted] = first_column.emplace(cells[i], cols[i]);
      if (!inserted)
        throw error(line, cols[i], "header", cells[i],
                    "each column name once: duplicate column '" + cells[i] + "' (first in column " +
                        std::to_string(it->second) + ")");
    }
    t_.header = cells;
    t_.header_line = line;
    t_.header_columns = cols;
    header_line_ = line;
  }

  std::string_view s_;
  CsvTable& t_;
  const detail::CsvRowSink* sink_ = nullptr;
  bool form_only_ = false;  //!< data rows checked for their form only, the sink not called
  detail::CsvLineHook hook_;  //!< data rows offered to it first
  std::size_t data_rows_ = 0;
  std::vector<std::string> cells_;
  std::vector<int> cols_;
  std::string quoted_;  // a quoted cell's text, unquoted
  std::size_t pos_ = 0;
  std::size_t line_start_ = 0;
  int line_ = 1;
  std::size_t rec_start_ = 0;  // where the line of the record being read starts
  int rec_line_ = 0;
  int header_line_ = 0;
  mutable std::size_t col_line_start_ = static_cast<std::size_t>(-1), col_pos_ = 0;
  mutable int col_ = 1;
};

}  // namespace

int CsvTable::column(const std::string& name) const {
  const auto it = std::find(header.begin(), header.end(), name);
  return it == header.end() ? -1 : static_cast<int>(it - header.begin());
}

InputError CsvTable::error(std::size_t row, std::size_t col, std::string expected) const {
  const std::string key = col < header.size() ? header[col] : "";
  if (row >= rows.size() || row >= lines.size()) return InputError(key, "", std::move(expected), file_only(file));
  const std::string value = col < rows[row].size() ? rows[row][col] : "";
  const int line = lines[row];
  const int c = row < columns.size() && col < columns[row].size() ? columns[row][col] : 0;
  return InputError(key, value, std::move(expected), InputWhere{file, line, c, detail::display_line(text, line)});
}

namespace {
// The checks before parsing (size, NUL bytes) and the text without its byte-order mark.
std::string_view prepared(const std::string& text, const std::string& file_name, std::size_t max_bytes) {
  if (text.size() > max_bytes)
    throw InputError("file", std::to_string(text.size()) + " bytes",
                     "a file of at most " + std::to_string(max_bytes) + " bytes", file_only(file_name));
  std::string_view s(text);
  if (s.size() >= 3 && s.substr(0, 3) == "\xEF\xBB\xBF") s.remove_prefix(3);  // UTF-8 byte-order mark
  if (const std::size_t nul = s.find('\0'); nul != std::string_view::npos) {
    const int line = static_cast<int>(std::count(s.begin(), s.begin() + static_cast<long>(nul), '\n')) + 1;
    std::size_t start = nul;
    while (start > 0 && s[start - 1] != '\n') --start;
    throw InputError("file", "byte 0x00", "text (a NUL byte is here; is this a CSV file?)",
                     InputWhere{file_name, line, static_cast<int>(nul - start) + 1, ""});
  }
  return s;
}
}  // namespace

CsvTable parse_csv(const std::string& text, const std::string& file_name, std::size_t max_bytes) {
  CsvTable t;
  t.file = file_name;
  const std::string_view s = prepared(text, file_name, max_bytes);
  t.text = detail::split_lines(s);
  Parser(s, t).run();
  return t;
}

namespace detail {

CsvFileFacts scan_csv_file(const std::string& path, std::size_t max_bytes) {
  const std::string readable = "a readable CSV file";
  if (const std::string why = not_a_plain_file(path); !why.empty())
    throw InputError("file", path, readable + " (" + why + ")", file_only(path));
  const int fd = ::open(path.c_str(), O_RDONLY | O_CLOEXEC);
  if (fd < 0) throw InputError("file", path, readable + " (cannot open it)", file_only(path));
  struct Closer {
    int fd;
    ~Closer() { ::close(fd); }
  } closer{fd};
  struct stat st {};
  if (::fstat(fd, &st) != 0 || !S_ISREG(st.st_mode)) throw InputError("file", path, readable + " (cannot open it)", file_only(path));
  CsvFileFacts f;
  f.size = static_cast<std::uint64_t>(st.st_size);
  f.mtime_ns = static_cast<std::int64_t>(st.st_mtim.tv_sec) * 1000000000 + st.st_mtim.tv_nsec;
  if (f.size > max_bytes)
    throw InputError("file", std::to_string(f.size) + " bytes", "a file of at most " + std::to_string(max_bytes) + " bytes",
                     file_only(path));
  // one pass in blocks: the digest, and a NUL byte refused wherever it is (before any cell is read)
  // FNV-1a, 64 bit, over the 8-byte words of each 1 MB block in four lanes (word i to lane i % 4:
  // four chains of multiplications side by side, not one), then the block's last bytes one by one
  std::uint64_t h[4] = {1469598103934665603ull, 0x9E3779B97F4A7C15ull, 0xC2B2AE3D27D4EB4Full, 0x165667B19E3779F9ull};
  const std::size_t block = 1u << 20;
  const std::unique_ptr<char[]> buf(new char[block]);  // not zero-filled: read into at once
  std::uint64_t at = 0;
  bool bom = false;
  for (;;) {
    std::size_t k = 0;  // the block filled whole (but at the end), so the words do not depend on how reads split
    while (k < block) {
      const ssize_t n = ::read(fd, buf.get() + k, block - k);
      if (n < 0) throw InputError("file", path, readable + " (reading it failed)", file_only(path));
      if (n == 0) break;
      k += static_cast<std::size_t>(n);
    }
    if (k == 0) break;
    if (at == 0 && k >= 3 && std::memcmp(buf.get(), "\xEF\xBB\xBF", 3) == 0) bom = true;
    std::size_t i = 0;
    for (; i + 32 <= k; i += 32)
      for (int l = 0; l < 4; ++l) {
        std::uint64_t w;
        std::memcpy(&w, buf.get() + i + 8 * l, sizeof w);
        h[l] = (h[l] ^ w) * 1099511628211ull;
      }
    for (int l = 0; i + 8 <= k; i += 8, ++l) {
      std::uint64_t w;
      std::memcpy(&w, buf.get() + i, sizeof w);
      h[l] = (h[l] ^ w) * 1099511628211ull;
    }
    for (; i < k; ++i) h[0] = (h[0] ^ static_cast<unsigned char>(buf[i])) * 1099511628211ull;
    if (const void* z = std::memchr(buf.get(), 0, k)) {
      // its line and column: the lines before it counted only now (the file is refused), from the start
      const std::size_t nul = static_cast<std::size_t>(static_cast<const char*>(z) - buf.get());
      std::uint64_t line = 1, line_start = 0;
      std::vector<char> again(at > 0 ? 1u << 20 : 0);
      for (std::uint64_t pos = 0; pos < at;) {
        const ssize_t n = ::pread(fd, again.data(), static_cast<std::size_t>(std::min<std::uint64_t>(again.size(), at - pos)),
                                  static_cast<off_t>(pos));
        if (n <= 0) throw InputError("file", path, readable + " (reading it failed)", file_only(path));
        for (ssize_t j = 0; j < n; ++j)
          if (again[static_cast<std::size_t>(j)] == '\n') ++line, line_start = pos + static_cast<std::uint64_t>(j) + 1;
        pos += static_cast<std::uint64_t>(n);
      }
      for (std::size_t j = 0; j < nul; ++j)
        if (buf[j] == '\n') ++line, line_start = at + j + 1;
      const std::uint64_t from = line == 1 && bom ? 3 : line_start;
      throw InputError("file", "byte 0x00", "text (a NUL byte is here; is this a CSV file?)",
                       InputWhere{path, static_cast<int>(line), static_cast<int>(at + nul - from) + 1, ""});
    }
    at += k;
    if (at > max_bytes) break;  // grown since the size was taken: read no further than the cap
  }
  f.digest = h[0] ^ (h[1] * 0x9E3779B97F4A7C15ull) ^ (h[2] * 0xC2B2AE3D27D4EB4Full) ^ (h[3] * 0x165667B19E3779F9ull);
  if (at != f.size) throw InputError("file", path, readable + " (it changed while it was read)", file_only(path));
  return f;
}

struct CsvFileReader::Impl {
  Impl(std::string p, CsvTable& t, const CsvRowSink& s, bool form_only, CsvLineHook hook)
      : path(std::move(p)), table(t), sink(s), parser("", t, &sink, form_only, hook) {}
  std::string path;
  CsvTable& table;
  CsvRowSink sink;
  Parser parser;
  int fd = -1;
  std::uint64_t left = 0;  // bytes of the file still to read (its size when scanned)
  // the piece, then the carry: the bytes after its last line end, moved to the front for the next
  // piece; not zero-filled (a std::string's resize filled every megabyte before it was read into)
  std::unique_ptr<char[]> buf;
  std::size_t room = 0, carry_at = 0, carry = 0;
  bool first = true, done = false;

  // Room for `need` bytes, the first `keep` kept.
  void make_room(std::size_t need, std::size_t keep) {
    if (need <= room) return;
    const std::size_t n = std::max(need, 2 * room);
    std::unique_ptr<char[]> b(new char[n]);
    if (keep > 0) std::memcpy(b.get(), buf.get(), keep);
    buf = std::move(b);
    room = n;
  }

  // The next piece of whole lines; false at the end of the file.
  bool refill() {
    if (left == 0 && carry == 0) return false;
    if (carry > 0) std::memmove(buf.get(), buf.get() + carry_at, carry);
    std::size_t size = carry, last = std::string::npos;
    carry = 0;
    while (left > 0) {
      const std::size_t want = static_cast<std::size_t>(std::min<std::uint64_t>(left, 1u << 20));
      make_room(size + want, size);
      const ssize_t n = ::read(fd, buf.get() + size, want);
      if (n <= 0) {
        if (n < 0) throw InputError("file", path, "a readable CSV file (reading it failed)", file_only(path));
        left = 0;
        break;
      }
      const std::size_t old = size;
      size += static_cast<std::size_t>(n);
      left -= static_cast<std::uint64_t>(n);
      // a line end in what was just read (the carry before it has none)
      if (const void* lf = ::memrchr(buf.get() + old, '\n', static_cast<std::size_t>(n))) {
        last = static_cast<std::size_t>(static_cast<const char*>(lf) - buf.get());
        break;
      }
    }
    if (left > 0 && last != std::string::npos) {
      carry_at = last + 1;
      carry = size - carry_at;
      size = last + 1;
    }
    std::string_view v(buf.get(), size);
    if (first && v.size() >= 3 && v.substr(0, 3) == "\xEF\xBB\xBF") v.remove_prefix(3);  // UTF-8 byte-order mark
    first = false;
    parser.rebase(v);
    return true;
  }
};

CsvFileReader::CsvFileReader(const std::string& path, const CsvFileFacts& facts, CsvTable& header, const CsvRowSink& sink,
                             bool form_only, CsvLineHook hook)
    : p_(std::make_unique<Impl>(path, header, sink, form_only, hook)) {
  header = CsvTable{};
  header.file = path;
  p_->fd = ::open(path.c_str(), O_RDONLY | O_CLOEXEC);
  if (p_->fd < 0) throw InputError("file", path, "a readable CSV file (cannot open it)", file_only(path));
  p_->left = facts.size;
}

CsvFileReader::~CsvFileReader() {
  if (p_ && p_->fd >= 0) ::close(p_->fd);
}

bool CsvFileReader::next() {
  Impl& m = *p_;
  if (m.done) return false;
  for (;;) {
    if (m.parser.step()) return true;
    if (!m.refill()) break;
  }
  m.done = true;
  m.parser.finish();
  return false;
}

std::size_t stream_csv_file(const std::string& path, const CsvFileFacts& facts, CsvTable& header, const CsvRowSink& sink,
                            bool form_only, CsvLineHook hook) {
  CsvFileReader r(path, facts, header, sink, form_only, hook);
  std::size_t rows = 0;
  while (r.next()) ++rows;
  return rows;
}

}  // namespace detail

void detail::cell_scalar(const std::string& cell, const std::string& unit, std::string& out) {
  const bool bare = !cell.empty() && cell.find_first_not_of("+-.0123456789eE") == std::string::npos;
  out = cell;
  if (bare && !unit.empty()) out.append(" ").append(unit);
}

CsvTable read_csv(const std::string& path, std::size_t max_bytes) {
  const std::string text = detail::read_capped_file(path, max_bytes, "CSV", "file");
  return parse_csv(text, path, max_bytes);
}

NamedColumns named_columns(const CsvTable& t, const std::vector<std::string>& allowed, const std::string& what) {
  Document d;
  d.file = t.file;
  d.lines = t.text;
  NamedColumns out;
  for (std::size_t c = 0; c < t.header.size(); ++c) {
    std::string h = t.header[c], unit;
    const auto br = h.find('[');
    if (br != std::string::npos && h.back() == ']') {
      unit = h.substr(br + 1, h.size() - br - 2);
      h = h.substr(0, br);
      while (!h.empty() && h.back() == ' ') h.pop_back();
    }
    if (std::find(allowed.begin(), allowed.end(), h) == allowed.end()) {
      const std::string cl = closest(h, allowed);
      std::string all;
      for (const auto& x : allowed) all += (all.empty() ? "" : ", ") + x;
      throw d.error(Mark{t.header_line > 0 ? t.header_line : 1, c < t.header_columns.size() ? t.header_columns[c] : 1}, what, t.header[c],
                    "a column among: " + all + (cl.empty() ? "" : " (closest: '" + cl + "')"));
    }
    const int col = c < t.header_columns.size() ? t.header_columns[c] : 1;
    const auto twice = std::find(out.names.begin(), out.names.end(), h);
    if (twice != out.names.end()) {
      const std::size_t first = static_cast<std::size_t>(twice - out.names.begin());
      throw d.error(Mark{t.header_line, col}, what, t.header[c],
                    "each quantity in one column only: '" + h + "' is also column " + std::to_string(first + 1) +
                        " ('" + t.header[first] + "')");
    }
    out.names.push_back(h);
    out.units.push_back(unit);
  }
  return out;
}

Node cell_node(const CsvTable& t, std::size_t row, std::size_t col, const std::string& name, const std::string& unit,
               const std::string& path_prefix) {
  Node n;
  n.type = Node::Type::scalar;
  detail::cell_scalar(t.rows[row][col], unit, n.scalar);
  n.mark = {t.lines[row], t.columns[row][col]};
  n.path = path_prefix + "[" + std::to_string(row) + "]." + name;
  return n;
}

}  // namespace acidload::io
