#include "species_data.hpp"

#include "input_error.hpp"
#include "protonflow/thermo/errors.hpp"
#include "protonflow/thermo/shared_database.hpp"

namespace protonflow::host {

std::shared_ptr<const thermo::Database> load_species_data(const std::filesystem::path& directory) {
  if (!std::filesystem::is_directory(directory)) {
    throw InputError(SourcePosition{directory.string(), 0, 0}, "the species data directory does not exist");
  }
  try {
    return thermo::shared_database(directory);
  } catch (const thermo::DataError& error) {
    throw InputError(SourcePosition{error.file(), error.line(), error.column()}, error.what());
  } catch (const thermo::ThermoError& error) {
    throw InputError(SourcePosition{directory.string(), 0, 0}, error.what());
  }
}

}  // namespace protonflow::host
