// The registry of case keys (keys.hpp). Ranges are in the core's units (core.hpp) and agree with the
// core's own validators, which name the same key paths; defaults agree with the core structs'
// initialisers (tests/unit/test_keys.cpp checks both).
#include "acidload/io/keys.hpp"

#include <cmath>
#include <cstdio>
#include <map>

#include "acidload/core/error.hpp"
#include "acidload/studies/monte_carlo.hpp"
#include "acidload/studies/parameters.hpp"
#include "acidload/core/constants.hpp"
#include "text.hpp"

namespace acidload::io {

namespace {

constexpr double inf = HUGE_VAL;

struct Builder {
  std::vector<CaseKey> keys;
  std::string section;
  CaseKey& add(std::string key, KeyType type, std::string doc) {
    CaseKey k;
    k.path = section.empty() ? key : section + "." + key;
    k.type = type;
    k.doc = std::move(doc);
    keys.push_back(std::move(k));
    return keys.back();
  }
  // a quantity: kind, range in core units, the unit docs write it in, default as shown
  CaseKey& q(std::string key, Kind kind, double lo, double hi, std::string unit, std::string def, std::string doc,
             std::string field) {
    CaseKey& k = add(std::move(key), KeyType::quantity, std::move(doc));
    k.kind = kind, k.low = lo, k.high = hi, k.unit = std::move(unit), k.default_text = std::move(def);
    k.field = std::move(field);
    return k;
  }
  CaseKey& w(std::string key, std::vector<std::string> words, std::string def, std::string doc, std::string field) {
    CaseKey& k = add(std::move(key), KeyType::word, std::move(doc));
    k.words = std::move(words), k.default_text = std::move(def), k.field = std::move(field);
    return k;
  }
  CaseKey& c(std::string key, std::string doc, std::string field) {
    CaseKey& k = add(std::move(key), KeyType::contaminant, std::move(doc));
    k.default_text = "0", k.field = std::move(field);
    return k;
  }
  CaseKey& other(std::string key, KeyType type, std::string def, std::string doc, std::string field = "") {
    CaseKey& k = add(std::move(key), type, std::move(doc));
    k.default_text = std::move(def), k.field = std::move(field);
    return k;
  }
};

// A calibratable key: fit and uncertainty vary it; its fit space, range and weak prior are the
// parameter's (studies/parameters.cpp; parameter() refuses a key without one, so the two lists agree).
CaseKey& cal(CaseKey& k) {
  k.calibratable = true;
  const ParameterInfo& p = parameter(k.path);
  k.prior_sd = p.prior_sd, k.prior_space = fit_space_text(p), k.prior_basis = p.prior_basis;
  k.fit_range = range_text(p), k.fit_unit = p.unit;
  return k;
}
CaseKey& alt(CaseKey& k, std::string other) {
  k.alternative = std::move(other);
  return k;
}
CaseKey& open_low(CaseKey& k) {
  k.low_open = true;
  return k;
}
CaseKey& layer(CaseKey& k) {
  k.layer = true;
  return k;
}

std::vector<CaseKey> build_table() {
  using K = Kind;
  using T = KeyType;
  Builder b;
  // ---- top level
  b.section = "";
  b.other("format-version", T::special, "required", "the format the file is written in (this acidload reads 1)");
  b.other("case", T::text, "–", "a title for reports", "CaseFile::title");
  b.other("base-name", T::text, "base", "name of the base case in comparisons", "EngineCase::name");
  layer(b.other("reference-state", T::special, "normal",
                "`normal` (0 °C, 101.325 kPa), `standard` (15 °C), or a map of `temperature` and `pressure`",
                "FuelAnalysis::reference"));
  layer(b.q("combustion-reference", K::temperature, 273.15, 298.15, "degC", "15 degC",
            "ISO 6976 combustion reference temperature: 0, 15, 20 or 25 degC", "FuelAnalysis::combustion"));
  layer(b.other("fuel", T::section, "required", "the gas analysis"));
  layer(b.other("engine", T::section, "required", "the engine and its operation"));
  layer(b.other("oil", T::section, "required", "the oil product and its charge"));
  layer(b.other("model", T::section, "–", "the model's calibratable parameters"));
  layer(b.other("limits", T::section, "–", "the condemning limits"));
  layer(b.other("run", T::section, "–", "horizon and output settings"));
  layer(b.other("record", T::section, "–", "an operating record"));
  b.other("variants", T::list, "–", "named variants to compare, each merged over the base");
  b.other("uncertainty", T::section, "–", "inputs for Monte Carlo");
  b.other("lab", T::section, "–",
          "the lab's precision, per-lab settings and alarm levels for `fit`, `forecast` and `predict` (docs/lab-results.md)");
  layer(b.other("scrubbing", T::section, "–", "gas cleaning before the engine: a train of stages"));
  layer(b.other("economics", T::section, "–", "prices: what oil, scrubbing and downtime cost"));
  b.other("site", T::section, "–",
          "a site: engines sharing this file's gas and scrubbing train (then no `record`, `variants`, `uncertainty` or `base-name`)");

  b.section = "reference-state";
  b.q("temperature", K::temperature, 200, 400, "degC", "0 degC", "temperature of the reference state",
      "ReferenceState::temperature");
  b.q("pressure", K::pressure, 5e4, 2e5, "kPa", "101.325 kPa", "pressure of the reference state",
      "ReferenceState::pressure");

  // ---- fuel
  b.section = "fuel";
  b.w("basis", {"dry", "wet"}, "dry", "basis of the figures that do not say", "FuelAnalysis::main_basis");
  b.other("composition", T::map, "required",
          "main components `CH4`, `CO2`, `N2`, `O2`, `H2`, `C2H6`, `C3H8`, `Ar` as fractions; normalised to what "
          "water and H2S leave (dry: summing to 100 % within 10 points; wet: to 100 % less the water)",
          "FuelAnalysis::main");
  alt(b.q("water", K::fraction, 0, 0.3, "%", "0 %", "water vapour in the wet gas", "FuelAnalysis::water_fraction"),
      "water-dew-point");
  alt(b.q("water-dew-point", K::temperature, 273.15, 353.15, "degC", "–",
          "instead of `water`: saturated at this temperature and `gas-pressure`", "FuelAnalysis::water_fraction"),
      "water");
  b.q("gas-pressure", K::pressure, 5e4, 5e5, "kPa", "101.325 kPa", "gas pressure for `water-dew-point`", "(for water-dew-point)");
  cal(b.c("h2s", "hydrogen sulfide", "FuelAnalysis::h2s"));
  b.c("other-sulfur", "COS, mercaptans, sulfides, as S", "FuelAnalysis::other_sulfur");
  b.c("chlorine", "organic chlorine total, as Cl", "FuelAnalysis::chlorine");
  b.c("fluorine", "organic fluorine total, as F", "FuelAnalysis::fluorine");
  b.other("halocarbons", T::map, "–",
          "compound → contaminant figure of the compound itself, summed to Cl and F by formula and added to the "
          "totals; names as in `acidload::halocarbon_table()` (e.g. `tetrachloroethene`) or formulas",
          "FuelAnalysis::halocarbons");

  // ---- engine
  b.section = "engine";
  b.q("rated-power", K::power, 1e3, 1e8, "kW", "= power", "electrical rating", "(load = power / rated power)");
  alt(b.q("power", K::power, 0, 1e8, "kW", "required unless fuel-flow", "electrical output", "Operation::electrical_power"),
      "load");
  alt(b.q("load", K::fraction, 0.05, 1.2, "%", "–", "instead of `power`: the share of `rated-power`", "Operation::load"),
      "power");
  alt(b.q("electrical-efficiency", K::fraction, 0.05, 0.6, "%", "required with power",
          "on the LHV; with the power, gives the fuel flow", "(fuel flow)"),
      "fuel-flow");
  alt(b.q("fuel-flow", K::molar_flow, 0, 1e8, "Nm3/h", "–", "instead of `electrical-efficiency`: the wet fuel gas flow",
          "Operation::fuel_flow"),
      "electrical-efficiency");
  b.q("excess-air-ratio", K::number, 1, 4, "", "1.8", "λ (lean burn 1.6–2.0)", "Air::excess_air_ratio");
  alt(b.q("air-water", K::fraction, 0, 0.1, "%", "0 %", "water in the combustion air", "Air::water_fraction"),
      "air-humidity");
  alt(b.q("air-humidity", K::fraction, 0, 1, "%", "–", "instead of `air-water`: relative humidity at `air-temperature` and `air-pressure`",
          "Air::water_fraction"),
      "air-water");
  b.q("air-temperature", K::temperature, 243.15, 323.15, "degC", "15 degC", "for `air-humidity`", "(for air-humidity)");
  b.q("air-pressure", K::pressure, 6e4, 1.1e5, "kPa", "101.325 kPa", "for `air-humidity`", "(for air-humidity)");
  cal(alt(b.q("blow-by", K::fraction, 0, 0.1, "%", "1 %", "blow-by as a share of the charge", "Operation::blowby_share"),
          "blow-by-flow"));
  alt(b.q("blow-by-flow", K::molar_flow, 0, 1e7, "Nm3/h", "–", "instead of `blow-by`: the blow-by flow", "Operation::blowby_flow"),
      "blow-by");
  cal(b.q("jacket-water-out", K::temperature, constants::engine_temperature_min, constants::engine_temperature_max, "degC", "90 degC",
          "jacket-water outlet temperature", "Operation::jacket_water_out"));
  b.q("coldest-crankcase-surface", K::temperature, constants::crankcase_surface_min, constants::engine_temperature_max, "degC", "60 degC",
      "coldest metal the blow-by wets (breather, covers)", "Operation::coldest_crankcase_surface");
  b.q("oil-temperature", K::temperature, constants::engine_temperature_min, constants::engine_temperature_max, "degC", "88 degC", "sump oil",
      "Segment::oil_temperature");
  b.q("crankcase-pressure", K::pressure, 5e4, 2e5, "kPa", "101.325 kPa", "absolute", "Operation::crankcase_pressure");
  b.q("exhaust-pressure", K::pressure, 5e4, 5e5, "kPa", "101.325 kPa", "absolute, at the heat-recovery exchanger",
      "Operation::exhaust_pressure");
  b.q("exhaust-temperature", K::temperature, 400, 1500, "degC", "450 degC", "for the SO3 equilibrium bound",
      "EngineCase::exhaust_temperature");
  b.q("start-every", K::duration, 0.1, 1e6, "h", "no starts", "running hours between starts", "Segment::starts");
  b.q("jacket-water-at-start", K::temperature, 233.15, constants::engine_temperature_max, "degC", "50 degC",
      "jacket water when the engine starts (preheated standby; 40–60 °C common practice; above `jacket-water-out`: taken as that)",
      "Operation::jacket_water_at_start");
  b.q("o2-of-air", K::fraction, 0.2, 0.22, "%", "21 %",
      "O2 of air in the O2 correction of NOx and the exhaust figures: 21 % (EU permits, TA Luft) or 20.9 % (US EPA)",
      "NoxEmission::o2_air");
  b.q("oxidation-catalyst", K::fraction, 0, 1, "%", "none",
      "an oxidation catalyst in the exhaust: the share of SO2 it turns to SO3 (raises the exhaust acid dew point)",
      "EngineCase::catalyst_so3_conversion");
  b.c("fuel-gas-sulfur-limit", "the engine maker's limit on total sulfur in the fuel gas, in `mg/Nm3 CH4`, `mg/MJ` or "
      "`mg/kWh` (of fuel heat, LHV; 1 kWh = 3.6 MJ); above it a warning", "FuelGasLimits::sulfur_per_*").default_text = "none";
  b.c("fuel-gas-halogen-limit", "the engine maker's limit on organic Cl + F in the fuel gas, in `mg/Nm3 CH4`, `mg/MJ` "
      "or `mg/kWh` (of fuel heat); above it a warning", "FuelGasLimits::halogens_per_*").default_text = "none";
  b.other("nox", T::special, "0",
          "engine-out NOx as NO2: `<n> mg/Nm3 at <n> % O2` (dry, 0 °C) or `<n> g/kWh`", "Operation::nox");

  // ---- oil
  b.section = "oil";
  cal(b.q("volume", K::volume, 1e-3, 100, "L", "required", "oil in circulation (sump, tank, cooler, filters) at 15 °C",
          "OilCharge::mass (× density)"));
  b.q("density", K::density, 600, 1200, "kg/m3", "880 kg/m3", "at 15 °C", "OilProperties::density_15");
  cal(b.q("fresh-tbn", K::acid_number, 0.5, 80, "mg KOH/g", "6 mg KOH/g", "fresh-oil base number by `tbn-method`",
          "OilProperties::fresh_tbn"));
  b.w("tbn-method", {"D2896", "D4739"}, "D2896", "the method of `fresh-tbn`", "OilProperties::fresh_tbn_method");
  b.q("fresh-tan", K::acid_number, 0, 20, "mg KOH/g", "1.5 mg KOH/g", "fresh-oil acid number (D664)", "OilProperties::fresh_tan");
  cal(b.q("consumption", K::specific_consumption, 0, 5e-9, "g/kWh", "0.2 g/kWh",
          "oil burnt (fit and uncertainty vary it as kg/h of the first segment)", "Segment::oil_consumption"));
  b.w("makeup", {"continuous", "top-ups"}, "continuous",
      "makeup keeps the level, or the level falls until a `top-up` event", "OilCharge::continuous_makeup");
  b.q("residual-share", K::fraction, 0, 0.9, "%", "10 %", "of the charge left in the system at an oil change",
      "OilCharge::residual_share");

  // ---- model (ranges: the core validators in core/transfer.cpp and core/oil.cpp)
  b.section = "model";
  cal(b.q("so3-share", K::fraction, 0, 1, "%", "2 %", "ε, fuel S to SO3 in the cylinder", "TransferParameters::so3_share"));
  cal(b.q("liner-uptake", K::fraction, 0, 0.1, "%", "0.025 %", "λ_L, share of fuel S taken up on the liner per 10 K of subcooling",
          "TransferParameters::liner_uptake"));
  open_low(b.q("liner-subcooling-scale", K::temperature_change, 0, inf, "K", "5 K", "ΔT_s of the softplus",
               "TransferParameters::liner_subcooling_scale"));
  cal(b.q("liner-wall-rise", K::temperature_change, 0, 200, "K", "40 K", "lower liner wall over jacket-water outlet at full load",
          "TransferParameters::liner_wall_rise"));
  b.q("liner-wall-rise-load-exponent", K::number, 0, 3, "", "1", "rise ∝ load^exponent",
      "TransferParameters::liner_wall_rise_load_exponent");
  b.q("liner-pressure", K::pressure, 1e5, 300e5, "bar", "30 bar", "cylinder pressure at which acid condenses on the liner",
      "TransferParameters::liner_pressure");
  b.q("cylinder-dew-point-offset", K::temperature_change, -100, 100, "K", "0 K", "added to the correlation's in-cylinder dew point",
      "TransferParameters::cylinder_dew_point_offset");
  cal(b.q("burnt-share-of-blow-by", K::fraction, 0, 1, "%", "70 %", "burnt gas in the blow-by",
          "TransferParameters::burnt_share_of_blowby"));
  b.q("capture-so3", K::fraction, 0, 1, "%", "100 %", "κ, SO3 taken up from the blow-by", "TransferParameters::capture_so3");
  b.q("capture-hcl", K::fraction, 0, 1, "%", "100 %", "κ, HCl taken up from the blow-by", "TransferParameters::capture_hcl");
  b.q("capture-hf", K::fraction, 0, 1, "%", "100 %", "κ, HF taken up from the blow-by", "TransferParameters::capture_hf");
  cal(b.q("capture-so2", K::fraction, 0, 1, "%", "10 %", "κ_SO2, SO2 taken up by fresh oil in a dry crankcase",
          "TransferParameters::capture_so2"));
  cal(b.q("capture-no2", K::fraction, 0, 1, "%", "1 %", "κ_N, NO2 taken up", "TransferParameters::capture_no2"));
  cal(b.q("wet-so2-factor", K::number, 1, 100, "", "3", "SO2 uptake wet over dry", "TransferParameters::wet_so2_factor"));
  open_low(alt(b.q("wetness-width", K::temperature_change, 0, inf, "K", "15 K",
          "10–90 % width of the crankcase condensation step: the spread of the wetted surfaces' temperatures above the coldest",
          "TransferParameters::wetness_width"),
      "wetness-scale"));
  open_low(alt(b.q("wetness-scale", K::temperature_change, 0, inf, "K", "–",
          "older form of `wetness-width`: the logistic scale s (width = 2 ln 9 · s = 4.39 s)", "TransferParameters::wetness_width"),
      "wetness-width"));
  b.q("warm-up-time", K::duration, 0, 24, "h", "0.5 h",
      "after a start: jacket water comes up to its running value and the crankcase stays wet this long",
      "TransferParameters::warmup_hours");
  b.q("warm-up-start-load", K::fraction, 0, 1, "%", "30 %", "load when a started engine takes load, share of the running load",
      "TransferParameters::warmup_start_load");
  b.q("load-ramp-time", K::duration, 0, 24, "h", "0.1 h", "time to reach the running load after a start",
      "TransferParameters::load_ramp_hours");
  b.w("oxidation-law", {"doubling", "arrhenius"}, "doubling", "how the oxidation rate follows temperature", "OxidationLaw::kind");
  cal(b.q("oxidation-rate", K::oxidation_rate, 0, 10, "A/cm/h", "0.008 A/cm/h", "k_ox at the reference temperature",
          "OxidationLaw::rate_at_reference"));
  b.q("oxidation-reference-temperature", K::temperature, 273.15, 573.15, "degC", "120 degC", "of the ring zone",
      "OxidationLaw::reference_temperature");
  b.q("oxidation-doubling-interval", K::temperature_change, 1, 50, "K", "10 K", "rise that doubles the rate (`doubling`)",
      "OxidationLaw::doubling_interval");
  b.q("activation-energy", K::molar_energy, 1e3, 400e3, "kJ/mol", "80 kJ/mol", "for `arrhenius`", "OxidationLaw::activation_energy");
  cal(b.q("ring-zone-offset", K::temperature_change, 0, 150, "K", "30 K", "ring zone over sump oil", "OxidationLaw::ring_zone_offset"));
  cal(b.q("organic-acid-yield", K::number, 0, 5, "", "0.08", "α, mg KOH/g of organic acid per A/cm of oxidation",
          "OxidationLaw::organic_acid_yield"));
  cal(b.q("nitration-yield", K::number, 0, 1e6, "", "1500", "A/cm of nitration per mol/kg of NO2 taken up",
          "OxidationLaw::nitration_yield"));
  cal(b.q("induction-time", K::duration, 1, 1e6, "h", "1500 h",
          "τ_A, hours the fresh antioxidant reserve lasts without makeup at the reference temperature", "OxidationLaw::induction_hours"));
  cal(b.q("depleted-oxidation-factor", K::number, 1, 100, "", "5", "m, oxidation once the antioxidant is spent over the protected rate",
          "OxidationLaw::depleted_factor"));
  cal(b.q("viscosity-per-oxidation", K::number, 0, 1, "", "0.008", "c_o, viscosity rise at 100 °C per A/cm of oxidation",
          "OilProperties::viscosity_per_oxidation"));
  cal(b.q("viscosity-per-nitration", K::number, 0, 1, "", "0.004", "c_n, viscosity rise at 100 °C per A/cm of nitration",
          "OilProperties::viscosity_per_nitration"));
  cal(b.q("weak-base-d2896", K::acid_number, 0, 10, "mg KOH/g", "0.6 mg KOH/g", "weak base D2896 titrates that neutralises no acid",
          "OilProperties::weak_base_d2896"));
  cal(b.q("weak-base-d4739", K::acid_number, 0, 10, "mg KOH/g", "0 mg KOH/g", "weak base D4739 titrates that neutralises no acid",
          "OilProperties::weak_base_d4739"));
  cal(b.q("base-floor", K::acid_number, 0, 40, "mg KOH/g", "1 mg KOH/g", "reactive base below which strong acid stays free",
          "OilProperties::base_floor"));
  cal(b.q("additive-depletion", K::per_hour, 0, 1, "1/h", "2e-4 1/h", "loss rate of the additive's own acidity",
          "OilProperties::additive_depletion"));
  cal(b.q("salt-titration-share", K::fraction, 0, 1, "%", "20 %", "β, neutralised salts still titrating in TAN",
          "OilProperties::salt_titration_share"));
  cal(b.q("organic-neutralised-share", K::fraction, 0, 1, "%", "50 %", "φ_B, organic acids neutralised by the base",
          "OilProperties::organic_neutralised_share"));

  // ---- limits (defaults: common practice, no single source)
  b.section = "limits";
  b.q("tbn-share-of-fresh", K::fraction, 0, 1, "%", "50 %", "TBN at or below this share of fresh", "LimitSettings::tbn_share_of_fresh");
  b.w("tbn-method", {"D2896", "D4739"}, "D4739", "method both TBNs are read by", "LimitSettings::tbn_method");
  b.q("tan-rise", K::acid_number, 0, 50, "mg KOH/g", "2 mg KOH/g", "TAN at or above fresh + this", "LimitSettings::tan_rise");
  b.other("crossover", T::flag, "true", "TAN at or above TBN", "LimitSettings::crossover");
  b.q("san", K::acid_number, 0, 50, "mg KOH/g", "0 mg KOH/g", "SAN above this (0: any free strong acid)", "LimitSettings::san");
  b.q("oxidation", K::oxidation, 0, 1000, "A/cm", "20 A/cm", "FTIR oxidation limit", "LimitSettings::oxidation");
  b.q("nitration", K::oxidation, 0, 1000, "A/cm", "20 A/cm", "FTIR nitration limit", "LimitSettings::nitration");
  b.q("viscosity-change", K::fraction, 0, 5, "%", "20 %", "kinematic viscosity at 100 °C up by this share over fresh",
      "LimitSettings::viscosity_rise");
  b.q("antioxidant-remaining", K::fraction, 0, 1, "%", "25 %", "antioxidant reserve down to this share of fresh",
      "LimitSettings::antioxidant_remaining");
  b.q("anti-wear-remaining", K::fraction, 0, 1, "%", "off",
      "anti-wear additive (its acidity) down to this share of fresh; setting it switches the limit on",
      "LimitSettings::anti_wear_remaining");
  b.q("water", K::fraction, 0, 1, "%", "0.5 %", "lab only: water in the oil above this share (the forecast holds the latest sample to it)", "LimitSettings::water");
  b.q("initial-ph", K::number, 0, 14, "", "4.5", "lab only: i-pH (ASTM D7946) at or below this (the forecast holds the latest sample to it)", "LimitSettings::initial_ph");
  b.q("max-hours", K::duration, 1, 1e6, "h", "8000 h",
      "the plant's planned maximum hours on a charge: the horizon; reaching it is no limit ('no limit within N h')",
      "LimitSettings::max_hours");
  b.other("ignore", T::list, "–",
          "limits switched off: `tbn-fall`, `tan-rise`, `crossover`, `san`, `oxidation`, `nitration`, `viscosity`, "
          "`antioxidant`, `anti-wear`, `max-hours`",
          "LimitSettings::enabled");

  // ---- lab (docs/lab-results.md "Lab settings in the case"); precedence: a row's *-sd > the call's
  // (--precision, Python precision=) > the lab's entry here > `precision` here > the built-in defaults
  b.section = "lab";
  b.other("precision", T::section, "the built-in defaults", "the default precision of every lab's readings (below)",
          "LabSettings::precision");
  b.other("labs", T::map, "–",
          "per laboratory, by its name as the lab file's `lab` column writes it: its `precision` and FTIR baselines (below)",
          "LabSettings::labs");
  b.other("alarm-levels", T::map, "common practice",
          "per quantity (a lab column: `fe`, `si`, `water`, `viscosity-100`, `antioxidant-remaining`, `i-ph`, `tan`, `tbn` …): "
          "its `caution` and `critical` level for the trend (below)",
          "LabSettings::alarm_levels");

  // one standard deviation per reading; defaults: Precision{} (studies/calibration.hpp, docs/references.md [LabPrecision])
  b.section = "precision";
  open_low(b.q("tbn-d2896", K::acid_number, 0, 10, "mg KOH/g", "0.15 mg KOH/g", "TBN by ASTM D2896, one standard deviation",
               "Precision::tbn_d2896"));
  open_low(b.q("tbn-d4739", K::acid_number, 0, 10, "mg KOH/g", "0.2 mg KOH/g", "TBN by ASTM D4739, one standard deviation",
               "Precision::tbn_d4739"));
  open_low(b.q("tan", K::acid_number, 0, 10, "mg KOH/g", "0.15 mg KOH/g", "TAN (D664), one standard deviation", "Precision::tan"));
  open_low(b.q("san", K::acid_number, 0, 10, "mg KOH/g", "0.1 mg KOH/g", "SAN (D664), one standard deviation", "Precision::san"));
  open_low(b.q("oxidation", K::oxidation, 0, 100, "A/cm", "1 A/cm", "FTIR oxidation, one standard deviation", "Precision::oxidation"));
  open_low(b.q("nitration", K::oxidation, 0, 100, "A/cm", "1 A/cm", "FTIR nitration, one standard deviation", "Precision::nitration"));

  b.section = "lab-entry";
  b.other("precision", T::section, "`lab.precision`", "this lab's precision, reading by reading (keys as `lab.precision`)",
          "LabOverride::precision");
  b.q("oxidation-baseline", K::oxidation, 0, 1000, "A/cm", "fitted (docs/lab-results.md)",
      "this lab's FTIR oxidation reading of the fresh oil, for its rows without an `oxidation-baseline` cell",
      "LabOverride::oxidation_baseline");
  b.q("nitration-baseline", K::oxidation, 0, 1000, "A/cm", "fitted (docs/lab-results.md)",
      "this lab's FTIR nitration reading of the fresh oil, for its rows without a `nitration-baseline` cell",
      "LabOverride::nitration_baseline");

  b.section = "alarm-level";
  b.other("caution", T::special, "required",
          "the caution level in the quantity's unit (ppm for elements, % for water, soot, the viscosity change and the "
          "antioxidant remaining, mg KOH/g for TAN and TBN, bare for i-pH)", "AlarmLevel::caution");
  b.other("critical", T::special, "required", "the critical level, in the same unit; for TBN, antioxidant and i-pH at or below "
          "the caution level (they alarm falling), else at or above it", "AlarmLevel::critical");

  // ---- run
  b.section = "run";
  b.q("hours", K::duration, 1, 1e7, "h", "max-hours", "horizon without a record", "Segment::hours");
  b.q("output-interval", K::duration, 0, 1e6, "h", "horizon / 400", "trajectory points at least this often (0: the default)",
      "RunOptions::output_interval");
  b.q("detection-step", K::duration, 0.01, 1e6, "h", "25 h", "limits checked at least this often", "RunOptions::detection_step");

  // ---- record
  b.section = "record";
  alt(b.other("file", T::text, "–", "a CSV record, relative to the file that names it", "EngineCase::record"), "segments");
  alt(b.other("segments", T::list, "–", "inline segments, each with its `hours`", "EngineCase::record"), "file");

  b.section = "segment";
  b.q("hours", K::duration, 0, 1e6, "h", "required", "running hours of the segment", "Segment::hours");
  b.q("calendar-hours", K::duration, 0, 1e7, "h", "= hours", "calendar time of the segment (standstill included)",
      "Segment::calendar_hours");
  b.q("starts", K::count, 0, 1e6, "", "from start-every", "engine starts during the segment", "Segment::starts");
  b.c("h2s", "hydrogen sulfide", "FuelAnalysis::h2s");
  b.c("other-sulfur", "other sulfur, as S", "FuelAnalysis::other_sulfur");
  b.c("chlorine", "organic chlorine, as Cl", "FuelAnalysis::chlorine");
  b.c("fluorine", "organic fluorine, as F", "FuelAnalysis::fluorine");
  alt(b.q("power", K::power, 0, 1e8, "kW", "previous", "electrical output", "Operation::electrical_power"), "load");
  alt(b.q("load", K::fraction, 0.05, 1.2, "%", "previous", "instead of `power`: share of `rated-power`", "Operation::load"), "power");
  b.q("jacket-water-out", K::temperature, constants::engine_temperature_min, constants::engine_temperature_max, "degC", "previous",
      "jacket-water outlet", "Operation::jacket_water_out");
  b.q("oil-temperature", K::temperature, constants::engine_temperature_min, constants::engine_temperature_max, "degC", "previous", "sump oil",
      "Segment::oil_temperature");
  b.q("coldest-crankcase-surface", K::temperature, constants::crankcase_surface_min, constants::engine_temperature_max, "degC", "previous",
      "coldest metal the blow-by wets", "Operation::coldest_crankcase_surface");
  b.q("blow-by", K::fraction, 0, 0.1, "%", "previous", "blow-by as a share of the charge", "Operation::blowby_share");
  b.q("excess-air-ratio", K::number, 1, 4, "", "previous", "λ", "Air::excess_air_ratio");
  b.w("event", {"oil-change", "top-up", "partial-drain"}, "–", "an event applied before the segment", "Segment::events");
  b.other("event-amount", T::special, "see below",
          "oil change: residual share (default `residual-share`); top-up: a volume (default back to full); "
          "partial drain: the share drained (required)",
          "OilEvent::amount");

  // ---- scrubbing (docs/model.md §18)
  b.section = "scrubbing";
  open_low(b.q("step", K::duration, 0, 1e5, "h", "24 h", "longest stretch of constant outlet handed to the oil balance",
               "CostCase::step"));
  b.other("stages", T::list, "–", "the stages in gas-flow order (below); none: raw gas", "CostCase::train");

  b.section = "stage";
  b.other("name", T::text, "stage N", "a name for tables", "TrainStage::name");
  b.w("kind", {"iron-oxide", "activated-carbon", "biological", "caustic", "fixed"}, "required",
      "iron-oxide or activated-carbon (media beds), biological, caustic or fixed (a stated removal)", "ScrubStage::kind");
  b.q("efficiency", K::fraction, 0, 1, "%", "99 % (beds); required otherwise",
      "beds: share of the gas the bed treats (the rest channels past); other stages: H2S removed", "ScrubStage::efficiency");
  open_low(b.q("capacity", K::mass_ratio, 1e-4, 2, "kg/kg", "0.2 kg/kg",
               "beds: sulfur held at exhaustion, kg S per kg media (the supplier's figure governs)", "ScrubStage::capacity"));
  b.q("bed-mass", K::mass, 1e-3, 1e7, "kg", "required (beds)", "beds: media in the bed", "ScrubStage::bed_mass");
  b.q("breakthrough-width", K::fraction, 1e-3, 2, "%", "20 %",
      "beds: share of the bed life from 10 % to 90 % breakthrough (assumed: fit it to the outlet readings)",
      "ScrubStage::breakthrough_width");
  alt(b.other("changeout-at", T::special, "required (beds): this or changeout-every",
              "beds: H2S at the bed's outlet that triggers a changeout, in ppmv (dry)", "ChangeoutRule::outlet_h2s"),
      "changeout-every");
  alt(b.q("changeout-every", K::duration, 1, 1e6, "h", "–", "beds: running hours between changeouts (a schedule)",
          "ChangeoutRule::every_hours"), "changeout-at");
  b.q("other-sulfur-removal", K::fraction, 0, 1, "%", "0", "carbon and fixed stages: share of the other sulfur removed",
      "ScrubStage::other_sulfur_removal");
  b.q("halogen-removal", K::fraction, 0, 1, "%", "0", "carbon and fixed stages: share of organic Cl and F removed",
      "ScrubStage::halogen_removal");
  b.q("capital", K::money, 0, 1e12, "", "0", "installed cost, annualised by the capital recovery factor", "StageCosts::capital");
  b.q("life", K::years, 1e-3, 200, "years", "15 years", "life for the capital recovery factor", "StageCosts::life_years");
  b.q("running-cost", K::money, 0, 1e12, "", "0", "fixed running cost per year (power, water, upkeep)", "StageCosts::running");

  // ---- economics (docs/model.md §19); prices in the case's currency
  b.section = "economics";
  b.other("currency", T::text, "–", "a label for the money figures (no exchange rates)", "CostCase::currency");
  open_low(b.q("hours-per-year", K::duration, 0, 8784, "h", "the record's running hours", "running hours a year",
               "CostCase::hours_per_year"));
  b.q("electricity-price", K::price_per_energy, 0, 1e5 / 3.6e9, "per MWh", "0", "value of electricity not generated",
      "Prices::electricity");
  b.q("oil-price", K::price_per_volume, 0, 1e7, "per L", "0", "new oil", "Prices::oil");
  b.q("oil-per-change", K::volume, 0, 100, "L", "the charge less its residual share", "new oil per oil change",
      "CostCase::oil_per_change");
  b.q("oil-change-labour", K::money, 0, 1e9, "", "0", "per oil change", "Prices::oil_change_labour");
  b.q("oil-change-downtime", K::duration, 0, 1e4, "h", "0", "engine hours lost per oil change", "Prices::oil_change_downtime");
  b.q("lab-cost", K::money, 0, 1e9, "", "0", "per oil sample", "Prices::lab_sample");
  b.q("sampling-interval", K::duration, 0, 1e6, "h", "no samples", "running hours between oil samples", "Prices::sampling_interval");
  b.q("iron-oxide-price", K::price_per_mass, 0, 1e6, "per kg", "0", "fresh iron-oxide media", "Prices::iron_oxide");
  b.q("carbon-price", K::price_per_mass, 0, 1e6, "per kg", "0", "fresh impregnated carbon", "Prices::carbon");
  b.q("disposal-price", K::price_per_mass, 0, 1e6, "per kg", "0", "spent media taken away", "Prices::disposal");
  b.q("changeout-labour", K::money, 0, 1e9, "", "0", "per media changeout", "Prices::changeout_labour");
  b.q("changeout-downtime", K::duration, 0, 1e4, "h", "0", "engine hours lost per media changeout (0 with a lead-lag pair)",
      "Prices::changeout_downtime");
  b.q("caustic-price", K::price_per_mass, 0, 1e6, "per kg", "0", "NaOH", "Prices::caustic");
  b.q("caustic-excess", K::number, 1, 10, "", "1", "NaOH used over the stoichiometric 2 mol per mol S", "Prices::caustic_excess");
  b.q("biological-consumables", K::price_per_mass, 0, 1e6, "per kg", "0",
      "biological stages: nutrients, water and air per kg of sulfur removed", "Prices::biological");
  b.q("discount-rate", K::fraction, 0, 1, "%", "6 %", "for the capital recovery factor", "Prices::discount_rate");
  b.q("wear-cost", K::money, 0, 1e12, "", "0", "engine wear: cost per 1000 h of overhaul brought forward", "Prices::wear_cost");
  b.q("wear-hours", K::duration, 0, 1e3, "h", "0 (no penalty)",
      "engine wear: overhaul hours brought forward per 1000 running hours per ppmv of mean H2S at the engine (your own figure)",
      "Prices::wear_hours");
  b.q("sensitivity-step", K::fraction, 1e-3, 0.99, "%", "20 %", "each price moved by this share in the sensitivity table",
      "EconomicsResults::sensitivity_step");

  // ---- a site (docs/model.md §18.4): engines on this file's one gas supply and one scrubbing train
  b.section = "site";
  b.other("name", T::text, "the `case` title", "a name for the site's tables", "SiteCase::name");
  b.other("gas-record", T::section, "the `fuel` section's gas throughout",
          "the record of the gas quality on the site's running-hours clock (below)", "SiteFile::gas");
  b.other("engines", T::list, "required", "the engines, each merged over the file's sections (below)", "SiteCase::engines");

  b.section = "gas-record";
  alt(b.other("file", T::text, "–", "a CSV of gas segments, relative to the site file", "SiteFile::gas"), "segments");
  alt(b.other("segments", T::list, "–", "inline gas segments, each with its `hours`", "SiteFile::gas"), "file");

  b.section = "gas-segment";
  b.q("hours", K::duration, 0, 1e6, "h", "required", "running hours of the site's clock this gas lasts", "SiteFile::gas");
  b.c("h2s", "hydrogen sulfide in the raw gas", "FuelAnalysis::h2s");
  b.c("other-sulfur", "other sulfur, as S", "FuelAnalysis::other_sulfur");
  b.c("chlorine", "organic chlorine, as Cl", "FuelAnalysis::chlorine");
  b.c("fluorine", "organic fluorine, as F", "FuelAnalysis::fluorine");

  b.section = "site-engine";
  b.other("name", T::text, "required", "the engine's name, unique on the site", "EngineCase::name");
  b.other("engine", T::section, "the file's `engine`", "its engine and operation, merged over the file's `engine`");
  b.other("oil", T::section, "the file's `oil`", "its oil and charge, merged over the file's `oil`");
  b.other("model", T::section, "the file's `model`", "its model parameters");
  b.other("limits", T::section, "the file's `limits`", "its condemning limits");
  b.other("run", T::section, "the file's `run`", "its horizon and output settings");
  b.other("record", T::section, "one segment of its operation",
          "its own record: hours, load or power, temperatures, events (no gas figures: the gas is the site's)");
  b.other("economics", T::section, "the file's `economics`",
          "its own prices: oil, oil changes, lab, downtime, wear, hours a year (the train's prices are the site's)");

  // ---- uncertainty
  b.section = "uncertainty";
  b.q("draws", K::count, 1, max_draws, "", "10000", "number of draws (at most 1e6: about 3 h of one core for a one-year hourly record)", "UncertaintySettings::draws");
  b.q("seed", K::count, 0, 9e15, "", "1", "seed of the counter-based random stream", "UncertaintySettings::seed");
  b.other("inputs", T::list, "required", "the uncertain inputs (below)", "UncertaintySettings::inputs");

  b.section = "uncertain-input";
  b.other("parameter", T::special, "required",
          "a calibratable key, e.g. `model.so3-share` or `fuel.h2s`, or a price of `economics` (for `costs --monte-carlo`)",
          "UncertainInput::key");
  b.w("distribution", {"normal", "lognormal", "uniform", "triangular"}, "required", "the distribution's shape",
      "Distribution::kind");
  b.other("mean", T::special, "–", "normal: the mean, in the parameter's units", "Distribution::a");
  b.other("sd", T::special, "–", "normal: the standard deviation, in the parameter's units", "Distribution::b");
  b.other("median", T::special, "–", "lognormal: the median, in the parameter's units", "Distribution::a");
  b.other("sigma-log", T::special, "–", "lognormal: the standard deviation of the logarithm, a bare number", "Distribution::b");
  b.other("low", T::special, "–", "uniform, triangular: the low end, in the parameter's units", "Distribution::a");
  b.other("mode", T::special, "–", "triangular: the mode, in the parameter's units", "Distribution::b");
  b.other("high", T::special, "–", "uniform, triangular: the high end, in the parameter's units", "Distribution::b or ::c");
  return b.keys;
}

const std::map<std::string, std::vector<std::string>, std::less<>>& sections() {
  static const auto s = [] {
    std::map<std::string, std::vector<std::string>, std::less<>> m;
    for (const CaseKey& k : case_keys()) {
      m[k.section()].push_back(k.key());
      if (k.layer) {
        m["overlay"].push_back(k.key());
        m["variant"].push_back(k.key());
      }
    }
    m["overlay"].insert(m["overlay"].begin(), {"format-version", "case"});
    m["variant"].insert(m["variant"].begin(), "name");
    return m;
  }();
  return s;
}

}  // namespace

std::string CaseKey::section() const {
  const auto dot = path.rfind('.');
  return dot == std::string::npos ? std::string() : path.substr(0, dot);
}

std::string CaseKey::key() const {
  const auto dot = path.rfind('.');
  return dot == std::string::npos ? path : path.substr(dot + 1);
}

bool CaseKey::in_range(double v) const {
  return std::isfinite(v) && (low_open ? v > low : v >= low) && v <= high;
}

std::string CaseKey::range_text(std::string_view written) const {
  std::string u(written);
  bool known = u.empty() ? (kind == Kind::fraction || kind == Kind::count || kind == Kind::number) : false;
  for (const auto& a : accepted_units(kind)) known |= a == u;
  if (!known || (u.empty() && kind == Kind::fraction)) u = unit;
  const auto show = [&](double v) {  // six significant digits: a range, not a round-trip value
    char buf[32];                     // (a count as the whole number one types: 1000000, not 1e+06)
    const double shown = from_core_unit(kind, u, v);
    std::snprintf(buf, sizeof buf, kind == Kind::count && std::fabs(shown) < 1e15 ? "%.0f" : "%.6g", shown);
    return std::string(buf);
  };
  const std::string tail = u.empty() ? "" : " " + u;
  if (std::isinf(high)) return (low_open ? "above " : "at least ") + show(low) + tail;
  return (low_open ? "above " + show(low) + " and up to " : "from " + show(low) + " to ") + show(high) + tail;
}

const std::vector<CaseKey>& case_keys() {
  static const std::vector<CaseKey> t = build_table();
  return t;
}

const CaseKey* find_case_key(std::string_view path) {
  static const auto index = [] {
    std::map<std::string, const CaseKey*, std::less<>> m;
    for (const CaseKey& k : case_keys()) m[k.path] = &k;
    return m;
  }();
  const auto it = index.find(path);
  return it == index.end() ? nullptr : it->second;
}

const CaseKey& case_key(std::string_view path) {
  if (const CaseKey* k = find_case_key(path)) return *k;
  std::vector<std::string> all;
  for (const CaseKey& k : case_keys()) all.push_back(k.path);
  throw InputError("key", std::string(path), "a key of the case format, one of: " + detail::join(all));
}

const std::vector<std::string>& section_keys(std::string_view section) {
  const auto it = sections().find(section);
  if (it == sections().end()) throw InputError("section", std::string(section), "a section of the case format");
  return it->second;
}

const std::vector<std::string>& calibratable_keys() {
  static const std::vector<std::string> k = [] {
    std::vector<std::string> v;
    for (const CaseKey& c : case_keys())
      if (c.calibratable) v.push_back(c.path);
    return v;
  }();
  return k;
}

std::string_view kind_id(Kind k) {
  switch (k) {
    case Kind::temperature: return "temperature";
    case Kind::temperature_change: return "temperature_change";
    case Kind::power: return "power";
    case Kind::volume: return "volume";
    case Kind::mass: return "mass";
    case Kind::molar_flow: return "molar_flow";
    case Kind::fraction: return "fraction";
    case Kind::acid_number: return "acid_number";
    case Kind::specific_consumption: return "specific_consumption";
    case Kind::duration: return "duration";
    case Kind::pressure: return "pressure";
    case Kind::density: return "density";
    case Kind::per_hour: return "per_hour";
    case Kind::oxidation: return "oxidation";
    case Kind::oxidation_rate: return "oxidation_rate";
    case Kind::molar_energy: return "molar_energy";
    case Kind::money: return "money";
    case Kind::price_per_volume: return "price_per_volume";
    case Kind::price_per_mass: return "price_per_mass";
    case Kind::price_per_energy: return "price_per_energy";
    case Kind::years: return "years";
    case Kind::mass_ratio: return "mass_ratio";
    case Kind::count: return "count";
    case Kind::number: return "number";
  }
  return "number";
}

}  // namespace acidload::io
