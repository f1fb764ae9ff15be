#include "acidload/core/halocarbons.hpp"

#include <functional>
#include <string>

#include "acidload/core/error.hpp"

namespace acidload {

const std::vector<Halocarbon>& halocarbon_table() {
  static const std::vector<Halocarbon> t = {
      {"chloromethane", "CH3Cl"},
      {"dichloromethane", "CH2Cl2"},
      {"trichloromethane", "CHCl3"},
      {"tetrachloromethane", "CCl4"},
      {"chloroethane", "C2H5Cl"},
      {"chloroethene", "C2H3Cl"},           // vinyl chloride
      {"1,1-dichloroethene", "C2H2Cl2"},
      {"cis-1,2-dichloroethene", "C2H2Cl2"},
      {"1,1-dichloroethane", "C2H4Cl2"},
      {"1,2-dichloroethane", "C2H4Cl2"},
      {"1,1,1-trichloroethane", "C2H3Cl3"},
      {"trichloroethene", "C2HCl3"},
      {"tetrachloroethene", "C2Cl4"},
      {"chlorobenzene", "C6H5Cl"},
      {"1,4-dichlorobenzene", "C6H4Cl2"},
      {"trichlorofluoromethane", "CCl3F"},  // CFC-11
      {"dichlorodifluoromethane", "CCl2F2"},  // CFC-12
      {"chlorodifluoromethane", "CHClF2"},  // HCFC-22
      {"dichlorofluoromethane", "CHCl2F"},  // HCFC-21
      {"1,1,2-trichloro-1,2,2-trifluoroethane", "C2Cl3F3"},  // CFC-113
      {"1,2-dichloro-1,1,2,2-tetrafluoroethane", "C2Cl2F4"},  // CFC-114
      {"chlorotrifluoroethene", "C2ClF3"},
      {"1,1-dichloro-1-fluoroethane", "C2H3Cl2F"},  // HCFC-141b
      {"1-chloro-1,1-difluoroethane", "C2H3ClF2"},  // HCFC-142b
  };
  return t;
}

const Halocarbon& find_halocarbon(std::string_view key) {
  for (const auto& h : halocarbon_table())
    if (h.name == key) return h;
  const Halocarbon* by_formula = nullptr;
  for (const auto& h : halocarbon_table())
    if (h.formula == key && !by_formula) by_formula = &h;
  if (by_formula) return *by_formula;
  std::string known;
  for (const auto& h : halocarbon_table()) known += (known.empty() ? "" : ", ") + std::string(h.name);
  throw InputError("compound", std::string(key), "a halocarbon name or formula: " + known);
}

namespace {
struct Parsed {
  Formula formula;
  double molar_mass;
};
// each entry's formula and molar mass, made once per process
const Parsed& parsed(const Halocarbon& entry) {
  static const std::vector<Parsed> p = [] {
    std::vector<Parsed> v;
    for (const auto& h : halocarbon_table()) {
      const Formula f = parse_formula(h.formula);
      v.push_back({f, molar_mass(f)});
    }
    return v;
  }();
  const auto& t = halocarbon_table();
  const std::less<const Halocarbon*> before;  // a total order of pointers, where < of unrelated ones is not
  if (before(&entry, t.data()) || !before(&entry, t.data() + t.size()))
    throw Error("internal: a halocarbon that is not an entry of the table");
  return p[static_cast<std::size_t>(&entry - t.data())];
}
}  // namespace

const Formula& halocarbon_formula(const Halocarbon& entry) { return parsed(entry).formula; }
double halocarbon_molar_mass(const Halocarbon& entry) { return parsed(entry).molar_mass; }

HalogenTotals halogen_totals(const std::vector<CompoundFraction>& compounds) {
  HalogenTotals t;
  for (const auto& c : compounds) {
    const Formula& f = halocarbon_formula(find_halocarbon(c.compound));
    check::fraction("compound mole fraction", c.mole_fraction);
    t.chlorine += c.mole_fraction * f[Element::Cl];  // x_Cl = Σ x_i n_Cl,i
    t.fluorine += c.mole_fraction * f[Element::F];
  }
  return t;
}

}  // namespace acidload
