// Every published value of the project's reference list that the engine reaches, at its tolerance.
// The source of each value stands beside it in reference_cases.cpp.
#include <catch2/catch.hpp>

#include <cmath>

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
