#include "release_warnings.hpp"

#include <protonflow/units/message_text.hpp>
#include <protonflow/units/toxic_release.hpp>

#include <array>
#include <cstddef>
#include <string>

namespace protonflow::units {

namespace {

// Exposure limits in ppm by volume, NIOSH Pocket Guide to Chemical Hazards (niosh-pocket-guide,
// from memory): the recommended limit (ceiling or 8-h average) and the level immediately dangerous
// to life or health (IDLH). The neutraliser warns where the gas in equilibrium with the liquor
// passes the recommended limit. Cl2 and HCN, released where hypochlorite or cyanide meets acid, are
// the shared warnings of every chemistry unit (toxic_release.hpp).
struct ExposureLimit {
  std::string_view gas;  // the gas species' name in the data
  std::string_view what;
  double recommended_ppm;
  double idlh_ppm;
};
constexpr std::array exposure_limits{
    ExposureLimit{"H2S(g)", "hydrogen sulfide (from sulfide meeting acid)", 10.0, 100.0},
    ExposureLimit{"NH3(g)", "ammonia (from ammonium meeting base)", 25.0, 300.0},
    ExposureLimit{"SO2(g)", "sulfur dioxide (from sulfite meeting acid)", 2.0, 100.0},
    ExposureLimit{"HCl(g)", "hydrogen chloride", 5.0, 50.0},
    ExposureLimit{"HF(g)", "hydrogen fluoride", 3.0, 30.0},
};

// Hot outlet: above 60 °C a splash scalds (common practice, as the shared product warnings use).
// Corrosive: pH <= 2 or >= 12.5, the corrosivity characteristic of US EPA 40 CFR 261.22 (from memory).
constexpr double hot_outlet = 333.15;  // K
constexpr double corrosive_low = 2.0;
constexpr double corrosive_high = 12.5;
constexpr double gas_constant = 8.314462618;  // J/(mol K), CODATA 2018 (exact since the 2019 SI)

}  // namespace

void warn_about_release(std::string_view unit_type, const thermo::ChemicalSystem& system, const thermo::Speciation& product,
                        unit::Warnings& warnings) {
  const std::string prefix = "unit '" + std::string(unit_type) + "': ";
  const auto& gases = system.phase_gases();
  for (std::size_t g = 0; g < gases.size(); ++g) {
    for (const ExposureLimit& limit : exposure_limits) {
      if (gases[g].name != limit.gas) continue;
      const double ppm = product.partial_pressure[g] / product.pressure * 1e6;
      if (!(ppm > limit.recommended_ppm)) continue;
      warnings.add(prefix + "toxic gas: " + std::string(limit.what) + " over the treated liquor at equilibrium: " +
                   number_text(ppm, 3) + " ppm in a closed headspace (NIOSH recommended limit " +
                   number_text(limit.recommended_ppm, 3) + " ppm, IDLH " + number_text(limit.idlh_ppm, 3) +
                   " ppm); enclose and ventilate the tank to a scrubber, monitor the air, and defer to local codes and a "
                   "qualified engineer");
    }
    if (gases[g].name == "CO2(g)" && product.gas_phase_present && product.gas_amount[g] > 0.0) {
      const double volume = product.gas_amount[g] * gas_constant * product.temperature / product.pressure;
      warnings.add(prefix + "CO2 is released: " + number_text(product.gas_amount[g], 4) + " mol/s, about " +
                   number_text(volume * 3600.0, 3) +
                   " m3/h at the outlet: expect foaming; leave freeboard, dose below the surface or add antifoam, and "
                   "vent the tank");
    }
  }
  warn_about_toxic_release(unit_type, system, product, warnings);
  if (product.temperature > hot_outlet) {
    warnings.add(prefix + "hot outlet: the treated slurry leaves at " + celsius_text(product.temperature) +
                 " (above 60 °C): it scalds on contact and may exceed the discharge temperature limit; cool it or dose "
                 "more dilute reagent");
  }
  if (product.ph <= corrosive_low || product.ph >= corrosive_high) {
    warnings.add(prefix + "corrosive liquor: pH " + number_text(product.ph, 3) +
                 " (at or beyond pH 2 or 12.5, the corrosivity characteristic of US EPA 40 CFR 261.22): it burns skin and "
                 "attacks metals; the discharge permit sets the pH window that may leave the site, and it governs");
  }
}

}  // namespace protonflow::units
