#include "acidload/core/version.hpp"
#ifndef ACIDLOAD_VERSION
#error "ACIDLOAD_VERSION is set by the build"
#endif
const char* acidload::version() noexcept { return ACIDLOAD_VERSION; }
