// The chemical system in which a chemistry unit equilibrates every stream of an instance:
// one per instance, built from the slate at create (docs/units.md, "The chemical system").
#pragma once

#include <protonflow/unit_module.hpp>

#include <protonflow/thermo/chemical_system.hpp>

#include <array>
#include <memory>
#include <string>
#include <string_view>

namespace protonflow::units {

// The activity-model parameter every chemistry unit declares, and the choices behind it.
inline constexpr std::array<const char*, 3> activity_model_choices{"davies", "b-dot", "pitzer"};
inline constexpr pfu_parameter activity_model_parameter =
    unit::choice("activity_model", activity_model_choices, "davies", "activity coefficients: Davies, extended Debye-Hueckel (B-dot) or Pitzer (brines and acids to about 6 mol/kg)");

// The precipitate-form parameter every unit that precipitates solids declares: which form of a solid
// with a fresh (amorphous) and an aged (crystalline) form may precipitate (thermo::SystemOptions::precipitates).
inline constexpr std::array<const char*, 2> precipitate_form_choices{"fresh", "aged"};
inline constexpr pfu_parameter precipitate_form_parameter =
    unit::choice("precipitate_form", precipitate_form_choices, "fresh",
                 "fresh: amorphous solids as a neutraliser makes them (ferrihydrite, Al(OH)3(am), Zn(OH)2(am)); aged: "
                 "the crystalline forms (goethite, gibbsite, zincite); solids with one form are not affected");

// The system over the slate's components (H2O must be one) with the activity model named by
// activity_model (one of activity_model_choices) and the precipitates named by precipitate_form (one of
// precipitate_form_choices); every solid the slate reaches may precipitate,
// and a closed gas phase may form wherever the slate reaches a gas, which is always (water vapour).
// Every slate solid phase must be a solid of the species data. Refuses with UnitError
// (PFU_INVALID_PARAMETER, or PFU_INTERNAL_ERROR when the species data cannot be read), the message
// beginning "unit 'UNIT_TYPE': ".
std::unique_ptr<thermo::ChemicalSystem> make_stream_system(std::string_view unit_type, const unit::Slate& slate,
                                                           const std::string& activity_model,
                                                           const std::string& precipitate_form);

}  // namespace protonflow::units
