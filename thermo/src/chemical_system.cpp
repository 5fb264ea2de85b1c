#include "protonflow/thermo/chemical_system.hpp"

#include <algorithm>
#include <limits>
#include <optional>
#include <fmt/format.h>
#include <set>

#include "protonflow/thermo/errors.hpp"
#include "protonflow/thermo/pitzer_parameters.hpp"
#include "protonflow/thermo/tableau.hpp"
#include "species_enthalpy.hpp"

namespace protonflow::thermo {

ChemicalSystem::ChemicalSystem(const Database& database, std::vector<std::string> components, SystemOptions options)
    : components_(std::move(components)), options_(std::move(options)) {
  if (std::find(components_.begin(), components_.end(), "H2O") == components_.end())
    throw ThermoError(ErrorKind::bad_input, "the component slate must include H2O, the solvent");
  const std::size_t water = database.index_of("H2O");
  water_formation_enthalpy_ = database.species()[water].formation_enthalpy
                                  ? database.species()[water].formation_enthalpy->value
                                  : std::numeric_limits<double>::quiet_NaN();
  const std::size_t proton = database.index_of("H^+");

  // Basis solutes: H^+ first, then every basis species a component needs, in database order.
  std::vector<BasisCombination> combinations;
  std::set<std::size_t> used{proton};
  for (const std::string& component : components_) {
    if (std::count(components_.begin(), components_.end(), component) > 1)
      throw ThermoError(ErrorKind::bad_input, fmt::format("component '{}' is listed twice", component));
    combinations.push_back(decompose(database, component));
    for (const auto& [index, k] : combinations.back())
      if (index != water) used.insert(index);
  }
  // An open gas brings its own basis species: water open to air takes up carbonate it never had.
  for (const std::string& name : options_.open_gases) {
    const Species& gas = database.species()[database.index_of(name)];
    for (const auto& [basis_name, k] : gas.reaction)
      if (basis_name != "H2O") used.insert(database.index_of(basis_name));
  }
  std::vector<std::size_t> basis{proton};
  for (std::size_t index : used)
    if (index != proton) basis.push_back(index);
  basis_count_ = basis.size();
  const auto basis_position = [&](const std::string& name) -> std::ptrdiff_t {
    for (std::size_t b = 0; b < basis.size(); ++b)
      if (database.species()[basis[b]].name == name) return static_cast<std::ptrdiff_t>(b);
    return -1;
  };

  // A formation reaction as coefficients per basis solute, with its water apart.
  const auto spread_reaction = [&](const Species& s, std::vector<double>& stoichiometry, double& water) {
    for (const auto& [name, k] : s.reaction) {
      if (name == "H2O") {
        water += k;
      } else {
        stoichiometry[static_cast<std::size_t>(basis_position(name))] += k;
      }
    }
  };
  // A constant fitted with the Pitzer parameters (pK of HSO4^- of Clegg, Rard & Pitzer 1994) replaces
  // the species data's under that model: the parameters mean something only with their own constant.
  // Its enthalpy and heat capacity go with it (below): the model's heats of dilution were fitted with
  // the ΔrH° and ΔrCp° its K(T) implies, not with the species data's.
  const auto pitzer_log_k = [](const Species& s) -> std::optional<TemperatureFunction> {
    for (const PitzerEquilibriumConstant& k : bundled_pitzer_parameters().equilibrium_constants) {
      if (k.species != s.name) continue;
      auto data = s.reaction, fitted = k.reaction;
      std::sort(data.begin(), data.end());
      std::sort(fitted.begin(), fitted.end());
      if (data != fitted)
        throw DataError(default_pitzer_parameters_file().string(), 0, 0,
                        fmt::format("the equilibrium constant of '{}' is for another reaction than the species data's",
                                    s.name));
      return k.log_k;
    }
    return std::nullopt;
  };
  const auto add_solute = [&](const Species& s) {
    Solute solute;
    solute.name = s.name;
    solute.charge = s.formula.charge;
    solute.ion_size_angstrom = s.ion_size_angstrom.value_or(0.0);
    solute.is_basis = s.is_basis;
    solute.stoichiometry.assign(basis_count_, 0.0);
    solute.minimum_temperature = s.minimum_temperature;
    solute.maximum_temperature = s.maximum_temperature;
    if (s.is_basis) {
      solute.stoichiometry[static_cast<std::size_t>(basis_position(s.name))] = 1.0;
    } else {
      spread_reaction(s, solute.stoichiometry, solute.water_coefficient);
      solute.log_k = s.log_k;
    }
    Species with_model_constant = s;
    if (!s.is_basis && options_.activity == ActivityModelKind::pitzer)
      if (const auto fitted = pitzer_log_k(s)) {
        solute.log_k = *fitted;
        // H° and Cp° from the basis species and the fitted K(T), as for a species without its own:
        // HSO4^- then sits 0.82 kJ/mol above the NBS value, at Clegg, Rard & Pitzer's eq. 21 (docs/activity.md).
        with_model_constant.log_k = *fitted;
        with_model_constant.formation_enthalpy.reset();
        with_model_constant.heat_capacity.reset();
      }
    const detail::StandardEnthalpy h = detail::standard_enthalpy(database, with_model_constant);
    solute.reference_enthalpy = h.at_reference;
    solute.heat_capacity = h.heat_capacity;
    if (solute.charge != 0 && solute.ion_size_angstrom <= 0.0)
      throw DataError(s.file, s.line, 1, fmt::format("charged species '{}' has no ion_size_angstrom", s.name));
    solutes_.push_back(std::move(solute));
  };
  for (std::size_t index : basis) add_solute(database.species()[index]);

  // Secondary solutes: every aqueous species whose reaction needs only the basis present.
  const auto reachable = [&](const Species& s) {
    return std::all_of(s.reaction.begin(), s.reaction.end(),
                       [&](const auto& term) { return term.first == "H2O" || basis_position(term.first) >= 0; });
  };
  // The Pitzer parameters carry some ion pairs in their binary terms; those pairs stay out.
  std::set<std::string, std::less<>> folded;
  if (options_.activity == ActivityModelKind::pitzer)
    for (const std::string& name : bundled_pitzer_parameters().folded_ion_pairs) folded.insert(name);
  if (options_.secondary_species.empty()) {
    for (const Species& s : database.species())
      if (!s.is_basis && s.phase == Phase::aqueous && reachable(s) && !folded.count(s.name))
        add_solute(s);
  } else {
    // OH^- belongs to every aqueous system: water's own ionization is never optional.
    std::vector<std::string> wanted = options_.secondary_species;
    if (std::find(wanted.begin(), wanted.end(), "OH^-") == wanted.end()) wanted.insert(wanted.begin(), "OH^-");
    for (const std::string& name : wanted) {
      const Species& s = database.species()[database.index_of(name)];
      if (s.is_basis) continue;
      if (!reachable(s))
        throw ThermoError(ErrorKind::bad_input,
                          fmt::format("species '{}' needs a basis species that no component brings", name));
      add_solute(s);
    }
  }

  // Solids and gases: every one the basis reaches; the options say which take part.
  const auto make_phase_species = [&](const Species& s) {
    PhaseSpecies p;
    p.name = s.name;
    p.stoichiometry.assign(basis_count_, 0.0);
    spread_reaction(s, p.stoichiometry, p.water_coefficient);
    p.log_k = s.log_k;
    // A solid's solubility product fitted with the Pitzer parameters (mirabilite, thenardite) replaces the
    // species data's under that model; its ΔrH° and ΔrCp° are the data's, so the solid's H° stays the data's.
    if (options_.activity == ActivityModelKind::pitzer)
      if (const auto fitted = pitzer_log_k(s)) p.log_k = *fitted;
    const detail::StandardEnthalpy h = detail::standard_enthalpy(database, s);
    p.reference_enthalpy = h.at_reference;
    p.heat_capacity = h.heat_capacity;
    p.minimum_temperature = s.minimum_temperature;
    p.maximum_temperature = s.maximum_temperature;
    return p;
  };
  const auto require_phase = [&](const std::string& name, Phase phase, const char* what) -> const Species& {
    const Species& s = database.species()[database.index_of(name)];
    if (s.phase != phase) throw ThermoError(ErrorKind::bad_input, fmt::format("'{}' is not a {}", name, what));
    if (!reachable(s))
      throw ThermoError(ErrorKind::bad_input,
                        fmt::format("{} '{}' needs a basis species that no component brings", what, name));
    return s;
  };
  for (const std::string& name : options_.allowed_solids) require_phase(name, Phase::solid, "solid");
  if (options_.precipitates == PrecipitateAge::any)
    throw ThermoError(ErrorKind::bad_input, "the precipitates to use are either the fresh or the aged ones");
  for (const Species& s : database.species()) {
    if (s.phase != Phase::solid || !reachable(s)) continue;
    PhaseSpecies p = make_phase_species(s);
    p.age = s.precipitate_age;
    // A solid of the other age is reported by its saturation index only.
    const bool right_age = p.age == PrecipitateAge::any || p.age == options_.precipitates;
    p.allowed = right_age && std::find(options_.allowed_solids.begin(), options_.allowed_solids.end(), s.name) !=
                                 options_.allowed_solids.end();
    solids_.push_back(std::move(p));
  }
  std::vector<std::size_t> pivots_taken;
  for (const std::string& name : options_.open_gases) {
    PhaseSpecies p = make_phase_species(require_phase(name, Phase::gas, "gas"));
    p.allowed = true;
    // The gas's activity fixes one basis species' activity: the first one not already fixed by another gas.
    bool found = false;
    for (std::size_t b = 1; b < basis_count_ && !found; ++b) {
      if (p.stoichiometry[b] == 0.0 || std::find(pivots_taken.begin(), pivots_taken.end(), b) != pivots_taken.end()) continue;
      p.pivot = b;
      pivots_taken.push_back(b);
      found = true;
    }
    if (!found)
      throw ThermoError(ErrorKind::bad_input,
                        fmt::format("open gas '{}' fixes no basis species of its own (water vapour belongs to a "
                                    "closed gas phase; two open gases may not fix the same species)",
                                    name));
    open_gases_.push_back(std::move(p));
  }
  if (options_.gas_phase) {
    for (const Species& s : database.species()) {
      if (s.phase != Phase::gas || !reachable(s)) continue;
      if (std::find(options_.open_gases.begin(), options_.open_gases.end(), s.name) != options_.open_gases.end())
        throw ThermoError(ErrorKind::bad_input,
                          fmt::format("gas '{}' is both open (fixed partial pressure) and part of a closed gas phase", s.name));
      PhaseSpecies p = make_phase_species(s);
      p.allowed = true;
      phase_gases_.push_back(std::move(p));
    }
  }

  for (std::size_t c = 0; c < components_.size(); ++c) {
    std::vector<double> per_basis(basis_count_, 0.0);
    double water_amount = 0.0;
    for (const auto& [index, k] : combinations[c]) {
      if (index == water) {
        water_amount += k;
      } else {
        per_basis[static_cast<std::size_t>(basis_position(database.species()[index].name))] += k;
      }
    }
    composition_.push_back(std::move(per_basis));
    water_in_.push_back(water_amount);
    const Species* named = database.find(components_[c]);
    molar_mass_.push_back(molar_mass(named ? named->formula : parse_formula(components_[c])));
  }

  minimum_temperature_ = 0.0;
  maximum_temperature_ = 1e9;
  const auto narrow = [&](double low, double high) {
    minimum_temperature_ = std::max(minimum_temperature_, low);
    maximum_temperature_ = std::min(maximum_temperature_, high);
  };
  for (const Solute& s : solutes_) narrow(s.minimum_temperature, s.maximum_temperature);
  for (const auto* list : {&solids_, &open_gases_, &phase_gases_})
    for (const PhaseSpecies& p : *list)
      if (p.allowed) narrow(p.minimum_temperature, p.maximum_temperature);
}

std::size_t ChemicalSystem::index_of_solute(std::string_view name) const {
  for (std::size_t i = 0; i < solutes_.size(); ++i)
    if (solutes_[i].name == name) return i;
  throw ThermoError(ErrorKind::unknown_species, fmt::format("'{}' is not a solute of this system", name));
}

std::size_t ChemicalSystem::index_of_component(std::string_view name) const {
  for (std::size_t i = 0; i < components_.size(); ++i)
    if (components_[i] == name) return i;
  throw ThermoError(ErrorKind::unknown_species, fmt::format("'{}' is not a component of this system", name));
}

}  // namespace protonflow::thermo
