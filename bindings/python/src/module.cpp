// acidload._core: the pybind11 module behind the acidload Python package. Declarations only: every
// function here forwards to the library (parse, call, convert containers to numpy/dicts) and no
// physics lives in this file. Units follow the core's table (acidload/core.hpp): hours, K, Pa, kg,
// m³, mol, mg KOH/g; the Python package around it puts units into keyword names.
#include <pybind11/numpy.h>
#include <pybind11/pybind11.h>
#include <pybind11/stl.h>

#include <array>
#include <cstddef>
#include <map>
#include <optional>
#include <string>
#include <vector>

#include "acidload/acidload.hpp"
#include "acidload/io/case_file.hpp"
#include "acidload/io/site_file.hpp"
#include "acidload/io/fitted_overlay.hpp"
#include "acidload/io/lab_file.hpp"
#include "acidload/io/quantity.hpp"
#include "acidload/io/report.hpp"
#include "acidload/io/results.hpp"
#include "acidload/studies/calibration.hpp"
#include "acidload/studies/forecast.hpp"
#include "acidload/studies/lab_settings.hpp"
#include "acidload/studies/monte_carlo.hpp"
#include "acidload/studies/trend.hpp"
#include "acidload/studies/inverse.hpp"
#include "acidload/studies/figure_table.hpp"

#include <atomic>
#include <chrono>
#include <future>

namespace py = pybind11;
using namespace acidload;

namespace {

// ---- exceptions ----------------------------------------------------------------------------
// The exception classes are defined in Python (acidload/_errors.py, ValueError subclasses) so that
// they carry documented attributes; the translator fills them from the C++ exception.
py::object error_class(const char* name) { return py::module_::import("acidload._errors").attr(name); }

py::object none_if_empty(const std::string& s) { return s.empty() ? py::none() : py::object(py::str(s)); }
py::object none_if_zero(int v) { return v > 0 ? py::object(py::int_(v)) : py::none(); }

void raise(const char* cls, const std::exception& e, py::dict attrs = {}) {
  py::object type = error_class(cls);
  py::object exc = type(py::str(e.what()), **attrs);
  PyErr_SetObject(type.ptr(), exc.ptr());
}

void translate(std::exception_ptr p) {
  try {
    if (p) std::rethrow_exception(p);
  } catch (const InputError& e) {
    py::dict a;
    a["key"] = e.key();
    a["value"] = e.value();
    a["expected"] = e.expected();
    a["file"] = none_if_empty(e.where().file);
    a["line"] = none_if_zero(e.where().line);
    a["column"] = none_if_zero(e.where().column);
    a["line_text"] = none_if_empty(e.where().line_text);
    raise("InputError", e, a);
  } catch (const NotModelledError& e) {
    raise("NotModelledError", e);
  } catch (const NoAnswerError& e) {
    raise("NoAnswerError", e);
  } catch (const FitRefusedError& e) {
    raise("FitRefusedError", e);
  } catch (const Error& e) {
    raise("Error", e);
  }
}

// ---- levers and units ------------------------------------------------------------------------
Lever lever_from(const std::string& text) {
  if (const std::optional<Lever> l = lever_named(text)) return *l;
  throw InputError("lever", text, "one of h2s, fresh-tbn, jacket-water-out, oil-volume");
}

// A contaminant unit as the program and case files write it ("ppmv", "mg/Nm3 CH4", "mg/kWh", "mg/m3 wet"):
// read by the case reader's own parser, so Python takes exactly the program's spellings. The core unit
// it is, the figure in that unit per one of it (mg/kWh is 1/3.6 mg/MJ), and the basis where it names one.
struct UnitAndBasis {
  ConcentrationUnit unit;
  double per_unit = 1;
  std::optional<Basis> basis;
};
UnitAndBasis unit_from(const std::string& text, const char* argument) {
  io::Document doc;
  doc.file = "(argument)";
  const std::string figure = "1 " + text;
  doc.lines = {figure};
  io::Node n;
  n.type = io::Node::Type::scalar;
  n.scalar = figure;
  n.mark = {1, 1};
  n.path = argument;
  try {
    const Concentration dry = io::concentration(doc, n, Basis::dry), wet = io::concentration(doc, n, Basis::wet);
    return {dry.unit, dry.value, dry.basis == wet.basis ? std::optional<Basis>(dry.basis) : std::nullopt};
  } catch (const InputError& e) {
    throw InputError(argument, text, e.expected());
  }
}

// A figure ("300 ppmv", "450 mg/Nm3 wet") as the program's convert reads it.
Concentration figure_from(const std::string& figure) {
  io::Document doc;
  doc.file = "(argument)";
  doc.lines = {figure};
  io::Node n;
  n.type = io::Node::Type::scalar;
  n.scalar = figure;
  n.mark = {1, 1};
  n.path = "figure";
  try {
    return io::concentration(doc, n, Basis::dry);
  } catch (const InputError& e) {
    throw InputError("figure", figure, e.expected());
  }
}

Basis basis_from(const std::string& text) {
  if (text == "dry") return Basis::dry;
  if (text == "wet") return Basis::wet;
  throw InputError("basis", text, "dry or wet");
}

// The kinds of quantity of the case format, by the enumerator's name.
io::Kind kind_from(const std::string& text) {
  static const std::pair<const char*, io::Kind> kinds[] = {
      {"temperature", io::Kind::temperature}, {"temperature_change", io::Kind::temperature_change},
      {"power", io::Kind::power}, {"volume", io::Kind::volume}, {"mass", io::Kind::mass},
      {"molar_flow", io::Kind::molar_flow}, {"fraction", io::Kind::fraction}, {"acid_number", io::Kind::acid_number},
      {"specific_consumption", io::Kind::specific_consumption}, {"duration", io::Kind::duration},
      {"pressure", io::Kind::pressure}, {"density", io::Kind::density}, {"per_hour", io::Kind::per_hour},
      {"oxidation", io::Kind::oxidation}, {"oxidation_rate", io::Kind::oxidation_rate},
      {"molar_energy", io::Kind::molar_energy}, {"count", io::Kind::count}, {"number", io::Kind::number}};
  std::string names;
  for (const auto& [n, k] : kinds) {
    if (text == n) return k;
    names += (names.empty() ? "" : ", ") + std::string(n);
  }
  throw InputError("kind", text, "one of: " + names);
}

// ---- a run of every variant of a case ---------------------------------------------------------
struct CaseRun {
  io::CaseFile file;
  std::vector<VariantSummary> rows;
  std::optional<io::EconomicsResults> economics;  // when the case has an economics section
  const io::EconomicsResults* econ() const { return economics ? &*economics : nullptr; }
};

CaseRun run_case(const io::CaseFile& c) {
  CaseRun r{c, {}, std::nullopt};
  py::gil_scoped_release release;
  r.rows.reserve(c.variants.size());
  for (const EngineCase& v : c.variants) r.rows.push_back(summarize(v));
  if (!c.costs.empty()) {
    r.economics.emplace();
    r.economics->variants = compare_costs(c.costs);
    r.economics->sensitivity = price_sensitivity(r.economics->variants, r.economics->sensitivity_step);
  }
  return r;
}

const CostCase& cost_case(const io::CaseFile& c, std::size_t variant) {
  if (c.costs.empty()) throw InputError("economics", "(no section)", "an 'economics' section with the prices in " + c.file);
  if (variant >= c.costs.size())
    throw InputError("variant", std::to_string(variant), "a variant index from 0 to " + std::to_string(c.costs.size() - 1));
  return c.costs[variant];
}

py::dict cheapest_dict(const CheapestLevel& a) {
  py::dict d;
  d["found"] = a.found;
  d["stage"] = a.stage;
  d["level_ppmv"] = a.level_ppmv;
  d["total_per_mwh"] = a.total_per_mwh;
  d["verified_low_per_mwh"] = a.verified_low;
  d["verified_high_per_mwh"] = a.verified_high;
  d["scan_ppmv"] = py::array_t<double>(a.grid_ppmv.size(), a.grid_ppmv.data());
  d["scan_total_per_mwh"] = py::array_t<double>(a.grid_total.size(), a.grid_total.data());
  d["reason"] = a.reason;
  d["evaluations"] = a.evaluations;
  return d;
}

// The trajectory of one variant as numpy arrays, one per field of TrajectoryPoint.
py::dict trajectory_arrays(const CaseRun& run, std::size_t i) {
  const VariantSummary& v = run.rows.at(i);
  const std::vector<TrajectoryPoint>& t = v.run.trajectory;
  const BaseNumberMethod limit_method = run.file.variants.at(i).model.limits.tbn_method;
  const std::size_t n = t.size();
  py::dict out;
  const auto column = [&](const char* key, auto get) {
    py::array_t<double> a(static_cast<py::ssize_t>(n));
    double* d = a.mutable_data();
    for (std::size_t k = 0; k < n; ++k) d[k] = get(t[k]);
    out[key] = a;
  };
  column("engine_hours", [](const TrajectoryPoint& p) { return p.engine_hours; });
  column("oil_hours", [](const TrajectoryPoint& p) { return p.oil_hours; });
  column("calendar_hours", [](const TrajectoryPoint& p) { return p.calendar_hours; });
  column("starts", [](const TrajectoryPoint& p) { return p.starts; });
  {
    py::array_t<int> a(static_cast<py::ssize_t>(n));
    int* d = a.mutable_data();
    for (std::size_t k = 0; k < n; ++k) d[k] = t[k].charge + 1;  // from 1, as trajectories.csv
    out["charge"] = a;
  }
  column("tbn", [&](const TrajectoryPoint& p) { return limit_method == BaseNumberMethod::d2896 ? p.tbn_d2896 : p.tbn_d4739; });
  column("tbn_d2896", [](const TrajectoryPoint& p) { return p.tbn_d2896; });
  column("tbn_d4739", [](const TrajectoryPoint& p) { return p.tbn_d4739; });
  column("tan", [](const TrajectoryPoint& p) { return p.tan; });
  column("san", [](const TrajectoryPoint& p) { return p.san; });
  column("base", [](const TrajectoryPoint& p) { return p.state.base; });
  column("strong_acid", [](const TrajectoryPoint& p) { return p.state.strong_acid; });
  column("weak_acid", [](const TrajectoryPoint& p) { return p.state.weak_acid; });
  column("salts", [](const TrajectoryPoint& p) { return p.state.salts; });
  column("additive_acidity", [](const TrajectoryPoint& p) { return p.state.additive_acidity; });
  column("oxidation", [](const TrajectoryPoint& p) { return p.state.oxidation; });
  column("nitration", [](const TrajectoryPoint& p) { return p.state.nitration; });
  column("oil_mass", [](const TrajectoryPoint& p) { return p.state.mass; });
  column("antioxidant", [](const TrajectoryPoint& p) { return p.state.antioxidant; });
  column("viscosity_rise", [](const TrajectoryPoint& p) { return p.viscosity_rise; });
  column("antioxidant_remaining", [](const TrajectoryPoint& p) { return 100 * p.state.antioxidant; });  // [% of fresh]
  column("viscosity_change", [](const TrajectoryPoint& p) { return 100 * p.viscosity_rise; });  // [% over fresh at 100 °C]
  return out;
}

py::dict rates_dict(const OilRates& r) {
  py::dict d;
  d["strong_acid"] = r.strong_acid;
  d["sulfurous_fresh"] = r.sulfurous_fresh;
  d["nitration"] = r.nitration;
  d["oxidation"] = r.oxidation;
  d["organic_acid"] = r.organic_acid;
  d["antioxidant_depletion"] = r.antioxidant_depletion;
  d["depleted_factor"] = r.depleted_factor;
  d["consumption"] = r.consumption;
  d["continuous_makeup"] = r.continuous_makeup;
  return d;
}

// ---- sweeps: the loop in C++, the GIL released ------------------------------------------------
using InArray = py::array_t<double, py::array::c_style | py::array::forcecast>;

py::array_t<double> sweep_for_python(const EngineCase& c, const std::string& lever, const InArray& values, int threads) {
  const Lever l = lever_from(lever);
  if (threads < 0) throw InputError("threads", std::to_string(threads), "0 (every core) or a positive thread count");
  py::array_t<double> out(values.request().shape);
  // The library's sweep runs on a thread of its own; this one checks for Ctrl-C (and any other
  // signal Python handles) every 50 ms and, on one, asks the sweep to stop and raises.
  std::atomic<bool> stop{false};
  std::vector<double> r;
  {
    py::gil_scoped_release release;
    auto job = std::async(std::launch::async, [&] {
      return acidload::sweep_drain_interval(c, l, values.data(), static_cast<std::size_t>(values.size()), threads, &stop);
    });
    while (job.wait_for(std::chrono::milliseconds(50)) != std::future_status::ready) {
      py::gil_scoped_acquire hold;
      if (PyErr_CheckSignals() != 0) {
        stop = true;
        py::error_already_set interrupted;  // takes the pending Python exception
        {
          py::gil_scoped_release wait;
          job.wait();
        }
        throw interrupted;
      }
    }
    r = job.get();
  }
  std::copy(r.begin(), r.end(), out.mutable_data());
  return out;
}

}  // namespace

// ---- calibration ----------------------------------------------------------------------------
py::dict residual_arrays(const std::vector<SampleResidual>& r) {
  const auto n = static_cast<py::ssize_t>(r.size());
  py::array_t<long> sample(n);
  py::array_t<double> measured(n), predicted(n), sigma(n), standardized(n);
  py::array_t<bool> censored(n), outlier(n);
  py::list reading;
  for (py::ssize_t i = 0; i < n; ++i) {
    const SampleResidual& x = r[static_cast<std::size_t>(i)];
    sample.mutable_at(i) = static_cast<long>(x.sample);
    measured.mutable_at(i) = x.measured;
    predicted.mutable_at(i) = x.predicted;
    sigma.mutable_at(i) = x.sigma;
    standardized.mutable_at(i) = x.standardized;
    censored.mutable_at(i) = x.censored;
    outlier.mutable_at(i) = x.outlier;
    reading.append(x.reading);
  }
  py::dict d;
  d["sample"] = sample, d["reading"] = reading, d["measured"] = measured, d["predicted"] = predicted;
  d["sigma"] = sigma, d["standardized"] = standardized, d["censored"] = censored, d["outlier"] = outlier;
  return d;
}

// Standardized residuals at fit-space values phi of the named parameters: the function a fit
// minimises, for driving from SciPy.
py::array_t<double> fit_residuals(const EngineCase& c, const std::vector<LabSample>& samples,
                                  const std::vector<std::string>& keys, const std::vector<double>& phi) {
  if (keys.size() != phi.size()) throw InputError("values", std::to_string(phi.size()), "one value per parameter");
  std::vector<SampleResidual> r;
  {
    py::gil_scoped_release release;
    EngineCase x = c;
    for (std::size_t j = 0; j < keys.size(); ++j) set_parameter(x, keys[j], from_fit_space(parameter(keys[j]), phi[j]));
    r = predict(x, samples, Precision{});
    profile_baselines(r, samples, baseline_groups(samples, FitSettings{}));  // the FTIR baselines a fit would fit
  }
  // then one prior row per parameter, (φ − φ₀)/σ₀ around the case's value, as calibrate has them
  py::array_t<double> out(static_cast<py::ssize_t>(r.size() + keys.size()));
  for (std::size_t i = 0; i < r.size(); ++i) out.mutable_at(static_cast<py::ssize_t>(i)) = r[i].standardized;
  for (std::size_t j = 0; j < keys.size(); ++j) {
    const ParameterInfo& info = parameter(keys[j]);
    const double phi0 = to_fit_space(info, inside_range(info, get_parameter(c, keys[j])));
    out.mutable_at(static_cast<py::ssize_t>(r.size() + j)) = (phi[j] - phi0) / info.prior_sd;
  }
  return out;
}

PYBIND11_MODULE(_core, m) {
  m.doc() = "acidload's C++ library, bound for Python (declarations only). Use the acidload package, "
            "not this module, directly.";
  py::register_exception_translator(&translate);

  m.def("version", []() { return std::string(version()); },
        "The library version 'MAJOR.MINOR.PATCH', as defined once in the top-level CMakeLists.txt.");

  // ---- constants
  m.attr("ZERO_CELSIUS") = constants::zero_celsius;
  m.attr("MOLAR_GAS_CONSTANT") = constants::molar_gas_constant;
  m.attr("STANDARD_ATMOSPHERE") = constants::standard_atmosphere;
  m.attr("CASE_FORMAT_VERSION") = io::case_format_version;

  // ---- species and gas conversions
  m.def("molar_mass", py::overload_cast<std::string_view>(&molar_mass), py::arg("formula"),
        "Molar mass of a chemical formula such as 'C2HCl3' or 'CH3(CH2)2SH' [kg/mol] (IUPAC standard atomic "
        "weights). Raises InputError naming the position of a mistake.");
  m.def("koh_equivalents", [](const std::string& acid) {
        for (Acid a : {Acid::H2SO4, Acid::HCl, Acid::HF, Acid::HNO3})
          if (acid == formula_text(a)) return koh_equivalents(a);
        throw InputError("acid", acid, "one of H2SO4, HCl, HF, HNO3");
      }, py::arg("acid"), "Base equivalents one mole of the acid neutralises [mol KOH/mol]: H2SO4 2, HCl 1, HF 1, HNO3 1.");
  m.def("molar_volume", [](double t, double p) { return molar_volume(ReferenceState{t, p}); },
        py::arg("temperature_k") = 273.15, py::arg("pressure_pa") = 101325.0,
        "Ideal-gas molar volume R·T/p [m³/mol] at a reference state (temperature [K], pressure [Pa]).");
  m.def("convert",
        [](double value, const std::string& from_unit, const std::string& from_basis, const std::string& to_unit,
           const std::string& to_basis, double molar_mass_kg, double ref_t, double ref_p, double water, double methane,
           double lhv, double flow) {
          GasContext g;
          g.reference = ReferenceState{ref_t, ref_p};
          g.water_fraction = water;
          g.methane_fraction = methane;
          g.lhv_molar = lhv;
          g.molar_flow = flow;
          // the basis: as the unit names it ("mg/Nm3 wet"), else the argument, else dry; both must agree
          const auto basis = [](const UnitAndBasis& u, const std::string& given, const char* argument) {
            const std::optional<Basis> b = given.empty() ? std::nullopt : std::optional<Basis>(basis_from(given));
            if (u.basis && b && *u.basis != *b)
              throw InputError(argument, given, std::string("the basis the unit names (") + (*u.basis == Basis::dry ? "dry" : "wet") + ")");
            return u.basis ? *u.basis : b.value_or(Basis::dry);
          };
          const UnitAndBasis from = unit_from(from_unit, "from_unit"), to = unit_from(to_unit, "to_unit");
          const Concentration c{value * from.per_unit, from.unit, basis(from, from_basis, "from_basis")};
          return convert(c, to.unit, basis(to, to_basis, "to_basis"), molar_mass_kg, g) / to.per_unit;
        },
        py::arg("value"), py::arg("from_unit"), py::arg("from_basis"), py::arg("to_unit"), py::arg("to_basis"),
        py::arg("molar_mass_kg_per_mol"), py::arg("reference_temperature_k"), py::arg("reference_pressure_pa"),
        py::arg("water_fraction"), py::arg("methane_fraction"), py::arg("lhv_j_per_mol"), py::arg("flow_mol_per_h"),
        "acidload::convert: a contaminant figure from one unit and basis to another. Units as the program and case "
        "files write them (ppmv, ppm, mg/Nm3, mg/m3 at the reference state, mg/MJ of LHV, mg/kWh, mg/Nm3 CH4, mol/h, "
        "optionally followed by dry or wet); bases dry, wet or '' (the unit's, else dry). molar mass [kg/mol] of the species "
        "the figure is stated as; reference state [K], [Pa]; water and methane mole fractions of the wet gas "
        "[mol/mol]; LHV of the wet gas [J/mol]; gas flow [mol/h].");

  py::class_<FigureRow>(m, "FigureRow", "A contaminant figure of one species in every unit (acidload::FigureRow).")
      .def_readonly("what", &FigureRow::what)
      .def_readonly("molar_mass", &FigureRow::molar_mass, "[kg/mol]")
      .def_readonly("ppmv_dry", &FigureRow::ppmv_dry)
      .def_readonly("ppmv_wet", &FigureRow::ppmv_wet)
      .def_readonly("mg_per_nm3_dry", &FigureRow::mg_per_nm3_dry)
      .def_readonly("mg_per_nm3_wet", &FigureRow::mg_per_nm3_wet)
      .def_readonly("mg_per_mj", &FigureRow::mg_per_mj)
      .def_readonly("mg_per_nm3_methane", &FigureRow::mg_per_nm3_methane)
      .def_readonly("mol_per_h", &FigureRow::mol_per_h);
  py::class_<FigureTable>(m, "FigureTable", "The gas of the case's first segment and the figure's rows.")
      .def_readonly("lhv_volumetric", &FigureTable::lhv_volumetric, "[J/m³]")
      .def_readonly("rows", &FigureTable::rows)
      .def_property_readonly("reference_temperature", [](const FigureTable& t) { return t.gas.reference.temperature; }, "[K]")
      .def_property_readonly("reference_pressure", [](const FigureTable& t) { return t.gas.reference.pressure; }, "[Pa]")
      .def_property_readonly("water_fraction", [](const FigureTable& t) { return t.gas.water_fraction; }, "[mol/mol] of the wet gas")
      .def_property_readonly("methane_fraction", [](const FigureTable& t) { return t.gas.methane_fraction; }, "[mol/mol] of the wet gas")
      .def_property_readonly("molar_flow", [](const FigureTable& t) { return t.gas.molar_flow; }, "[mol/h]");
  m.def("figure_in_every_unit",
        [](const EngineCase& c, const std::string& figure, const std::string& species) {
          return figure_in_every_unit(first_segment(c), figure_from(figure), species);
        },
        py::arg("case"), py::arg("figure"), py::arg("species"),
        "acidload::figure_in_every_unit: a contaminant figure as the program's convert reads it ('300 ppmv', "
        "'450 mg/Nm3 wet', '60 mg/Nm3 CH4') in every unit for the gas of the case's first segment.");

  m.def("parse_quantity",
        [](const std::string& text, const std::string& kind) {
          double v = 0;
          std::string why;
          if (!io::parse_quantity_text(text, kind_from(kind), v, why)) throw InputError("quantity", text, why);
          return v;
        },
        py::arg("text"), py::arg("kind"),
        "A value with its unit as a case file writes it ('1.2 MW', '90 degC', '600 L', '0.25 g/kWh') parsed for "
        "a kind of quantity (temperature, temperature_change, power, volume, mass, molar_flow, fraction, "
        "acid_number, specific_consumption, duration, pressure, density, per_hour, oxidation, oxidation_rate, "
        "molar_energy, count, number) into the core's unit (K, W, m³, kg, mol/h, -, mg KOH/g, kg/J, h, Pa, "
        "kg/m³, 1/h, A/cm, A/cm per h, J/mol).");
  m.def("accepted_units", [](const std::string& kind) { return io::accepted_units(kind_from(kind)); },
        py::arg("kind"), "The units a kind of quantity accepts, as written in case files.");

  // ---- water (IAPWS-IF97 region 4)
  py::module_ water = m.def_submodule("water", "Water saturation by IAPWS-IF97 region 4 (IAPWS R7-97(2012)).");
  water.def("saturation_pressure", &water::saturation_pressure, py::arg("temperature_k"),
            "Saturation pressure p_s(T) [Pa], IF97 eq. 30; T in [273.15, 647.096] K else InputError.");
  water.def("saturation_temperature", &water::saturation_temperature, py::arg("pressure_pa"),
            "Saturation temperature T_s(p) [K], IF97 eq. 31; p in [611.213 Pa, 22.064 MPa] else InputError.");
  water.def("dew_point", &water::dew_point, py::arg("water_fraction"), py::arg("total_pressure_pa"),
            "Water dew point of a gas [K]: T_s(x_H2O · p_total); x [mol/mol], p [Pa].");

  // ---- SO2 + ½ O2 ⇌ SO3
  py::module_ so3 = m.def_submodule("so3", "Equilibrium of SO2 + 1/2 O2 = SO3 (NIST-JANAF data, p° = 1 bar).");
  so3.attr("T_MIN") = so3::t_min;
  so3.attr("T_MAX") = so3::t_max;
  so3.attr("STANDARD_PRESSURE") = so3::standard_pressure;
  so3.def("kp", &so3::kp, py::arg("temperature_k"),
          "Kp = (p_SO3/p°)/((p_SO2/p°)·(p_O2/p°)^½) [bar^-½], p° = 1 bar; T in [298, 6000] K.");
  so3.def("standard_gibbs_reaction", &so3::standard_gibbs_reaction, py::arg("temperature_k"),
          "ΔG° of SO2 + ½ O2 ⇌ SO3 at 1 bar [J/mol].");
  so3.def("equilibrium_so3_share", &so3::equilibrium_so3_share, py::arg("temperature_k"), py::arg("o2_fraction"),
          py::arg("total_pressure_pa"),
          "Equilibrium SO3/(SO2 + SO3) [mol/mol] at T [K], O2 mole fraction [mol/mol] and total pressure [Pa].");

  // ---- scrubber beds (Thomas breakthrough) and cost arithmetic, for direct use and the reference tests
  py::module_ scrub = m.def_submodule("scrubber", "Media beds by the Thomas breakthrough form, throughput variable.");
  scrub.def("thomas_steepness", &thomas_steepness, py::arg("width"),
            "beta = 2 ln 9 / width [-]; width: share of the bed life from 10 % to 90 % breakthrough.");
  scrub.def("breakthrough_share", &breakthrough_share, py::arg("fed_share"), py::arg("steepness"),
            "F(phi) = 1/(1 + exp(beta (1 - phi))) [-]; phi = sulfur fed / (q0 M).");
  scrub.def("captured_share", &captured_share, py::arg("fed_share"), py::arg("steepness"),
            "G(phi) = integral of 1 - F from 0 to phi: sulfur held as a share of q0 M [-].");
  scrub.def("bed_outlet_ratio", &bed_outlet_ratio, py::arg("fed_share"), py::arg("efficiency"), py::arg("steepness"),
            "Outlet over inlet H2S, (1 - eta) + eta F(phi) [-].");
  scrub.def("fed_share_at_outlet_ratio", &fed_share_at_outlet_ratio, py::arg("ratio"), py::arg("efficiency"),
            py::arg("steepness"), "phi at which the outlet ratio is reached [-] (InputError outside the fresh bed's range).");
  scrub.def("iron_oxide_theoretical_capacity", &iron_oxide_theoretical_capacity,
            "3 M_S / M_Fe2O3 [kg S per kg Fe2O3] (Fe2O3 + 3 H2S -> Fe2S3 + 3 H2O).");
  scrub.def("caustic_per_sulfur", &caustic_per_sulfur, "2 M_NaOH / M_S [kg NaOH per kg S] (H2S + 2 NaOH -> Na2S + 2 H2O).");
  py::module_ econ = m.def_submodule("economics", "Cost arithmetic: the capital recovery factor.");
  econ.def("capital_recovery_factor", &capital_recovery_factor, py::arg("discount_rate"), py::arg("life_years"),
           "i (1+i)^n / ((1+i)^n - 1) [1/year]; 1/n at i = 0.");

  // ---- the oil balance (docs/model.md §8), for direct use and for the reference tests
  py::module_ oil = m.def_submodule("oil", "The oil balance of one segment of constant rates (docs/model.md §8).");
  py::enum_<BaseNumberMethod>(oil, "BaseNumberMethod", "Base-number titration methods (ASTM D2896, D4739).")
      .value("D2896", BaseNumberMethod::d2896)
      .value("D4739", BaseNumberMethod::d4739);
  py::class_<OilProperties>(oil, "OilProperties", "The oil product; concentrations [mg KOH/g].")
      .def(py::init<>())
      .def_readwrite("fresh_tbn", &OilProperties::fresh_tbn, "fresh-oil base number by fresh_tbn_method [mg KOH/g]")
      .def_readwrite("fresh_tbn_method", &OilProperties::fresh_tbn_method, "method of fresh_tbn")
      .def_readwrite("weak_base_d2896", &OilProperties::weak_base_d2896, "weak base D2896 reads [mg KOH/g]")
      .def_readwrite("weak_base_d4739", &OilProperties::weak_base_d4739, "weak base D4739 reads [mg KOH/g]")
      .def_readwrite("base_floor", &OilProperties::base_floor, "b_min [mg KOH/g]")
      .def_readwrite("fresh_tan", &OilProperties::fresh_tan, "fresh-oil acid number (D664) [mg KOH/g]")
      .def_readwrite("additive_depletion", &OilProperties::additive_depletion, "k_d [1/h]")
      .def_readwrite("salt_titration_share", &OilProperties::salt_titration_share, "β [-]")
      .def_readwrite("organic_neutralised_share", &OilProperties::organic_neutralised_share, "φ_B [-]")
      .def_readwrite("density_15", &OilProperties::density_15, "density at 15 °C [kg/m³]")
      .def_readwrite("viscosity_per_oxidation", &OilProperties::viscosity_per_oxidation, "c_o, viscosity rise per A/cm of oxidation [-]")
      .def_readwrite("viscosity_per_nitration", &OilProperties::viscosity_per_nitration, "c_n, viscosity rise per A/cm of nitration [-]")
      .def("fresh_reactive_base", &OilProperties::fresh_reactive_base, "b_fresh [mg KOH/g]");
  py::class_<OilState>(oil, "OilState", "The oil's state; concentrations [mg KOH/g] unless stated.")
      .def(py::init<>())
      .def(py::init([](double mass, double base, double strong_acid, double weak_acid, double salts, double oxidation,
                       double nitration, double additive_acidity, double antioxidant) {
             return OilState{mass, base, strong_acid, weak_acid, salts, oxidation, nitration, additive_acidity, antioxidant};
           }),
           py::kw_only(), py::arg("mass"), py::arg("base"), py::arg("strong_acid") = 0.0, py::arg("weak_acid") = 0.0,
           py::arg("salts") = 0.0, py::arg("oxidation") = 0.0, py::arg("nitration") = 0.0,
           py::arg("additive_acidity") = 0.0, py::arg("antioxidant") = 1.0)
      .def_readwrite("mass", &OilState::mass, "oil in circulation [kg]")
      .def_readwrite("base", &OilState::base, "b, reactive base [mg KOH/g]")
      .def_readwrite("strong_acid", &OilState::strong_acid, "s, free strong acid (= SAN) [mg KOH/g]")
      .def_readwrite("weak_acid", &OilState::weak_acid, "a_w, free organic acids [mg KOH/g]")
      .def_readwrite("salts", &OilState::salts, "c_n, neutralised-acid salts [mg KOH/g]")
      .def_readwrite("oxidation", &OilState::oxidation, "o [A/cm]")
      .def_readwrite("nitration", &OilState::nitration, "n [A/cm]")
      .def_readwrite("additive_acidity", &OilState::additive_acidity, "t_add [mg KOH/g]")
      .def_readwrite("antioxidant", &OilState::antioxidant, "A, antioxidant reserve as a share of fresh [0-1]")
      .def("__repr__", [](const OilState& s) {
        return "OilState(mass=" + format_value(s.mass) + ", base=" + format_value(s.base) + ", strong_acid=" +
               format_value(s.strong_acid) + ", weak_acid=" + format_value(s.weak_acid) + ", salts=" +
               format_value(s.salts) + ", oxidation=" + format_value(s.oxidation) + ", nitration=" +
               format_value(s.nitration) + ", additive_acidity=" + format_value(s.additive_acidity) +
               ", antioxidant=" + format_value(s.antioxidant) + ")";
      });
  py::class_<OilRates>(oil, "OilRates", "Rates constant over a segment.")
      .def(py::init<>())
      .def_readwrite("strong_acid", &OilRates::strong_acid, "R_strong [g KOH/h]")
      .def_readwrite("sulfurous_fresh", &OilRates::sulfurous_fresh, "SO2 uptake of fresh oil [g KOH/h]")
      .def_readwrite("nitration", &OilRates::nitration, "nitration inflow [A/cm · kg/h]")
      .def_readwrite("oxidation", &OilRates::oxidation, "k_ox [A/cm per h]")
      .def_readwrite("organic_acid", &OilRates::organic_acid, "α·k_ox [mg KOH/g per h]")
      .def_readwrite("antioxidant_depletion", &OilRates::antioxidant_depletion, "k_A, zero-order antioxidant use [share of fresh per h]")
      .def_readwrite("depleted_factor", &OilRates::depleted_factor, "m, oxidation with the antioxidant spent over protected [-]")
      .def_readwrite("consumption", &OilRates::consumption, "oil burnt or lost [kg/h]")
      .def_readwrite("continuous_makeup", &OilRates::continuous_makeup, "makeup equals consumption");
  py::class_<OilBalance>(oil, "OilBalance", "Constants of the oil balance.")
      .def(py::init<>())
      .def_readwrite("fresh_base", &OilBalance::fresh_base, "b_fresh [mg KOH/g]")
      .def_readwrite("base_floor", &OilBalance::base_floor, "b_min [mg KOH/g]")
      .def_readwrite("fresh_additive", &OilBalance::fresh_additive, "t_add of fresh oil [mg KOH/g]")
      .def_readwrite("additive_depletion", &OilBalance::additive_depletion, "k_d [1/h]")
      .def_readwrite("organic_neutralised_share", &OilBalance::organic_neutralised_share, "φ_B [-]");
  py::class_<OilLedger>(oil, "OilLedger", "Running totals of the two conservation ledgers [g KOH].")
      .def(py::init<>())
      .def_readwrite("base_added", &OilLedger::base_added, "reactive base brought by fresh oil [g KOH]")
      .def_readwrite("base_removed", &OilLedger::base_removed, "reactive base carried out with oil [g KOH]")
      .def_readwrite("base_consumed", &OilLedger::base_consumed, "reactive base used up neutralising acid [g KOH]")
      .def_readwrite("acid_entered", &OilLedger::acid_entered, "strong acid, SO2 and organic acid in [g KOH]")
      .def_readwrite("acid_removed", &OilLedger::acid_removed, "free acid carried out with oil [g KOH]")
      .def_readwrite("sulfurous_taken_up", &OilLedger::sulfurous_taken_up, "of the acid entered, SO2 taken up [g KOH]");
  py::enum_<Regime>(oil, "Regime", "What the oil does in a segment: above the base floor, at the floor with free strong acid, at the floor with the organic acid limiting.")
      .value("above_floor", Regime::above_floor)
      .value("floor_acid", Regime::floor_acid)
      .value("floor_weak", Regime::floor_weak);
  py::class_<SegmentOutcome>(oil, "SegmentOutcome", "What the oil did during a segment: the floor crossing and acid clearing times [h].")
      .def_readonly("floor_reached_at", &SegmentOutcome::floor_reached_at, "[h] into the segment, -1 if not")
      .def_readonly("acid_cleared_at", &SegmentOutcome::acid_cleared_at, "[h] into the segment, -1 if not")
      .def_readonly("antioxidant_spent_at", &SegmentOutcome::antioxidant_spent_at, "[h] into the segment, -1 if not")
      .def_readonly("end_regime", &SegmentOutcome::end_regime);
  oil.def("balance_constants", &balance_constants, py::arg("oil"), "The constants of the balance for an oil.");
  oil.def("fresh_oil", &fresh_oil, py::arg("oil"), py::arg("mass_kg"), "A fresh charge of mass [kg].");
  oil.def("advance",
          [](OilState s, const OilBalance& k, const OilRates& r, double hours, OilLedger& ledger) {
            const SegmentOutcome out = advance(s, k, r, hours, ledger);
            return py::make_tuple(s, out);
          },
          py::arg("state"), py::arg("constants"), py::arg("rates"), py::arg("hours"), py::arg("ledger"),
          "Advances a state over hours [h] of constant rates, exactly; returns (new state, SegmentOutcome) and "
          "adds to the ledger.");
  oil.def("advance_record",
          [](OilState s, const OilBalance& k, const py::array_t<double, py::array::c_style | py::array::forcecast>& table,
             bool continuous) {
            // one row per segment: hours, strong acid, SO2 of fresh oil, nitration, oxidation, organic acid, consumption
            if (table.ndim() != 2 || table.shape(1) != 7)
              throw InputError("table", "(shape)", "an n × 7 array: hours, strong_acid, sulfurous_fresh, nitration, "
                                                   "oxidation, organic_acid, consumption");
            const auto t = table.unchecked<2>();
            const py::ssize_t n = t.shape(0);
            {
              py::gil_scoped_release release;
              OilLedger ledger;
              for (py::ssize_t i = 0; i < n; ++i) {
                OilRates r;
                r.strong_acid = t(i, 1), r.sulfurous_fresh = t(i, 2), r.nitration = t(i, 3), r.oxidation = t(i, 4);
                r.organic_acid = t(i, 5), r.consumption = t(i, 6), r.continuous_makeup = continuous;
                advance(s, k, r, t(i, 0), ledger);
              }
            }
            return s;
          },
          py::arg("state"), py::arg("constants"), py::arg("table"), py::arg("continuous_makeup") = true,
          "Advances a state through a record of segments given as an n × 7 array of rates (core units), in C++ "
          "with the GIL released; returns the end state.");
  oil.def("steady_state", &steady_state, py::arg("state"), py::arg("constants"), py::arg("rates"),
          "The state a segment of constant rates settles to (continuous makeup).");
  oil.def("top_up", [](OilState s, const OilProperties& o, double mass, OilLedger& l) { top_up(s, o, mass, l); return s; },
          py::arg("state"), py::arg("oil"), py::arg("mass_kg"), py::arg("ledger"), "Adds fresh oil [kg]; returns the new state.");
  oil.def("oil_change",
          [](OilState s, const OilProperties& o, double residual, double full, OilLedger& l) {
            oil_change(s, o, residual, full, l);
            return s;
          },
          py::arg("state"), py::arg("oil"), py::arg("residual_share"), py::arg("full_mass_kg"), py::arg("ledger"),
          "Oil change leaving residual_share [-] of full_mass [kg]; returns the new state.");
  oil.def("tbn", &tbn, py::arg("state"), py::arg("oil"), py::arg("method"), "TBN by a method [mg KOH/g].");
  oil.def("tan", &acidload::tan, py::arg("state"), py::arg("oil"), "TAN (D664) [mg KOH/g].");
  oil.def("san", &san, py::arg("state"), "SAN (D664) [mg KOH/g].");

  // ---- cases
  py::class_<EngineCase>(m, "EngineCase", "One variant of a case: everything one run needs.")
      .def_readonly("name", &EngineCase::name, "the variant's name")
      .def("lever_value", [](const EngineCase& c, const std::string& l) { return lever_value(c, lever_from(l)); },
           py::arg("lever"), "The lever's value in its core unit (h2s ppmv dry, fresh-tbn mg KOH/g, "
                             "jacket-water-out K, oil-volume m³).")
      .def("with_lever", [](const EngineCase& c, const std::string& l, double v) { return with_lever(c, lever_from(l), v); },
           py::arg("lever"), py::arg("value"), "The variant with one lever set (core unit).")
      .def_property_readonly("segments", [](const EngineCase& c) { return record_segments(c); }, "segments in the record")
      .def_property_readonly("streamed", [](const EngineCase& c) { return c.streamed != nullptr; },
                             "whether the record is read from its file for each run instead of held")
      .def_property_readonly("max_hours", [](const EngineCase& c) { return c.model.limits.max_hours; },
                             "the plant's planned maximum hours on a charge: the horizon [h]");
  py::class_<LabSettings>(m, "LabSettings", "A case's 'lab' section (docs/lab-results.md).")
      .def(py::init<>())
      .def("to_dict", [](const LabSettings& l) {
        const auto prec = [](const PrecisionSetting& p) {
          py::dict d;
          const std::pair<const char*, const std::optional<double>*> f[] = {
              {"tbn_d2896", &p.tbn_d2896}, {"tbn_d4739", &p.tbn_d4739}, {"tan", &p.tan},
              {"san", &p.san}, {"oxidation", &p.oxidation}, {"nitration", &p.nitration}};
          for (const auto& [k, v] : f)
            if (*v) d[k] = **v;
          return d;
        };
        py::dict out, labs, levels;
        out["precision"] = prec(l.precision);
        for (const auto& [name, o] : l.labs) {
          py::dict e;
          e["precision"] = prec(o.precision);
          e["oxidation_baseline"] = o.oxidation_baseline ? py::cast(*o.oxidation_baseline) : py::none();
          e["nitration_baseline"] = o.nitration_baseline ? py::cast(*o.nitration_baseline) : py::none();
          labs[py::str(name)] = e;
        }
        out["labs"] = labs;
        for (const AlarmLevel& a : l.alarm_levels) levels[py::str(a.quantity)] = py::make_tuple(a.caution, a.critical);
        out["alarm_levels"] = levels;
        return out;
      }, "{'precision': {reading: sd}, 'labs': {name: {'precision', 'oxidation_baseline', 'nitration_baseline'}}, "
         "'alarm_levels': {quantity: (caution, critical)}}; readings tbn_d2896, tbn_d4739, tan, san [mg KOH/g], "
         "oxidation, nitration [A/cm]; only what the case states.");
  py::class_<io::CaseFile>(m, "CaseFile", "A loaded case: the base and its variants.")
      .def_readonly("file", &io::CaseFile::file, "path as given")
      .def_readonly("title", &io::CaseFile::title, "the 'case' key")
      .def_readonly("variants", &io::CaseFile::variants, "[0] is the base case")
      .def_readonly("overlays", &io::CaseFile::overlays, "overlay files applied, in order")
      .def_readonly("format_version", &io::CaseFile::format_version, "as written in the file")
      .def_readonly("lab", &io::CaseFile::lab, "the 'lab' section: precision, per-lab settings, alarm levels")
      .def_property_readonly("names", [](const io::CaseFile& c) {
        std::vector<std::string> n;
        for (const EngineCase& v : c.variants) n.push_back(v.name);
        return n;
      }, "the variants' names, base first")
      .def_property_readonly("streamed", [](const io::CaseFile& c) {
        for (const EngineCase& v : c.variants)
          if (v.streamed) return true;
        return false;
      }, "whether a variant's record is read from its file for each run instead of held")
      .def("held", &io::held_records, py::call_guard<py::gil_scoped_release>(),
           "The case with every streamed record read into segments (at most 1 000 000 per record).");
  // reading a case is pure C++ (about as long as running it): the GIL released, so fleets load on threads
  const auto how = [](bool stream) { return stream ? io::RecordReading::stream : io::RecordReading::hold; };
  m.def("load_case",
        [how](const std::string& path, const std::vector<std::string>& overlays, bool stream) {
          return io::load_case(path, overlays, how(stream));
        },
        py::arg("path"), py::arg("overlays") = std::vector<std::string>{}, py::arg("stream") = false,
        py::call_guard<py::gil_scoped_release>(),
        "Reads a case file (and overlays merged over it). Raises InputError with file, line and column. "
        "stream: a CSV record kept as its checked description and read again for each run.");
  m.def("load_case_text",
        [how](std::string_view text, const std::string& file_name, const std::string& base_dir,
              const std::vector<std::string>& overlays, bool stream) {
          return io::load_case_text(text, file_name, base_dir, overlays, how(stream));
        },
        py::arg("text"), py::arg("file_name"), py::arg("base_dir"), py::arg("overlays") = std::vector<std::string>{},
        py::arg("stream") = false, py::call_guard<py::gil_scoped_release>(),
        "Reads a case from YAML text; relative file names (a record CSV) resolve against base_dir.");
  // a site (docs/model.md §18.4): one gas supply and one train shared by several engines
  py::class_<io::SiteFile>(m, "SiteFile", "A loaded site file: the shared gas and train, the engines.")
      .def_readonly("file", &io::SiteFile::file, "path as given")
      .def_readonly("title", &io::SiteFile::title, "the 'case' key (or the site's name)")
      .def_property_readonly("name", [](const io::SiteFile& f) { return f.site.name; }, "the site's name")
      .def_property_readonly("engine_names", [](const io::SiteFile& f) {
        std::vector<std::string> n;
        for (const CostCase& c : f.site.engines) n.push_back(c.engine.name);
        return n;
      }, "the engines, in the file's order")
      .def_readonly("currency", &io::SiteFile::currency, "economics.currency")
      .def_readonly("gas_hours", &io::SiteFile::gas_hours, "the gas record's stretches [h] (empty: the fuel gas throughout)");
  m.def("is_site_file", &io::is_site_file, py::arg("path"), "True when the file's top level holds 'site'.");
  m.def("load_site", &io::load_site, py::arg("path"), py::call_guard<py::gil_scoped_release>(),
        "Reads a site file. Raises InputError with file, line and column.");
  m.def("load_site_text", &io::load_site_text, py::arg("text"), py::arg("file_name"), py::arg("base_dir"),
        py::call_guard<py::gil_scoped_release>(), "Reads a site from YAML text.");
  m.def("run_site", [](const io::SiteFile& f) {
    SiteResult r;
    {
      py::gil_scoped_release nogil;
      r = run_site(f.site);
    }
    const auto items = [](const CostItems& c) {
      py::dict d;
      for (std::size_t i = 0; i < cost_item_count; ++i) d[py::str(std::string(name(all_cost_items[i])))] = c[i];
      return d;
    };
    double hours = 0;
    for (const Segment& s : r.raw) hours += s.hours;
    py::list stages;
    for (std::size_t k = 0; k < r.scrubbed.stages.size(); ++k) {
      const StageRecord& s = r.scrubbed.stages[k];
      const TrainStage& t = f.site.train[k];
      py::dict d;
      d["name"] = t.name;
      d["kind"] = std::string(name(t.stage.kind));
      d["changeouts"] = s.changeouts;
      d["bed_share_used"] = s.bed_share_used;
      d["first_bed_life_h"] = s.first_bed_life >= 0 ? py::object(py::float_(s.first_bed_life)) : py::object(py::none());
      const double beds = s.changeouts + s.bed_share_used;
      d["bed_interval_h"] = is_media_bed(t.stage.kind) ? py::object(py::float_(beds > 0 ? hours / beds : HUGE_VAL)) : py::object(py::none());
      d["changeouts_per_year"] = r.shared_quantities.stages[k].changeouts;
      d["sulfur_removed_kg"] = s.sulfur_removed;
      d["mean_outlet_h2s_ppmv"] = s.mean_outlet_ppmv;
      stages.append(d);
    }
    py::list engines;
    for (const SiteEngine& e : r.engines) {
      py::dict d;
      d["name"] = e.name;
      d["gas_share"] = e.gas_share;
      d["running_hours"] = e.costs.record_hours;
      d["mean_h2s_ppmv"] = e.mean_h2s_ppmv;
      d["sulfur_burnt_mol"] = e.sulfur_burnt;
      d["oil_changes"] = e.oil.changes;
      d["completed_charges"] = e.oil.completed;
      d["drain_intervals_h"] = e.oil.intervals;
      d["mwh_per_year"] = e.costs.quantities.energy / 3.6e9;
      d["oil_changes_per_year"] = e.costs.quantities.oil_changes;
      d["total_per_year"] = e.costs.total_per_year;
      d["total_per_mwh"] = e.costs.total_per_mwh;
      d["per_year"] = items(e.costs.per_year);
      engines.append(d);
    }
    double fuel = 0, h2s = 0;
    for (const Segment& s : r.raw) fuel += s.operation.fuel_flow * s.hours, h2s += s.operation.fuel_flow * s.fuel[Gas::H2S] * s.hours;
    py::dict site;
    site["name"] = r.name;
    site["running_hours"] = hours;
    site["hours_per_year"] = r.shared_quantities.running_hours;
    site["mean_fuel_flow_mol_per_h"] = hours > 0 ? fuel / hours : 0.0;
    site["mean_h2s_flow_mol_per_h"] = hours > 0 ? h2s / hours : 0.0;
    site["stages"] = stages;
    site["sulfur_raw_mol"] = r.scrubbed.sulfur.raw;
    site["sulfur_stages_mol"] = r.scrubbed.sulfur.stages;
    site["sulfur_engines_mol"] = r.scrubbed.sulfur.engine;
    site["sulfur_balance_error"] = r.sulfur_balance_error;
    site["shared_per_year"] = items(r.shared_per_year);
    site["total_per_year"] = r.total_per_year;
    py::dict out;
    out["site"] = site;
    out["engines"] = engines;
    return out;
  }, py::arg("site"), "Runs a site (the C++ released from the GIL); the per-site and per-engine figures as dicts.");
  m.def("section_keys", [](const std::string& s) { return io::section_keys(s); }, py::arg("section"),
        "The keys of a case-file section ('' for the top level).");
  m.def(
      "case_keys",
      [] {
        static const char* const types[] = {"quantity", "contaminant", "word", "flag", "text",
                                            "section", "list", "map", "special"};
        py::list out;
        for (const io::CaseKey& k : io::case_keys()) {
          py::dict d;
          d["path"] = k.path;
          d["section"] = k.section();
          d["key"] = k.key();
          d["type"] = types[static_cast<int>(k.type)];
          d["kind"] = k.type == io::KeyType::quantity ? py::str(std::string(io::kind_id(k.kind))) : py::str("");
          d["kind_name"] = k.type == io::KeyType::quantity ? py::str(std::string(io::kind_name(k.kind))) : py::str("");
          d["range"] = k.type == io::KeyType::quantity ? py::str(k.range_text()) : py::str("");
          d["unit"] = k.unit;
          d["default"] = k.default_text;
          d["doc"] = k.doc;
          d["calibratable"] = k.calibratable;
          d["prior_sd"] = k.prior_sd, d["prior_space"] = k.prior_space, d["prior_basis"] = k.prior_basis;
          d["fit_range"] = k.fit_range, d["fit_unit"] = k.fit_unit;
          d["field"] = k.field;
          d["alternative"] = k.alternative;
          d["words"] = k.words;
          out.append(d);
        }
        return out;
      },
      "The registry of case keys (acidload/io/keys.hpp), one dict per key: path, section, key, type, kind "
      "(the schema's $defs name), kind_name, range (in the documented unit), unit, default, doc, calibratable, "
      "prior_sd, prior_space, prior_basis (the fit's weak prior), fit_range, fit_unit, field, alternative, words.");

  // ---- runs
  py::class_<CaseRun>(m, "CaseRun", "Every variant of a case, run.")
      .def_property_readonly("names", [](const CaseRun& r) {
        std::vector<std::string> n;
        for (const auto& v : r.rows) n.push_back(v.name);
        return n;
      })
      .def("summary_json", [](const CaseRun& r) { return io::summary_json(r.file, r.rows, r.econ()); },
           py::call_guard<py::gil_scoped_release>(), "The summary as JSON text, exactly as 'acidload run --out' writes summary.json.")
      .def("trajectories_csv", [](const CaseRun& r) { return io::trajectories_csv(r.rows); },
           "The trajectories as CSV text, exactly as 'acidload run --out' writes trajectories.csv.")
      .def("trajectory", &trajectory_arrays, py::arg("index"), "The trajectory of variant `index` as numpy arrays.")
      .def("first_rates", [](const CaseRun& r, std::size_t i) { return rates_dict(r.rows.at(i).run.first_rates); },
           py::arg("index"), "The first segment's oil-balance rates of variant `index`.")
      .def("write_results", [](const CaseRun& r, const std::string& folder) { io::write_results(folder, r.file, r.rows, r.econ()); },
           py::arg("folder"), "Writes summary.json and trajectories.csv into folder, as the program does.")
      .def("summary_csv", [](const CaseRun& r) { return io::summary_csv(r.file, r.rows); },
           "The comparison table as CSV text, exactly as 'acidload run --summary-csv' writes it.")
      .def("report_html",
           [](const CaseRun& r, const std::string& lab, const std::vector<std::string>& parameters) {
             io::ReportOptions o;
             o.lab_file = lab;
             if (!parameters.empty()) o.parameters = parameters;
             py::gil_scoped_release release;
             return io::report_html(io::gather_report(r.file, r.rows, o));
           },
           py::arg("lab") = "", py::arg("parameters") = std::vector<std::string>{},
           "The report page as HTML text, as 'acidload report' writes it (lab: a lab CSV file or '').")
      .def("write_report",
           [](const CaseRun& r, const std::string& path, const std::string& lab, const std::vector<std::string>& parameters) {
             io::ReportOptions o;
             o.lab_file = lab;
             if (!parameters.empty()) o.parameters = parameters;
             py::gil_scoped_release release;
             io::write_report(path, io::report_html(io::gather_report(r.file, r.rows, o)), io::report_inputs(r.file, lab));
           },
           py::arg("path"), py::arg("lab") = "", py::arg("parameters") = std::vector<std::string>{},
           "Writes the report page atomically; an existing file is replaced only if it is an acidload report.");
  m.def("run_case", &run_case, py::arg("case"), "Runs every variant of a case (the GIL released).");

  // ---- economics of a case with an economics section (variants by index)
  m.def("has_economics", [](const io::CaseFile& c) { return !c.costs.empty(); }, py::arg("case"),
        "Whether the case has an economics section.");
  m.def("stage_names", [](const io::CaseFile& c, std::size_t v) {
          std::vector<std::string> n;
          for (const TrainStage& t : cost_case(c, v).train) n.push_back(t.name);
          return n;
        }, py::arg("case"), py::arg("variant"), "The names of a variant's scrubbing stages, in gas-flow order.");
  m.def("level_stage", [](const io::CaseFile& c, std::size_t v) { return level_stage(cost_case(c, v)); }, py::arg("case"),
        py::arg("variant"), "The stage (0-based) a cheapest-level question varies by default.");
  m.def("default_level_range", [](const io::CaseFile& c, std::size_t v, std::size_t stage) {
          const LevelRange r = default_level_range(cost_case(c, v), stage);
          return std::make_pair(r.low, r.high);
        }, py::arg("case"), py::arg("variant"), py::arg("stage"), "The default range of a cheapest-level question [ppmv dry].");
  m.def("cheapest_level", [](const io::CaseFile& c, std::size_t v, std::size_t stage, double low, double high, int points,
                             double tolerance) {
          CheapestLevel a;
          {
            py::gil_scoped_release release;
            a = cheapest_level(cost_case(c, v), stage, low, high, points, tolerance);
          }
          return cheapest_dict(a);
        }, py::arg("case"), py::arg("variant"), py::arg("stage"), py::arg("low_ppmv"), py::arg("high_ppmv"),
        py::arg("points") = 13, py::arg("tolerance_ppmv") = 0.05,
        "The outlet (changeout) level of a stage with the lowest total per MWh, verified forward (GIL released).");
  m.def("cost_sweep", [](const io::CaseFile& c, std::size_t v, std::size_t stage, const std::vector<double>& levels) {
          const CostCase& cc = cost_case(c, v);
          py::array_t<double> items({levels.size(), cost_item_count});
          py::array_t<double> totals(levels.size());
          std::vector<CostItems> rows(levels.size());
          {
            py::gil_scoped_release release;
            for (std::size_t i = 0; i < levels.size(); ++i) rows[i] = costs(with_outlet_level(cc, stage, levels[i])).per_mwh;
          }
          auto it = items.mutable_unchecked<2>();
          auto t = totals.mutable_unchecked<1>();
          for (std::size_t i = 0; i < levels.size(); ++i) {
            t(i) = total(rows[i]);
            for (std::size_t k = 0; k < cost_item_count; ++k) it(i, k) = rows[i][k];
          }
          return std::make_pair(totals, items);
        }, py::arg("case"), py::arg("variant"), py::arg("stage"), py::arg("levels_ppmv"),
        "Totals per MWh and the items per MWh (levels x items) at each outlet (changeout) level (GIL released).");
  m.def("price_keys", []() { return price_keys(); }, "The economics keys an uncertainty input may vary.");
  m.def("cost_items", []() {
          std::vector<std::string> n;
          for (CostItem i : all_cost_items) n.emplace_back(name(i));
          return n;
        }, "The names of the cost items, in the order of cost_sweep's columns.");
  m.def("cost_monte_carlo", [](const io::CaseFile& c, int draws, long long seed, int threads) {
          if (c.costs.empty()) throw InputError("economics", "(no section)", "an 'economics' section with the prices in " + c.file);
          CostMonteCarlo r;
          {
            py::gil_scoped_release release;
            r = cost_monte_carlo(c.costs, c.uncertainty.inputs, draws > 0 ? draws : c.uncertainty.draws,
                                 seed < 0 ? c.uncertainty.seed : static_cast<std::uint64_t>(seed), threads);
          }
          py::dict d;
          d["draws"] = r.draws;
          d["p10_per_mwh"] = r.p10;
          d["p50_per_mwh"] = r.p50;
          d["p90_per_mwh"] = r.p90;
          d["cheapest_share"] = r.cheapest_share;
          py::list per;
          for (const auto& x : r.total_per_mwh) per.append(py::array_t<double>(x.size(), x.data()));
          d["total_per_mwh"] = per;
          return d;
        }, py::arg("case"), py::arg("draws") = 0, py::arg("seed") = -1, py::arg("threads") = 0,
        "Monte Carlo of every variant's total per MWh over the case's uncertainty inputs (draws 0 and seed < 0: "
        "the section's; GIL released).");

  // ---- studies
  m.def("drain_interval",
        [](const EngineCase& c) {
          py::gil_scoped_release release;
          return drain_interval(c);
        },
        py::arg("case"), "The drain interval of a variant [h]; None when no oil-condition limit is reached within the "
        "plant's planned maximum (limits.max-hours): 'no limit within N h'.");
  m.def("sweep_drain_interval", &sweep_for_python, py::arg("case"), py::arg("lever"), py::arg("values"),
        py::arg("threads") = 0,
        "Drain interval [h] for each value of one lever (core unit), NaN where no limit is reached within the planned "
        "maximum, computed in C++ with the GIL released, on "
        "`threads` threads (0 = every core; the answers are the same for any count).");
  py::class_<InverseAnswer>(m, "InverseAnswer", "The answer of solve_for_interval, in the lever's core unit.")
      .def_readonly("found", &InverseAnswer::found)
      .def_readonly("value", &InverseAnswer::value, "in the lever's core unit")
      .def_readonly("interval_at_value", &InverseAnswer::interval_at_value, "[h]; None: no limit within the planned maximum")
      .def_readonly("interval_at_low", &InverseAnswer::interval_at_low, "[h]; None: no limit within the planned maximum")
      .def_readonly("interval_at_high", &InverseAnswer::interval_at_high, "[h]; None: no limit within the planned maximum")
      .def_readonly("jump", &InverseAnswer::jump, "no answer: the interval jumps over the target near `value`")
      .def_readonly("jump_from", &InverseAnswer::jump_from, "[h] just below the jump; None: no limit")
      .def_readonly("jump_to", &InverseAnswer::jump_to, "[h] just above the jump; None: no limit")
      .def_readonly("reason", &InverseAnswer::reason)
      .def_readonly("evaluations", &InverseAnswer::evaluations);
  m.def("default_search",
        [](const EngineCase& c, const std::string& lever) {
          const LeverSearch s = default_search(c, lever_from(lever));
          return py::make_tuple(s.low, s.high, s.tolerance);
        },
        py::arg("case"), py::arg("lever"),
        "(low, high, tolerance) in the lever's core unit: where solve searches when no range is given "
        "(acidload::default_search, the same defaults as the program's solve).");
  m.def("solve_for_interval",
        [](const EngineCase& c, const std::string& lever, double target, double low, double high, double tolerance) {
          const Lever l = lever_from(lever);
          py::gil_scoped_release release;
          return solve_for_interval(c, l, target, low, high, tolerance);
        },
        py::arg("case"), py::arg("lever"), py::arg("target_hours"), py::arg("low"), py::arg("high"),
        py::arg("tolerance"),
        "The lever value in [low, high] (core unit) at which the drain interval equals target_hours [h] "
        "(TOMS 748 bracketing); an answer with found=False and a reason when the range gives none.");

  m.def("viscosity_change", &viscosity_change, py::arg("nu"), py::arg("nu_fresh"),
        "A lab sample's kinematic viscosity change over the fresh oil's, (nu - nu_fresh)/nu_fresh [-], both at 100 °C "
        "in one unit (what the forecast holds to limits.viscosity-change).");

  // ---- calibration, forecast, Monte Carlo
  py::class_<LabSample>(m, "LabSample", "One lab report of a used-oil sample (readings [mg KOH/g], FTIR [A/cm]).")
      .def_readonly("charge", &LabSample::charge, "0-based charge of the record")
      .def_readonly("oil_hours", &LabSample::oil_hours, "[h]")
      .def_readonly("tbn", &LabSample::tbn)
      .def_readonly("tan", &LabSample::tan)
      .def_readonly("san", &LabSample::san)
      .def_readonly("san_censored", &LabSample::san_censored)
      .def_readonly("oxidation", &LabSample::oxidation)
      .def_readonly("nitration", &LabSample::nitration)
      .def_readonly("initial_ph", &LabSample::initial_ph)
      .def_readonly("lab", &LabSample::lab)
      .def_readonly("where", &LabSample::where)
      .def_readonly("tbn_method", &LabSample::tbn_method)
      .def_readonly("date", &LabSample::date, "as written")
      .def_readonly("trended", &LabSample::trended, "readings trended, not modelled (wear metals, viscosity, water …), by column")
      .def_readonly("other", &LabSample::other, "columns acidload does not know, as written")
      .def_readonly("oxidation_baseline", &LabSample::oxidation_baseline, "[A/cm]")
      .def_readonly("nitration_baseline", &LabSample::nitration_baseline, "[A/cm]");
  m.def("read_lab_samples", [](const std::string& path) { return io::read_lab_samples(path); }, py::arg("path"),
        "Reads lab results from a CSV file (docs/lab-results.md).");
  m.def("read_lab_notes", [](const std::string& path) {
    std::vector<std::string> notes;
    io::read_lab_samples(path, &notes);
    return notes;
  }, py::arg("path"), "The notes reading a lab file gives (columns carried through unread).");
  m.def("lever_keys", []() {
    std::vector<std::pair<std::string, std::string>> k;
    for (Lever l : all_levers) k.emplace_back(std::string(name(l)), std::string(case_key(l)));
    return k;
  }, "(lever, case key) for every lever of solve: the parameter of fit and uncertainty each one sets.");
  m.def("parameter_keys", []() {
    std::vector<std::string> k;
    for (const auto& p : parameter_table()) k.push_back(p.key);
    return k;
  }, "Keys of the parameters that can be fitted or varied.");
  m.def("parameter_bound", [](const std::string& k) {
    switch (parameter(k).bound) {
      case Bound::positive: return std::string("positive");
      case Bound::share: return std::string("share");
      case Bound::interval: return std::string("interval");
      case Bound::free: return std::string("free");
    }
    return std::string();
  }, py::arg("key"), "How a parameter is bounded: 'positive' (fitted as log), 'share' (logit), 'interval' "
                     "(logit of the place in its range) or 'free'.");
  m.def("parameter_range", [](const std::string& k) {
    const ParameterInfo& p = parameter(k);
    return py::make_tuple(p.low, p.high, p.prior_sd, p.unit);
  }, py::arg("key"), "(low, high, prior_sd, unit): the range (interval bounds), the weak prior's sd in fit space, the core unit.");
  m.def("to_fit_space", [](const std::string& k, double x) { return to_fit_space(parameter(k), x); }, py::arg("key"), py::arg("x"));
  m.def("from_fit_space", [](const std::string& k, double phi) { return from_fit_space(parameter(k), phi); }, py::arg("key"),
        py::arg("phi"));
  m.def("from_fit_space", [](const std::string& k, double phi) { return from_fit_space(parameter(k), phi); }, py::arg("key"), py::arg("phi"));
  m.def("dx_dphi", [](const std::string& k, double phi) { return dx_dphi(parameter(k), phi); }, py::arg("key"), py::arg("phi"));
  m.def("get_parameter", &get_parameter, py::arg("case"), py::arg("key"), "A parameter's value in a case (core unit).");
  m.def("with_parameter", [](const EngineCase& c, const std::string& k, double v) {
    EngineCase x = c;
    set_parameter(x, k, v);
    return x;
  }, py::arg("case"), py::arg("key"), py::arg("value"), "A copy of the case with one parameter set (core unit).");
  m.def("predict", [](const EngineCase& c, const std::vector<LabSample>& s) {
    std::vector<SampleResidual> r;
    {
      py::gil_scoped_release release;
      r = predict(c, s, Precision{});
    }
    return residual_arrays(r);
  }, py::arg("case"), py::arg("samples"), "Every reading of the samples with the model's prediction and the method's sigma.");
  m.def("fit_residuals", &fit_residuals, py::arg("case"), py::arg("samples"), py::arg("parameters"), py::arg("phi"),
        "Standardized residuals (measured − predicted)/sigma at fit-space values phi (log or logit of each "
        "parameter): the function calibrate minimises, for driving from SciPy.");
  py::class_<FitResult>(m, "FitResult", "A calibration's outcome.")
      .def_property_readonly("keys", [](const FitResult& f) {
        std::vector<std::string> k;
        for (const auto& p : f.parameters) k.push_back(p.key);
        return k;
      })
      .def_property_readonly("estimates", [](const FitResult& f) {
        std::vector<double> v;
        for (const auto& p : f.parameters) v.push_back(p.estimate);
        return v;
      }, "in each parameter's core unit")
      .def_property_readonly("standard_errors", [](const FitResult& f) {
        std::vector<double> v;
        for (const auto& p : f.parameters) v.push_back(p.standard_error);
        return v;
      }, "delta method, core unit")
      .def_property_readonly("initial", [](const FitResult& f) {
        std::vector<double> v;
        for (const auto& p : f.parameters) v.push_back(p.initial);
        return v;
      })
      .def_property_readonly("fit_estimates", [](const FitResult& f) {
        std::vector<double> v;
        for (const auto& p : f.parameters) v.push_back(p.fit_estimate);
        return v;
      }, "in fit space (log or logit)")
      .def_property_readonly("baselines", [](const FitResult& f) {
        py::list out;
        for (const auto& b : f.baselines) {
          py::dict d;
          d["lab"] = b.lab, d["reading"] = b.reading, d["value"] = b.value, d["standard_error"] = b.standard_error;
          d["readings"] = b.readings;
          out.append(d);
        }
        return out;
      }, "FTIR baselines the fit estimated per lab [A/cm]")
      .def_readonly("covariance", &FitResult::covariance, "in fit space")
      .def_readonly("correlation", &FitResult::correlation)
      .def_property_readonly("residuals", [](const FitResult& f) { return residual_arrays(f.residuals); })
      .def_readonly("sum_of_squares", &FitResult::sum_of_squares)
      .def_readonly("observations", &FitResult::observations)
      .def_readonly("degrees_of_freedom", &FitResult::degrees_of_freedom)
      .def_readonly("s2", &FitResult::s2, "reduced chi-square")
      .def_readonly("iterations", &FitResult::iterations)
      .def_readonly("converged", &FitResult::converged)
      .def_readonly("flags", &FitResult::flags)
      .def_readonly("notes", &FitResult::notes, "why these parameters, when chosen for what the lab reports")
      .def_readonly("warnings", &FitResult::warnings)
      .def_readonly("chi2_p", &FitResult::chi2_p, "P(chi-square >= the sum of squares)")
      .def_property_readonly("held", [](const FitResult& f) {
        std::vector<bool> v;
        for (const auto& p : f.parameters) v.push_back(p.held);
        return v;
      }, "per parameter: held at its prior (the samples do not respond to it)")
      .def_readonly("fitted", &FitResult::fitted, "the case with the estimates put in")
      .def_readonly("samples", &FitResult::samples, "the samples fitted (the case's per-lab FTIR baselines put in)")
      .def("overlay_text", [](const FitResult& f, const std::string& c, const std::string& l) { return io::overlay_text(f, c, l); },
           py::arg("case_file"), py::arg("lab_file"), "The estimates as overlay text for 'acidload run --overlay'.")
      .def("write_overlay",
           [](const FitResult& f, const std::string& path, const std::string& c, const std::string& l,
              const std::vector<std::string>& inputs) { io::write_overlay(path, f, c, l, inputs); },
           py::arg("path"), py::arg("case_file"), py::arg("lab_file"), py::arg("inputs"),
           "Writes the overlay as the program's fit --write-overlay does (io::write_overlay: the files read "
           "and files acidload did not write are refused).");
  m.def("calibrate", [](const EngineCase& c, std::vector<LabSample> s, const std::vector<std::string>& keys,
                        const std::map<std::string, double>& precision,
                        const std::map<std::string, std::map<std::string, double>>& lab_precision, bool priors,
                        const LabSettings& lab) {
    FitSettings fs;
    fs.parameters = keys;
    fs.priors = priors;
    const auto stated = [](const std::map<std::string, double>& m) {
      PrecisionSetting p;
      for (const auto& [k, v] : m) {
        if (!(v > 0 && v < 1e3)) throw InputError("precision " + k, format_value(v), "a standard deviation above 0");
        if (k == "tbn_d2896") p.tbn_d2896 = v;
        else if (k == "tbn_d4739") p.tbn_d4739 = v;
        else if (k == "tan") p.tan = v;
        else if (k == "san") p.san = v;
        else if (k == "oxidation") p.oxidation = v;
        else if (k == "nitration") p.nitration = v;
        else throw InputError("precision", k, "one of tbn_d2896, tbn_d4739, tan, san, oxidation, nitration");
      }
      return p;
    };
    std::map<std::string, PrecisionSetting> by_lab;
    for (const auto& [name, m] : lab_precision) by_lab[name] = stated(m);
    // precedence: a row's *-sd > lab_precision= > precision= > the case's lab entry > lab.precision > the defaults
    resolve_precision(fs, lab, stated(precision), by_lab);
    apply_lab_baselines(s, lab);
    py::gil_scoped_release release;
    return calibrate(c, s, fs);
  }, py::arg("case"), py::arg("samples"), py::arg("parameters"), py::arg("precision") = std::map<std::string, double>{},
        py::arg("lab_precision") = std::map<std::string, std::map<std::string, double>>{}, py::arg("priors") = true,
        py::arg("lab") = LabSettings{},
        "Weighted least squares (Levenberg-Marquardt, weak priors) of the named parameters (none: chosen for what "
        "the lab reports) to the samples; precision [mg KOH/g, A/cm] by reading, and by lab, over the case's lab settings.");
  const auto limit_dict = [](const LimitForecast& x) {
    py::dict d;
    d["limit"] = x.key;
    d["reached"] = x.reached, d["already"] = x.already;
    d["remaining_h"] = x.remaining, d["low_h"] = x.low, d["high_h"] = x.high;
    d["prior_driven"] = x.prior_driven, d["prior_from"] = x.prior_from;
    d["why"] = x.why;
    return d;
  };
  const auto forecast_dict = [limit_dict](const Forecast& fc) {
    py::dict d;
    py::list limits;
    for (const auto& x : fc.limits) limits.append(limit_dict(x));
    d["limits"] = limits;
    d["change_now"] = fc.change_now;
    d["lab_first"] = fc.lab_first;
    d["latest_sample"] = fc.latest_sample;
    d["start_oil_hours"] = fc.start_oil_hours;
    d["end_oil_hours"] = fc.end_oil_hours;
    py::list up;
    for (const auto& u : fc.update) {
      py::dict x;
      x["reading"] = u.reading, x["model"] = u.model, x["measured"] = u.measured, x["updated"] = u.updated, x["gain"] = u.gain;
      up.append(x);
    }
    d["update"] = up;
    const KalmanUpdate& k = fc.kalman;
    py::dict kd;
    kd["state"] = k.state, kd["prior"] = k.prior, kd["posterior"] = k.posterior;
    kd["sensitivity"] = k.sensitivity, kd["covariance"] = k.covariance, kd["reading_matrix"] = k.reading_matrix;
    kd["gain"] = k.gain, kd["readings"] = k.readings, kd["measured"] = k.measured, kd["sigma"] = k.sigma;
    kd["extra_variance_factor"] = k.extra_variance_factor;
    d["kalman"] = kd;
    d["next_sample_in_h"] = fc.next_sample_in;
    d["warnings"] = fc.warnings;
    return d;
  };
  m.def("forecast", [forecast_dict](const FitResult& f, std::optional<double> initial_ph, double sample_interval) {
    Forecast fc;
    {
      py::gil_scoped_release release;
      fc = forecast_current(f, LabLimits{initial_ph, sample_interval});
    }
    return forecast_dict(fc);
  }, py::arg("fit"), py::arg("initial_ph") = py::none(), py::arg("sample_interval") = LabLimits{}.sample_interval,
        "The lab-first forecast of the current charge: limits (remaining hours [h], 90 % band, already; initial_ph "
        "None: the case's limits.initial-ph), the state "
        "update, the next sample due [h].");
  m.def("predict_charge", [forecast_dict](const FitResult& f, bool next_charge, const std::vector<EngineCase>& plan, int draws,
                                          std::uint64_t seed, bool model_form, bool lab_first, std::optional<double> initial_ph) {
    PredictSettings ps;
    ps.next_charge = next_charge;
    for (const EngineCase& c : plan) ps.conditions.insert(ps.conditions.end(), c.record.begin(), c.record.end());
    ps.draws = draws, ps.seed = seed, ps.model_form = model_form, ps.lab_first = lab_first;
    ps.lab.initial_ph = initial_ph;
    Prediction p;
    {
      py::gil_scoped_release release;
      p = predict_charge(f, ps);
    }
    py::dict d;
    d["next_charge"] = p.next_charge;
    d["interval_h"] = p.interval;
    d["limit"] = p.limit ? std::string(name(*p.limit)) : std::string("none");
    d["p5_h"] = p.p5, d["p50_h"] = p.p50, d["p95_h"] = p.p95;
    d["remaining_p5_h"] = p.remaining_p5, d["remaining_p50_h"] = p.remaining_p50, d["remaining_p95_h"] = p.remaining_p95;
    py::dict ending;
    for (std::size_t k = 0; k < limit_count; ++k)
      if (p.ending[k]) ending[py::str(std::string(name(all_limits[k])))] = p.ending[k];
    d["ending"] = ending;
    d["parameter_spread"] = p.parameter_spread, d["model_form_spread"] = p.model_form_spread;
    d["model_form_excess"] = p.model_form_excess;
    py::list held;
    for (const auto& h : p.held_out) held.append(py::make_tuple(h.charge, h.own, h.from_others));
    d["held_out"] = held;
    d["draws"] = p.draws;
    d["intervals_h"] = py::array_t<double>(static_cast<py::ssize_t>(p.intervals.size()), p.intervals.data());
    d["current"] = forecast_dict(p.current);
    d["notes"] = p.notes, d["warnings"] = p.warnings;
    return d;
  }, py::arg("fit"), py::arg("next_charge") = true, py::arg("plan") = std::vector<EngineCase>{}, py::arg("draws") = 400,
        py::arg("seed") = 1, py::arg("model_form") = true, py::arg("lab_first") = true, py::arg("initial_ph") = py::none(),
        "The drain interval of the next charge (or the current one continued) with its P5/P50/P95 band [h]; plan: cases "
        "whose records are the planned operation (empty: the record's last segment).");
  m.def("trend", [](const FitResult& f, const std::vector<std::tuple<std::string, double, double, bool>>& levels,
                    const LabSettings& lab) {
    std::vector<AlarmLevel> lv;
    for (const auto& [q, caution, critical, rising] : levels) {
      if (!(std::isfinite(caution) && std::isfinite(critical)) || (rising ? critical < caution : critical > caution))
        throw InputError("alarm level " + q, format_value(caution) + " / " + format_value(critical),
                         "a caution level and a critical level beyond it");
      lv.push_back({q, caution, critical, rising, "set by the user"});
    }
    TrendResult t;
    {
      py::gil_scoped_release release;
      t = trend(f, merged_levels(lab, lv));  // the call's levels over the case's lab.alarm-levels
    }
    py::dict d;
    py::list alarms;
    for (const Alarm& a : t.alarms) {
      py::dict x;
      x["sample"] = a.sample, x["quantity"] = a.quantity, x["level"] = a.level, x["value"] = a.value, x["limit"] = a.limit;
      x["message"] = a.message;
      alarms.append(x);
    }
    d["alarms"] = alarms;
    const auto opt = [](const std::optional<double>& v) { return v ? py::cast(*v) : py::none(); };
    d["tbn_slope"] = opt(t.tbn_slope), d["tbn_slope_model"] = opt(t.tbn_slope_model), d["tbn_slope_error"] = opt(t.tbn_slope_error);
    d["implied_h2s_ppmv"] = opt(t.implied_h2s);
    return d;
  }, py::arg("fit"), py::arg("levels") = std::vector<std::tuple<std::string, double, double, bool>>{}, py::arg("lab") = LabSettings{},
        "Trend and alarms: the latest sample against the model's band, the TBN slope [mg KOH/g per h] against the "
        "model's and the H2S it implies [ppmv], readings against caution/critical levels ((quantity, caution, "
        "critical, rising) replace the defaults).");
  m.def("default_alarm_levels", []() {
    py::list out;
    for (const AlarmLevel& l : default_alarm_levels()) out.append(py::make_tuple(l.quantity, l.caution, l.critical, l.rising, l.basis));
    return out;
  }, "The default alarm levels: (quantity, caution, critical, rising, basis).");
  m.def("monte_carlo", [](const EngineCase& c, const std::vector<std::tuple<std::string, std::string, double, double, double>>& inputs,
                          int draws, std::uint64_t seed, int threads, const FitResult* fit, bool every_charge) {
    std::vector<UncertainInput> in;
    for (const auto& [key, kind, a, b, cc] : inputs) {
      Distribution d;
      if (kind == "normal") d.kind = Distribution::Kind::normal;
      else if (kind == "lognormal") d.kind = Distribution::Kind::lognormal;
      else if (kind == "uniform") d.kind = Distribution::Kind::uniform;
      else if (kind == "triangular") d.kind = Distribution::Kind::triangular;
      else throw InputError("distribution", kind, "normal, lognormal, uniform or triangular");
      d.a = a, d.b = b, d.c = cc;
      in.push_back({key, d});
    }
    MonteCarloResult r;
    {
      py::gil_scoped_release release;
      r = monte_carlo(c, in, fit, every_charge, draws, seed, threads);
    }
    py::dict d;
    d["drain_interval_h"] = py::array_t<double>(static_cast<py::ssize_t>(r.drain_interval.size()), r.drain_interval.data());
    d["first_san_h"] = py::array_t<double>(static_cast<py::ssize_t>(r.first_san.size()), r.first_san.data());
    d["interval_p10_h"] = r.interval_p10, d["interval_p50_h"] = r.interval_p50, d["interval_p90_h"] = r.interval_p90;
    d["san_p10_h"] = r.san_p10, d["san_p50_h"] = r.san_p50, d["san_p90_h"] = r.san_p90;
    d["interval_p5_h"] = r.interval_p5, d["interval_p95_h"] = r.interval_p95, d["san_p5_h"] = r.san_p5, d["san_p95_h"] = r.san_p95;
    py::list charges;
    for (std::size_t k = 0; k < r.charge_bands.size(); ++k) {
      py::dict x;
      const IntervalBand& b = r.charge_bands[k];
      x["charge"] = k + 1;
      x["drain_interval_h"] = py::array_t<double>(static_cast<py::ssize_t>(r.charge_intervals[k].size()), r.charge_intervals[k].data());
      x["p5_h"] = b.p5, x["p10_h"] = b.p10, x["p50_h"] = b.p50, x["p90_h"] = b.p90, x["p95_h"] = b.p95;
      charges.append(x);
    }
    d["charges"] = charges;
    d["clipped"] = r.clipped;
    d["fitted_parameters"] = r.fitted_parameters;
    d["draws"] = r.draws;
    return d;
  }, py::arg("case"), py::arg("inputs"), py::arg("draws"), py::arg("seed"), py::arg("threads") = 0,
        py::arg("fit") = static_cast<const FitResult*>(nullptr), py::arg("every_charge") = false,
        "Monte Carlo: inputs as (key, distribution, a, b, c) in core units (normal: mean, sd; lognormal: median, "
        "sigma of ln; uniform: low, high; triangular: low, mode, high); identical for any thread count.");
  m.def("case_uncertainty", [](const io::CaseFile& f) {
    py::list out;
    for (const auto& x : without_prices(f.uncertainty.inputs)) {  // prices: cost_monte_carlo
      const char* kinds[] = {"normal", "lognormal", "uniform", "triangular"};
      out.append(py::make_tuple(x.key, kinds[static_cast<int>(x.distribution.kind)], x.distribution.a, x.distribution.b,
                                x.distribution.c));
    }
    return py::make_tuple(out, f.uncertainty.draws, f.uncertainty.seed);
  }, py::arg("case_file"), "The case file's uncertainty section: (inputs, draws, seed).");
}
