// Finding unit modules: the search path, and which module offers each unit type. Flowsheets name
// unit types, never files, so this is the only place a module's file is chosen.
#pragma once

#include <cstddef>
#include <filesystem>
#include <map>
#include <span>
#include <string>
#include <string_view>
#include <vector>

#include <protonflow/unit_host.hpp>

namespace protonflow::host {

// The directory the build puts its unit modules in.
std::filesystem::path builtin_unit_directory();

// Directories to search, first match wins: each --unit-dir in order, then the entries of
// environment (PROTONFLOW_UNIT_PATH, colon-separated, empty entries skipped), then builtin.
// A directory named twice keeps its first place.
std::vector<std::filesystem::path> unit_search_path(std::span<const std::string> unit_dirs, std::string_view environment,
                                                    const std::filesystem::path& builtin);

// The same, with PROTONFLOW_UNIT_PATH from the environment and the built-in directory.
std::vector<std::filesystem::path> unit_search_path(std::span<const std::string> unit_dirs);

// The module files of one directory (regular files with the platform's shared-library suffix),
// sorted by name; none if the directory does not exist. Subdirectories are not searched.
std::vector<std::filesystem::path> module_files(const std::filesystem::path& directory);

// A module file that could not be used, and why.
struct ModuleProblem {
  std::filesystem::path file;
  std::string message;
};

// A unit type that a module later on the path offers again, and which is therefore ignored there.
struct ShadowedUnit {
  std::string type;
  std::filesystem::path used;
  std::filesystem::path ignored;
};

// Every unit type found on a search path and the module that provides it.
class UnitCatalog {
 public:
  // Loads every module file of every directory; a module that fails to load becomes a problem.
  static UnitCatalog scan(std::span<const std::filesystem::path> search_path);

  // The module offering that type, or nullptr.
  const unit_host::Module* module_for(std::string_view type) const;
  // The description of that type, or nullptr.
  const unit_host::UnitClassInfo* unit_class(std::string_view type) const;
  // The module offering that type; throws std::runtime_error listing the known types, the
  // directories searched and the modules that failed to load.
  const unit_host::Module& require(std::string_view type) const;

  // Every type, sorted by name.
  std::vector<std::string> types() const;
  const std::vector<std::filesystem::path>& search_path() const noexcept { return search_path_; }
  const std::vector<unit_host::Module>& modules() const noexcept { return modules_; }
  const std::vector<ModuleProblem>& problems() const noexcept { return problems_; }
  const std::vector<ShadowedUnit>& shadowed() const noexcept { return shadowed_; }

 private:
  std::vector<std::filesystem::path> search_path_;
  std::vector<unit_host::Module> modules_;
  std::map<std::string, std::size_t, std::less<>> module_of_type_;  // index into modules_
  std::vector<ModuleProblem> problems_;
  std::vector<ShadowedUnit> shadowed_;
};

}  // namespace protonflow::host
