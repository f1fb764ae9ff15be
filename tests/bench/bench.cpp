// acidload benchmarks (built with the project, not run by the tests): prints figures and ratios;
// every side is timed once per round, the sides interleaved, and a figure is the median of the
// rounds with its spread.
//   bench            the C++ table: (5) the limit — a minimal closed-form loop written here against
//                    acidload's oil balance and full simulate, and the rate of reading the input
//                    bytes; (2b) Monte Carlo on the demo history with and without the early stop,
//                    1 and 2 threads; (6) memory of a ten-year one-minute record against a one-year one
//   bench --memory-run YEARS   stream YEARS of one-minute segments, print the peak resident memory
//   bench --limit-side SIDE [N]  run one side of (5) N times (minimal, balance, simulate, daily, cycle; once by
//                    default, for callgrind), print its end base and CPU time per segment
//   bench --record-csv FILE    write the one-year hourly record's inputs for the Python side
#include <sys/resource.h>
#include <sys/wait.h>

#include <algorithm>
#include <array>
#include <chrono>
#include <ctime>
#include <cmath>
#include <cstdio>
#include <cstdlib>
#include <cstring>
#include <random>
#include <string>
#include <thread>
#include <utility>
#include <vector>

#include "acidload/acidload.hpp"
#include "acidload/core/oil_rates.hpp"
#include "acidload/studies/calibration.hpp"
#include "acidload/studies/monte_carlo.hpp"
#include "acidload/io/case_file.hpp"
#include <unistd.h>

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
  c.oil.fresh_tbn = 12.0;  // a charge that lasts the year with makeup, above the base floor
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


// Median and spread (min, max) of per-round figures.
struct Spread {
  double median = 0, low = 0, high = 0;
};
Spread spread(std::vector<double> v) {
  std::sort(v.begin(), v.end());
  return {v[v.size() / 2], v.front(), v.back()};
}
template <class F>
double seconds(F f) {
  const auto a = clock_type::now();
  f();
  return std::chrono::duration<double>(clock_type::now() - a).count();
}
// CPU time of the calling thread: for work on this thread alone, so that on a shared machine the
// time spent waiting for a core does not count.
double thread_cpu() {
  timespec t{};
  clock_gettime(CLOCK_THREAD_CPUTIME_ID, &t);
  return static_cast<double>(t.tv_sec) + 1e-9 * static_cast<double>(t.tv_nsec);
}
template <class F>
double cpu_seconds(F f) {
  const double a = thread_cpu();
  f();
  return thread_cpu() - a;
}

// The limit: the oil balance of a record of constant-rate segments above the base floor with
// continuous makeup, written for the benchmark from the balance's equations (docs/model.md; no
// library call in the loop): every state y obeys dy/dt = A − L·y over a segment, so
// y ← y∞ + (y − y∞)·e^{−L·h}, y∞ = A/L, with three distinct exponentials per segment (the makeup k,
// k + SO2 uptake, k + additive depletion). States: reactive base b, weak acid w, u = b + salts,
// oxidation, nitration, additive, antioxidant reserve a (dA/dt = k − k_A − k·A while any is left;
// once spent with k_A > k, oxidation and organic acid run at m − (m − 1)·k/k_A times the protected
// rates). The one segment in which the reserve runs out is split there (a logarithm, once a year).
struct Minimal {
  double b, w, u, ox, ni, add, anti;
};
inline void minimal_piece(Minimal& y, const OilRates& r, const OilBalance& k, double M, double h, double f) {
  const double phi = k.organic_neutralised_share, bf = k.fresh_base, bmin = k.base_floor;
  const double km = r.consumption / M, l1 = r.sulfurous_fresh / (bf - bmin) / M, rw = r.organic_acid * f;
  const double e_k = std::exp(-km * h), e_b = std::exp(-(km + l1) * h), e_a = std::exp(-(km + k.additive_depletion) * h);
  const double b_inf = (-r.strong_acid / M - phi * rw + l1 * bmin + km * bf) / (km + l1);
  y.b = b_inf + (y.b - b_inf) * e_b;
  const double w_inf = (1 - phi) * rw / km;
  y.w = w_inf + (y.w - w_inf) * e_k;
  y.u = bf + (y.u - bf) * e_k;
  const double ox_inf = r.oxidation * f / km, ni_inf = r.nitration / M / km;
  y.ox = ox_inf + (y.ox - ox_inf) * e_k;
  y.ni = ni_inf + (y.ni - ni_inf) * e_k;
  const double add_inf = km * k.fresh_additive / (km + k.additive_depletion);
  y.add = add_inf + (y.add - add_inf) * e_a;
  if (y.anti > 0 || r.antioxidant_depletion < km) {
    const double a_inf = (km - r.antioxidant_depletion) / km;
    y.anti = std::fmin(1.0, std::fmax(0.0, a_inf + (y.anti - a_inf) * e_k));
  }
}
Minimal minimal_loop(const std::vector<double>& hours, const std::vector<OilRates>& rates, const OilBalance& k, double M,
                     const OilState& start) {
  Minimal y{start.base, start.weak_acid, start.base + start.salts, start.oxidation, start.nitration, start.additive_acidity,
            start.antioxidant};
  for (std::size_t i = 0; i < rates.size(); ++i) {
    const OilRates& r = rates[i];
    const double km = r.consumption / M, kA = r.antioxidant_depletion;
    const bool spent = y.anti <= 0 && kA > km;
    const double f = spent ? r.depleted_factor - (r.depleted_factor - 1) * std::fmin(1.0, km / kA) : 1.0;
    if (!spent && y.anti > 0 && kA > km) {  // does the reserve run out in this segment? a(t) = a∞ + (a0 − a∞) e^{−k t}, a∞ < 0
      const double a_inf = (km - kA) / km, t0 = std::log((y.anti - a_inf) / -a_inf) / km;
      if (t0 < hours[i]) {
        minimal_piece(y, r, k, M, t0, 1.0);
        y.anti = 0;
        minimal_piece(y, r, k, M, hours[i] - t0, r.depleted_factor - (r.depleted_factor - 1) * std::fmin(1.0, km / kA));
        continue;
      }
    }
    minimal_piece(y, r, k, M, hours[i], f);
  }
  return y;
}

// A year of hourly segments whose operating state changes once a day (a daily gas analysis and
// load reading): the rates repeat 24 times, so the transfer need not be recomputed.
std::vector<Segment> hourly_year_daily_readings() {
  std::vector<Segment> r;
  for (int h = 0; h < 8760; ++h) r.push_back(segment(1.0, h2s_at(h - h % 24), load_at(12)));
  return r;
}

// A year of hourly segments on a daily cycle: each hour's H2S and load differ from the previous hour's,
// and the day repeats (a daily load profile, hourly gas readings quantised to whole ppmv): 24 operating
// states, none back to back, so only a cache of recent states reuses the transfer.
std::vector<Segment> hourly_year_daily_cycle() {
  std::vector<Segment> r;
  for (int h = 0; h < 8760; ++h) r.push_back(segment(1.0, std::round(h2s_at(h % 24)), load_at(h % 24)));
  return r;
}

// Monte Carlo's draw without the early stop: the first charge continued to the planned maximum, every
// limit watched (what each draw cost before the stop), for the ratio.
std::vector<double> draws_without_stop(const EngineCase& c0, const std::vector<UncertainInput>& in, int draws, std::uint64_t seed) {
  EngineCase c = c0;
  c.record.clear();
  double hours = 0;
  for (std::size_t i = 0; i < c0.record.size(); ++i) {
    bool change = false;
    for (const OilEvent& e : c0.record[i].events) change |= e.kind == OilEvent::Kind::oil_change;
    if (change && i > 0) break;
    c.record.push_back(c0.record[i]);
    hours += c0.record[i].hours;
  }
  if (hours < c0.model.limits.max_hours) {
    Segment more = c.record.back();
    more.events.clear();
    more.starts = more.hours > 0 ? more.starts / more.hours * (c0.model.limits.max_hours - hours) : 0;
    more.hours = c0.model.limits.max_hours - hours;
    more.calendar_hours = -1;
    c.record.push_back(more);
  }
  std::vector<double> out;
  for (int i = 0; i < draws; ++i) {
    EngineCase x = c;
    for (std::size_t k = 0; k < in.size(); ++k)
      set_parameter(x, in[k].key, sample(in[k].distribution, uniform01(seed, static_cast<std::uint64_t>(i), 2 * k),
                                         uniform01(seed, static_cast<std::uint64_t>(i), 2 * k + 1)));
    RunOptions o = x.options;
    o.output_interval = 0;
    o.keep_segment_ends = false;
    const RunResult r = simulate(x.charge, x.model, x.record, o);
    out.push_back(r.charges.front().first ? r.charges.front().drain_interval : x.model.limits.max_hours);
  }
  return out;
}

// Each segment's hours and oil rates (its transfer made here, outside the timed loops): the inputs the
// minimal loop and the oil balance are given.
std::pair<std::vector<double>, std::vector<OilRates>> hours_and_rates(const std::vector<Segment>& record, const ModelParameters& m) {
  std::vector<double> hours;
  std::vector<OilRates> rates;
  for (const Segment& s : record) {
    hours.push_back(s.hours);
    rates.push_back(oil_rates(transfer(s.fuel, s.operation, m.transfer), m.oxidation, s.oil_temperature, s.oil_consumption, true));
  }
  return {hours, rates};
}

// One side of part 5 run once, for an instruction count that the machine's load does not move
// (valgrind --tool=callgrind acidload_bench --limit-side SIDE); prints the end base.
int limit_side(const char* side, int repeats) {
  const std::vector<Segment> record = std::strcmp(side, "daily") == 0   ? hourly_year_daily_readings()
                                      : std::strcmp(side, "cycle") == 0 ? hourly_year_daily_cycle()
                                                                        : hourly_year();
  const OilCharge c = charge();
  const ModelParameters m = model();
  const OilBalance k = balance_constants(c.oil);
  const auto inputs = hours_and_rates(record, m);  // not a structured binding: the lambdas below capture them
  const std::vector<double>& hours = inputs.first;
  const std::vector<OilRates>& rates = inputs.second;
  const OilState start = fresh_oil(c.oil, c.mass);
  double base = 0;
  const double a = thread_cpu();
  for (int rep = 0; rep < repeats; ++rep) {
  if (std::strcmp(side, "minimal") == 0) {
    base = minimal_loop(hours, rates, k, c.mass, start).b;
  } else if (std::strcmp(side, "balance") == 0) {
    OilState bal = start;
    OilLedger ledger;
    for (std::size_t i = 0; i < rates.size(); ++i) advance(bal, k, rates[i], hours[i], ledger);
    base = bal.base;
  } else if (std::strcmp(side, "simulate") == 0 || std::strcmp(side, "daily") == 0 || std::strcmp(side, "cycle") == 0) {
    base = simulate(c, m, record).final_state.base;
  } else {
    std::fprintf(stderr, "--limit-side: one of minimal, balance, simulate, daily, cycle\n");
    return 2;
  }
  }
  std::printf("%.17g %.4f us/segment (CPU time of the thread, %d runs)\n", base, (thread_cpu() - a) / repeats / 8760 * 1e6, repeats);
  return 0;
}

}  // namespace

int main(int argc, char** argv) {
  if (argc == 3 && std::strcmp(argv[1], "--memory-run") == 0) return memory_run(std::atof(argv[2]));
  if ((argc == 3 || argc == 4) && std::strcmp(argv[1], "--limit-side") == 0) return limit_side(argv[2], argc == 4 ? std::atoi(argv[3]) : 1);
  // one side of bench.py's record reading (part 4), run in a child so that bench.py interleaves it
  // with its own sides: prints the CPU seconds of this thread for the C++ call, and its peak memory
  if (argc == 3 && std::strcmp(argv[1], "--load-record") == 0) {
    const double a = thread_cpu();
    // as `acidload check` and Python read it: every row checked, the record kept as its description
    const std::size_t segments = record_segments(io::load_case(argv[2], {}, io::RecordReading::stream).variants.front());
    const double t = thread_cpu() - a;
    rusage u{};
    getrusage(RUSAGE_SELF, &u);
    std::printf("%.9f %zu %ld\n", t, segments, u.ru_maxrss);
    return 0;
  }
  // the floor under any record reader: the file's bytes read (page cache) and its lines counted
  if (argc == 3 && std::strcmp(argv[1], "--read-bytes") == 0) {
    std::vector<char> buf(1 << 20);
    long bytes = 0, lines = 0;
    const double a = thread_cpu();
    FILE* in = std::fopen(argv[2], "rb");
    if (!in) return 1;
    for (std::size_t n; (n = std::fread(buf.data(), 1, buf.size(), in)) > 0;) {
      bytes += static_cast<long>(n);
      for (const char* p = buf.data(); (p = static_cast<const char*>(std::memchr(p, '\n', static_cast<std::size_t>(buf.data() + n - p)))); ++p) ++lines;
    }
    std::fclose(in);
    const double t = thread_cpu() - a;
    std::printf("%.9f %ld %ld\n", t, lines, bytes);
    return 0;
  }
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
  const int rounds = 7;
  std::printf("acidload %s benchmarks, C++ side: every side timed in each of %d rounds, the sides interleaved\n"
              "(A B C A B C …); a figure is the median of the rounds [lowest – highest]\n\n", version(), rounds);

  // (5) the limit: a year of hourly segments
  const std::vector<Segment> year = hourly_year(), daily = hourly_year_daily_readings(), cycle = hourly_year_daily_cycle();
  const OilCharge c = charge();
  const ModelParameters m = model();
  const OilBalance k = balance_constants(c.oil);
  const auto inputs = hours_and_rates(year, m);  // not a structured binding: the lambdas below capture them
  const std::vector<double>& hours = inputs.first;
  const std::vector<OilRates>& rates = inputs.second;
  const OilState start = fresh_oil(c.oil, c.mass);
  Minimal lim{};
  OilState bal{};
  RunResult full, full_daily, full_cycle;
  std::vector<double> r_bal, r_full, r_daily, r_cycle, r_cycle_full, t_lim;
  std::array<int, 5> order{0, 1, 2, 3, 4};
  std::mt19937 shuffle(19);
  for (int round = 0; round < rounds; ++round) {
    // the order shuffled each round (a fixed seed): no side always runs right after the same one
    std::shuffle(order.begin(), order.end(), shuffle);
    double a = 0, b = 0, f = 0, d = 0, y = 0;
    for (int j = 0; j < 5; ++j) switch (order[static_cast<std::size_t>(j)]) {
        case 0: a = cpu_seconds([&] { lim = minimal_loop(hours, rates, k, c.mass, start); }); break;
        case 1:
          b = cpu_seconds([&] {
            bal = start;
            OilLedger ledger;
            for (std::size_t i = 0; i < rates.size(); ++i) advance(bal, k, rates[i], hours[i], ledger);
          });
          break;
        case 2: f = cpu_seconds([&] { full = simulate(c, m, year); }); break;
        case 3: d = cpu_seconds([&] { full_daily = simulate(c, m, daily); }); break;
        default: y = cpu_seconds([&] { full_cycle = simulate(c, m, cycle); }); break;
      }
    t_lim.push_back(a / 8760 * 1e6);
    r_bal.push_back(b / a), r_full.push_back(f / a), r_daily.push_back(d / a), r_cycle.push_back(y / a);
    r_cycle_full.push_back(f / y);
  }
  const double dev_bal = std::fabs(bal.base - lim.b), dev_full = std::fabs(full.final_state.base - lim.b);
  const double dev_salts = std::fabs(bal.salts - (lim.u - lim.b));
  const Spread tl = spread(t_lim), sb = spread(r_bal), sf = spread(r_full), sd = spread(r_daily), sy = spread(r_cycle),
               syf = spread(r_cycle_full);
  std::printf("5. the limit: a year of hourly segments (8760; H2S and load vary every hour), above the base floor\n");
  std::printf("   minimal closed-form loop (written here, no library call)  %.4f us/segment [%.4f – %.4f]\n", tl.median, tl.low, tl.high);
  std::printf("   acidload oil balance (advance per segment) / minimal      %6.2f  [%.2f – %.2f]   base agrees to %.1e mg KOH/g, salts to %.1e\n",
              sb.median, sb.low, sb.high, dev_bal, dev_salts);
  std::printf("   acidload simulate, transfer every hour / minimal          %6.2f  [%.2f – %.2f]   (target <= 2)   base agrees to %.1e\n",
              sf.median, sf.low, sf.high, dev_full);
  std::printf("   acidload simulate, state repeats 24 h (transfer reused) / minimal %.2f [%.2f – %.2f]   (target <= 2)\n",
              sd.median, sd.low, sd.high);
  std::printf("   acidload simulate, daily cycle (24 states, none back to back) / minimal %.2f [%.2f – %.2f]   (target <= 2)\n"
              "   transfer every hour / daily cycle  %.2f [%.2f – %.2f]   (what the cache of recent states saves)\n",
              sy.median, sy.low, sy.high, syf.median, syf.low, syf.high);
  std::printf("   (simulate includes the transfer, limit watching with detection steps of 25 h and a trajectory point per segment;\n"
              "   every side on one thread, CPU time of that thread)\n\n");

  // (5) reading the input bytes: the floor under any record reader
  {
    char name[] = "/tmp/acidload-bench-XXXXXX";
    const int fd = mkstemp(name);
    FILE* f = fdopen(fd, "w");
    const long rows = 1000000;
    std::fprintf(f, "hours [h],h2s [ppmv],load [%%]\n");
    for (long i = 0; i < rows; ++i) std::fprintf(f, "1,%.1f,%.1f\n", h2s_at(static_cast<double>(i)), 100 * load_at(static_cast<double>(i)));
    std::fclose(f);
    std::vector<double> rate;
    long bytes = 0, lines = 0;
    std::vector<char> buf(1 << 20);
    for (int round = 0; round < 5; ++round) {
      bytes = lines = 0;
      const double t = seconds([&] {
        FILE* in = std::fopen(name, "rb");
        for (std::size_t n; (n = std::fread(buf.data(), 1, buf.size(), in)) > 0;) {
          bytes += static_cast<long>(n);
          for (const char* p = buf.data(); (p = static_cast<const char*>(std::memchr(p, '\n', static_cast<std::size_t>(buf.data() + n - p)))); ++p) ++lines;
        }
        std::fclose(in);
      });
      rate.push_back(static_cast<double>(lines - 1) / t);
    }
    std::remove(name);
    const Spread r = spread(rate);
    std::printf("   reading the input bytes (1e6-row record, %.1f MB, from the page cache, lines counted)\n", static_cast<double>(bytes) / 1e6);
    std::printf("   %.0f million rows/s [%.0f – %.0f] = %.0f MB/s\n\n", r.median / 1e6, r.low / 1e6, r.high / 1e6,
                r.median * static_cast<double>(bytes) / static_cast<double>(lines) / 1e6);
  }

  // (2b) Monte Carlo on the demo history: the early stop, and threads
  {
    const io::CaseFile file = io::load_case(std::string(ACIDLOAD_SOURCE_DIR) + "/cases/demo-site-history.yaml");
    const EngineCase& e = file.variants.front();
    const std::vector<UncertainInput>& in = file.uncertainty.inputs;
    const int draws = 4000;
    const std::uint64_t seed = file.uncertainty.seed;
    MonteCarloResult one, two;
    std::vector<double> plain;
    std::vector<double> t1, t2, tp;
    for (int round = 0; round < 5; ++round) {
      t1.push_back(seconds([&] { one = monte_carlo(e, in, draws, seed, 1); }));
      t2.push_back(seconds([&] { two = monte_carlo(e, in, draws, seed, 2); }));
      tp.push_back(seconds([&] { plain = draws_without_stop(e, in, draws, seed); }));
    }
    std::vector<double> stop_ratio, speedup;
    for (std::size_t i = 0; i < t1.size(); ++i) stop_ratio.push_back(tp[i] / t1[i]), speedup.push_back(t1[i] / t2[i]);
    double worst = 0;
    for (int i = 0; i < draws; ++i) worst = std::fmax(worst, std::fabs(one.drain_interval[static_cast<std::size_t>(i)] - plain[static_cast<std::size_t>(i)]));
    const Spread s1 = spread(t1), ss = spread(stop_ratio), sp = spread(speedup);
    std::printf("2b. Monte Carlo, %d draws of the demo history (cases/demo-site-history.yaml, its 4 inputs)\n", draws);
    std::printf("   1 thread, each draw stopped once its interval and first SAN are known  %8.0f draws/s [%.0f – %.0f]\n",
                draws / s1.median, draws / s1.high, draws / s1.low);
    std::printf("   without the stop (first charge run to the planned maximum, every limit watched) / with  %.2f [%.2f – %.2f]\n",
                ss.median, ss.low, ss.high);
    std::printf("   intervals of the two agree to %.1e h\n", worst);
    std::printf("   2 threads / 1 thread speed-up  %.2f [%.2f – %.2f]   (target >= 0.9 x %u cores; the machine is shared)   identical results: %s\n\n",
                sp.median, sp.low, sp.high, std::thread::hardware_concurrency(),
                one.drain_interval == two.drain_interval && one.first_san == two.first_san ? "yes" : "NO");
  }

  // memory: ten-year one-minute record against a one-year one, decimated to a point a day
  const MemoryFigure one = memory_child(argv[0], 1), ten = memory_child(argv[0], 10);
  std::printf("6. memory of the library's streaming call (simulate with a segment source), one-minute segments, a point a day\n");
  std::printf("   one year  (%8ld segments, %6zu points) peak %8ld kB\n", 525600L, one.points, one.kb);
  std::printf("   ten years (%8ld segments, %6zu points) peak %8ld kB\n", 5256000L, ten.points, ten.kb);
  const double kept_kb = static_cast<double>(ten.points - one.points) * sizeof(TrajectoryPoint) / 1024.0;
  std::printf("   ratio ten / one %6.2f; growth %ld kB, of which the extra kept points are %.0f kB (x2 for vector growth)\n",
              static_cast<double>(ten.kb) / static_cast<double>(one.kb), ten.kb - one.kb, kept_kb);
  return 0;
}
