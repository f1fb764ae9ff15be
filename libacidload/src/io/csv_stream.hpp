#pragma once
// CSV rows streamed one at a time (internal to acidload::io; not installed): a record is read row
// by row into segments, with no table of cells and no copy of the file's lines kept, the file read
// in pieces.
#include <cstddef>
#include <cstdint>
#include <memory>
#include <functional>
#include <string>
#include <string_view>
#include <vector>

#include "acidload/io/csv.hpp"
#include "acidload/io/quantity.hpp"

namespace acidload::io::detail {

//! One data row: its cells (trimmed), the 1-based character column of each, its 1-based file line
//! and the line's text (for a caret).
using CsvRowSink = std::function<void(const std::vector<std::string>& cells, const std::vector<int>& columns, int line,
                                      std::string_view line_text)>;

//! A data row offered as its line's bytes before the parser reads it: `take` returns true when it
//! took the row (the row is counted, the sink not called), false to leave it to the parser, which
//! then reads it as if it had not been offered (cells to the sink, or its refusal). Only lines after
//! the header that are neither blank nor comments are offered, without their line end (LF or CR LF).
//! A hook must take only a line whose cells the parser would read plainly (no quotes, spaces, tabs
//! or lone CR, the header's number of cells): it is handed nothing the parser would have checked.
struct CsvLineHook {
  bool (*take)(void* context, std::string_view line, int line_number) = nullptr;
  void* context = nullptr;
};

//! What is known of a CSV file from one pass over its bytes: its size, modification time and a
//! digest (FNV-1a, 64 bit) of every byte, to tell later whether it is still the file that was read.
struct CsvFileFacts {
  std::uint64_t size = 0;
  std::int64_t mtime_ns = 0;
  std::uint64_t digest = 0;
  bool operator==(const CsvFileFacts& o) const { return size == o.size && mtime_ns == o.mtime_ns && digest == o.digest; }
};

//! Scans the file in blocks of 1 MB: a plain file of at most `max_bytes`, with no NUL byte (refused
//! with its line and column, before any cell is read). Memory: one block.
CsvFileFacts scan_csv_file(const std::string& path, std::size_t max_bytes);

//! A CSV file's data rows one at a time, parsed as read_csv parses (the same checks, messages and
//! positions), read in pieces of whole lines of about 1 MB: memory does not grow with the file.
//! `header` gets the file name, the header, its line and columns and the file's lines up to the
//! header's. Each next() hands one data row to `sink` and returns true; false at the end (where a
//! file with no header or no data row is refused). The sink's own exceptions pass through.
class CsvFileReader {
 public:
  //! `form_only`: a data row whose form is right is passed over (counted, the sink not called); a
  //! row with a mistake in its form is read and refused as always.
  //! `hook`: data rows offered to it first (see CsvLineHook); not with `form_only`.
  CsvFileReader(const std::string& path, const CsvFileFacts& facts, CsvTable& header, const CsvRowSink& sink,
                bool form_only = false, CsvLineHook hook = {});
  ~CsvFileReader();
  CsvFileReader(const CsvFileReader&) = delete;
  CsvFileReader& operator=(const CsvFileReader&) = delete;
  bool next();

 private:
  struct Impl;
  std::unique_ptr<Impl> p_;
};

//! Every data row of the file to `sink` (a CsvFileReader read to the end); returns their number.
std::size_t stream_csv_file(const std::string& path, const CsvFileFacts& facts, CsvTable& header, const CsvRowSink& sink,
                            bool form_only = false, CsvLineHook hook = {});

//! A cell's text as its node's scalar: a bare number gets the header's `unit` ("500" → "500 ppmv").
void cell_scalar(const std::string& cell, const std::string& unit, std::string& out);

//! The fast path's pieces of the quantity reader (quantity.cpp), each exactly the generic reader's
//! arithmetic: a whole cell as a number (its syntax and magnitude checks; false where the reader
//! refuses it); a header unit's factor and offset for a kind (false: not one of the kind's units,
//! or no unit where the kind needs one); a number converted with them, false where the reader
//! refuses the result (a temperature at or below 0 K, a negative pressure or count, beyond 1e300).
bool plain_number(std::string_view s, double& out);
bool unit_conversion(Kind k, std::string_view unit_text, double& factor, double& offset);
bool converted(Kind k, double v, double factor, double offset, double& out);

}  // namespace acidload::io::detail
