// Reader of the Pitzer parameter file (format: docs/activity.md, "Pitzer parameter file").
#include "protonflow/thermo/pitzer_parameters.hpp"

#include <yaml-cpp/yaml.h>

#include <cmath>
#include <fmt/format.h>
#include <initializer_list>
#include <set>

#include "protonflow/thermo/constants.hpp"
#include "protonflow/thermo/database.hpp"
#include "protonflow/thermo/errors.hpp"
#include "protonflow/thermo/formula.hpp"

namespace protonflow::thermo {

double moller_temperature_function(const std::array<double, 8>& a, double t) noexcept {
  return a[0] + a[1] * t + a[2] / t + a[3] * std::log(t) + a[4] / (t - 263.0) + a[5] * t * t + a[6] / (680.0 - t) +
         a[7] / (t - 227.0);
}

double PitzerCoefficient::at(double temperature) const noexcept {
  if (has_function) return value + moller_temperature_function(function_terms, temperature) - function_at_reference;
  const double dt = temperature - reference_temperature;
  return value + dt * (d_dT + dt * (0.5 * d2_dT2 + dt * d3_dT3 / 6.0));
}

namespace {

class ParameterFileReader {
 public:
  explicit ParameterFileReader(std::string file) : file_(std::move(file)) {}

  PitzerParameters read() {
    YAML::Node root;
    try {
      root = YAML::LoadFile(file_);
    } catch (const YAML::ParserException& e) {
      throw DataError(file_, e.mark.line + 1, e.mark.column + 1, e.msg);
    } catch (const YAML::BadFile&) {
      throw DataError(file_, 0, 0, "cannot open the file");
    }
    if (!root.IsMap()) fail(root, "a Pitzer parameter file is a map of sections (binary, theta, psi, lambda, zeta, ...)");
    check_keys(root, {"maximum_ionic_strength", "folded_ion_pairs", "binary", "theta", "psi", "lambda", "zeta",
                      "equilibrium_constants"});
    PitzerParameters p;
    if (root["maximum_ionic_strength"]) p.maximum_ionic_strength = sourced(root["maximum_ionic_strength"]);
    if (const auto pairs = root["folded_ion_pairs"]) {
      if (!pairs.IsSequence()) fail(pairs, "'folded_ion_pairs' is a list of species names");
      for (const auto& name : pairs) p.folded_ion_pairs.push_back(species_name(name));
    }
    for (const auto& node : section(root, "binary")) p.binary.push_back(read_binary(node));
    for (const auto& node : section(root, "theta")) p.theta.push_back(read_pair(node, "theta"));
    for (const auto& node : section(root, "lambda")) p.lambda.push_back(read_pair(node, "lambda"));
    for (const auto& node : section(root, "psi")) p.psi.push_back(read_triple(node, "psi"));
    for (const auto& node : section(root, "zeta")) p.zeta.push_back(read_triple(node, "zeta"));
    for (const auto& node : section(root, "equilibrium_constants"))
      p.equilibrium_constants.push_back(read_equilibrium_constant(node));
    return p;
  }

 private:
  [[noreturn]] void fail(const YAML::Node& node, const std::string& what) const {
    throw DataError(file_, node.Mark().line + 1, node.Mark().column + 1, what);
  }

  void check_keys(const YAML::Node& map, const std::set<std::string>& allowed) const {
    for (const auto& entry : map) {
      const auto key = entry.first.as<std::string>();
      if (!allowed.count(key)) fail(entry.first, fmt::format("unknown key '{}'", key));
    }
  }

  YAML::Node section(const YAML::Node& root, const char* key) const {
    const YAML::Node node = root[key];
    if (node && !node.IsSequence()) fail(node, fmt::format("'{}' is a list of entries", key));
    return node ? node : YAML::Node(YAML::NodeType::Sequence);
  }

  // {value: x, source: key} (a note is allowed); every number names its source.
  double sourced(const YAML::Node& node) const {
    if (!node.IsMap() || !node["value"] || !node["source"])
      fail(node, "a parameter needs both 'value' and 'source'");
    check_keys(node, {"value", "source", "note"});
    try {
      return node["value"].as<double>();
    } catch (const YAML::Exception&) {
      fail(node["value"], "the value is not a number");
    }
  }

  // A species name in the project's notation; the older one ("Ca+2") is refused as the loader refuses it.
  std::string species_name(const YAML::Node& node) const {
    if (!node.IsScalar()) fail(node, "a species name is a single word, e.g. Ca^2+");
    const auto name = node.as<std::string>();
    if (const auto replacement = notation_replacement(name))
      fail(node, fmt::format("'{}' is the older ion notation: write '{}'", name, *replacement));
    return name;
  }

  std::vector<std::string> species(const YAML::Node& node, std::size_t count) const {
    const YAML::Node list = node["species"];
    if (!list || !list.IsSequence() || list.size() != count)
      fail(node, fmt::format("an entry needs 'species', a list of {} names", count));
    std::vector<std::string> names;
    for (const auto& name : list) names.push_back(species_name(name));
    return names;
  }

  // A parameter with its derivatives at the entry's reference temperature (298.15 K unless given).
  PitzerCoefficient coefficient(const YAML::Node& node, const std::string& key) const {
    PitzerCoefficient c;
    if (node[key]) c.value = sourced(node[key]);
    if (node[key + "_dT"]) c.d_dT = sourced(node[key + "_dT"]);
    if (node[key + "_dT2"]) c.d2_dT2 = sourced(node[key + "_dT2"]);
    if (node[key + "_dT3"]) c.d3_dT3 = sourced(node[key + "_dT3"]);
    if (node["reference_temperature"]) c.reference_temperature = sourced(node["reference_temperature"]);
    if (c.reference_temperature <= 0.0) fail(node["reference_temperature"], "the reference temperature is in kelvin, above 0");
    if (const YAML::Node function = node[key + "_function"]) read_function(function, key, c);
    return c;
  }

  // {terms: [a1, ..., a8], source: key}: the eight terms of Møller's (1988) eq. 13, carried from the
  // parameter's value at the reference temperature (docs/activity.md).
  void read_function(const YAML::Node& node, const std::string& key, PitzerCoefficient& c) const {
    if (!node.IsMap() || !node["terms"] || !node["source"])
      fail(node, fmt::format("'{}_function' needs 'terms' (eight numbers, Møller 1988 eq. 13) and 'source'", key));
    check_keys(node, {"terms", "source", "note"});
    if (c.d_dT != 0.0 || c.d2_dT2 != 0.0 || c.d3_dT3 != 0.0)
      fail(node, fmt::format("give '{}' either derivatives or a function of temperature, not both", key));
    const YAML::Node terms = node["terms"];
    if (!terms.IsSequence() || terms.size() != c.function_terms.size())
      fail(terms, "'terms' is a list of eight numbers: a1 + a2 T + a3/T + a4 ln T + a5/(T - 263) + a6 T^2 + a7/(680 - T) + a8/(T - 227)");
    for (std::size_t t = 0; t < c.function_terms.size(); ++t) {
      try {
        c.function_terms[t] = terms[t].as<double>();
      } catch (const YAML::Exception&) {
        fail(terms[t], "the term is not a number");
      }
    }
    c.has_function = true;
    c.function_at_reference = moller_temperature_function(c.function_terms, c.reference_temperature);
  }

  static std::set<std::string> with_derivatives(std::initializer_list<const char*> keys) {
    std::set<std::string> all;
    for (const std::string key : keys)
      for (const char* suffix : {"", "_dT", "_dT2", "_dT3", "_function"}) all.insert(key + suffix);
    return all;
  }

  PitzerBinary read_binary(const YAML::Node& node) {
    std::set<std::string> allowed = with_derivatives({"beta0", "beta1", "beta2", "c_phi", "c0", "c1"});
    allowed.insert({"species", "alpha1", "alpha2", "alpha1_reciprocal_T", "omega", "reference_temperature",
                    "minimum_temperature", "maximum_temperature", "note"});
    check_keys(node, allowed);
    const auto names = species(node, 2);
    PitzerBinary b{names[0], names[1], coefficient(node, "beta0"), coefficient(node, "beta1"), coefficient(node, "beta2"),
                   coefficient(node, "c_phi")};
    if (!node["beta0"]) fail(node, fmt::format("the pair {}–{} needs at least beta0", names[0], names[1]));
    // C⁰ of Archer's form is Cφ / (2√|z_c z_a|) (Pitzer 1991, eq. 3.63): kept as Cφ.
    if (node["c0"]) {
      if (node["c_phi"]) fail(node["c0"], "give either c_phi or c0 (= c_phi / (2 sqrt|z_c z_a|)), not both");
      const double scale = 2.0 * std::sqrt(static_cast<double>(charge_magnitude(names[0]) * charge_magnitude(names[1])));
      b.c_phi = coefficient(node, "c0");
      b.c_phi.value *= scale, b.c_phi.d_dT *= scale, b.c_phi.d2_dT2 *= scale, b.c_phi.d3_dT3 *= scale;
      for (double& term : b.c_phi.function_terms) term *= scale;
      b.c_phi.function_at_reference *= scale;
    }
    b.c1 = coefficient(node, "c1");
    if (node["omega"]) b.omega = sourced(node["omega"]);
    if (b.omega <= 0.0) fail(node["omega"], "omega is positive (kg^1/2 mol^-1/2)");
    if (node["alpha1_reciprocal_T"]) b.alpha1_reciprocal_T = sourced(node["alpha1_reciprocal_T"]);
    if (node["minimum_temperature"]) b.minimum_temperature = sourced(node["minimum_temperature"]);
    if (node["maximum_temperature"]) b.maximum_temperature = sourced(node["maximum_temperature"]);
    if (!(b.minimum_temperature < b.maximum_temperature))
      fail(node, "the pair's minimum_temperature must lie below its maximum_temperature");
    // F(T) has poles at 263 K (a5), 680 K (a7) and 227 K (a8): a pair whose functions use one keeps its range
    // on the near side of it.
    for (const PitzerCoefficient* c : {&b.beta0, &b.beta1, &b.beta2, &b.c_phi}) {
      if (!c->has_function) continue;
      const auto& a = c->function_terms;
      const double lowest_pole = a[4] != 0.0 ? 263.0 : a[7] != 0.0 ? 227.0 : 0.0;
      if (!(b.minimum_temperature > lowest_pole) || (a[6] != 0.0 && !(b.maximum_temperature < 680.0)))
        fail(node, fmt::format("the pair {}–{} has a function of temperature: give minimum_temperature above {:g} K and "
                               "maximum_temperature below 680 K (the poles of Møller's eq. 13 that its terms use)",
                               names[0], names[1], lowest_pole));
    }
    // α by charge type (Pitzer 1991, ch. 3): α₁ = 2 with no β², except 2:2 salts, α₁ = 1.4 and
    // α₂ = 12; an entry may set its own.
    const bool two_two = charge_magnitude(names[0]) >= 2 && charge_magnitude(names[1]) >= 2;
    b.alpha1 = node["alpha1"] ? sourced(node["alpha1"]) : two_two ? 1.4 : 2.0;
    b.alpha2 = node["alpha2"] ? sourced(node["alpha2"]) : 12.0;
    if (charge_sign(names[0]) <= 0 || charge_sign(names[1]) >= 0)
      fail(node["species"], fmt::format("a binary entry lists a cation then an anion, not {} and {}", names[0], names[1]));
    once(node, "binary", names[0] + " " + names[1]);
    return b;
  }

  // θ: two ions of one sign; λ: a neutral species first, then any species.
  PitzerPair read_pair(const YAML::Node& node, const std::string& key) {
    check_keys(node, {"species", key, key + "_dT", key + "_dT2", "note"});
    const auto names = species(node, 2);
    if (!node[key]) fail(node, fmt::format("the entry needs '{}'", key));
    const int a = charge_sign(names[0]), b = charge_sign(names[1]);
    if (key == "theta" && (a == 0 || a != b || names[0] == names[1]))
      fail(node["species"], fmt::format("theta is for two different ions of the same sign, not {} and {}", names[0], names[1]));
    if (key == "lambda" && a != 0)
      fail(node["species"], fmt::format("lambda lists a neutral species first, not {}", names[0]));
    once(node, key, names[0] < names[1] || key == "lambda" ? names[0] + " " + names[1] : names[1] + " " + names[0]);
    return {names[0], names[1], coefficient(node, key)};
  }

  // ψ: two different ions of one sign, then one of the other; ζ: a neutral, a cation, an anion.
  PitzerTriple read_triple(const YAML::Node& node, const std::string& key) {
    check_keys(node, {"species", key, key + "_dT", key + "_dT2", "note"});
    const auto names = species(node, 3);
    if (!node[key]) fail(node, fmt::format("the entry needs '{}'", key));
    const int a = charge_sign(names[0]), b = charge_sign(names[1]), c = charge_sign(names[2]);
    if (key == "psi" && (a == 0 || a != b || c != -a || names[0] == names[1]))
      fail(node["species"], fmt::format("psi lists two different ions of one sign, then one of the other, not {}, {}, {}",
                                        names[0], names[1], names[2]));
    if (key == "zeta" && (a != 0 || b <= 0 || c >= 0))
      fail(node["species"],
           fmt::format("zeta lists a neutral species, a cation and an anion, not {}, {}, {}", names[0], names[1], names[2]));
    const bool ordered = names[0] < names[1] || key == "zeta";
    once(node, key, (ordered ? names[0] + " " + names[1] : names[1] + " " + names[0]) + " " + names[2]);
    return {names[0], names[1], names[2], coefficient(node, key)};
  }

  // species, the formation reaction it stands for, and a five-term log10 K with one source.
  PitzerEquilibriumConstant read_equilibrium_constant(const YAML::Node& node) {
    check_keys(node, {"species", "reaction", "five_term_log10_K", "note"});
    if (!node["species"]) fail(node, "an equilibrium constant names its 'species'");
    PitzerEquilibriumConstant k;
    k.species = species_name(node["species"]);
    const YAML::Node reaction = node["reaction"];
    if (!reaction || !reaction.IsMap() || reaction.size() == 0)
      fail(node, "an equilibrium constant needs 'reaction', a map of basis species to coefficients");
    for (const auto& term : reaction) {
      try {
        k.reaction.emplace_back(species_name(term.first), term.second.as<double>());
      } catch (const YAML::Exception&) {
        fail(term.second, "a reaction coefficient is a number");
      }
    }
    const YAML::Node body = node["five_term_log10_K"];
    if (!body || !body.IsMap() || !body["source"])
      fail(node, "an equilibrium constant needs 'five_term_log10_K' with its 'source'");
    check_keys(body, {"constant", "linear_per_K", "reciprocal_K", "log10_T", "reciprocal_square_K2", "source", "note"});
    k.log_k.form = TemperatureFunction::Form::five_term;
    const char* terms[] = {"constant", "linear_per_K", "reciprocal_K", "log10_T", "reciprocal_square_K2"};
    for (std::size_t t = 0; t < 5; ++t) {
      if (!body[terms[t]]) continue;
      try {
        k.log_k.coefficients[t] = body[terms[t]].as<double>();
      } catch (const YAML::Exception&) {
        fail(body[terms[t]], "the coefficient is not a number");
      }
    }
    once(node, "equilibrium_constants", k.species);
    return k;
  }

  // A parameter listed twice would be counted twice.
  void once(const YAML::Node& node, const std::string& section, const std::string& key) {
    if (!seen_.insert(section + ": " + key).second)
      fail(node, fmt::format("{} of {} is listed twice", section, key));
  }

  static int charge_sign(const std::string& canonical) {
    if (canonical.find('^') == std::string::npos) return 0;
    return canonical.back() == '+' ? 1 : -1;
  }
  static int charge_magnitude(const std::string& canonical) {
    const auto caret = canonical.find('^');
    if (caret == std::string::npos) return 0;
    const std::string number = canonical.substr(caret + 1, canonical.size() - caret - 2);
    return number.empty() ? 1 : std::stoi(number);
  }

  std::string file_;
  std::set<std::string> seen_;
};

}  // namespace

PitzerParameters load_pitzer_parameters(const std::filesystem::path& file) {
  return ParameterFileReader(file.string()).read();
}

std::filesystem::path default_pitzer_parameters_file() {
  return default_data_directory() / "pitzer" / "ion-interaction.yaml";
}

const PitzerParameters& bundled_pitzer_parameters() {
  static const PitzerParameters parameters = load_pitzer_parameters(default_pitzer_parameters_file());
  return parameters;
}

}  // namespace protonflow::thermo
