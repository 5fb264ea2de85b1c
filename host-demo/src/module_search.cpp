#include "module_search.hpp"

#include <algorithm>
#include <cstdlib>
#include <stdexcept>
#include <system_error>

#include <boost/dll/shared_library.hpp>

namespace protonflow::host {

std::filesystem::path builtin_unit_directory() { return PROTONFLOW_UNIT_DIR; }

std::vector<std::filesystem::path> unit_search_path(std::span<const std::string> unit_dirs, std::string_view environment,
                                                    const std::filesystem::path& builtin) {
  std::vector<std::filesystem::path> path;
  const auto add = [&](std::string_view directory) {
    if (directory.empty()) return;
    const std::filesystem::path normal = std::filesystem::path(directory).lexically_normal();
    if (std::ranges::find(path, normal) == path.end()) path.push_back(normal);
  };
  for (const std::string& directory : unit_dirs) add(directory);
  while (!environment.empty()) {
    const std::size_t colon = environment.find(':');
    add(environment.substr(0, colon));
    environment = colon == std::string_view::npos ? std::string_view{} : environment.substr(colon + 1);
  }
  add(builtin.string());
  return path;
}

std::vector<std::filesystem::path> unit_search_path(std::span<const std::string> unit_dirs) {
  const char* environment = std::getenv("PROTONFLOW_UNIT_PATH");
  return unit_search_path(unit_dirs, environment == nullptr ? "" : environment, builtin_unit_directory());
}

std::vector<std::filesystem::path> module_files(const std::filesystem::path& directory) {
  std::vector<std::filesystem::path> files;
  std::error_code error;
  const std::string suffix = boost::dll::shared_library::suffix().string();
  // A directory that does not exist (or cannot be read) holds no modules; it is not an error,
  // because the built-in and environment entries are often absent.
  for (std::filesystem::directory_iterator entry(directory, error), end; !error && entry != end; entry.increment(error)) {
    std::error_code status_error;
    if (entry->is_regular_file(status_error) && entry->path().extension() == suffix) files.push_back(entry->path());
  }
  std::ranges::sort(files);
  return files;
}

UnitCatalog UnitCatalog::scan(std::span<const std::filesystem::path> search_path) {
  UnitCatalog catalog;
  catalog.search_path_.assign(search_path.begin(), search_path.end());
  for (const std::filesystem::path& directory : search_path) {
    for (const std::filesystem::path& file : module_files(directory)) {
      try {
        unit_host::Module module(file);
        const std::size_t index = catalog.modules_.size();
        for (const unit_host::UnitClassInfo& unit_class : module.classes()) {
          const auto [where, added] = catalog.module_of_type_.try_emplace(unit_class.type, index);
          if (!added) catalog.shadowed_.push_back({unit_class.type, catalog.modules_[where->second].file(), file});
        }
        catalog.modules_.push_back(std::move(module));
      } catch (const unit_host::LoadError& error) {
        catalog.problems_.push_back({file, error.what()});
      }
    }
  }
  return catalog;
}

const unit_host::Module* UnitCatalog::module_for(std::string_view type) const {
  const auto found = module_of_type_.find(type);
  return found == module_of_type_.end() ? nullptr : &modules_[found->second];
}

const unit_host::UnitClassInfo* UnitCatalog::unit_class(std::string_view type) const {
  const unit_host::Module* module = module_for(type);
  return module == nullptr ? nullptr : module->find(type);
}

const unit_host::Module& UnitCatalog::require(std::string_view type) const {
  if (const unit_host::Module* module = module_for(type)) return *module;
  std::string message = "unknown unit type '" + std::string(type) + "'";
  const std::vector<std::string> known = types();
  message += known.empty() ? "; no unit types were found" : "; known types:";
  for (const std::string& name : known) message += " " + name;
  message += "\nsearched:";
  for (const std::filesystem::path& directory : search_path_) message += " " + directory.string();
  if (search_path_.empty()) message += " (no directories)";
  for (const ModuleProblem& problem : problems_) message += "\nnot loaded: " + problem.message;
  throw std::runtime_error(message);
}

std::vector<std::string> UnitCatalog::types() const {
  std::vector<std::string> names;
  for (const auto& [name, index] : module_of_type_) names.push_back(name);
  return names;  // std::map keeps them sorted
}

}  // namespace protonflow::host
