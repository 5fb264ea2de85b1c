#include <catch2/catch.hpp>

#include "protonflow/thermo/errors.hpp"
#include "protonflow/thermo/formula.hpp"

using protonflow::thermo::parse_formula;
using protonflow::thermo::ThermoError;

TEST_CASE("formulas with hydrates, parentheses and charges are read") {
  const auto gypsum = parse_formula("CaSO4:2H2O");
  CHECK(gypsum.elements.at("Ca") == 1.0);
  CHECK(gypsum.elements.at("S") == 1.0);
  CHECK(gypsum.elements.at("O") == 6.0);
  CHECK(gypsum.elements.at("H") == 4.0);
  CHECK(gypsum.charge == 0);

  const auto borate = parse_formula("B(OH)4-");
  CHECK(borate.elements.at("O") == 4.0);
  CHECK(borate.elements.at("H") == 4.0);
  CHECK(borate.charge == -1);

  CHECK(parse_formula("SO4-2").charge == -2);
  CHECK(parse_formula("Ca+2").charge == 2);
  CHECK(parse_formula("Na+").charge == 1);
  CHECK(parse_formula("PO4-3").charge == -3);

  const auto nested = parse_formula("Ca3(PO4)2");
  CHECK(nested.elements.at("Ca") == 3.0);
  CHECK(nested.elements.at("P") == 2.0);
  CHECK(nested.elements.at("O") == 8.0);

  const auto hemihydrate = parse_formula("CaSO4:0.5H2O");
  CHECK(hemihydrate.elements.at("H") == 1.0);
  CHECK(hemihydrate.elements.at("O") == 4.5);

  CHECK(parse_formula("CaSO4\u00b72H2O").elements == gypsum.elements);
  CHECK(to_string(parse_formula("CH3COOH")) == "C2H4O2");
  CHECK(to_string(parse_formula("SO4-2")) == "O4S-2");
}

TEST_CASE("unreadable formulas are rejected with the position") {
  CHECK_THROWS_WITH(parse_formula("NaXx"), Catch::Contains("unknown element 'Xx'") && Catch::Contains("character 3"));
  CHECK_THROWS_WITH(parse_formula("Ca(OH"), Catch::Contains("missing ')'"));
  CHECK_THROWS_WITH(parse_formula(""), Catch::Contains("empty"));
  CHECK_THROWS_WITH(parse_formula("SO4-0"), Catch::Contains("charge"));
  CHECK_THROWS_WITH(parse_formula("H2O x"), Catch::Contains("unexpected ' '"));
  CHECK_THROWS_WITH(parse_formula("na"), Catch::Contains("expected an element symbol"));
  CHECK_THROWS_AS(parse_formula("()"), ThermoError);
  // Found by the flowsheet fuzzer: a long charge once overflowed an int.
  CHECK_THROWS_WITH(parse_formula("Na+2222222222"), Catch::Contains("not a charge"));
}
