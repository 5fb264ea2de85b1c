// The species data are parsed once per process: the chemistry unit modules and the host (here, the
// test) link one engine, libprotonflow_thermo, so a parse by any of them is the parse of all. The
// modules read the data from $PROTONFLOW_DATA_DIR, pointed here at a copy of the bundled data that
// no one has parsed yet.
#include <catch2/catch.hpp>

#include <cstdlib>
#include <filesystem>
#include <fstream>
#include <memory>
#include <optional>
#include <string>

#include "../support/temporary_directory.hpp"
#include "protonflow/thermo/database.hpp"
#include "protonflow/thermo/shared_database.hpp"
#include "units_test_support.hpp"

using namespace units_test;
using host::ParameterValue;
namespace thermo = protonflow::thermo;

namespace {

// Points the modules at another data directory for the life of the object.
class DataDirectoryOverride {
 public:
  explicit DataDirectoryOverride(const std::filesystem::path& directory) {
    if (const char* old = std::getenv("PROTONFLOW_DATA_DIR")) previous_ = old;
    ::setenv("PROTONFLOW_DATA_DIR", directory.c_str(), 1);
  }
  DataDirectoryOverride(const DataDirectoryOverride&) = delete;
  DataDirectoryOverride& operator=(const DataDirectoryOverride&) = delete;
  ~DataDirectoryOverride() {
    if (previous_) {
      ::setenv("PROTONFLOW_DATA_DIR", previous_->c_str(), 1);
    } else {
      ::unsetenv("PROTONFLOW_DATA_DIR");
    }
  }

 private:
  std::optional<std::string> previous_;
};

const host::Slate water_slate{{"H2O"}, {}};
const host::Slate hcl_naoh{{"H2O", "HCl", "NaOH"}, {}};

}  // namespace

TEST_CASE("the unit modules and the host share one parse of the species data") {
  const protonflow::test_support::TemporaryDirectory temporary;
  const auto data = temporary.path() / "data";
  std::filesystem::copy(thermo::default_data_directory(), data, std::filesystem::copy_options::recursive);
  const DataDirectoryOverride override_data(data);
  REQUIRE(thermo::default_data_directory() == data);

  const host::Module heater(UNITS_HEATER_MODULE);
  const host::Module neutraliser(UNITS_NEUTRALISER_MODULE);
  const host::Module mixer(UNITS_ACID_MIXER_MODULE);
  const long parses_before = thermo::shared_database_parses();

  // The heater's create parses the copy, through the one engine this test links too.
  const host::Instance heating = heater.create("heater", std::vector<ParameterValue>{{"outlet_temperature", 308.15}},
                                               water_slate);
  CHECK(thermo::shared_database_parses() == parses_before + 1);
  // The other modules, and the host, find it parsed.
  const host::Instance neutralising = neutraliser.create("neutraliser", std::vector<ParameterValue>{}, hcl_naoh);
  const host::Instance mixing = mixer.create("acid_mixer", std::vector<ParameterValue>{}, hcl_naoh);
  const std::shared_ptr<const thermo::Database> database = thermo::shared_database(data);
  CHECK(thermo::shared_database_parses() == parses_before + 1);
  CHECK(database->find("H2O") != nullptr);

  // A changed file is parsed again at the next create, once.
  std::ofstream(data / "water.yaml", std::ios::app) << "\n# appended by the test\n";
  const host::Instance second = heater.create("heater", std::vector<ParameterValue>{{"outlet_temperature", 308.15}},
                                              water_slate);
  CHECK(thermo::shared_database_parses() == parses_before + 2);
  CHECK(thermo::shared_database(data).get() != database.get());
  CHECK(thermo::shared_database_parses() == parses_before + 2);
}
