#include <protonflow/units/dry_stream.hpp>

#include <protonflow/thermo/errors.hpp>
#include <protonflow/thermo/stream_enthalpy.hpp>
#include <protonflow/units/message_text.hpp>
#include <protonflow/units/thermo_failure.hpp>

#include <algorithm>
#include <cmath>

namespace protonflow::units {

namespace {

// Stoichiometric coefficients are simple fractions; compositions that agree to this are the same.
constexpr double same_composition = 1e-9;

bool matches(const std::vector<double>& composition, double water, const thermo::PhaseSpecies& species, double scale) {
  if (std::abs(water - scale * species.water_coefficient) > same_composition * std::max(1.0, std::abs(water))) return false;
  for (std::size_t b = 0; b < composition.size(); ++b) {
    if (std::abs(composition[b] - scale * species.stoichiometry[b]) > same_composition * std::max(1.0, std::abs(composition[b]))) {
      return false;
    }
  }
  return true;
}

}  // namespace

DryStream::DryStream(std::string_view unit_type, const thermo::ChemicalSystem& system, const unit::Slate& slate)
    : unit_type_(unit_type), system_(&system), components_(slate.components), solid_names_(slate.solids) {
  for (std::size_t c = 0; c < components_.size(); ++c) {
    std::optional<std::size_t> found;
    const auto& gases = system.phase_gases();
    for (std::size_t g = 0; g < gases.size() && !found; ++g) {
      if (matches(system.composition(c), system.water_in(c), gases[g], 1.0)) found = g;
    }
    gas_of_.push_back(found);
  }
  for (const std::string& name : solid_names_) {
    const auto& solids = system.solids();
    const auto found = std::ranges::find(solids, name, &thermo::PhaseSpecies::name);
    solid_of_.push_back(found == solids.end() ? std::nullopt : std::optional<std::size_t>(found - solids.begin()));
  }
  state_.molality.assign(system.solutes().size(), 0.0);
  state_.activity.assign(system.solutes().size(), 0.0);
  state_.log10_gamma.assign(system.solutes().size(), 0.0);
  state_.solid_amount.assign(system.solids().size(), 0.0);
  state_.saturation_index.assign(system.solids().size(), 0.0);
  state_.gas_amount.assign(system.phase_gases().size(), 0.0);
  state_.partial_pressure.assign(system.phase_gases().size(), 0.0);
}

bool DryStream::is_dry(const unit::InletState& stream) {
  const auto aqueous = stream.phase(PFU_AQUEOUS_ROW);
  if (!std::ranges::all_of(aqueous, [](double flow) { return flow == 0.0; })) return false;
  return std::ranges::any_of(stream.flows, [](double flow) { return flow > 0.0; });
}

double DryStream::enthalpy(const unit::InletState& stream, double temperature, const std::string& what) {
  const std::string head = "unit '" + unit_type_ + "': " + what + ": ";
  std::ranges::fill(state_.solid_amount, 0.0);
  std::ranges::fill(state_.gas_amount, 0.0);
  gas_amount_ = 0.0;
  for (std::size_t c = 0; c < components_.size(); ++c) {
    const double flow = stream.flow(PFU_GAS_ROW, c);
    if (flow == 0.0) continue;
    if (!gas_of_[c]) {
      throw unit::UnitError(PFU_BAD_INLET, head + "its gas row carries " + components_[c] +
                                               ", which is no gas of the species data; a dry gas must be made of gases "
                                               "such as HCl, CO2 or H2O (vapour)");
    }
    state_.gas_amount[*gas_of_[c]] += flow;
    gas_amount_ += flow;
  }
  for (std::size_t i = 0; i < solid_names_.size(); ++i) {
    const std::size_t row = PFU_FIRST_SOLID_ROW + i;
    std::vector<double> basis(system_->basis_count(), 0.0);
    double water = 0.0;
    bool any = false;
    for (std::size_t c = 0; c < components_.size(); ++c) {
      const double flow = stream.flow(row, c);
      if (flow == 0.0) continue;
      any = true;
      for (std::size_t b = 0; b < basis.size(); ++b) basis[b] += flow * system_->composition(c)[b];
      water += flow * system_->water_in(c);
    }
    if (!any) continue;
    const std::string refused = head + "its " + solid_names_[i] + " row is not " + solid_names_[i];
    if (!solid_of_[i]) throw unit::UnitError(PFU_BAD_INLET, refused + ": the species data have no such solid here");
    const thermo::PhaseSpecies& solid = system_->solids()[*solid_of_[i]];
    // The amount of the solid whose composition the row's contents are.
    double amount = 0.0;
    for (std::size_t b = 0; b < basis.size() && amount == 0.0; ++b) {
      if (solid.stoichiometry[b] != 0.0) amount = basis[b] / solid.stoichiometry[b];
    }
    if (!(amount > 0.0) || !matches(basis, water, solid, amount)) {
      throw unit::UnitError(PFU_BAD_INLET, refused + ": its components do not add up to that solid's formula");
    }
    state_.solid_amount[*solid_of_[i]] += amount;
  }
  state_.temperature = temperature;
  state_.pressure = stream.pressure;
  state_.water_mass = 0.0;
  state_.gas_phase_present = gas_amount_ > 0.0;
  state_.gas_phase_amount = gas_amount_;
  try {
    return thermo::state_enthalpy(*system_, state_);
  } catch (const thermo::ThermoError& error) {
    throw_unit_error(error, unit_type_, what, PFU_BAD_INLET);
  }
}

}  // namespace protonflow::units
