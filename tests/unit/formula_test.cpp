#include <catch2/catch.hpp>

#include "protonflow/thermo/errors.hpp"
#include "protonflow/thermo/formula.hpp"

using protonflow::thermo::parse_formula;
using protonflow::thermo::ThermoError;

TEST_CASE("formulas with hydrates, parentheses and charges are read") {
  const auto gypsum = parse_formula("CaSO4.2H2O");
  CHECK(gypsum.elements.at("Ca") == 1.0);
  CHECK(gypsum.elements.at("S") == 1.0);
  CHECK(gypsum.elements.at("O") == 6.0);
  CHECK(gypsum.elements.at("H") == 4.0);
  CHECK(gypsum.charge == 0);

  const auto borate = parse_formula("B(OH)4^-");
  CHECK(borate.elements.at("O") == 4.0);
  CHECK(borate.elements.at("H") == 4.0);
  CHECK(borate.charge == -1);

  CHECK(parse_formula("SO4^2-").charge == -2);
  CHECK(parse_formula("Ca^2+").charge == 2);
  CHECK(parse_formula("Na^+").charge == 1);
  CHECK(parse_formula("PO4^3-").charge == -3);

  const auto nested = parse_formula("Ca3(PO4)2");
  CHECK(nested.elements.at("Ca") == 3.0);
  CHECK(nested.elements.at("P") == 2.0);
  CHECK(nested.elements.at("O") == 8.0);

  const auto hemihydrate = parse_formula("CaSO4.0.5H2O");
  CHECK(hemihydrate.elements.at("H") == 1.0);
  CHECK(hemihydrate.elements.at("O") == 4.5);

  CHECK(parse_formula("CaSO4\u00b72H2O").elements == gypsum.elements);
  CHECK(to_string(parse_formula("CH3COOH")) == "C2H4O2");
  CHECK(to_string(parse_formula("SO4^2-")) == "O4S^2-");
}

TEST_CASE("unreadable formulas are rejected with the position") {
  CHECK_THROWS_WITH(parse_formula("NaXx"), Catch::Contains("unknown element 'Xx'") && Catch::Contains("character 3"));
  CHECK_THROWS_WITH(parse_formula("Ca(OH"), Catch::Contains("missing ')'"));
  CHECK_THROWS_WITH(parse_formula(""), Catch::Contains("empty"));
  CHECK_THROWS_WITH(parse_formula("SO4^0-"), Catch::Contains("charge"));
  CHECK_THROWS_WITH(parse_formula("H2O x"), Catch::Contains("unexpected ' '"));
  CHECK_THROWS_WITH(parse_formula("na"), Catch::Contains("expected an element symbol"));
  CHECK_THROWS_AS(parse_formula("()"), ThermoError);
  // Found by the flowsheet fuzzer: a long charge once overflowed an int.
  CHECK_THROWS_WITH(parse_formula("Na^2222222222+"), Catch::Contains("not a charge"));
}

TEST_CASE("the older notation is refused with the name to write instead") {
  CHECK_THROWS_WITH(parse_formula("Ca+2"), Catch::Contains("write 'Ca^2+'"));
  CHECK_THROWS_WITH(parse_formula("SO4-2"), Catch::Contains("write 'SO4^2-'"));
  CHECK_THROWS_WITH(parse_formula("Na+"), Catch::Contains("write 'Na^+'"));
  CHECK_THROWS_WITH(parse_formula("CaSO4:2H2O"), Catch::Contains("write 'CaSO4.2H2O'"));
  CHECK_THROWS_WITH(parse_formula("Na^1+"), Catch::Contains("no 1"));
  CHECK_THROWS_WITH(parse_formula("Na^2"), Catch::Contains("'^2+'"));
  CHECK(protonflow::thermo::notation_replacement("Fe2(OH)2+4") == "Fe2(OH)2^4+");
  CHECK(protonflow::thermo::notation_replacement("Cl-1") == "Cl^-");
  CHECK_FALSE(protonflow::thermo::notation_replacement("Fe(OH)3(am)").has_value());
  CHECK_FALSE(protonflow::thermo::notation_replacement("SO4^2-").has_value());
  CHECK_FALSE(protonflow::thermo::notation_replacement("H^+").has_value());
}

TEST_CASE("hydrates take '.', or the IUPAC middle dot, and a decimal water count") {
  const auto hemihydrate = parse_formula("CaSO3.0.5H2O");
  CHECK(hemihydrate.elements.at("H") == 1.0);
  CHECK(hemihydrate.elements.at("O") == 3.5);
  CHECK(parse_formula("Na2CO3.10H2O").elements.at("O") == 13.0);
  CHECK(parse_formula("FeSO4\u00b77H2O").elements == parse_formula("FeSO4.7H2O").elements);
  CHECK(parse_formula("Fe2(OH)2^4+").charge == 4);
  CHECK_THROWS_WITH(parse_formula("CaSO4."), Catch::Contains("expected an element symbol"));
}
