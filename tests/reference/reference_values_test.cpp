// Every published value of the project's reference list that the engine reaches, at its tolerance.
// The source of each value stands beside it in reference_cases.cpp.
#include <catch2/catch.hpp>

#include <cmath>
#include <utility>
#include <vector>

#include "protonflow/thermo/pitzer_parameters.hpp"
#include "protonflow/thermo/temperature_function.hpp"
#include "reference_cases.hpp"
#include "solution_probe.hpp"

using namespace protonflow::reference;

TEST_CASE("published reference values are met within their tolerance") {
  for (const ReferenceCase& c : reference_cases()) {
    const double model = c.model();
    INFO(c.quantity << " — " << c.source << ": published " << c.published << ", model " << model);
    CHECK(std::abs(model - c.published) <= c.tolerance);
  }
}

TEST_CASE("Henderson-Hasselbalch with activity: pH = pKa + log10(γ(A^-)/γ(HA))") {
  // Henderson–Hasselbalch (the project's list of closed forms): with the buffer far above [H^+],
  // pH − pKa equals log10 γ(A−) − log10 γ(HA) of the same solution.
  const ProbeResult r = solve_recipe({{"CH3COOH", 0.5}, {"NaOH", 0.25}}, protonflow::thermo::ActivityModelKind::davies);
  const double pka = formation_log_k("CH3COOH(aq)");
  CHECK(r.speciation.ph == Approx(pka + r.log10_gamma("CH3COO^-") - r.log10_gamma("CH3COOH(aq)")).margin(1e-3));
}

TEST_CASE("gypsum dissolves more in NaCl brine, as Marshall & Slusher 1966 measured (Pitzer)") {
  // Marshall & Slusher 1966, J. Phys. Chem. 70, 4015 (from memory): at 25 °C gypsum's solubility
  // rises steeply with NaCl, to roughly three times its value in water at 2–3 mol/kg NaCl, through a
  // broad maximum; the dilute-solution models cannot reach that far.
  using protonflow::thermo::ActivityModelKind;
  const double water = gypsum_solubility(0.0, ActivityModelKind::pitzer);
  const double half = gypsum_solubility(0.5, ActivityModelKind::pitzer);
  const double one = gypsum_solubility(1.0, ActivityModelKind::pitzer);
  const double three = gypsum_solubility(3.0, ActivityModelKind::pitzer);
  CHECK(water < half);
  CHECK(half < one);
  CHECK(one < three);
  CHECK(three / water > 2.5);
  CHECK(three / water < 4.5);
}

TEST_CASE("the sodium sulfates' log K(T) carry the NBS reaction enthalpy and heat capacity of their data") {
  // NBS 1982 (the data's ΔfH° and Cp° of the solids, Na^+, SO4^2- and water): the five-term forms of the
  // species data and of the Pitzer file must give ΔrH° = R ln10 T² d(log K)/dT and its T-derivative ΔrCp°.
  const protonflow::thermo::Database& data = bundled_database();
  const auto h = [&](const char* name) { return data.find(name)->formation_enthalpy->value; };
  const auto cp = [&](const char* name) { return data.find(name)->heat_capacity->value; };
  for (const auto& [solid, waters] : {std::pair{"thenardite", 0.0}, std::pair{"mirabilite", 10.0}}) {
    INFO(solid);
    const double reaction_h = h(solid) - 2.0 * h("Na^+") - h("SO4^2-") - waters * h("H2O");  // J/mol
    const double reaction_cp = cp(solid) - 2.0 * cp("Na^+") - cp("SO4^2-") - waters * cp("H2O");  // J/(mol K)
    std::vector<protonflow::thermo::TemperatureFunction> forms{data.find(solid)->log_k};
    for (const auto& k : protonflow::thermo::bundled_pitzer_parameters().equilibrium_constants)
      if (k.species == solid) forms.push_back(k.log_k);
    REQUIRE(forms.size() == 2);
    for (const auto& form : forms) {
      const auto enthalpy = [&](double t) { return protonflow::thermo::reaction_enthalpy(form, t, 101325.0); };
      CHECK(enthalpy(298.15) == Approx(reaction_h).margin(10.0));
      CHECK((enthalpy(299.15) - enthalpy(297.15)) / 2.0 == Approx(reaction_cp).margin(0.05));
    }
  }
}
