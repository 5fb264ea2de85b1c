#include <protonflow/units/stream_chemistry.hpp>

#include <protonflow/thermo/database.hpp>
#include <protonflow/thermo/errors.hpp>
#include <protonflow/thermo/shared_database.hpp>
#include <protonflow/thermo/species.hpp>

namespace protonflow::units {

std::unique_ptr<thermo::ChemicalSystem> make_stream_system(std::string_view unit_type, const unit::Slate& slate,
                                                           const std::string& activity_model,
                                                           const std::string& precipitate_form) {
  const std::string prefix = "unit '" + std::string(unit_type) + "': ";
  if (!slate.find_component("H2O")) throw unit::UnitError(PFU_INVALID_PARAMETER, prefix + "the slate must include H2O, the solvent");
  thermo::SystemOptions options;
  options.activity = activity_model == "b-dot"    ? thermo::ActivityModelKind::b_dot
                     : activity_model == "pitzer" ? thermo::ActivityModelKind::pitzer
                                                  : thermo::ActivityModelKind::davies;
  options.precipitates = precipitate_form == "aged" ? thermo::PrecipitateAge::aged : thermo::PrecipitateAge::fresh;
  // The species data, parsed once per process and shared, read-only, by the host and every unit
  // (shared_database.hpp): each create checks the files against that parse, which costs a read of
  // them, not a parse. The system keeps nothing of the database, so a later change of the files
  // leaves this unit's system as it was created.
  std::shared_ptr<const thermo::Database> shared;
  try {
    shared = thermo::shared_database(thermo::default_data_directory());
  } catch (const thermo::ThermoError& error) {
    throw unit::UnitError(PFU_INTERNAL_ERROR, prefix + "cannot read the species data: " + error.what());
  }
  const thermo::Database& database = *shared;
  try {
    for (const std::string& solid : slate.solids) {
      const thermo::Species* species = database.find(solid);
      if (species == nullptr || species->phase != thermo::Phase::solid) {
        throw unit::UnitError(PFU_INVALID_PARAMETER, prefix + "slate solid phase '" + solid +
                                                         "' is not a solid of the species data (thermo/data/solids.yaml)");
      }
    }
    // Every solid the slate reaches may precipitate; a gas phase may form wherever the slate
    // reaches a gas (it always reaches water vapour).
    thermo::SystemOptions probe = options;
    probe.gas_phase = true;
    const thermo::ChemicalSystem reach(database, slate.components, probe);
    for (const thermo::PhaseSpecies& solid : reach.solids()) options.allowed_solids.push_back(solid.name);
    options.gas_phase = !reach.phase_gases().empty();
    return std::make_unique<thermo::ChemicalSystem>(database, slate.components, options);
  } catch (const thermo::ThermoError& error) {
    throw unit::UnitError(PFU_INVALID_PARAMETER, prefix + "the slate cannot be used: " + error.what());
  }
}

}  // namespace protonflow::units
