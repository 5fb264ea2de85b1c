#include "species_enthalpy.hpp"

#include <cmath>
#include <limits>

#include "protonflow/thermo/constants.hpp"
#include "protonflow/thermo/temperature_function.hpp"
#include "protonflow/thermo/water_enthalpy.hpp"

namespace protonflow::thermo::detail {

StandardEnthalpy standard_enthalpy(const Database& database, const Species& s) {
  constexpr double reference = constants::reference_temperature;
  constexpr double unknown = std::numeric_limits<double>::quiet_NaN();
  if (s.phase == Phase::solvent) {
    return {s.formation_enthalpy ? s.formation_enthalpy->value : unknown, liquid_water_heat_capacity(reference)};
  }
  if (s.is_basis) {
    // A basis species without data has no enthalpy; without Cp° it is taken as 0 (docs/energy.md).
    return {s.formation_enthalpy ? s.formation_enthalpy->value : unknown, s.heat_capacity ? s.heat_capacity->value : 0.0};
  }
  // Σ ν (basis) + ΔrH° of formation: consistent with the species' log K(T).
  double from_reaction = reaction_enthalpy(s.log_k, reference, constants::standard_atmosphere);
  double heat_capacity_from_reaction = 0.0;
  for (const auto& [name, k] : s.reaction) {
    const StandardEnthalpy basis = standard_enthalpy(database, *database.find(name));
    from_reaction += k * basis.at_reference;
    heat_capacity_from_reaction += k * basis.heat_capacity;
  }
  if (s.log_k.form == TemperatureFunction::Form::five_term) {
    // ΔrCp = dΔrH/dT of the five-term form, by a central difference.
    const double h = 0.01;
    heat_capacity_from_reaction += (reaction_enthalpy(s.log_k, reference + h, constants::standard_atmosphere) -
                                    reaction_enthalpy(s.log_k, reference - h, constants::standard_atmosphere)) /
                                   (2.0 * h);
  }
  return {s.formation_enthalpy ? s.formation_enthalpy->value : from_reaction,
          s.heat_capacity ? s.heat_capacity->value : heat_capacity_from_reaction};
}

}  // namespace protonflow::thermo::detail
