#include "acidload/core/species.hpp"

#include <cctype>

#include "acidload/core/error.hpp"

namespace acidload {

double atomic_weight(Element e) {
  switch (e) {  // [g/mol]
    // IUPAC 2007 standard values (from memory), each inside the IUPAC 2011 interval (seen); the
    // abridged "conventional" values 1.008 … 15.999 are not used: O 15.999 lies below its interval.
    case Element::H: return 1.00794;        // interval [1.00784, 1.00811]
    case Element::C: return 12.0107;        // interval [12.0096, 12.0116]
    case Element::N: return 14.0067;        // interval [14.00643, 14.00728]
    case Element::O: return 15.9994;        // interval [15.99903, 15.99977]
    case Element::S: return 32.065;         // interval [32.059, 32.076]
    case Element::Cl: return 35.453;        // interval [35.446, 35.457]
    case Element::F: return 18.998403163;   // IUPAC, PAC 88(3) 2016
    case Element::K: return 39.0983;        // IUPAC
    case Element::Ar: return 39.948;        // IUPAC conventional
  }
  return 0;
}

std::string_view symbol(Element e) {
  static constexpr std::string_view s[] = {"H", "C", "N", "O", "S", "Cl", "F", "K", "Ar"};
  return s[static_cast<std::size_t>(e)];
}

namespace {
bool element_from_symbol(std::string_view sym, Element& out) {
  for (std::size_t i = 0; i < element_count; ++i)
    if (symbol(static_cast<Element>(i)) == sym) {
      out = static_cast<Element>(i);
      return true;
    }
  return false;
}

// Recursive-descent parser: formula := group*; group := (element | '(' formula ')') count?
struct Parser {
  std::string_view text;
  std::size_t pos = 0;
  int depth = 0;

  [[noreturn]] void fail(const std::string& what) const {
    throw InputError("formula", std::string(text),
                     what + " at character " + std::to_string(pos + 1) +
                         " (elements: H C N O S Cl F K Ar, counts, parentheses)");
  }
  double count() {
    std::size_t start = pos;
    double n = 0;
    while (pos < text.size() && std::isdigit(static_cast<unsigned char>(text[pos]))) {
      n = n * 10 + (text[pos] - '0');
      if (n > 1e6) fail("a count too large");
      ++pos;
    }
    return pos == start ? 1.0 : n;
  }
  Formula sequence() {
    Formula f;
    while (pos < text.size() && text[pos] != ')') {
      Formula g;
      if (text[pos] == '(') {
        if (++depth > 8) fail("parentheses nested too deep");
        ++pos;
        g = sequence();
        if (pos >= text.size() || text[pos] != ')') fail("a closing parenthesis");
        ++pos;
        --depth;
      } else if (std::isupper(static_cast<unsigned char>(text[pos]))) {
        std::size_t start = pos++;
        if (pos < text.size() && std::islower(static_cast<unsigned char>(text[pos]))) ++pos;
        Element e;
        if (!element_from_symbol(text.substr(start, pos - start), e)) {
          pos = start;
          fail("a known element symbol");
        }
        g[e] = 1;
      } else {
        fail("an element symbol or '('");
      }
      double n = count();
      if (n == 0) fail("a count of at least 1");
      for (std::size_t i = 0; i < element_count; ++i) f.atoms[i] += n * g.atoms[i];
    }
    return f;
  }
};
}  // namespace

Formula parse_formula(std::string_view text) {
  Parser p{text};
  if (text.empty()) throw InputError("formula", "", "a chemical formula such as \"H2S\"");
  Formula f = p.sequence();
  if (p.pos != text.size()) p.fail("no unmatched ')'");
  return f;
}

double molar_mass(const Formula& f) {
  double m = 0;
  for (std::size_t i = 0; i < element_count; ++i) m += f.atoms[i] * atomic_weight(static_cast<Element>(i));
  return m * 1e-3;  // g/mol -> kg/mol
}

double molar_mass(std::string_view formula_text) { return molar_mass(parse_formula(formula_text)); }

namespace {
constexpr std::string_view gas_formulas[] = {"CH4", "CO2", "N2", "O2",  "H2S", "H2O", "H2", "C2H6",
                                             "C3H8", "Ar", "SO2", "SO3", "HCl", "HF",  "NO2"};
const std::array<Formula, gas_count>& gas_formula_table() {
  static const std::array<Formula, gas_count> t = [] {
    std::array<Formula, gas_count> a{};
    for (std::size_t i = 0; i < gas_count; ++i) a[i] = parse_formula(gas_formulas[i]);
    return a;
  }();
  return t;
}
constexpr std::string_view acid_formulas[] = {"H2SO4", "HCl", "HF", "HNO3"};
}  // namespace

std::string_view formula_text(Gas g) { return gas_formulas[static_cast<std::size_t>(g)]; }
const Formula& formula(Gas g) { return gas_formula_table()[static_cast<std::size_t>(g)]; }
double molar_mass(Gas g) {
  static const std::array<double, gas_count> m = [] {  // summed once over the elements
    std::array<double, gas_count> t{};
    for (std::size_t i = 0; i < gas_count; ++i) t[i] = molar_mass(formula(static_cast<Gas>(i)));
    return t;
  }();
  return m[static_cast<std::size_t>(g)];
}

Gas gas_from_formula(std::string_view text) {
  for (std::size_t i = 0; i < gas_count; ++i)
    if (gas_formulas[i] == text) return static_cast<Gas>(i);
  std::string known;
  for (auto f : gas_formulas) known += (known.empty() ? "" : ", ") + std::string(f);
  throw InputError("species", std::string(text), "one of " + known);
}

std::string_view formula_text(Acid a) { return acid_formulas[static_cast<std::size_t>(a)]; }
double molar_mass(Acid a) {
  // parsed once: the hot path (acid inflow as KOH, every segment) asks for these constantly
  static const std::array<double, 4> m = [] {
    std::array<double, 4> t{};
    for (std::size_t i = 0; i < t.size(); ++i) t[i] = molar_mass(acid_formulas[i]);
    return t;
  }();
  return m[static_cast<std::size_t>(a)];
}

double koh_equivalents(Acid a) {
  switch (a) {
    case Acid::H2SO4: return 2;  // diprotic
    case Acid::HCl: return 1;
    case Acid::HF: return 1;
    case Acid::HNO3: return 1;
  }
  return 0;
}

double koh_molar_mass() {
  static const double m = molar_mass("KOH");  // parsed once (thread-safe static), not per segment
  return m;
}

double mg_koh_per_mg(Acid a) { return koh_equivalents(a) * koh_molar_mass() / molar_mass(a); }

}  // namespace acidload
