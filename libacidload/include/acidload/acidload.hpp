#pragma once
// acidload: the main API. Include this one header; link acidload::acidload.
#include "acidload/core.hpp"
#include "acidload/studies/economics.hpp"
#include "acidload/studies/site.hpp"
#include "acidload/studies/timeline.hpp"
#include "acidload/studies/whatif.hpp"
#include "acidload/units.hpp"
