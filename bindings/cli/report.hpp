#pragma once
// Printing for the acidload program: plain text tables of what the library computed.
#include <cstdio>
#include <string>
#include <vector>

#include "acidload/io/case_file.hpp"
#include "acidload/io/results.hpp"
#include "acidload/studies/calibration.hpp"
#include "acidload/studies/forecast.hpp"
#include "acidload/studies/monte_carlo.hpp"
#include "acidload/studies/trend.hpp"
#include "acidload/studies/whatif.hpp"

namespace acidload_cli {

//! What `check` reports: the inputs as the reader understood them.
void print_check(std::FILE* out, const acidload::io::CaseFile& c);
//! The comparison table of the variants.
void print_comparison(std::FILE* out, const acidload::io::CaseFile& c,
                      const std::vector<acidload::VariantSummary>& rows);
//! A contaminant figure in every unit for a case's gas (a figure such as "300 ppmv"; species H2S, S, Cl,
//! F or a halocarbon).
void print_conversion(std::FILE* out, const acidload::EngineCase& c, const std::string& figure,
                      const std::string& species);
//! A calibration: estimates, standard errors, correlations, residuals, goodness of fit, flags.
void print_fit(std::FILE* out, const acidload::EngineCase& c, const acidload::FitResult& f);
//! The lab-first forecast of the current charge: limits passed ("change the oil now"), hours left, next sample.
void print_forecast(std::FILE* out, const acidload::FitResult& f, const acidload::Forecast& fc);
//! Trend and alarms after a fit.
void print_trend(std::FILE* out, const acidload::FitResult& f, const acidload::TrendResult& t);
//! The predicted drain interval with its band.
void print_prediction(std::FILE* out, const acidload::FitResult& f, const acidload::Prediction& p);
//! `uncertainty --next-charge`: P5, P10, P50, P90, P95 of the predicted interval's draws.
void print_prediction_percentiles(std::FILE* out, const acidload::FitResult& f, const acidload::Prediction& p, std::uint64_t seed);
//! Monte Carlo percentiles.
void print_monte_carlo(std::FILE* out, const acidload::EngineCase& c, const std::vector<acidload::UncertainInput>& in,
                       const acidload::MonteCarloResult& r, std::uint64_t seed);
//! The fleet table: one line per case and variant (drain interval, limit, readings there), the
//! shortest interval of the fleet named.
void print_fleet(std::FILE* out, const std::vector<acidload::io::FleetCase>& fleet);
//! The one-line caution every result carries, and the fuller one.
void print_caution(std::FILE* out);
//! Cautions on the oil and the exhaust where a case calls for them: the ash of a higher-TBN oil, an oxidation catalyst.
void print_oil_cautions(std::FILE* out, const acidload::io::CaseFile& c);
//! Fresh TBN above which the ash caution is shown [mg KOH/g] (low-ash gas-engine oils are about 4-7; common practice).
inline constexpr double high_tbn_caution = 7.5;

}  // namespace acidload_cli
