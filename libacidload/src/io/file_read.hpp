#pragma once
// The one way acidload::io reads an input file whole (internal; not installed): a plain file only
// (a folder, FIFO, device or socket is refused before it is opened, so that no read blocks or runs
// without end), read in blocks and refused as soon as it passes a byte cap.
#include <cstddef>
#include <string>

namespace acidload::io::detail {

//! The file's bytes. `kind` names the file in messages ("YAML", "CSV": "a readable CSV file (…)");
//! `size_key` is the key an oversized file is reported under. Every refusal is an InputError naming the file.
std::string read_capped_file(const std::string& path, std::size_t max_bytes, const std::string& kind,
                             const std::string& size_key);

}  // namespace acidload::io::detail
