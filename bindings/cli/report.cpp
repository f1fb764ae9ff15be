#include "report.hpp"

#include <cmath>
#include <string>

#include "acidload/acidload.hpp"
#include "acidload/io/document.hpp"
#include "acidload/io/quantity.hpp"
#include "acidload/studies/figure_table.hpp"
#include "cli.hpp"

namespace acidload_cli {

using namespace acidload;

namespace {
double c_of(double kelvin) { return kelvin - constants::zero_celsius; }
std::string whole_hours(double h) { return std::to_string(static_cast<long>(h + 0.5)) + " h"; }

// How a charge ended, in the words of every table: "N h  limit", "no limit within N h" (the planned
// maximum, docs/model.md §9), "no limit in the record (N h)".
std::string charge_outcome(const ChargeSummary& ch) {
  if (ch.oil_limit_reached()) return whole_hours(ch.drain_interval) + "  " + std::string(name(*ch.first));
  if (ch.first) return "no limit within " + whole_hours(ch.drain_interval);
  return "no limit in the record (" + whole_hours(ch.oil_hours) + ")";
}

// A name in a table column of `width` characters: longer names are cut with "…" so the columns
// stay aligned (the full name is in summary.json, trajectories.csv and acidload check).
std::string in_column(const std::string& name, std::size_t width) {
  std::size_t chars = 0, cut = name.size();
  for (std::size_t i = 0; i < name.size(); ++i)
    if ((static_cast<unsigned char>(name[i]) & 0xC0) != 0x80 && ++chars == width) cut = i;
  if (chars <= width) return name + std::string(width - chars, ' ');
  return name.substr(0, cut) + "…";
}
const char* method_name(BaseNumberMethod m) { return m == BaseNumberMethod::d2896 ? "D2896" : "D4739"; }

// The dew points and walls of cold running, and the exhaust, of a variant's first segment.
void print_temperatures(std::FILE* out, const Transfer& t) {
  std::fprintf(out, "  cold running: blow-by water dew point %s, crankcase wetness %.0f %%; in-cylinder acid dew point %s;\n",
               t.blowby_water_dew_point > 0 ? (std::to_string(static_cast<int>(std::lround(c_of(t.blowby_water_dew_point)))) + " degC").c_str() : "none",
               t.wetness * 100,
               t.cylinder_acid_dew_point > 0 ? (std::to_string(static_cast<int>(std::lround(c_of(t.cylinder_acid_dew_point)))) + " degC").c_str() : "none (no SO3)");
  std::fprintf(out, "                liner wall %.0f degC running, %.0f degC at a start; warm-up adds %.1f %% to the liner acid\n",
               c_of(t.liner_temperature), c_of(t.liner_temperature_at_start),
               t.inflow.sulfuric_liner > t.inflow.sulfuric_warmup && t.inflow.sulfuric_liner > 0
                   ? 100 * t.inflow.sulfuric_warmup / (t.inflow.sulfuric_liner - t.inflow.sulfuric_warmup) : 0.0);
}

void print_emissions(std::FILE* out, const char* what, const Emissions& e) {
  std::fprintf(out, "  %s (O2 %.1f %% dry, H2O %.1f %% wet; figures dry at %.0f %% O2, O2 of air %.1f %%):\n", what,
               e.o2_dry * 100, e.water_wet * 100, e.o2_reference * 100, e.o2_air * 100);
  std::fprintf(out, "    SO2 %.3g mg/Nm3 (%.3g ppmv), SO3 %.3g mg/Nm3, HCl %.3g mg/Nm3, HF %.3g mg/Nm3, NOx %.3g mg/Nm3 as NO2\n",
               e.so2.mg_per_m3_dry_at_ref, e.so2.ppmv_dry_at_ref, e.so3.mg_per_m3_dry_at_ref, e.hcl.mg_per_m3_dry_at_ref,
               e.hf.mg_per_m3_dry_at_ref, e.nox.mg_per_m3_dry_at_ref);
}

void print_warnings(std::FILE* out, const std::string& variant, const std::vector<Warning>& w) {
  for (const Warning& x : w)
    std::fprintf(out, "  warning [%s]: %s = %s: %s\n", variant.c_str(), x.key.c_str(), x.value.c_str(), x.reason.c_str());
}
}  // namespace

void print_check(std::FILE* out, const io::CaseFile& c) {
  std::fprintf(out, "%s: format version %d, %zu variant(s) — inputs read as follows (invented data if it is the demo)\n",
               c.file.c_str(), c.format_version, c.variants.size());
  if (!c.title.empty()) std::fprintf(out, "case: %s\n", c.title.c_str());
  for (const std::string& o : c.overlays) std::fprintf(out, "overlay: %s\n", o.c_str());
  for (const EngineCase& v : c.variants) {
    const Segment& s = first_segment(v);
    const FuelGas& g = s.fuel;
    const GasContext ctx = context(g);
    std::fprintf(out, "\n[%s]\n", v.name.c_str());
    std::fprintf(out, "  fuel: CH4 %.2f %%, CO2 %.2f %%, H2O %.2f %% (wet); LHV %.3f MJ/Nm3\n", g[Gas::CH4] * 100,
                 g[Gas::CO2] * 100, g[Gas::H2O] * 100, lower_heating_value_volumetric(g) * 1e-6);
    std::fprintf(out, "        H2S %.2f ppmv dry; other S %.3f mg/Nm3 dry as S; Cl %.3f, F %.3f mg/Nm3 dry\n",
                 from_wet_mole_fraction(g[Gas::H2S], ConcentrationUnit::ppmv, Basis::dry, molar_mass(Gas::H2S), ctx),
                 from_wet_mole_fraction(g.other_sulfur, ConcentrationUnit::mg_per_m3, Basis::dry, atomic_weight(Element::S) * 1e-3, ctx),
                 from_wet_mole_fraction(g.chlorine, ConcentrationUnit::mg_per_m3, Basis::dry, atomic_weight(Element::Cl) * 1e-3, ctx),
                 from_wet_mole_fraction(g.fluorine, ConcentrationUnit::mg_per_m3, Basis::dry, atomic_weight(Element::F) * 1e-3, ctx));
    std::fprintf(out, "  engine: %.1f kW, fuel %.2f Nm3/h, lambda %.2f, blow-by %.2f %%, jacket water %.1f degC, oil %.1f degC\n",
                 s.operation.electrical_power * 1e-3, s.operation.fuel_flow * molar_volume(ReferenceState::normal()),
                 s.operation.air.excess_air_ratio, s.operation.blowby_share * 100, c_of(s.operation.jacket_water_out),
                 c_of(s.oil_temperature));
    std::fprintf(out, "  oil: %.1f kg (%.0f L), fresh TBN %.2f mg KOH/g by %s, TAN %.2f, consumption %.4f kg/h, %s makeup\n",
                 v.charge.mass, v.charge.mass / v.charge.oil.density_15 * 1e3, v.charge.oil.fresh_tbn,
                 method_name(v.charge.oil.fresh_tbn_method), v.charge.oil.fresh_tan, s.oil_consumption,
                 v.charge.continuous_makeup ? "continuous" : "top-up");
    const LimitSettings& l = v.model.limits;
    std::fprintf(out, "  limits: TBN <= %.0f %% of fresh (%s), TAN >= fresh + %.2f, crossover %s, SAN > %.2f, ox %.0f, nitr %.0f A/cm,\n"
                      "          viscosity +%.0f %%, antioxidant %.0f %% left; lab only: water %.2f %%, i-pH %.1f; planned maximum %.0f h\n",
                 l.tbn_share_of_fresh * 100, method_name(l.tbn_method), l.tan_rise, l.crossover ? "on" : "off", l.san,
                 l.oxidation, l.nitration, l.viscosity_rise * 100, l.antioxidant_remaining * 100, l.water * 100,
                 l.initial_ph, l.max_hours);
    Transfer t;
    segment_rates(s, v.charge, v.model, &t);
    print_temperatures(out, t);
    print_emissions(out, "exhaust, engine out", emissions(t.exhaust, s.operation.nox.o2_reference, s.operation.nox.o2_air));
    if (v.catalyst_so3_conversion >= 0)
      print_emissions(out, "after the oxidation catalyst",
                      emissions(after_oxidation_catalyst(t.exhaust, v.catalyst_so3_conversion), s.operation.nox.o2_reference,
                                s.operation.nox.o2_air));
    print_warnings(out, v.name, input_warnings(s.fuel, s.operation, v.fuel_gas_limits));
    std::fprintf(out, "  record: %zu segment(s), %.1f h\n", record_segments(v), record_hours(v));
  }
}

void print_comparison(std::FILE* out, const io::CaseFile& c, const std::vector<VariantSummary>& rows) {
  if (!c.title.empty()) std::fprintf(out, "%s\n\n", c.title.c_str());
  // the outcome column holds the longest outcome, "no limit in the record (NNNNN h)"
  std::fprintf(out, "%-31s %-29s %-11s %-11s %-33s %5s %5s %5s %6s\n", "", "acid into the oil [g KOH/h]", " S to oil %",
               "TBN fall", "drain interval", "TBN", "TAN", "SAN", "H2SO4");
  std::fprintf(out, "%-31s %5s %5s %5s %5s %5s %5s %5s %5s %5s %-33s %5s %5s %5s %6s\n", "variant", "H2SO4", "SO2", "HCl",
               "HF", "HNO3", "fresh", "avg", "fresh", "avg", "and the limit reached", "end", "end", "end", "dew C");
  for (const VariantSummary& v : rows) {
    const std::string outcome = charge_outcome(v.charge);
    char avg[16] = "    -";
    if (v.sulfur_share_to_oil_average >= 0) std::snprintf(avg, sizeof avg, "%5.3f", v.sulfur_share_to_oil_average * 100);
    std::fprintf(out, "%s %5.2f %5.2f %5.2f %5.2f %5.2f %5.3f %5s %5.3f %5.3f %-33s %5.2f %5.2f %5.2f %6.1f\n",
                 in_column(v.name, 31).c_str(), v.inflow_koh.sulfuric, v.inflow_koh.sulfurous_fresh, v.inflow_koh.hydrochloric,
                 v.inflow_koh.hydrofluoric, v.inflow_koh.nitric, v.sulfur_share_to_oil * 100, avg, -v.initial_tbn_rate * 100,
                 -v.tbn_fall_rate_average * 100, outcome.c_str(), v.tbn_end, v.tan_end, v.san_end,
                 v.dew_points.sulfuric > 0 ? c_of(v.dew_points.sulfuric) : 0.0);
    if (v.steady_state) {
      const OilState& x = *v.steady_state;
      const OilProperties& oil = c.variants[static_cast<std::size_t>(&v - rows.data())].charge.oil;
      std::fprintf(out, "  settles at: TBN %.2f (D4739), TAN %.2f, SAN %.2f mg KOH/g, oxidation %.1f, nitration %.1f A/cm, "
                        "viscosity %+.0f %%, antioxidant %.0f %% left\n",
                   tbn(x, oil, BaseNumberMethod::d4739), acidload::tan(x, oil), san(x), x.oxidation, x.nitration,
                   viscosity_rise(x, oil) * 100, x.antioxidant * 100);
    }
    if (v.run.charges.size() > 1)  // a record with oil changes: every charge's outcome
      for (const ChargeSummary& ch : v.run.charges) {
        const std::string what = ch.oil_limit_reached() ? "limit " + std::string(name(*ch.first)) + " at " + whole_hours(ch.drain_interval) + " of oil"
                                                        : charge_outcome(ch);
        std::fprintf(out, "  charge %d (from %.0f h, ran %.0f h%s): %s\n", ch.index + 1, ch.start_engine_hours, ch.oil_hours,
                     ch.ended_by_change ? ", then changed" : "", what.c_str());
      }
  }
  const LimitSettings& l = c.variants.front().model.limits;
  std::fprintf(out, "\nUnits: acid into the oil in g KOH/h; S to oil %% = share of the fuel's sulfur; TBN fall in mg KOH/g\n"
                    "per 100 h (summary.json gives the rates per hour and negative, initial-tbn-rate-mg-koh-per-g-per-h and\n"
                    "tbn-rate-charge-average-mg-koh-per-g-per-h, and the sulfur shares as fractions); TBN, TAN, SAN in\n"
                    "mg KOH/g; dew point in degC.\n");
  std::fprintf(out, "\nTBN by %s at the drain interval (or at the end of the record). 'fresh': the fresh charge in the first\n"
                    "segment (SO2 uptake falls as the base is used); 'avg': averaged over the charge to its first limit.\n"
                    "'no limit within N h': no oil-condition limit before the planned maximum hours (limits.max-hours).\n",
               method_name(l.tbn_method));
  bool any = false;
  for (const VariantSummary& v : rows) any = any || !v.warnings.empty();
  if (any) {
    std::fprintf(out, "\nPlausibility (warnings, not refusals):\n");
    for (const VariantSummary& v : rows) print_warnings(out, v.name, v.warnings);
  }
}

void print_conversion(std::FILE* out, const EngineCase& c, const std::string& figure, const std::string& species) {
  io::Document doc;
  doc.file = "(command line)";
  doc.lines = {figure};
  io::Node n;
  n.type = io::Node::Type::scalar;
  n.scalar = figure;
  n.mark = {1, 1};
  n.path = "figure";
  const FigureTable t = figure_in_every_unit(c.record.front(), io::concentration(doc, n, Basis::dry), species);
  const GasContext& ctx = t.gas;
  std::fprintf(out, "%s of %s in the gas of '%s' (reference %.2f K, %.3f kPa; water %.3f %%; CH4 %.3f %% wet; LHV %.3f MJ/Nm3):\n",
               figure.c_str(), species.c_str(), c.name.c_str(), ctx.reference.temperature, ctx.reference.pressure * 1e-3,
               ctx.water_fraction * 100, ctx.methane_fraction * 100, t.lhv_volumetric * 1e-6);
  for (const FigureRow& r : t.rows) {
    std::fprintf(out, "  %-24s %12.5g ppmv dry %12.5g ppmv wet %12.5g mg/Nm3 dry %12.5g mg/Nm3 wet\n", r.what.c_str(),
                 r.ppmv_dry, r.ppmv_wet, r.mg_per_nm3_dry, r.mg_per_nm3_wet);
    std::fprintf(out, "  %-24s %12.5g mg/MJ    %12.5g mg/Nm3 CH4", "", r.mg_per_mj, r.mg_per_nm3_methane);
    if (ctx.molar_flow > 0)
      std::fprintf(out, " %12.5g mol/h at %.1f Nm3/h of fuel", r.mol_per_h, ctx.molar_flow * molar_volume(ReferenceState::normal()));
    std::fprintf(out, "\n");
  }
}

void print_fit(std::FILE* out, const EngineCase& c, const FitResult& f) {
  std::fprintf(out, "Fit of '%s': %d readings, %zu parameters, %d iterations, %s\n", c.name.c_str(), f.observations,
               f.parameters.size(), f.iterations, f.converged ? "converged" : "NOT converged (use the figures with care)");
  std::fprintf(out, "reduced chi-square %.3f on %d degrees of freedom (about 1 when the lab precisions are right)\n\n",
               f.s2, f.degrees_of_freedom);
  for (const std::string& n : f.notes) std::fprintf(out, "%s%s\n", n.back() == ':' ? "" : "  - ", n.c_str());
  if (!f.notes.empty()) std::fprintf(out, "\n");
  std::fprintf(out, "  %-34s %14s %14s %14s  %s\n", "parameter", "start", "estimate", "std. error", "unit");
  for (const FittedParameter& p : f.parameters)
    std::fprintf(out, "  %-34s %14.6g %14.6g %14.6g  %s%s\n", p.key.c_str(), p.initial, p.estimate, p.standard_error,
                 parameter(p.key).unit.c_str(), p.held ? "  (held at its prior)" : "");
  if (f.parameters.size() > 1) {
    std::fprintf(out, "\ncorrelation of the estimates:\n");
    for (std::size_t i = 0; i < f.parameters.size(); ++i) {
      std::fprintf(out, "  %-34s", f.parameters[i].key.c_str());
      for (std::size_t j = 0; j < f.parameters.size(); ++j) std::fprintf(out, " %7.3f", f.correlation[i][j]);
      std::fprintf(out, "\n");
    }
  }
  std::fprintf(out, "\nresiduals (measured − fitted, in standard deviations of the method):\n");
  std::fprintf(out, "  %-10s %-10s %10s %10s %8s\n", "sample", "reading", "measured", "fitted", "resid.");
  for (const SampleResidual& r : f.residuals)
    std::fprintf(out, "  %-10zu %-10s %10.3f %10.3f %8.2f%s%s\n", r.sample + 1, r.reading.c_str(), r.measured, r.predicted,
                 r.standardized, r.censored ? "  (censored)" : "", r.outlier ? "  OUTLIER?" : "");
  if (!f.flags.empty()) {
    std::fprintf(out, "\nflags:\n");
    for (const std::string& fl : f.flags) std::fprintf(out, "  - %s\n", fl.c_str());
  }
  for (const std::string& w : f.warnings) std::fprintf(out, "\nWARNING: %s\n", w.c_str());
}

void print_forecast(std::FILE* out, const FitResult& f, const Forecast& fc) {
  std::fprintf(out, "Current charge after the fit (%zu parameters, reduced chi-square %.3f)\n", f.parameters.size(), f.s2);
  if (fc.lab_first) {
    std::fprintf(out, "Started from sample %zu (%s, %.0f oil hours), the model state moved toward its readings:\n",
                 fc.latest_sample + 1, f.samples[fc.latest_sample].where.c_str(), fc.start_oil_hours);
    std::fprintf(out, "  %-10s %10s %10s %10s %6s\n", "reading", "model", "measured", "updated", "gain");
    for (const StateUpdate& u : fc.update)
      std::fprintf(out, "  %-10s %10.3f %10.3f %10.3f %6.2f\n", u.reading.c_str(), u.model, u.measured, u.updated, u.gain);
  }
  if (fc.change_now) {
    std::fprintf(out, "\nCHANGE THE OIL NOW: the latest sample has already passed ");
    int n = 0;
    for (const LimitForecast& x : fc.limits) n += x.already;
    std::fprintf(out, "%d limit%s:\n", n, n == 1 ? "" : "s");
    for (const LimitForecast& x : fc.limits)
      if (x.already) std::fprintf(out, "  - %s: %s\n", x.key.c_str(), x.why.c_str());
  }
  std::fprintf(out, "\nhours left from the end of the record (%.0f oil hours) to each limit:\n", fc.end_oil_hours);
  std::fprintf(out, "  %-12s %12s   %s\n", "limit", "remaining", "90 % band (the fit's parameters and the priors of those not fitted)");
  for (const LimitForecast& x : fc.limits) {
    if (x.already) std::fprintf(out, "  %-12s %12s   reached now\n", x.key.c_str(), "0 h");
    else if (x.key == "i-ph" || x.key == "water") std::fprintf(out, "  %-12s %12s   (not passed by the latest sample)\n", x.key.c_str(), "lab only");
    else if (!x.reached) std::fprintf(out, "  %-12s %12s\n", x.key.c_str(), "not reached");
    else if (x.key == "max-hours")  // the plant's planned maximum: the horizon, no oil limit and no band
      std::fprintf(out, "  %-12s %10.0f h   the planned maximum (limits.max-hours), not an oil limit\n", x.key.c_str(), x.remaining);
    else if (x.prior_driven) {  // the band says what the priors allow, not what the lab measured
      std::string from;
      for (const std::string& k : x.prior_from) from += (from.empty() ? "" : ", ") + k;
      std::fprintf(out, "  %-12s %10.0f h   %.0f to %.0f h   PRIOR-DRIVEN: from the weak prior of %s (not fitted)\n", x.key.c_str(),
                   x.remaining, x.low, x.high, from.c_str());
    } else std::fprintf(out, "  %-12s %10.0f h   %.0f to %.0f h\n", x.key.c_str(), x.remaining, x.low, x.high);
  }
  bool prior = false;
  for (const LimitForecast& x : fc.limits) prior |= x.prior_driven && !x.already && x.reached;
  if (prior)
    std::fprintf(out, "  (a PRIOR-DRIVEN band rests on the model's default and its weak prior (docs/lab-results.md), not on\n"
                      "   the lab: nothing reported measures it; antioxidant and viscosity readings are trended, not fitted)\n");
  if (!fc.change_now) std::fprintf(out, "\nnext sample due in %.0f h\n", fc.next_sample_in);
  for (const std::string& w : fc.warnings) std::fprintf(out, "\nWARNING: %s\n", w.c_str());
}

void print_trend(std::FILE* out, const FitResult& f, const TrendResult& t) {
  std::fprintf(out, "\nTrend and alarms (levels: common practice, no source, unless set; the engine maker's and oil\n"
                    "supplier's condemning limits govern):\n");
  if (t.tbn_slope && t.tbn_slope_model)
    std::fprintf(out, "  TBN slope of the current charge: %.3g mg KOH/g per 1000 h measured, %.3g the model's%s\n",
                 *t.tbn_slope * 1000, *t.tbn_slope_model * 1000,
                 t.implied_h2s ? (" (implies about " + std::to_string(static_cast<long>(*t.implied_h2s + 0.5)) + " ppmv H2S)").c_str() : "");
  if (t.alarms.empty()) std::fprintf(out, "  no alarm\n");
  for (const Alarm& a : t.alarms) std::fprintf(out, "  %-8s %s\n", a.level == "model" ? "MODEL" : a.level == "critical" ? "CRITICAL" : "caution",
                                               a.message.c_str());
  (void)f;
}

void print_prediction_percentiles(std::FILE* out, const FitResult& f, const Prediction& p, std::uint64_t seed) {
  const double cap = f.fitted.model.limits.max_hours;
  const auto h = [&](double v) { return v >= cap ? "none within " + whole_hours(cap) : whole_hours(v); };
  std::fprintf(out, "Monte Carlo of the next charge: %zu draws, seed %llu; %zu fitted parameters drawn jointly from the fit's covariance\n"
                    "(every draw inside the ranges), times the model-form error (ln spread %.3f)\n",
               p.intervals.size(), static_cast<unsigned long long>(seed), f.parameters.size(), p.model_form_spread);
  std::fprintf(out, "  %-28s %10s %10s %10s %10s %10s\n", "", "P5", "P10", "P50", "P90", "P95");
  const std::vector<double>& v = p.intervals.empty() ? std::vector<double>{p.interval} : p.intervals;
  std::fprintf(out, "  %-28s %10s %10s %10s %10s %10s\n", "drain interval, next charge", h(percentile(v, 5)).c_str(),
               h(percentile(v, 10)).c_str(), h(percentile(v, 50)).c_str(), h(percentile(v, 90)).c_str(), h(percentile(v, 95)).c_str());
  std::fprintf(out, "  at the fit's estimates: %s, ended by %s\n", h(p.interval).c_str(),
               p.limit ? std::string(description(*p.limit)).c_str() : "no oil-condition limit (the planned maximum)");
  std::fprintf(out, "  draws ending by each limit:");
  for (std::size_t k = 0; k < limit_count; ++k)
    if (p.ending[k]) std::fprintf(out, " %s %d", std::string(name(all_limits[k])).c_str(), p.ending[k]);
  std::fprintf(out, "\n(low percentiles are the pessimistic end: the earlier oil change; 'none within': no limit within the\n"
                    "planned maximum, limits.max-hours)\n");
  for (const std::string& w : p.warnings) std::fprintf(out, "\nWARNING: %s\n", w.c_str());
}

void print_prediction(std::FILE* out, const FitResult& f, const Prediction& p) {
  const double cap = f.fitted.model.limits.max_hours;
  const auto h = [&](double v) { return v >= cap ? "no limit within " + whole_hours(cap) : whole_hours(v); };
  if (p.current.change_now) {
    std::fprintf(out, "CHANGE THE OIL NOW: the latest sample has already passed:\n");
    for (const LimitForecast& x : p.current.limits)
      if (x.already) std::fprintf(out, "  - %s: %s\n", x.key.c_str(), x.why.c_str());
    std::fprintf(out, "\n");
  }
  std::fprintf(out, "%s: drain interval %s, ended by %s\n", p.next_charge ? "Next charge" : "Current charge",
               h(p.interval).c_str(), p.limit ? std::string(description(*p.limit)).c_str() : "no oil-condition limit (the planned maximum)");
  std::fprintf(out, "  band of the interval:  P5 %s (pessimistic)   P50 %s   P95 %s (optimistic)\n", h(p.p5).c_str(),
               h(p.p50).c_str(), h(p.p95).c_str());
  if (!p.next_charge)
    std::fprintf(out, "  hours left from the end of the record:  P5 %.0f h   P50 %.0f h   P95 %.0f h\n", p.remaining_p5,
                 p.remaining_p50, p.remaining_p95);
  std::fprintf(out, "  spread of ln(interval): parameters %.3f, model form %.3f (from %zu past charges predicted from the others; "
               "%.3f of it beyond the parameters' is drawn)\n",
               p.parameter_spread, p.model_form_spread, p.held_out.size(), p.model_form_excess);
  std::fprintf(out, "  draws ending by each limit (of %d):", p.draws);
  for (std::size_t k = 0; k < limit_count; ++k)
    if (p.ending[k]) std::fprintf(out, " %s %d", std::string(name(all_limits[k])).c_str(), p.ending[k]);
  std::fprintf(out, "\n");
  if (!p.held_out.empty()) {
    std::fprintf(out, "\n  %-8s %16s %18s\n", "charge", "on its own [h]", "from others [h]");
    for (const HeldOutCharge& x : p.held_out) std::fprintf(out, "  %-8d %16.0f %18.0f\n", x.charge + 1, x.own, x.from_others);
  }
  if (!p.current.change_now) std::fprintf(out, "\nnext sample due in %.0f h\n", p.current.next_sample_in);
  for (const std::string& n : p.notes) std::fprintf(out, "note: %s\n", n.c_str());
  for (const std::string& w : p.warnings) std::fprintf(out, "\nWARNING: %s\n", w.c_str());
}

void print_monte_carlo(std::FILE* out, const EngineCase& c, const std::vector<UncertainInput>& in, const MonteCarloResult& r,
                       std::uint64_t seed) {
  std::fprintf(out, "Monte Carlo of '%s': %d draws, seed %llu, inputs:", c.name.c_str(), r.draws,
               static_cast<unsigned long long>(seed));
  for (const UncertainInput& x : in) std::fprintf(out, " %s", x.key.c_str());
  if (r.fitted_parameters) std::fprintf(out, "; %d fitted parameters drawn jointly from the fit's covariance", r.fitted_parameters);
  const auto h = [](double v) { return std::isfinite(v) ? std::to_string(static_cast<long>(v + 0.5)) + " h" : std::string("none"); };
  std::fprintf(out, "\n  %-28s %10s %10s %10s %10s %10s\n", "", "P5", "P10", "P50", "P90", "P95");
  if (r.charge_bands.empty())
    std::fprintf(out, "  %-28s %10s %10s %10s %10s %10s\n", "drain interval, 1st charge", h(r.interval_p5).c_str(), h(r.interval_p10).c_str(),
                 h(r.interval_p50).c_str(), h(r.interval_p90).c_str(), h(r.interval_p95).c_str());
  for (std::size_t k = 0; k < r.charge_bands.size(); ++k) {
    const IntervalBand& b = r.charge_bands[k];
    const std::string label = "drain interval, charge " + std::to_string(k + 1);
    std::fprintf(out, "  %-28s %10s %10s %10s %10s %10s\n", label.c_str(), h(b.p5).c_str(), h(b.p10).c_str(), h(b.p50).c_str(),
                 h(b.p90).c_str(), h(b.p95).c_str());
  }
  std::fprintf(out, "  %-28s %10s %10s %10s %10s %10s\n", "first free strong acid", h(r.san_p5).c_str(), h(r.san_p10).c_str(),
               h(r.san_p50).c_str(), h(r.san_p90).c_str(), h(r.san_p95).c_str());
  std::fprintf(out, "(low percentiles are the pessimistic end: the earlier oil change; each charge runs on under its own\n"
                    "last conditions; where no oil-condition limit is reached a draw counts the plant's planned maximum,\n"
                    "%.0f h (limits.max-hours), so a percentile at %.0f h reads 'no limit within %.0f h'; 'none': no free\n"
                    "acid within the planned maximum in at least that share of the draws)\n",
               c.model.limits.max_hours, c.model.limits.max_hours, c.model.limits.max_hours);
  if (r.clipped)
    std::fprintf(out, "%d of %d draws had an input outside its parameter's range: clipped into it\n", r.clipped, r.draws);
}

void print_caution(std::FILE* out) {
  std::fprintf(out,
               "\nCaution: estimates that support, not replace, the engine maker's and oil supplier's limits, lab\n"
               "analysis, local codes and licensed practice. Never extend a drain interval without lab confirmation.\n"
               "H2S is toxic (the nose stops warning above ~100 ppm) and flammable; used oil with free acid is corrosive.\n");
}

void print_oil_cautions(std::FILE* out, const io::CaseFile& c) {
  bool high_tbn = false, catalyst = false;
  for (const EngineCase& v : c.variants) {
    high_tbn = high_tbn || v.charge.oil.fresh_tbn > high_tbn_caution;
    catalyst = catalyst || v.catalyst_so3_conversion >= 0;
  }
  if (high_tbn)
    std::fprintf(out, "Caution: a higher-TBN oil carries more ash (sulfated ash, ASTM D874): ash deposits on valves, plugs and\n"
                      "catalysts; gas engines are limited to low-ash oils. Use it only with the engine maker's approval.\n");
  if (catalyst)
    std::fprintf(out, "Caution: an oxidation catalyst turns SO2 into SO3, which raises the exhaust acid dew point and the wall\n"
                      "temperature the heat recovery downstream must keep; sulfur and silicon also poison the catalyst.\n");
}

void print_fleet(std::FILE* out, const std::vector<io::FleetCase>& fleet) {
  std::size_t variants = 0;
  for (const auto& f : fleet) variants += f.rows.size();
  std::fprintf(out, "Fleet: %zu cases, %zu variants (first charge of each)\n", fleet.size(), variants);
  // the same words as the single-case table: "N h  limit", "no limit within N h", "no limit in the record (N h)"
  std::fprintf(out, "%-24s %-31s %-33s %5s %5s %5s\n", "case", "variant", "drain interval and limit", "TBN", "TAN",
               "SAN");
  const std::string *short_case = nullptr, *short_variant = nullptr;
  double shortest = INFINITY;
  for (const auto& f : fleet)
    for (const VariantSummary& v : f.rows) {
      std::fprintf(out, "%-24s %-31s %-33s %5.2f %5.2f %5.2f\n", terminal_safe(f.stem).c_str(), terminal_safe(v.name).c_str(),
                   charge_outcome(v.charge).c_str(), v.tbn_end, v.tan_end, v.san_end);
      if (v.charge.oil_limit_reached() && v.charge.drain_interval < shortest) {
        shortest = v.charge.drain_interval;
        short_case = &f.stem;
        short_variant = &v.name;
      }
    }
  if (short_case)
    std::fprintf(out, "Shortest interval: %.0f h (%s, %s)\n", shortest, terminal_safe(*short_case).c_str(),
                 terminal_safe(*short_variant).c_str());
}

}  // namespace acidload_cli
