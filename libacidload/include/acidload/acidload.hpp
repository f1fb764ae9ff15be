#pragma once
// acidload: the main API. Include this one header; link acidload::acidload.
// The Boost.Units typed constructors are not in it: include acidload/units.hpp and link
// acidload::units where you want typed inputs.
#include "acidload/core.hpp"
#include "acidload/studies/economics.hpp"
#include "acidload/studies/site.hpp"
#include "acidload/studies/timeline.hpp"
#include "acidload/studies/whatif.hpp"
