#pragma once
#include <cstdio>
namespace acidload_cli {
//! Prints the demo site's results (invented data); returns the exit code.
int run_demo(std::FILE* out);
}  // namespace acidload_cli
