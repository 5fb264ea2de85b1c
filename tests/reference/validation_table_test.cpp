#include <catch2/catch.hpp>

#include <fstream>
#include <sstream>

#include "reference_cases.hpp"

TEST_CASE("validation table is current") {
  std::ifstream committed(PROTONFLOW_VALIDATION_TABLE);
  REQUIRE(committed.good());
  std::stringstream text;
  text << committed.rdbuf();
  INFO("docs/validation.md is stale: regenerate it with build/tests/reference/validation_table > docs/validation.md");
  CHECK(text.str() == protonflow::reference::render_validation_table());
}
