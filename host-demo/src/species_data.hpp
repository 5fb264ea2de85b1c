// The species data, read for a command: a bad data file becomes an InputError at its own line.
#pragma once

#include <filesystem>
#include <memory>

#include "protonflow/thermo/database.hpp"

namespace protonflow::host {

// Reads every data file of the directory; throws InputError naming the file, line and column. The
// process's one parse of those files (thermo/shared_database.hpp), which the unit modules share.
std::shared_ptr<const thermo::Database> load_species_data(const std::filesystem::path& directory);

}  // namespace protonflow::host
