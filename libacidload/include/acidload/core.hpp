#pragma once
// acidload::core — the physics, in SI doubles. Units inside the core, one table:
//
//   quantity                    unit            note
//   time                        h               hours throughout: segments, rates "per hour"
//   amount of substance         mol             gas volumes at a reference state are amounts
//   molar flow                  mol/h
//   mass                        kg              oil mass; molar masses in kg/mol
//   volume                      m³
//   temperature                 K               inputs in °C are converted at the boundary
//   pressure                    Pa
//   power                       W               electrical output; energy in J
//   molar heating value         J/mol
//   mole fraction               mol/mol         "ppmv" only at the boundary
//   acid and base numbers       mg KOH/g        TBN, TAN, SAN and every oil concentration
//   base-equivalent flow        g KOH/h         acid inflow as the KOH it neutralises;
//                                               g KOH/h ÷ kg oil = mg KOH/g per hour
//   oxidation, nitration        A/cm            FTIR, per cm of path length
//
// Every field's comment repeats its unit in brackets.
#include "acidload/core/combustion.hpp"
#include "acidload/core/condemning_limits.hpp"
#include "acidload/core/constants.hpp"
#include "acidload/core/dew_points.hpp"
#include "acidload/core/economics.hpp"
#include "acidload/core/error.hpp"
#include "acidload/core/exhaust.hpp"
#include "acidload/core/fuel.hpp"
#include "acidload/core/gas.hpp"
#include "acidload/core/halocarbons.hpp"
#include "acidload/core/heating_value.hpp"
#include "acidload/core/oil.hpp"
#include "acidload/core/oil_rates.hpp"
#include "acidload/core/plausibility.hpp"
#include "acidload/core/scrubber.hpp"
#include "acidload/core/so3_equilibrium.hpp"
#include "acidload/core/species.hpp"
#include "acidload/core/transfer.hpp"
#include "acidload/core/version.hpp"
#include "acidload/core/water.hpp"
