#pragma once
// Scratch files of the unit tests: a name of this process under the temporary folder, so that two
// test runs on one machine (two engineers, or the mutation checks' two copies) never share a file.
#include <filesystem>
#include <string>

#include <unistd.h>

namespace acidload::test {

inline std::filesystem::path scratch_path(const std::string& name) {
  return std::filesystem::temp_directory_path() / ("acidload-" + std::to_string(::getpid()) + "-" + name);
}

}  // namespace acidload::test
