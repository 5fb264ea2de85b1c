#include "protonflow/thermo/pitzer_enthalpy.hpp"

namespace protonflow::thermo {

namespace {

SoluteProperties solute_properties(const ChemicalSystem& system) {
  SoluteProperties p;
  for (const Solute& s : system.solutes()) {
    p.charge.push_back(s.charge);
    p.ion_size_angstrom.push_back(s.ion_size_angstrom);
    p.name.push_back(s.name);
  }
  return p;
}

}  // namespace

PitzerExcessEnthalpy::PitzerExcessEnthalpy(const ChemicalSystem& system, const PitzerParameters& parameters)
    : model_(solute_properties(system), parameters) {}

double PitzerExcessEnthalpy::excess_enthalpy(const ChemicalSystem&, const Speciation& state) const {
  return state.water_mass * model_.relative_enthalpy(state.temperature, state.pressure, state.molality);
}

std::unique_ptr<ExcessEnthalpyModel> make_excess_enthalpy_model(const ChemicalSystem& system) {
  if (system.options().activity != ActivityModelKind::pitzer) return nullptr;
  return std::make_unique<PitzerExcessEnthalpy>(system);
}

}  // namespace protonflow::thermo
