#include "acidload/core/transfer.hpp"

#include <cmath>
#include <limits>

#include "acidload/core/constants.hpp"
#include "acidload/core/dew_points.hpp"
#include "acidload/core/error.hpp"
#include "acidload/core/water.hpp"

namespace acidload {

namespace {
constexpr std::size_t i(Gas g) { return static_cast<std::size_t>(g); }
}  // namespace

void validate(const TransferParameters& p) {
  check::fraction("model.so3-share", p.so3_share);
  check::in_range("model.liner-uptake", p.liner_uptake, 0.0, 0.1, "(share of fuel S per 10 K)");
  check::positive("model.liner-subcooling-scale", p.liner_subcooling_scale);
  check::in_range("model.liner-wall-rise", p.liner_wall_rise, 0.0, 200.0, "K");
  check::in_range("model.liner-wall-rise-load-exponent", p.liner_wall_rise_load_exponent, 0.0, 3.0, "");
  check::in_range("model.liner-pressure", p.liner_pressure, 1e5, 300e5, "Pa");
  check::in_range("model.cylinder-dew-point-offset", p.cylinder_dew_point_offset, -100.0, 100.0, "K");
  check::fraction("model.burnt-share-of-blow-by", p.burnt_share_of_blowby);
  check::fraction("model.capture-so3", p.capture_so3);
  check::fraction("model.capture-hcl", p.capture_hcl);
  check::fraction("model.capture-hf", p.capture_hf);
  check::fraction("model.capture-so2", p.capture_so2);
  check::in_range("model.wet-so2-factor", p.wet_so2_factor, 1.0, 100.0, "");
  check::positive("model.wetness-width", p.wetness_width);
  check::in_range("model.warm-up-time", p.warmup_hours, 0.0, 24.0, "h");
  check::fraction("model.warm-up-start-load", p.warmup_start_load);
  check::in_range("model.load-ramp-time", p.load_ramp_hours, 0.0, 24.0, "h");
  check::fraction("model.capture-no2", p.capture_no2);
}

namespace {
// lo ≤ v ≤ hi, inline (NaN fails): the common case of validate(Operation) without a call per field.
bool within(double v, double lo, double hi) { return v >= lo && v <= hi; }
constexpr double huge = std::numeric_limits<double>::max();
// Every field fine, with the bounds of the named checks below (finite: ≤ the largest double).
bool operation_fine(const Operation& op) {
  return within(op.fuel_flow, 0, huge) && within(op.electrical_power, 0, huge) && within(op.load, 0.05, 1.2) &&
         within(op.blowby_share, 0, 1) && within(op.blowby_flow, 0, huge) &&
         within(op.jacket_water_out, constants::engine_temperature_min, constants::engine_temperature_max) &&
         within(op.coldest_crankcase_surface, constants::crankcase_surface_min, constants::engine_temperature_max) &&
         within(op.crankcase_pressure, 5e4, 2e5) && within(op.exhaust_pressure, 5e4, 5e5) &&
         within(op.starts_per_hour, 0.0, 10.0) && within(op.jacket_water_at_start, 233.15, 423.15);
}
}  // namespace

void validate(const Operation& op) {
  if (operation_fine(op)) return;  // the common case; otherwise the first bad field is named below
  check::non_negative("engine.fuel-flow", op.fuel_flow);
  check::non_negative("engine.electrical-power", op.electrical_power);
  check::in_range("engine.load", op.load, 0.05, 1.2, "(share of rated output)");
  check::fraction("engine.blow-by", op.blowby_share);
  check::non_negative("engine.blow-by-flow", op.blowby_flow);
  check::in_range("engine.jacket-water-out", op.jacket_water_out, constants::engine_temperature_min, constants::engine_temperature_max, "K");
  check::in_range("engine.coldest-crankcase-surface", op.coldest_crankcase_surface, constants::crankcase_surface_min,
                   constants::engine_temperature_max, "K");
  check::in_range("engine.crankcase-pressure", op.crankcase_pressure, 5e4, 2e5, "Pa");
  check::in_range("engine.exhaust-pressure", op.exhaust_pressure, 5e4, 5e5, "Pa");
  check::in_range("engine.starts-per-hour", op.starts_per_hour, 0.0, 10.0, "1/h");
  check::in_range("engine.jacket-water-at-start", op.jacket_water_at_start, 233.15, 423.15, "K");
}

double AcidInflow::strong_koh() const {
  const double eq = koh_equivalents(Acid::H2SO4) * (sulfuric_liner + sulfuric_blowby) +  // liner includes warm-up
                    koh_equivalents(Acid::HCl) * hydrochloric + koh_equivalents(Acid::HF) * hydrofluoric +
                    koh_equivalents(Acid::HNO3) * nitric;  // [mol KOH/h]
  return eq * koh_molar_mass() * 1e3;                     // [g KOH/h]
}

AcidInflow::PerAcid AcidInflow::as_koh() const {
  const double g = koh_molar_mass() * 1e3;  // [g KOH/mol]
  return {koh_equivalents(Acid::H2SO4) * (sulfuric_liner + sulfuric_blowby) * g, sulfurous_fresh_koh(),
          koh_equivalents(Acid::HCl) * hydrochloric * g, koh_equivalents(Acid::HF) * hydrofluoric * g,
          koh_equivalents(Acid::HNO3) * nitric * g};
}

AcidInflow::PerAcid AcidInflow::as_mass() const {
  return {(sulfuric_liner + sulfuric_blowby) * molar_mass(Acid::H2SO4) * 1e3, sulfurous_fresh * molar_mass(Gas::SO2) * 1e3,
          hydrochloric * molar_mass(Acid::HCl) * 1e3, hydrofluoric * molar_mass(Acid::HF) * 1e3,
          nitric * molar_mass(Acid::HNO3) * 1e3};  // mol/h × kg/mol × 1000 g/kg
}

double AcidInflow::sulfurous_fresh_koh() const {
  return 2 * sulfurous_fresh * koh_molar_mass() * 1e3;  // SO2 counts 2 equivalents (docs/model.md §2.4)
}

namespace {
// l^e for the liner wall's rise with load; e = 1 (the default) without the call: pow(l, 1) is l exactly
// (correctly rounded, the result representable), so the bits are the same, and the warm-up
// quadrature asks for it at every node
double load_power(double l, double e) { return e == 1.0 ? l : std::pow(l, e); }
}  // namespace

double liner_uptake_factor(double subcooling, double scale) {
  const double z = subcooling / scale;
  // softplus, written to neither overflow for large z nor lose digits for very negative z
  const double sp = z > 0 ? z + std::log1p(std::exp(-z)) : std::log1p(std::exp(z));
  return scale / 10.0 * sp;
}

double crankcase_wetness(double dew, double cold, double width, double starts_per_hour, double warmup) {
  const double scale = width / (2 * std::log(9.0));                 // logistic 10–90 % over `width`
  const double ws = 1.0 / (1.0 + std::exp(-(dew - cold) / scale));  // share of wetted surface below the dew point
  const double fw = std::fmin(1.0, starts_per_hour * warmup);       // share of time warming up
  return 1.0 - (1.0 - ws) * (1.0 - fw);
}

double warmup_liner_wall(double t, double js, double jr, double tw, double rise, double e, double load, double sigma,
                         double tr) {
  const double jacket = tw > 0 && t < tw ? js + (jr - js) * t / tw : jr;
  const double share = tr > 0 && t < tr ? sigma + (1 - sigma) * t / tr : 1.0;
  return jacket + rise * load_power(load * share, e);
}

int warmup_panels(double wall_start, double wall_end, double scale) {
  // g changes over ΔT_s of wall temperature: a panel per ΔT_s of the wall's (monotone) rise over the piece,
  // at least 16 (the rule's accuracy on the usual scales), at most 1024 (bounded work for a tiny ΔT_s)
  return static_cast<int>(std::fmin(1024.0, std::fmax(16.0, std::ceil(std::fabs(wall_end - wall_start) / scale))));
}

double warmup_liner_extra(double dew, double js, double jr, double tw, double rise, double e, double load, double sigma,
                          double tr, double scale) {
  // 5-point Gauss–Legendre nodes and weights on [−1, 1] (Abramowitz & Stegun, Table 25.4)
  static constexpr double x[5] = {0.0, 0.5384693101056831, -0.5384693101056831, 0.9061798459386640, -0.9061798459386640};
  static constexpr double w[5] = {0.5688888888888889, 0.4786286704993665, 0.4786286704993665, 0.2369268850561891,
                                  0.2369268850561891};
  const double g_run = liner_uptake_factor(dew - (jr + rise * load_power(load, e)), scale);
  const auto integrand = [&](double t) {
    const double share = tr > 0 && t < tr ? sigma + (1 - sigma) * t / tr : 1.0;  // sulfur flow follows the load
    return share * liner_uptake_factor(dew - warmup_liner_wall(t, js, jr, tw, rise, e, load, sigma, tr), scale) - g_run;
  };
  // two smooth pieces: up to the earlier ramp end, then to the later one
  const double a = std::fmin(tw, tr), b = std::fmax(tw, tr);
  double sum = 0;
  for (const auto& [lo, hi] : {std::pair{0.0, a}, std::pair{a, b}}) {
    if (hi <= lo) continue;
    const int panels = warmup_panels(warmup_liner_wall(lo, js, jr, tw, rise, e, load, sigma, tr),
                                     warmup_liner_wall(hi, js, jr, tw, rise, e, load, sigma, tr), scale);
    const double h = (hi - lo) / panels;
    for (int k = 0; k < panels; ++k)
      for (int j = 0; j < 5; ++j) sum += 0.5 * h * w[j] * integrand(lo + h * (k + 0.5 + 0.5 * x[j]));
  }
  return sum;
}

// E ≤ S·g(T_dp − T_w(0)) − T·g(T_dp − T_w,run), T = max(t_w, t_r), S = ∫₀ᵀ l(t)/l dt = T − t_r(1 − σ)/2:
// the wall is never colder than at the start (jacket water and load only rise) and g increases
double warmup_liner_extra_bound(double dew, double js, double jr, double tw, double rise, double e, double load, double sigma,
                                double tr, double scale) {
  const double g0 = liner_uptake_factor(dew - warmup_liner_wall(0, js, jr, tw, rise, e, load, sigma, tr), scale);
  const double g_run = liner_uptake_factor(dew - (jr + rise * load_power(load, e)), scale);
  const double T = std::fmax(tw, tr), S = T - (tr > 0 ? tr * (1 - sigma) / 2 : 0);
  return S * g0 - T * g_run;
}

namespace {
Transfer transfer_of(const FuelGas& fuel, const Operation& op, const TransferParameters& p, bool check_parameters,
                     bool figures);
}  // namespace

Transfer transfer(const FuelGas& fuel, const Operation& op, const TransferParameters& p, bool check_parameters) {
  return transfer_of(fuel, op, p, check_parameters, true);
}

Transfer transfer_checks(const FuelGas& fuel, const Operation& op, const TransferParameters& p) {
  return transfer_of(fuel, op, p, true, false);
}

namespace {
// `figures` false: for the refusals only (transfer_checks).
Transfer transfer_of(const FuelGas& fuel, const Operation& op, const TransferParameters& p, bool check_parameters,
                     bool figures) {
  validate(op);
  if (check_parameters) validate(p);
  Transfer t;
  t.fuel_flow = op.fuel_flow;
  t.sulfur_flow = fuel.sulfur() * op.fuel_flow;
  t.combustion = burn(fuel, op.air, p.so3_share);
  add_nox(t.combustion, op.fuel_flow > 0 ? nox_per_mol_fuel(t.combustion, op.nox, op.fuel_flow, op.electrical_power) : 0);
  const Combustion& c = t.combustion;
  t.charge_flow = op.fuel_flow * c.charge();
  t.blowby_flow = op.blowby_flow > 0 ? op.blowby_flow : op.blowby_share * t.charge_flow;
  if (t.blowby_flow > 0.2 * t.charge_flow && t.charge_flow > 0)
    throw InputError("engine.blow-by-flow", format_value(t.blowby_flow) + " mol/h",
                     "blow-by below 20 % of the charge (" + format_value(0.2 * t.charge_flow) + " mol/h)");
  const double bb_charge_share = t.charge_flow > 0 ? t.blowby_flow / t.charge_flow : 0;

  // Burnt gas per mole of charge, and the three streams leaving the cylinders [mol/h].
  const double burnt_fuel = op.fuel_flow * (1 - bb_charge_share);  // fuel burnt in the cylinder proper
  const double bb_burnt_fuel = op.fuel_flow * bb_charge_share * p.burnt_share_of_blowby;
  const double bb_unburnt_fuel = op.fuel_flow * bb_charge_share * (1 - p.burnt_share_of_blowby);
  for (Gas g : all_gases) {
    t.exhaust[i(g)] = burnt_fuel * c.products[i(g)];
    t.blowby_burnt[i(g)] = bb_burnt_fuel * c.products[i(g)];
    t.blowby_unburnt[i(g)] = bb_unburnt_fuel * (fuel[g] + c.air_moles[i(g)]);
  }
  t.unburnt_sulfur = bb_unburnt_fuel * fuel.other_sulfur;
  t.unburnt_chlorine = bb_unburnt_fuel * fuel.chlorine;
  t.unburnt_fluorine = bb_unburnt_fuel * fuel.fluorine;

  // Liner path: acid condensing on the liner below the in-cylinder acid dew point.
  const double jacket_start = std::fmin(op.jacket_water_at_start, op.jacket_water_out);  // a warm standby never cools it
  t.liner_temperature = op.jacket_water_out + p.liner_wall_rise * load_power(op.load, p.liner_wall_rise_load_exponent);
  if (c.products[i(Gas::SO3)] > 0) {
    const double pw = c.wet_fraction(Gas::H2O) * p.liner_pressure;
    const double ps = c.wet_fraction(Gas::SO3) * p.liner_pressure;
    t.cylinder_acid_dew_point = dew_point::sulfuric_verhoff_banchero(pw, ps) + p.cylinder_dew_point_offset;
    t.liner_subcooling = t.cylinder_acid_dew_point - t.liner_temperature;
    t.liner_share = p.liner_uptake * liner_uptake_factor(t.liner_subcooling, p.liner_subcooling_scale);
    // cold running: after each start the liner is colder while jacket water and load come up
    // per running hour; warm-ups that would overlap (starts · warm-up > 1) count as warming up all the time
    const double warm = std::fmax(p.warmup_hours, p.load_ramp_hours);
    const auto per_hour_of = [&](double per_start) {
      return op.starts_per_hour * warm > 1 ? per_start / warm : op.starts_per_hour * per_start;
    };
    if (op.starts_per_hour > 0) {
      // for the refusals only, the integral's upper bound where it already keeps the liner check
      // below its limit (with a margin of 1e-6, far above the quadrature's error): the check then passes
      // on the integral too; otherwise the integral, as for the figures
      bool bounded = false;
      if (!figures) {
        const double bound = warmup_liner_extra_bound(t.cylinder_acid_dew_point, jacket_start, op.jacket_water_out,
                                                      p.warmup_hours, p.liner_wall_rise, p.liner_wall_rise_load_exponent,
                                                      op.load, p.warmup_start_load, p.load_ramp_hours,
                                                      p.liner_subcooling_scale);
        bounded = t.liner_share + p.liner_uptake * std::fmax(0.0, per_hour_of(bound)) <= 0.5 * (1 - 1e-6);
        if (bounded) t.warmup_liner_per_start = bound;
      }
      if (!bounded)
        t.warmup_liner_per_start = warmup_liner_extra(t.cylinder_acid_dew_point, jacket_start,
                                                      op.jacket_water_out, p.warmup_hours, p.liner_wall_rise,
                                                      p.liner_wall_rise_load_exponent, op.load, p.warmup_start_load,
                                                      p.load_ramp_hours, p.liner_subcooling_scale);
    }
    const double per_hour = per_hour_of(t.warmup_liner_per_start);
    t.inflow.sulfuric_warmup = std::fmax(0.0, p.liner_uptake * per_hour * t.sulfur_flow);
    if (t.liner_share + p.liner_uptake * std::fmax(0.0, per_hour) > 0.5)
      throw InputError("model.liner-uptake", format_value(p.liner_uptake),
                       "parameters that keep the liner uptake below half the fuel sulfur (it is " +
                           format_value(t.liner_share + p.liner_uptake * std::fmax(0.0, per_hour)) + ")");
  }
  t.liner_temperature_at_start = warmup_liner_wall(0, jacket_start, op.jacket_water_out, p.warmup_hours,
                                                   p.liner_wall_rise, p.liner_wall_rise_load_exponent, op.load,
                                                   p.warmup_start_load, p.load_ramp_hours);
  // Liner uptake: a share of the fuel S, taken from the cylinder gas's SO2 and SO3 in proportion.
  const double liner_s = t.liner_share * t.sulfur_flow + t.inflow.sulfuric_warmup;
  const double exhaust_s = t.exhaust[i(Gas::SO2)] + t.exhaust[i(Gas::SO3)];
  if (liner_s > 0) {
    const double keep = 1 - liner_s / exhaust_s;
    t.exhaust[i(Gas::SO2)] *= keep;
    t.exhaust[i(Gas::SO3)] *= keep;
  }
  t.inflow.sulfuric_liner = liner_s;

  // Crankcase path: the blow-by's water dew point against the coldest wetted surface, cold starts.
  double bb_total = 0;
  for (Gas g : all_gases) bb_total += t.blowby_burnt[i(g)] + t.blowby_unburnt[i(g)];
  const double bb_water = t.blowby_burnt[i(Gas::H2O)] + t.blowby_unburnt[i(Gas::H2O)];
  t.blowby_water_dew_point = 0;
  if (bb_total > 0 && bb_water / bb_total * op.crankcase_pressure >= water::if97_p_min)
    t.blowby_water_dew_point = water::dew_point(bb_water / bb_total, op.crankcase_pressure);
  t.wetness = crankcase_wetness(t.blowby_water_dew_point > 0 ? t.blowby_water_dew_point : 0,
                                op.coldest_crankcase_surface, p.wetness_width, op.starts_per_hour, p.warmup_hours);
  t.inflow.sulfuric_blowby = p.capture_so3 * t.blowby_burnt[i(Gas::SO3)];
  t.inflow.hydrochloric = p.capture_hcl * t.blowby_burnt[i(Gas::HCl)];
  t.inflow.hydrofluoric = p.capture_hf * t.blowby_burnt[i(Gas::HF)];
  t.inflow.nitric = p.capture_no2 * t.blowby_burnt[i(Gas::NO2)];
  // r_SO2 = ṅ_SO2,bb · κ_SO2 · (b − b_min)/(b_fresh − b_min) · (1 + w (m_wet − 1)); here at fresh oil.
  t.inflow.sulfurous_fresh = t.blowby_burnt[i(Gas::SO2)] * p.capture_so2 * (1 + t.wetness * (p.wet_so2_factor - 1));
  if (t.inflow.sulfurous_fresh > t.blowby_burnt[i(Gas::SO2)])
    throw InputError("model.capture-so2", format_value(p.capture_so2),
                     "a capture share that, with the wet-crankcase factor, stays at most 1 (it is " +
                         format_value(p.capture_so2 * (1 + t.wetness * (p.wet_so2_factor - 1))) + ")");
  return t;
}
}  // namespace

std::array<double, gas_count> Transfer::oil_uptake(double r) const {
  std::array<double, gas_count> u{};
  u[i(Gas::SO3)] = inflow.sulfuric_blowby;
  u[i(Gas::SO2)] = inflow.sulfurous_fresh * r;
  u[i(Gas::HCl)] = inflow.hydrochloric;
  u[i(Gas::HF)] = inflow.hydrofluoric;
  u[i(Gas::NO2)] = inflow.nitric;
  // the liner's share, from the cylinder gas in its SO2:SO3 proportion
  const double s = combustion.products[i(Gas::SO2)] + combustion.products[i(Gas::SO3)];
  if (s > 0) {
    u[i(Gas::SO2)] += inflow.sulfuric_liner * combustion.products[i(Gas::SO2)] / s;
    u[i(Gas::SO3)] += inflow.sulfuric_liner * combustion.products[i(Gas::SO3)] / s;
  }
  return u;
}

std::array<double, gas_count> Transfer::blowby_vented(double r) const {
  std::array<double, gas_count> v{};
  for (Gas g : all_gases) v[i(g)] = blowby_burnt[i(g)] + blowby_unburnt[i(g)];
  v[i(Gas::SO3)] -= inflow.sulfuric_blowby;
  v[i(Gas::SO2)] -= inflow.sulfurous_fresh * r;
  v[i(Gas::HCl)] -= inflow.hydrochloric;
  v[i(Gas::HF)] -= inflow.hydrofluoric;
  v[i(Gas::NO2)] -= inflow.nitric;
  return v;
}

double Transfer::sulfur_share_to_oil(double r) const {
  if (sulfur_flow <= 0) return 0;
  return (inflow.sulfuric_liner + inflow.sulfuric_blowby + inflow.sulfurous_fresh * r) / sulfur_flow;
}

}  // namespace acidload
