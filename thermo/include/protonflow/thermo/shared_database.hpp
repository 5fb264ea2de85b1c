// The species data of a directory, parsed once per process and shared: the host and every unit
// module that links the engine (one shared library, libprotonflow_thermo) read the same database.
#pragma once

#include <filesystem>
#include <memory>

#include "protonflow/thermo/database.hpp"

namespace protonflow::thermo {

// The database of every *.yaml file of the directory. The files are read at every call and
// compared, name by name and byte by byte, with those the directory's database was parsed from;
// while they are the same, every call returns that same database, and a file added, removed or
// changed is parsed again. The directory is the key as spelled, so that each species' file name
// reads as a fresh load would give it. Safe from any thread; the database is immutable, and one
// that a changed file replaced lives on while anyone holds it. Throws as load_database.
std::shared_ptr<const Database> shared_database(const std::filesystem::path& directory);

// How many times shared_database has parsed files in this process, over every directory and every
// caller (the host's and the unit modules'): what shows that they share one parse.
long shared_database_parses() noexcept;

}  // namespace protonflow::thermo
