#include "protonflow/thermo/tableau.hpp"

#include <algorithm>
#include <cmath>
#include <fmt/format.h>
#include <map>

#include "protonflow/thermo/errors.hpp"

namespace protonflow::thermo {

namespace {

bool is_hydrogen_or_oxygen(const std::string& element) { return element == "H" || element == "O"; }

// Element counts without H and O: those two are free, balanced by H2O and H^+.
std::map<std::string, double> heavy_elements(const Formula& formula) {
  std::map<std::string, double> heavy;
  for (const auto& [element, count] : formula.elements)
    if (!is_hydrogen_or_oxygen(element)) heavy[element] = count;
  return heavy;
}

double count_of(const Formula& formula, const std::string& element) {
  const auto it = formula.elements.find(element);
  return it == formula.elements.end() ? 0.0 : it->second;
}

// Depth-first search for every exact cover of the heavy elements by basis species with positive
// integer coefficients, each heavy element from one basis species only (two sulfur species in one
// cover would be a disproportionation, e.g. thiosulfate as sulfate + sulfide); keeps the covers
// with the fewest distinct species.
class CoverSearch {
 public:
  CoverSearch(const Database& database, const Formula& target)
      : database_(database), target_(target), target_heavy_(heavy_elements(target)) {
    const auto& heavy = target_heavy_;
    for (std::size_t i = 0; i < database.species().size(); ++i) {
      const Species& s = database.species()[i];
      if (!s.is_basis || s.phase != Phase::aqueous || s.name == "H^+") continue;
      const auto own = heavy_elements(s.formula);
      if (own.empty()) continue;
      bool fits = true;
      for (const auto& [element, count] : own) fits = fits && heavy.contains(element) && count <= heavy.at(element) + 1e-9;
      if (fits) candidates_.push_back(i);
    }
  }

  std::vector<BasisCombination> best_covers() {
    BasisCombination chosen;
    search(0, target_heavy_, chosen);
    return best_;
  }

 private:
  void search(std::size_t next, std::map<std::string, double> remaining, BasisCombination& chosen) {
    if (std::all_of(remaining.begin(), remaining.end(), [](const auto& e) { return std::abs(e.second) < 1e-9; })) {
      consider(chosen);
      return;
    }
    for (std::size_t c = next; c < candidates_.size(); ++c) {
      const auto own = heavy_elements(database_.species()[candidates_[c]].formula);
      const bool element_already_supplied = std::any_of(own.begin(), own.end(), [&](const auto& e) {
        return std::abs(remaining[e.first] - target_heavy_.at(e.first)) > 1e-9;
      });
      if (element_already_supplied) continue;
      // the largest coefficient this species can take without overshooting any element
      double limit = 1e300;
      for (const auto& [element, count] : own) limit = std::min(limit, std::floor(remaining[element] / count + 1e-9));
      for (double k = limit; k >= 1.0; k -= 1.0) {
        auto after = remaining;
        for (const auto& [element, count] : own) after[element] -= k * count;
        chosen.emplace_back(candidates_[c], k);
        search(c + 1, after, chosen);
        chosen.pop_back();
      }
    }
  }

  // H2O from the oxygen count, H^+ from the hydrogen count; the charge must then be right (no redox).
  void consider(const BasisCombination& chosen) {
    double oxygen = 0.0, hydrogen = 0.0, charge = 0.0;
    for (const auto& [index, k] : chosen) {
      const Formula& f = database_.species()[index].formula;
      oxygen += k * count_of(f, "O");
      hydrogen += k * count_of(f, "H");
      charge += k * f.charge;
    }
    const double water = count_of(target_, "O") - oxygen;
    const double protons = count_of(target_, "H") - hydrogen - 2.0 * water;
    if (std::abs(charge + protons - target_.charge) > 1e-9) return;
    BasisCombination full = chosen;
    if (std::abs(water) > 1e-12) full.emplace_back(database_.index_of("H2O"), water);
    if (std::abs(protons) > 1e-12) full.emplace_back(database_.index_of("H^+"), protons);
    if (best_.empty() || chosen.size() < best_size_) {
      best_ = {full};
      best_size_ = chosen.size();
    } else if (chosen.size() == best_size_) {
      best_.push_back(full);
    }
  }

  const Database& database_;
  const Formula& target_;
  const std::map<std::string, double> target_heavy_;
  std::vector<std::size_t> candidates_;
  std::vector<BasisCombination> best_;
  std::size_t best_size_ = 0;
};

std::string describe(const Database& database, const BasisCombination& combination) {
  std::string text;
  for (const auto& [index, k] : combination)
    text += fmt::format("{}{:g} {}", text.empty() ? "" : " + ", k, database.species()[index].name);
  return text;
}

}  // namespace

BasisCombination decompose(const Database& database, std::string_view component) {
  // A database species named or written exactly so: its own reaction is the decomposition.
  // A pure liquid (H2SO4(l)) has no reaction: it decomposes by its formula like any compound.
  const auto has_reaction = [](const Species& s) { return s.is_basis || !s.reaction.empty(); };
  const Species* named = database.find(component);
  Formula formula;
  if (named) {
    formula = named->formula;
    if (!has_reaction(*named)) named = nullptr;
  } else {
    formula = parse_formula(component);
  }
  if (!named) {
    for (const Species& s : database.species()) {
      if (has_reaction(s) && s.formula.elements == formula.elements && s.formula.charge == formula.charge) {
        named = &s;
        break;
      }
    }
  }
  if (formula.charge != 0)
    throw ThermoError(ErrorKind::bad_input,
                      fmt::format("component '{}' is charged; a stream's components are neutral compounds", component));
  if (named) {
    if (named->is_basis) return {{database.index_of(named->name), 1.0}};
    BasisCombination combination;
    for (const auto& [name, k] : named->reaction) combination.emplace_back(database.index_of(name), k);
    return combination;
  }
  const auto covers = CoverSearch(database, formula).best_covers();
  if (covers.empty())
    throw ThermoError(ErrorKind::unknown_species,
                      fmt::format("no combination of the database's basis species makes '{}' without a change of "
                                  "oxidation state; check the formula or add the species to thermo/data",
                                  component));
  if (covers.size() > 1)
    throw ThermoError(ErrorKind::unknown_species,
                      fmt::format("'{}' can be read as {} or as {}; add it to thermo/data to say which",
                                  component, describe(database, covers[0]), describe(database, covers[1])));
  return covers.front();
}

}  // namespace protonflow::thermo
