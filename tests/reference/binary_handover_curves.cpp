// Prints, for one binary (HCl, NaOH or H2SO4; argument, default HCl) at 25 °C and molalities from
// 0.1 mol/kg to past the hand-over, the binary model's L_φ and water activity beside the ionic
// engine's with the Pitzer model (its equilibrium enthalpy with the Pitzer heats of dilution): the
// data of docs/plots/*-handover.svg (docs/plots/handover_svg.py draws them). Past the hand-over the
// engine's numbers are extrapolations, printed only to show where the two part.
#include <algorithm>
#include <cmath>
#include <cstdio>
#include <exception>
#include <string>
#include <utility>
#include <vector>

#include "protonflow/thermo/concentrated_binary.hpp"
#include "protonflow/thermo/pitzer_enthalpy.hpp"
#include "protonflow/thermo/stream_enthalpy.hpp"
#include "solution_probe.hpp"

using namespace protonflow::thermo;
using protonflow::reference::solve_recipe;

int main(int argc, char** argv) {
  const std::string solute = argc > 1 ? argv[1] : "HCl";
  const ConcentratedBinary binary = concentrated_binary_of(solute);
  const double molar_mass = describe(binary).solute_molar_mass;
  const double handover = ionic_model_scope(binary, 0.01).largest_molality;
  // The engine's equilibrium enthalpy (J) of 1 kg of water holding m mol of the solute, and its a_w.
  const auto engine = [&](double m) {
    const auto r = solve_recipe({{solute, m}}, ActivityModelKind::pitzer);
    const auto excess = make_excess_enthalpy_model(r.system);
    return std::pair{state_enthalpy(r.system, r.speciation, excess.get()), r.speciation.water_activity};
  };
  // L_φ of both against the same zero, the engine's: the enthalpy of 1 kg of water holding m mol of
  // the solute, less pure water's and the solute's ions' standard enthalpies at infinite dilution
  // (the engine's species data), per mol of solute.
  const auto water = solve_recipe({}, ActivityModelKind::pitzer);
  const double engine_water = state_enthalpy(water.system, water.speciation);
  const std::vector<std::pair<std::string, double>> ions =
      solute == "HCl"    ? std::vector<std::pair<std::string, double>>{{"H^+", 1}, {"Cl^-", 1}}
      : solute == "NaOH" ? std::vector<std::pair<std::string, double>>{{"Na^+", 1}, {"OH^-", 1}}
                         : std::vector<std::pair<std::string, double>>{{"H^+", 2}, {"SO4^2-", 1}};
  double engine_per_mol = 0.0;  // J/mol: Σ ν_i H°_i of the solute's ions at infinite dilution
  const auto probe = solve_recipe({{solute, 0.1}}, ActivityModelKind::pitzer);
  for (const auto& [name, count] : ions)
    for (const Solute& s : probe.system.solutes())
      if (s.name == name) engine_per_mol += count * s.reference_enthalpy;
  std::printf("# %s 298.15 K handover %g\n", solute.c_str(), handover);
  std::printf("molality,binary_l_phi_kJ,engine_l_phi_kJ,binary_water_activity,engine_water_activity\n");
  const double last = 2.5 * handover;
  std::vector<double> molalities;
  for (double m = 0.1; m <= last * 1.0001; m *= 1.1) molalities.push_back(m);
  molalities.push_back(handover);  // the hand-over itself, in order
  std::ranges::sort(molalities);
  for (const double m : molalities) {
    const double w = m * molar_mass / (1.0 + m * molar_mass);
    const BinaryProperties p = binary_properties(binary, 298.15, w);
    const double binary_total = (1.0 + m * molar_mass) * p.specific_enthalpy;
    const double binary_l_phi = (binary_total - engine_water - m * engine_per_mol) / m;
    double engine_l_phi = std::nan(""), a_w = std::nan("");
    try {
      const auto [h, a] = engine(m);
      engine_l_phi = (h - engine_water - m * engine_per_mol) / m;
      a_w = a;
    } catch (const std::exception&) {
      // Far beyond the hand-over the engine may not converge: no point there (nan in the CSV).
    }
    std::printf("%.5g,%.5g,%.5g,%.5g,%.5g\n", m, binary_l_phi / 1e3, engine_l_phi / 1e3,
                p.water_activity, a_w);
  }
}
