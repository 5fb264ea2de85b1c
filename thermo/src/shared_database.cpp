#include "protonflow/thermo/shared_database.hpp"

#include <algorithm>
#include <atomic>
#include <fstream>
#include <map>
#include <mutex>
#include <sstream>
#include <string>
#include <vector>

#include <fmt/format.h>

#include "protonflow/thermo/errors.hpp"

namespace protonflow::thermo {

namespace {

// Every *.yaml file of the directory with its text, in name order (a stable species order,
// whatever the file system's).
std::vector<DataText> read_data_files(const std::filesystem::path& directory) {
  if (!std::filesystem::is_directory(directory))
    throw ThermoError(ErrorKind::bad_data, fmt::format("species data directory '{}' does not exist", directory.string()));
  std::vector<std::filesystem::path> files;
  for (const auto& entry : std::filesystem::directory_iterator(directory))
    if (entry.path().extension() == ".yaml") files.push_back(entry.path());
  std::sort(files.begin(), files.end());
  if (files.empty())
    throw ThermoError(ErrorKind::bad_data, fmt::format("no *.yaml species data in '{}'", directory.string()));

  std::vector<DataText> texts;
  texts.reserve(files.size());
  for (const auto& file : files) {
    std::ifstream in(file, std::ios::binary);
    if (!in) throw DataError(file.string(), 0, 0, "cannot open the file");
    std::ostringstream text;
    text << in.rdbuf();
    if (in.bad() || text.fail()) throw DataError(file.string(), 0, 0, "cannot read the file");
    texts.push_back({file.string(), std::move(text).str()});
  }
  return texts;
}

bool same_files(const std::vector<DataText>& a, const std::vector<DataText>& b) {
  return std::equal(a.begin(), a.end(), b.begin(), b.end(),
                    [](const DataText& x, const DataText& y) { return x.file == y.file && x.text == y.text; });
}

// What one directory's database was parsed from, and the database.
struct ParsedDirectory {
  std::vector<DataText> files;
  std::shared_ptr<const Database> database;
};

// One per process, however many modules link the engine: it lives in the engine's shared library.
struct DatabaseCache {
  std::mutex mutex;
  std::map<std::string, ParsedDirectory> directories;
  std::atomic<long> parses = 0;
};

DatabaseCache& database_cache() {
  static DatabaseCache cache;
  return cache;
}

}  // namespace

std::shared_ptr<const Database> shared_database(const std::filesystem::path& directory) {
  std::vector<DataText> files = read_data_files(directory);
  DatabaseCache& cache = database_cache();
  // Parsing under the lock: two units created at once in two threads parse the files once.
  const std::scoped_lock lock(cache.mutex);
  const auto found = cache.directories.find(directory.string());
  if (found != cache.directories.end() && same_files(found->second.files, files)) return found->second.database;
  auto database = std::make_shared<const Database>(load_database(files));
  ++cache.parses;
  cache.directories.insert_or_assign(directory.string(), ParsedDirectory{std::move(files), database});
  return database;
}

long shared_database_parses() noexcept { return database_cache().parses.load(); }

Database load_database(const std::filesystem::path& directory) { return *shared_database(directory); }

}  // namespace protonflow::thermo
