#include "acidload/io/results.hpp"

#include <fcntl.h>
#include <pthread.h>
#include <sys/file.h>
#include <sys/stat.h>
#include <unistd.h>

#include <atomic>
#include <cerrno>
#include <chrono>
#include <cmath>
#include <csignal>
#include <cstdio>
#include <cstdlib>
#include <cstring>
#include <filesystem>
#include <fstream>
#include <optional>
#include <set>
#include <sstream>
#include <thread>

#include "acidload/core/constants.hpp"
#include "acidload/core/error.hpp"
#include "acidload/core/version.hpp"
#include "output_text.hpp"

namespace acidload::io {

namespace {
using detail::csv_field;
std::string num(double v) { return detail::json_number(v); }
std::string quote(const std::string& s) { return detail::json_string(s); }
}  // namespace

std::string summary_json(const CaseFile& c, const std::vector<VariantSummary>& rows, const EconomicsResults* economics) {
  std::ostringstream j;
  j << "{\n  \"acidload-version\": " << quote(version()) << ",\n  \"case-file\": " << quote(c.file)
    << ",\n  \"case\": " << quote(c.title) << ",\n  \"note\": "
    << quote("Estimates that support, not replace, the engine maker's and oil supplier's limits, lab analysis, "
             "local codes and licensed practice.")
    << ",\n  \"variants\": [";
  for (std::size_t i = 0; i < rows.size(); ++i) {
    const VariantSummary& v = rows[i];
    const ChargeSummary& ch = v.charge;
    j << (i ? "," : "") << "\n    {\n      \"name\": " << quote(v.name) << ",\n";
    j << "      \"acid-inflow-g-koh-per-h\": {\"sulfuric\": " << num(v.inflow_koh.sulfuric)
      << ", \"sulfurous-fresh-oil\": " << num(v.inflow_koh.sulfurous_fresh)
      << ", \"hydrochloric\": " << num(v.inflow_koh.hydrochloric) << ", \"hydrofluoric\": " << num(v.inflow_koh.hydrofluoric)
      << ", \"nitric\": " << num(v.inflow_koh.nitric) << "},\n";
    const AcidInflow::PerAcid g = v.inflow.as_mass();
    j << "      \"acid-inflow-g-per-h\": {\"sulfuric\": " << num(g.sulfuric) << ", \"sulfurous-fresh-oil\": "
      << num(g.sulfurous_fresh) << ", \"hydrochloric\": " << num(g.hydrochloric) << ", \"hydrofluoric\": "
      << num(g.hydrofluoric) << ", \"nitric\": " << num(g.nitric) << "},\n";
    j << "      \"acid-inflow-mol-per-h\": {\"sulfuric-liner\": " << num(v.inflow.sulfuric_liner)
      << ", \"sulfuric-blow-by\": " << num(v.inflow.sulfuric_blowby)
      << ", \"sulfurous-fresh-oil\": " << num(v.inflow.sulfurous_fresh) << ", \"hydrochloric\": " << num(v.inflow.hydrochloric)
      << ", \"hydrofluoric\": " << num(v.inflow.hydrofluoric) << ", \"nitric\": " << num(v.inflow.nitric) << "},\n";
    j << "      \"sulfur-share-to-oil\": " << num(v.sulfur_share_to_oil) << ",\n";
    j << "      \"sulfur-share-to-oil-charge-average\": "
      << (v.sulfur_share_to_oil_average >= 0 ? num(v.sulfur_share_to_oil_average) : "null") << ",\n";
    j << "      \"initial-tbn-rate-mg-koh-per-g-per-h\": " << num(v.initial_tbn_rate) << ",\n";
    j << "      \"tbn-rate-charge-average-mg-koh-per-g-per-h\": " << num(v.tbn_fall_rate_average) << ",\n";
    // an oil-condition limit, or none: the planned maximum hours is a horizon, not a result
    j << "      \"drain-interval-h\": " << (ch.oil_limit_reached() ? num(ch.drain_interval) : "null") << ",\n";
    j << "      \"limit-reached\": " << (ch.oil_limit_reached() ? quote(std::string(name(*ch.first))) : "null") << ",\n";
    j << "      \"no-limit-within-h\": "
      << (ch.oil_limit_reached() ? "null" : num(ch.first ? ch.drain_interval : ch.oil_hours)) << ",\n";
    j << "      \"antioxidant-spent-at-h\": " << (ch.antioxidant_spent_at >= 0 ? num(ch.antioxidant_spent_at) : "null") << ",\n";
    j << "      \"at-drain-or-end\": {\"tbn-mg-koh-per-g\": " << num(v.tbn_end) << ", \"tan-mg-koh-per-g\": " << num(v.tan_end)
      << ", \"san-mg-koh-per-g\": " << num(v.san_end) << "},\n";
    j << "      \"limits\": {";
    for (std::size_t k = 0; k < limit_count; ++k) {
      const Limit l = all_limits[k];
      const LimitReading& r = ch.at_end[k];
      j << (k ? ", " : "") << quote(std::string(name(l))) << ": {\"reached-at-h\": "
        << (ch.reached_at[k] >= 0 ? num(ch.reached_at[k]) : "null") << ", \"value\": " << num(r.value)
        << ", \"limit\": " << num(r.limit) << ", \"margin\": " << num(r.margin()) << "}";
    }
    j << "},\n";
    j << "      \"charges\": [";
    for (std::size_t k = 0; k < v.run.charges.size(); ++k) {
      const ChargeSummary& x = v.run.charges[k];
      j << (k ? ", " : "") << "{\"start-engine-hours-h\": " << num(x.start_engine_hours) << ", \"oil-hours-h\": "
        << num(x.oil_hours) << ", \"ended-by-oil-change\": " << (x.ended_by_change ? "true" : "false")
        << ", \"drain-interval-h\": " << (x.oil_limit_reached() ? num(x.drain_interval) : "null") << ", \"limit-reached\": "
        << (x.oil_limit_reached() ? quote(std::string(name(*x.first))) : "null") << "}";
    }
    j << "],\n";
    j << "      \"floor-reached-at-h\": " << (ch.floor_reached_at >= 0 ? num(ch.floor_reached_at) : "null") << ",\n";
    if (v.steady_state) {
      const OilState& s = *v.steady_state;
      const OilProperties& oil = c.variants[i].charge.oil;
      j << "      \"steady-state\": {\"base-mg-koh-per-g\": " << num(s.base) << ", \"tbn-d4739-mg-koh-per-g\": "
        << num(tbn(s, oil, BaseNumberMethod::d4739)) << ", \"tan-mg-koh-per-g\": " << num(acidload::tan(s, oil))
        << ", \"san-mg-koh-per-g\": " << num(s.strong_acid)
        << ", \"oxidation-a-per-cm\": " << num(s.oxidation) << ", \"nitration-a-per-cm\": " << num(s.nitration)
        << ", \"viscosity-rise\": " << num(viscosity_rise(s, oil)) << ", \"antioxidant-remaining\": " << num(s.antioxidant)
        << ", \"anti-wear-remaining\": " << num(anti_wear_remaining(s, oil)) << "},\n";
    } else {
      j << "      \"steady-state\": null,\n";
    }
    const auto c_of = [](double k) { return k > 0 ? num(k - constants::zero_celsius) : std::string("null"); };
    j << "      \"exhaust-dew-points-degc\": {\"water\": " << c_of(v.dew_points.water) << ", \"sulfuric\": "
      << c_of(v.dew_points.sulfuric) << ", \"sulfuric-zarenezhad\": " << c_of(v.dew_points.sulfuric_zarenezhad)
      << ", \"sulfuric-okkes\": " << c_of(v.dew_points.sulfuric_okkes) << ", \"hydrochloric\": "
      << c_of(v.dew_points.hydrochloric) << ", \"minimum-wall\": " << c_of(v.dew_points.minimum_wall_temperature) << "},\n";
    {
      const Transfer& t = v.run.first_transfer;
      j << "      \"temperatures-degc\": {\"blow-by-water-dew-point\": " << c_of(t.blowby_water_dew_point)
        << ", \"in-cylinder-acid-dew-point\": " << c_of(t.cylinder_acid_dew_point) << ", \"liner-wall-running\": "
        << c_of(t.liner_temperature) << ", \"liner-wall-at-start\": " << c_of(t.liner_temperature_at_start) << "},\n";
      j << "      \"crankcase-wetness\": " << num(t.wetness) << ",\n";
      j << "      \"warm-up-liner-acid-mol-s-per-h\": " << num(t.inflow.sulfuric_warmup) << ",\n";
    }
    const auto figures = [&](const Emissions& e) {
      std::ostringstream o;
      const auto one = [&](const char* key, const EmissionFigure& f, bool last) {
        o << quote(key) << ": {\"ppmv-wet\": " << num(f.ppmv_wet) << ", \"ppmv-dry\": " << num(f.ppmv_dry)
          << ", \"mg-per-nm3-wet\": " << num(f.mg_per_m3_wet) << ", \"mg-per-nm3-dry\": " << num(f.mg_per_m3_dry)
          << ", \"ppmv-dry-at-o2-reference\": " << num(f.ppmv_dry_at_ref) << ", \"mg-per-nm3-dry-at-o2-reference\": "
          << num(f.mg_per_m3_dry_at_ref) << "}" << (last ? "" : ", ");
      };
      o << "{\"o2-reference\": " << num(e.o2_reference) << ", \"o2-of-air\": " << num(e.o2_air) << ", \"o2-dry\": "
        << num(e.o2_dry) << ", \"h2o-wet\": " << num(e.water_wet) << ", \"flow-wet-nm3-per-h\": " << num(e.flow_wet)
        << ", \"flow-dry-nm3-per-h\": " << num(e.flow_dry) << ", \"so2-kg-per-h\": " << num(e.so2_mass_flow) << ", ";
      one("so2", e.so2, false), one("so3", e.so3, false), one("hcl", e.hcl, false), one("hf", e.hf, false);
      one("nox-as-no2", e.nox, false), one("h2o", e.h2o, false), one("o2", e.o2, true);
      o << "}";
      return o.str();
    };
    j << "      \"exhaust\": " << figures(v.emissions) << ",\n";
    j << "      \"exhaust-after-catalyst\": " << (v.emissions_after_catalyst ? figures(*v.emissions_after_catalyst) : "null")
      << ",\n";
    if (v.dew_points_after_catalyst) {
      const ExhaustDewPoints& d = *v.dew_points_after_catalyst;
      j << "      \"exhaust-dew-points-after-catalyst-degc\": {\"water\": " << c_of(d.water) << ", \"sulfuric\": "
        << c_of(d.sulfuric) << ", \"hydrochloric\": " << c_of(d.hydrochloric) << ", \"minimum-wall\": "
        << c_of(d.minimum_wall_temperature) << "},\n";
    } else {
      j << "      \"exhaust-dew-points-after-catalyst-degc\": null,\n";
    }
    j << "      \"warnings\": [";
    for (std::size_t w = 0; w < v.warnings.size(); ++w)
      j << (w ? ", " : "") << "{\"key\": " << quote(v.warnings[w].key) << ", \"value\": " << quote(v.warnings[w].value)
        << ", \"reason\": " << quote(v.warnings[w].reason) << "}";
    j << "],\n";
    j << "      \"so3-share\": " << num(v.so3_share) << ",\n      \"so3-share-equilibrium-bound\": " << num(v.so3_share_bound)
      << ",\n      \"engine-hours\": " << num(v.run.engine_hours) << "\n    }";
  }
  j << "\n  ]";
  if (economics) j << ",\n  \"economics\": " << economics_json(*economics, 2);
  j << "\n}\n";
  return j.str();
}

std::string trajectories_csv(const std::vector<VariantSummary>& rows) {
  std::ostringstream o;
  o << "variant,charge,engine_hours_h,oil_hours_h,calendar_hours_h,tbn_d2896_mg_koh_per_g,tbn_d4739_mg_koh_per_g,"
       "tan_mg_koh_per_g,san_mg_koh_per_g,oxidation_a_per_cm,nitration_a_per_cm,oil_mass_kg,"
       "antioxidant_remaining_pct_of_fresh,viscosity_change_100c_pct\n";
  for (const VariantSummary& v : rows)
    for (const TrajectoryPoint& p : v.run.trajectory)
      o << csv_field(v.name) << ',' << p.charge + 1 << ','  // charges from 1, as in the console and lab files
        << num(p.engine_hours) << ',' << num(p.oil_hours) << ','
        << num(p.calendar_hours) << ',' << num(p.tbn_d2896) << ',' << num(p.tbn_d4739) << ',' << num(p.tan) << ','
        << num(p.san) << ',' << num(p.state.oxidation) << ',' << num(p.state.nitration) << ',' << num(p.state.mass) << ','
        << num(100 * p.state.antioxidant) << ',' << num(100 * p.viscosity_rise) << '\n';
  return o.str();
}

namespace {
namespace fs = std::filesystem;

constexpr const char* temp_prefix = ".acidload-tmp-";
constexpr double lock_wait_seconds = 120;

std::string shown(const fs::path& p) { return "'" + p.string() + "'"; }
std::string why(int err) { return std::strerror(err); }

// SIGINT, SIGTERM, SIGHUP and SIGQUIT held back while a temporary exists: a signal then takes
// effect once the new result is in place or the temporary is gone.
class HoldSignals {
 public:
  HoldSignals() {
    sigset_t s;
    sigemptyset(&s);
    for (int sig : {SIGINT, SIGTERM, SIGHUP, SIGQUIT}) sigaddset(&s, sig);
    pthread_sigmask(SIG_BLOCK, &s, &old_);
  }
  ~HoldSignals() { pthread_sigmask(SIG_SETMASK, &old_, nullptr); }
  HoldSignals(const HoldSignals&) = delete;
  HoldSignals& operator=(const HoldSignals&) = delete;

 private:
  sigset_t old_;
};

// An exclusive flock on the parent folder: writers into one folder take turns.
class ParentLock {
 public:
  explicit ParentLock(const fs::path& dir) {
    fd_ = ::open(dir.c_str(), O_RDONLY | O_DIRECTORY | O_CLOEXEC);
    if (fd_ < 0) throw Error("cannot open the folder " + shown(dir) + " to write into it: " + why(errno));
    const auto start = std::chrono::steady_clock::now();
    while (::flock(fd_, LOCK_EX | LOCK_NB) != 0) {
      const int e = errno;
      if (e != EWOULDBLOCK && e != EINTR) {
        ::close(fd_);
        throw Error("cannot lock the folder " + shown(dir) + ": " + why(e));
      }
      if (std::chrono::duration<double>(std::chrono::steady_clock::now() - start).count() > lock_wait_seconds) {
        ::close(fd_);
        throw Error("another acidload has been writing into " + shown(dir) + " for over " +
                    format_value(lock_wait_seconds) + " s; nothing was written (try again when it has finished)");
      }
      std::this_thread::sleep_for(std::chrono::milliseconds(20));
    }
  }
  ~ParentLock() { ::close(fd_); }
  ParentLock(const ParentLock&) = delete;
  ParentLock& operator=(const ParentLock&) = delete;
  int fd() const { return fd_; }

 private:
  int fd_ = -1;
};

// The path to write, with '.', '..', a trailing '/' and symbolic links resolved (a link is written
// through: its target is replaced, the link kept).
fs::path resolve(const std::string& given, const char* what) {
  if (given.empty()) throw Error(std::string("an empty name as the ") + what + "; nothing was written");
  for (const fs::path& part : fs::path(given))
    if (part.string().size() > 255)
      throw Error("the " + std::string(what) + " name '" + part.string().substr(0, 40) + "…' is " +
                  std::to_string(part.string().size()) + " bytes long, more than the 255 a file system takes; nothing was written");
  std::error_code ec;
  fs::path p = fs::weakly_canonical(fs::absolute(given), ec);
  if (ec) throw Error("cannot resolve the " + std::string(what) + " " + shown(given) + ": " + ec.message());
  p = p.lexically_normal();
  if (!p.has_filename() && p.has_parent_path() && p != p.root_path()) p = p.parent_path();
  if (!p.has_filename() || p == p.root_path())
    throw Error("the " + std::string(what) + " " + shown(given) + " is the root folder; nothing was written");
  if (fs::is_symlink(fs::symlink_status(p, ec)))
    throw Error("the " + std::string(what) + " " + shown(given) + " is a symbolic link to '" +
                fs::read_symlink(p, ec).string() + "', which does not exist; nothing was written");
  return p;
}

// The files acidload listed in a results folder's marker; nullopt when there is no marker.
std::optional<std::set<std::string>> listed_files(const fs::path& dir) {
  std::ifstream f(dir / results_marker);
  if (!f) return std::nullopt;
  std::set<std::string> names;
  std::string line;
  bool in_list = false;
  while (std::getline(f, line)) {
    if (in_list && !line.empty()) names.insert(line);
    if (line == "files:") in_list = true;
  }
  return names;
}

// Why `dir` (an existing folder) may not be replaced, or "" when it may: it must be empty, or a
// results folder holding only the marker and the files the marker lists.
std::string not_replaceable(const fs::path& dir) {
  std::error_code ec;
  const auto listed = listed_files(dir);
  fs::directory_iterator it(dir, ec);
  if (ec) return "it cannot be read (" + ec.message() + ")";
  for (; it != fs::directory_iterator(); it.increment(ec)) {
    const std::string name = it->path().filename().string();
    if (!listed)
      return "it is a folder acidload did not write (it holds '" + name + "' and no " + results_marker +
             " marker); give a new or empty folder, or a results folder of an earlier run";
    if (name != results_marker && !listed->count(name))
      return "it holds '" + name + "', which acidload did not write there; move it out, or give another folder";
    if (fs::is_directory(fs::symlink_status(it->path(), ec)))
      return "it holds the folder '" + name + "', which acidload did not write there";
  }
  if (ec) return "it cannot be read (" + ec.message() + ")";
  return "";
}

// Removes a folder of acidload's (checked by not_replaceable) with its marker last, so that a kill
// part-way leaves a folder still recognisably acidload's for the next run to finish removing.
void remove_own_folder(const fs::path& dir) {
  std::error_code ec;
  std::vector<fs::path> entries;
  for (fs::directory_iterator it(dir, ec); !ec && it != fs::directory_iterator(); it.increment(ec))
    if (it->path().filename() != results_marker) entries.push_back(it->path());
  for (const fs::path& p : entries) fs::remove(p, ec);
  fs::remove(dir / results_marker, ec);
  fs::remove(dir, ec);
}

bool process_alive(long pid) { return pid > 0 && (::kill(static_cast<pid_t>(pid), 0) == 0 || errno == EPERM); }

// Temporaries (.acidload-tmp-PID-N) of writers that are no longer running, left by a kill: removed
// when they hold only what acidload writes (a folder) or are a plain file; called under the lock.
void remove_stale_temporaries(const fs::path& parent) {
  std::error_code ec;
  fs::directory_iterator it(parent, ec);
  if (ec) return;
  for (; it != fs::directory_iterator(); it.increment(ec)) {
    const std::string name = it->path().filename().string();
    if (name.rfind(temp_prefix, 0) != 0) continue;
    const long pid = std::strtol(name.c_str() + std::strlen(temp_prefix), nullptr, 10);
    if (process_alive(pid)) continue;
    std::error_code e2;
    const auto st = fs::symlink_status(it->path(), e2);
    if (fs::is_directory(st)) {
      if (not_replaceable(it->path()).empty()) remove_own_folder(it->path());
    } else if (fs::is_regular_file(st)) {
      fs::remove(it->path(), e2);
    }
  }
}

fs::path temporary_name(const fs::path& parent) {
  static std::atomic<unsigned> counter{0};
  return parent / (temp_prefix + std::to_string(::getpid()) + "-" + std::to_string(counter++));
}

// Writes text to a new file and flushes it to the disk.
void put_file(const fs::path& p, const std::string& text) {
  const int fd = ::open(p.c_str(), O_WRONLY | O_CREAT | O_EXCL | O_CLOEXEC, 0644);
  if (fd < 0) throw Error("cannot create " + shown(p) + ": " + why(errno));
  std::size_t done = 0;
  while (done < text.size()) {
    const ssize_t n = ::write(fd, text.data() + done, text.size() - done);
    if (n < 0 && errno == EINTR) continue;
    if (n <= 0) {
      const int e = errno;
      ::close(fd);
      throw Error("cannot write " + shown(p) + ": " + why(e));
    }
    done += static_cast<std::size_t>(n);
  }
  if (::fsync(fd) != 0 || ::close(fd) != 0) throw Error("cannot write " + shown(p) + ": " + why(errno));
}

// The run's inputs must not lie in the target, nor the target be the folder holding one of them.
void refuse_input_folder(const fs::path& target, const std::vector<std::string>& inputs) {
  std::error_code ec;
  for (const std::string& in : inputs) {
    if (in.empty() || !fs::exists(in, ec)) continue;
    const fs::path p = fs::weakly_canonical(fs::absolute(in), ec);
    if (ec) continue;
    const auto rel = p.lexically_relative(target);
    if (!rel.empty() && *rel.begin() != "..")
      throw Error("the output folder " + shown(target) + " holds the input '" + in +
                  "' of this run; give a folder of its own for the results (nothing was written)");
  }
}
}  // namespace

void write_results_folder(const std::string& folder, const std::vector<ResultFile>& files,
                          const std::vector<std::string>& inputs) {
  for (const ResultFile& f : files)
    if (f.name.empty() || f.name.find('/') != std::string::npos || f.name == results_marker || f.name[0] == '.')
      throw Error("internal: '" + f.name + "' is not a plain name for a results file");
  const fs::path target = resolve(folder, "output folder");
  const fs::path parent = target.parent_path();
  refuse_input_folder(target, inputs);
  std::error_code ec;
  fs::create_directories(parent, ec);
  if (!fs::is_directory(parent)) throw Error("cannot create the folder " + shown(parent) + ": " + ec.message());
  const ParentLock lock(parent);
  remove_stale_temporaries(parent);
  const auto st = fs::symlink_status(target, ec);
  const bool existed = fs::exists(st);
  if (existed && !fs::is_directory(st))
    throw Error("the output path " + shown(target) + " exists and is not a folder; nothing was written");
  if (existed)
    if (const std::string no = not_replaceable(target); !no.empty())
      throw Error("will not write into " + shown(target) + ": " + no + " (nothing was written)");

  std::string marker = "acidload results folder, written by acidload " + std::string(version()) +
                       ". A later run with --out to this folder replaces it whole; acidload refuses to\n"
                       "replace a folder without this file, or one holding files it did not write.\nfiles:\n";
  for (const ResultFile& f : files) marker += f.name + "\n";

  const HoldSignals hold;
  const fs::path fresh = temporary_name(parent);
  if (::mkdir(fresh.c_str(), 0755) != 0) throw Error("cannot create " + shown(fresh) + ": " + why(errno));
  try {
    put_file(fresh / results_marker, marker);  // first: a killed write leaves a folder recognisably ours
    for (const ResultFile& f : files) put_file(fresh / f.name, f.text);
  } catch (...) {
    remove_own_folder(fresh);
    throw;
  }
  int rc = existed ? ::renameat2(AT_FDCWD, fresh.c_str(), AT_FDCWD, target.c_str(), RENAME_EXCHANGE)
                   : ::renameat2(AT_FDCWD, fresh.c_str(), AT_FDCWD, target.c_str(), RENAME_NOREPLACE);
  if (rc != 0 && (errno == EINVAL || errno == ENOSYS)) {
    // A file system without renameat2's flags: two renames, the old folder kept until the new is in place.
    if (existed) {
      const fs::path old = temporary_name(parent);
      if (::rename(target.c_str(), old.c_str()) != 0) {
        const int e = errno;
        remove_own_folder(fresh);
        throw Error("cannot replace " + shown(target) + ": " + why(e) + " (nothing was written)");
      }
      if (::rename(fresh.c_str(), target.c_str()) != 0) {
        const int e = errno;
        ::rename(old.c_str(), target.c_str());  // put the previous result back
        remove_own_folder(fresh);
        throw Error("cannot move the results into " + shown(target) + ": " + why(e));
      }
      remove_own_folder(old);
      ::fsync(lock.fd());
      return;
    }
    rc = ::rename(fresh.c_str(), target.c_str());
  }
  if (rc != 0) {
    const int e = errno;
    remove_own_folder(fresh);
    throw Error("cannot move the results into " + shown(target) + ": " + why(e) + " (nothing was written)");
  }
  if (existed) remove_own_folder(fresh);  // the previous result, now under the temporary name
  ::fsync(lock.fd());
}

void write_owned_file(const std::string& path, const std::string& text, const std::string& signature,
                      const std::vector<std::string>& inputs) {
  const fs::path target = resolve(path, "output file");
  const fs::path parent = target.parent_path();
  std::error_code ec;
  for (const std::string& in : inputs)
    if (!in.empty() && fs::exists(in, ec) && fs::exists(target, ec) && fs::equivalent(in, target, ec))
      throw Error("will not write " + shown(target) + ": it is '" + in + "', which this command read (nothing was written)");
  if (!fs::is_directory(parent, ec))
    throw Error("cannot write " + shown(target) + ": the folder " + shown(parent) + " does not exist");
  const ParentLock lock(parent);
  remove_stale_temporaries(parent);
  const auto st = fs::symlink_status(target, ec);
  if (fs::exists(st)) {
    if (!fs::is_regular_file(st))
      throw Error("will not write " + shown(target) + ": it exists and is not a plain file (nothing was written)");
    std::ifstream f(target, std::ios::binary);
    std::string first;
    std::getline(f, first);
    if (first.rfind(signature, 0) != 0)
      throw Error("will not replace " + shown(target) + ": acidload did not write it (its first line is not '" +
                  signature + "…'); give a new file name (nothing was written)");
  }
  const HoldSignals hold;
  const fs::path fresh = temporary_name(parent);
  try {
    put_file(fresh, text);
  } catch (...) {
    fs::remove(fresh, ec);
    throw;
  }
  if (::rename(fresh.c_str(), target.c_str()) != 0) {
    const int e = errno;
    fs::remove(fresh, ec);
    throw Error("cannot write " + shown(target) + ": " + why(e));
  }
  ::fsync(lock.fd());
}

void write_results(const std::string& folder, const CaseFile& c, const std::vector<VariantSummary>& rows,
                   const EconomicsResults* economics) {
  std::vector<std::string> inputs{c.file};
  inputs.insert(inputs.end(), c.overlays.begin(), c.overlays.end());
  // everything is computed before the disk is touched
  write_results_folder(folder, {{"summary.json", summary_json(c, rows, economics)}, {"trajectories.csv", trajectories_csv(rows)}},
                       inputs);
}

namespace {
// The figures of one variant that a fleet summary lists (the first charge).
struct FleetRow {
  std::string limit;
  double interval, tbn, tan, san;
};
FleetRow fleet_row(const VariantSummary& v) {
  const ChargeSummary& ch = v.charge;
  return {ch.first ? std::string(name(*ch.first)) : std::string(), ch.first ? ch.drain_interval : NAN, v.tbn_end,
          v.tan_end, v.san_end};
}
}  // namespace

std::string fleet_summary_json(const std::vector<FleetCase>& cases) {
  std::ostringstream j;
  std::size_t variants = 0;
  for (const FleetCase& f : cases) variants += f.rows.size();
  j << "{\n  \"acidload-version\": " << quote(version()) << ",\n  \"cases\": " << cases.size()
    << ",\n  \"variants\": " << variants << ",\n  \"note\": "
    << quote("Estimates that support, not replace, the engine maker's and oil supplier's limits, lab analysis, "
             "local codes and licensed practice. The first charge of each variant; the full figures are in "
             "each case's summary file.")
    << ",\n  \"fleet\": [";
  for (std::size_t i = 0; i < cases.size(); ++i) {
    const FleetCase& f = cases[i];
    j << (i ? "," : "") << "\n    {\"case-file\": " << quote(f.file->file) << ", \"case\": " << quote(f.file->title)
      << ", \"summary-file\": " << quote(f.stem + ".summary.json") << ", \"trajectories-file\": "
      << quote(f.stem + ".trajectories.csv") << ",\n     \"variants\": [";
    for (std::size_t k = 0; k < f.rows.size(); ++k) {
      const FleetRow r = fleet_row(f.rows[k]);
      j << (k ? "," : "") << "\n       {\"name\": " << quote(f.rows[k].name) << ", \"drain-interval-h\": " << num(r.interval)
        << ", \"limit-reached\": " << (r.limit.empty() ? "null" : quote(r.limit)) << ", \"tbn-mg-koh-per-g\": "
        << num(r.tbn) << ", \"tan-mg-koh-per-g\": " << num(r.tan) << ", \"san-mg-koh-per-g\": " << num(r.san) << "}";
    }
    j << "]}";
  }
  j << "\n  ]\n}\n";
  return j.str();
}

std::string fleet_summary_csv(const std::vector<FleetCase>& cases) {
  std::ostringstream o;
  o << "case-file,case,variant,drain-interval [h],limit-reached,tbn at drain or end [mg KOH/g],"
       "tan at drain or end [mg KOH/g],san at drain or end [mg KOH/g]\n";
  const auto cell = [](double v) { return std::isfinite(v) ? num(v) : std::string(); };
  for (const FleetCase& f : cases)
    for (const VariantSummary& v : f.rows) {
      const FleetRow r = fleet_row(v);
      o << csv_field(f.file->file) << ',' << csv_field(f.file->title) << ',' << csv_field(v.name) << ','
        << cell(r.interval) << ',' << r.limit << ',' << cell(r.tbn) << ',' << cell(r.tan) << ',' << cell(r.san) << '\n';
    }
  return o.str();
}

}  // namespace acidload::io
