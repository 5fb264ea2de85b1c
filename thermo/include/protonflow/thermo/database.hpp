// The species database: every species of thermo/data/*.yaml, checked for consistency.
#pragma once

#include <filesystem>
#include <string>
#include <string_view>
#include <vector>

#include "protonflow/thermo/species.hpp"

namespace protonflow::thermo {

class Database {
 public:
  explicit Database(std::vector<Species> species);

  const std::vector<Species>& species() const noexcept { return species_; }
  // The species of that name, or nullptr.
  const Species* find(std::string_view name) const noexcept;
  // Index of the species of that name; throws ThermoError(unknown_species) listing near names.
  std::size_t index_of(std::string_view name) const;

 private:
  std::vector<Species> species_;
};

// Reads every *.yaml file of a directory; throws DataError with file, line and column. A copy of
// the process's one parse of those files while they are unchanged (shared_database.hpp).
Database load_database(const std::filesystem::path& directory);

// Species data held in memory: the text of one data file and the name to report it under.
struct DataText {
  std::string file;
  std::string text;
};

// Reads species data from texts, in their order, with the same checks as the directory form.
Database load_database(const std::vector<DataText>& texts);

// The directory of the bundled data: $PROTONFLOW_DATA_DIR if set, else the build's data folder.
std::filesystem::path default_data_directory();

}  // namespace protonflow::thermo
