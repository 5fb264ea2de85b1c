// Prints, for HCl–H2O at 25 °C and molalities 0.1–16 mol/kg, the binary model's L_φ and water
// activity beside the ionic engine's (Davies, dilute-solution enthalpy), and Parker's L_φ where
// tabulated: the data of docs/plots/hcl-handover.svg (docs/plots/handover_svg.py draws it).
#include <cstdio>
#include <vector>

#include "protonflow/thermo/concentrated_binary.hpp"
#include "protonflow/thermo/stream_enthalpy.hpp"
#include "solution_probe.hpp"

using namespace protonflow::thermo;
using protonflow::reference::solve_recipe;

int main() {
  const ConcentratedBinary hcl = ConcentratedBinary::hydrochloric_acid;
  const double molar_mass = describe(hcl).solute_molar_mass;
  const auto engine_enthalpy = [](double m) {
    const auto r = solve_recipe({{"HCl", m}}, ActivityModelKind::davies);
    return std::pair{state_enthalpy(r.system, r.speciation), r.speciation.water_activity};
  };
  const double engine_dilute = engine_enthalpy(1e-6).first;
  std::printf("molality,binary_l_phi_kJ,engine_l_phi_kJ,binary_water_activity,engine_water_activity\n");
  for (double m = 0.1; m <= 16.0001; m *= 1.12) {
    const double w = m * molar_mass / (1.0 + m * molar_mass);
    const BinaryProperties p = binary_properties(hcl, 298.15, w);
    const auto [h_engine, a_engine] = engine_enthalpy(m);
    // L_φ of the engine: its enthalpy change per mol HCl against the same HCl at infinite dilution.
    const double engine_l_phi = (h_engine - engine_dilute - (m - 1e-6) * (-74852.0 - 92307.0)) / m;
    std::printf("%.5g,%.5g,%.5g,%.5g,%.5g\n", m, p.heat_of_solution / 1e3 + 74.852, engine_l_phi / 1e3,
                p.water_activity, a_engine);
  }
}
