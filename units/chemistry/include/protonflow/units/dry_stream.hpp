// A stream without an aqueous phase — a dry gas, dry solids, or both — and its enthalpy: the gas
// row as the system's phase gases and each solid row as its solid, at the stream's temperature.
// Without water there is no aqueous chemistry to equilibrate, so the phases are taken as they are
// given and do not react with each other (docs/units.md, "Dry inlets").
#pragma once

#include <protonflow/unit_module.hpp>

#include <protonflow/thermo/chemical_system.hpp>
#include <protonflow/thermo/equilibrium_solver.hpp>

#include <cstddef>
#include <optional>
#include <string>
#include <string_view>
#include <vector>

namespace protonflow::units {

class DryStream {
 public:
  // Finds, once, the phase gas each slate component is (if any) and the solid of each solid row;
  // the system is read here and must outlive the object.
  DryStream(std::string_view unit_type, const thermo::ChemicalSystem& system, const unit::Slate& slate);

  // Whether the stream's aqueous row is empty (and it carries flow elsewhere).
  static bool is_dry(const unit::InletState& stream);

  // Enthalpy (J, so W per second of flow) of the stream's gas and solid rows at temperature T (K).
  // A gas-row component that is no single gas of the system, or a solid row whose contents are not
  // its solid's composition, is a UnitError(PFU_BAD_INLET) naming `what`, the component and the row.
  double enthalpy(const unit::InletState& stream, double temperature, const std::string& what);

  // Of the last enthalpy(): mol in the gas phase, and mol of each solid (ChemicalSystem::solids() order).
  double gas_amount() const noexcept { return gas_amount_; }
  const std::vector<double>& solid_amount() const noexcept { return state_.solid_amount; }

 private:
  std::string unit_type_;
  const thermo::ChemicalSystem* system_;
  std::vector<std::string> components_;
  std::vector<std::string> solid_names_;            // the slate's solid rows
  std::vector<std::optional<std::size_t>> gas_of_;  // per component: its phase gas
  std::vector<std::optional<std::size_t>> solid_of_;  // per solid row: its solid in the system
  thermo::Speciation state_;                        // scratch: the dry state
  double gas_amount_ = 0.0;
};

}  // namespace protonflow::units
