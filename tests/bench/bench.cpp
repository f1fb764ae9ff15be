// acidload benchmarks (built with the project, not run by the tests): prints figures and ratios,
// each timing the median of several runs, each ratio measured side by side in the same run.
//   bench            the C++ table: (1) one engine over a one-year hourly record against the limit
//                    loop, (2) Monte Carlo with 1 and 2 threads, (5) memory of a ten-year
//                    one-minute record against a one-year one
//   bench --memory-run YEARS   stream YEARS of one-minute segments, print the peak resident memory
//   bench --record-csv FILE    write the one-year hourly record's inputs for the Python side
#include <sys/resource.h>
#include <sys/wait.h>

#include <algorithm>
#include <chrono>
#include <cmath>
#include <cstdio>
#include <cstdlib>
#include <cstring>
#include <string>
#include <vector>

#include "acidload/acidload.hpp"
#include "acidload/core/rates.hpp"
#include "acidload/studies/calibration.hpp"
#include "acidload/studies/monte_carlo.hpp"

using namespace acidload;
using clock_type = std::chrono::steady_clock;

namespace {

// The engine of the benchmarks: the sanity case of docs/model.md §5.5 (invented operating data).
FuelGas gas(double h2s_ppmv) {
  FuelAnalysis a;
  a.main[static_cast<std::size_t>(Gas::CH4)] = 0.5;
  a.main[static_cast<std::size_t>(Gas::CO2)] = 0.5;
  a.h2s = {h2s_ppmv, ConcentrationUnit::ppmv, Basis::dry};
  return resolve(a);
}

Segment segment(double hours, double h2s_ppmv, double load) {
  Segment s;
  s.hours = hours;
  s.fuel = gas(h2s_ppmv);
  s.operation.electrical_power = 1e6 * load;
  s.operation.load = load;
  s.operation.fuel_flow = fuel_flow_from_power(s.operation.electrical_power, 0.40, lower_heating_value(s.fuel));
  s.operation.nox = {500, NoxEmission::Unit::mg_per_m3_dry_at_o2_ref, 0.05};
  s.oil_temperature = 273.15 + 88;
  s.oil_consumption = 0.2e-3 * 1000 * load;
  return s;
}

// H2S and load varying hour by hour (a daily and a seasonal swing).
double h2s_at(double hour) { return 300 + 120 * std::sin(hour / 24 * 6.2831853) + 60 * std::sin(hour / 8760 * 6.2831853); }
double load_at(double hour) { return 0.85 + 0.15 * std::sin(hour / 24 * 6.2831853 + 1.0); }

OilCharge charge() {
  OilCharge c;
  c.oil.fresh_tbn = 9.0;  // a charge that lasts the year with makeup
  c.mass = 0.6 * c.oil.density_15;
  return c;
}

ModelParameters model() {
  ModelParameters m;
  m.limits.max_hours = 1e6;
  return m;
}

std::vector<Segment> hourly_year() {
  std::vector<Segment> r;
  for (int h = 0; h < 8760; ++h) r.push_back(segment(1.0, h2s_at(h), load_at(h)));
  return r;
}

double median(std::vector<double> v) {
  std::sort(v.begin(), v.end());
  return v[v.size() / 2];
}

template <class F>
double time_median(int runs, F f) {
  std::vector<double> t;
  for (int i = 0; i < runs; ++i) {
    const auto a = clock_type::now();
    f();
    t.push_back(std::chrono::duration<double>(clock_type::now() - a).count());
  }
  return median(t);
}

// The limit: the same closed forms in a bare loop — transfer, rates, one exact advance per
// segment — with no trajectory, no limit watching, nothing else.
OilState limit_loop(const std::vector<Segment>& rec, const OilCharge& c, const ModelParameters& m) {
  const OilBalance k = balance_constants(c.oil);
  OilState s = fresh_oil(c.oil, c.mass);
  OilLedger ledger;
  for (const Segment& seg : rec) {
    const Transfer t = transfer(seg.fuel, seg.operation, m.transfer);
    const OilRates r = oil_rates(t, m.oxidation, seg.oil_temperature, seg.oil_consumption, true);
    advance(s, k, r, seg.hours, ledger);
  }
  return s;
}

long peak_rss_kb() {
  rusage u{};
  getrusage(RUSAGE_SELF, &u);
  return u.ru_maxrss;
}

int memory_run(double years) {
  const long minutes = static_cast<long>(years * 8760 * 60);
  long i = 0;
  Segment s = segment(1.0 / 60, 300, 1.0);
  RunOptions o;
  o.keep_segment_ends = false;
  o.output_interval = 24;  // a point a day
  o.detection_step = 0;
  const RunResult r = simulate(charge(), model(), [&]() -> const Segment* {
    if (i >= minutes) return nullptr;
    const double hour = static_cast<double>(i++) / 60;
    s.fuel = gas(h2s_at(hour));
    return &s;
  }, o);
  std::printf("%ld %zu %.6f\n", peak_rss_kb(), r.trajectory.size(), r.final_state.base);
  return 0;
}

struct MemoryFigure {
  long kb = 0;
  std::size_t points = 0;
};
MemoryFigure memory_child(const char* self, double years) {
  const std::string cmd = std::string("\"") + self + "\" --memory-run " + std::to_string(years);
  FILE* p = popen(cmd.c_str(), "r");
  MemoryFigure m;
  double base = 0;
  if (p && std::fscanf(p, "%ld %zu %lf", &m.kb, &m.points, &base) != 3) m.kb = -1;
  if (p) pclose(p);
  return m;
}

}  // namespace

int main(int argc, char** argv) {
  if (argc == 3 && std::strcmp(argv[1], "--memory-run") == 0) return memory_run(std::atof(argv[2]));
  if (argc == 3 && std::strcmp(argv[1], "--record-csv") == 0) {
    FILE* f = std::fopen(argv[2], "w");
    if (!f) return 1;
    const OilCharge c = charge();
    const ModelParameters m = model();
    const OilBalance k = balance_constants(c.oil);
    std::fprintf(f, "hours,strong_acid_g_koh_per_h,sulfurous_fresh_g_koh_per_h,nitration,oxidation,organic_acid,consumption_kg_per_h\n");
    for (const Segment& s : hourly_year()) {
      const OilRates r = oil_rates(transfer(s.fuel, s.operation, m.transfer), m.oxidation, s.oil_temperature, s.oil_consumption, true);
      std::fprintf(f, "%.17g,%.17g,%.17g,%.17g,%.17g,%.17g,%.17g\n", s.hours, r.strong_acid, r.sulfurous_fresh, r.nitration,
                   r.oxidation, r.organic_acid, r.consumption);
    }
    const OilState x = fresh_oil(c.oil, c.mass);
    std::fprintf(stderr, "constants: fresh_base %.17g floor %.17g fresh_additive %.17g depletion %.17g phi %.17g mass %.17g base %.17g\n",
                 k.fresh_base, k.base_floor, k.fresh_additive, k.additive_depletion, k.organic_neutralised_share, x.mass, x.base);
    std::fclose(f);
    return 0;
  }
  std::setvbuf(stdout, nullptr, _IONBF, 0);  // figures appear as they are measured
  const int runs = 7;
  std::printf("acidload %s benchmarks (median of %d runs; ratios measured side by side in this run)\n\n", version(), runs);

  // (1) one engine over a one-year hourly record
  const std::vector<Segment> year = hourly_year();
  const OilCharge c = charge();
  const ModelParameters m = model();
  RunResult full;
  OilState lim;
  const double t_acid = time_median(runs, [&] { full = simulate(c, m, year); });
  const double t_limit = time_median(runs, [&] { lim = limit_loop(year, c, m); });
  const double rel = std::fabs(full.final_state.base - lim.base) / lim.base;
  std::printf("1. one-year hourly record, 8760 segments (H2S and load varying)\n");
  std::printf("   acidload simulate            %8.3f us/segment\n", t_acid / 8760 * 1e6);
  std::printf("   limit loop (same closed forms) %6.3f us/segment\n", t_limit / 8760 * 1e6);
  std::printf("   ratio acidload / limit        %8.2f   (target <= 2)   end states agree to %.1e\n\n", t_acid / t_limit, rel);

  // (2) Monte Carlo, 10 000 draws of that record
  EngineCase e;
  e.charge = c;
  e.model = m;
  e.model.limits.max_hours = 8760;
  e.record = year;
  const std::vector<UncertainInput> in = {{"model.so3-share", {Distribution::Kind::triangular, 0.005, 0.02, 0.035}},
                                          {"engine.blow-by", {Distribution::Kind::uniform, 0.006, 0.014, 0}}};
  const int draws = 10000;
  const int mc_runs = 5;
  MonteCarloResult r1, r2;
  const double t1 = time_median(mc_runs, [&] { r1 = monte_carlo(e, in, draws, 1, 1); });
  const double t2 = time_median(mc_runs, [&] { r2 = monte_carlo(e, in, draws, 1, 2); });
  std::printf("2. Monte Carlo, %d draws of the one-year record\n", draws);
  std::printf("   1 thread  %10.0f draws/s\n   2 threads %10.0f draws/s\n", draws / t1, draws / t2);
  std::printf("   speed-up  %10.2f   (target >= 1.8)   identical results: %s\n\n", t1 / t2,
              r1.drain_interval == r2.drain_interval ? "yes" : "NO");

  // (5) memory: ten-year one-minute record against a one-year one, decimated to a point a day
  const MemoryFigure one = memory_child(argv[0], 1), ten = memory_child(argv[0], 10);
  std::printf("5. memory, one-minute segments streamed, a trajectory point a day\n");
  std::printf("   one year  (%8ld segments, %6zu points) peak %8ld kB\n", 525600L, one.points, one.kb);
  std::printf("   ten years (%8ld segments, %6zu points) peak %8ld kB\n", 5256000L, ten.points, ten.kb);
  const double kept_kb = static_cast<double>(ten.points - one.points) * sizeof(TrajectoryPoint) / 1024.0;
  std::printf("   ratio ten / one %6.2f; growth %ld kB, of which the extra kept points are %.0f kB (x2 for vector growth)\n",
              static_cast<double>(ten.kb) / static_cast<double>(one.kb), ten.kb - one.kb, kept_kb);
  std::printf("   (target: flat — no growth with record length beyond the kept output)\n");
  return 0;
}
