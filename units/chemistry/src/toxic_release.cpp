#include <protonflow/units/toxic_release.hpp>

#include <protonflow/units/message_text.hpp>

#include <array>
#include <cstddef>
#include <string>

namespace protonflow::units {

namespace {

// Exposure limits in ppm by volume, NIOSH Pocket Guide to Chemical Hazards [niosh-pocket-guide], read
// in NIOSH's IDLH documentation (HCN's IDLH is the original value): the recommended exposure limit (Cl2: a 15-minute ceiling of 0.5 ppm; HCN: a short-term limit of
// 4.7 ppm) and the level immediately dangerous to life or health. The REL is the threshold because it is
// the published level a worker at the tank may not exceed; a closed headspace over the liquor comes to
// the equilibrium partial pressure, an open tank dilutes it, so the warning errs on the safe side.
struct ReleasedGas {
  std::string_view gas;        // the gas species' name in the data
  std::string_view dissolved;  // its molecular aqueous counterpart
  double molar_mass;           // kg/mol of the dissolved species (IUPAC atomic weights)
  std::string_view cause;
  std::string_view remedy;
  double recommended_ppm;
  double idlh_ppm;
};
constexpr std::array released_gases{
    ReleasedGas{"Cl2(g)", "Cl2(aq)", 0.070906, "chlorine: hypochlorite (or dissolved chlorine) with chloride in acid liquor",
                "keep hypochlorite and chlorinated liquors alkaline and apart from acids, dose acid only after the "
                "hypochlorite is destroyed (bisulfite), enclose and vent to a caustic scrubber",
                0.5, 10.0},
    ReleasedGas{"HCN(g)", "HCN(aq)", 0.027026, "hydrogen cyanide: cyanide below about pH 10.5 (pKa 9.2)",
                "keep cyanide liquors above pH 10.5 until the cyanide is destroyed (alkaline chlorination), never "
                "acidify them, enclose and vent to a caustic scrubber, monitor the air",
                4.7, 50.0},
};

}  // namespace

void warn_about_toxic_release(std::string_view unit_type, const thermo::ChemicalSystem& system,
                              const thermo::Speciation& product, unit::Warnings& warnings) {
  const auto& gases = system.phase_gases();
  for (const ReleasedGas& released : released_gases) {
    for (std::size_t g = 0; g < gases.size(); ++g) {
      if (gases[g].name != released.gas || g >= product.partial_pressure.size()) continue;
      const double ppm = product.partial_pressure[g] / product.pressure * 1e6;
      if (!(ppm > released.recommended_ppm)) continue;
      std::string dissolved;
      for (std::size_t i = 0; i < system.solutes().size(); ++i) {
        if (system.solutes()[i].name != released.dissolved) continue;
        // mg per kg of water: the liquor's litre is close to it in a dilute liquor.
        dissolved = ", " + number_text(product.molality[i] * released.molar_mass * 1e6, 3) + " mg/kg of water as " +
                    std::string(released.dissolved);
      }
      warnings.add("unit '" + std::string(unit_type) + "': toxic gas released: " + std::string(released.cause) + " at pH " +
                   number_text(product.ph, 3) + dissolved + ", " + number_text(ppm, 3) +
                   " ppm in a closed headspace over the liquor (NIOSH recommended limit " +
                   number_text(released.recommended_ppm, 3) + " ppm, IDLH " + number_text(released.idlh_ppm, 3) +
                   " ppm): " + std::string(released.remedy) + "; defer to local codes and a qualified engineer");
    }
  }
}

}  // namespace protonflow::units
