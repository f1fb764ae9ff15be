#pragma once
namespace acidload {
//! The library version, "MAJOR.MINOR.PATCH", as defined once in the top-level CMakeLists.txt.
const char* version() noexcept;
}  // namespace acidload
