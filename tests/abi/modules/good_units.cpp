// Test module built with the C++ helper: three small units that exercise the boundary. They are
// test fixtures, not models; the real units live in units/.
//   passthrough  copies its inlet to its outlet
//   mixer        sums two inlets; temperature by a constant-heat-capacity energy balance
//   probe        copies its inlet, and fails or warns on request, to test every path of the boundary
//   blender      any number of inlets (a list port) into equal shares on a list of outlets, with two
//                series: the temperature after each inlet is blended in, and a profile whose length
//                is fixed at create
#include <protonflow/unit_module.hpp>

#include <algorithm>
#include <array>
#include <cmath>
#include <cstddef>
#include <limits>
#include <new>
#include <span>
#include <stdexcept>
#include <string>

namespace {

namespace unit = protonflow::unit;

constexpr std::uint32_t all_phases = PFU_PHASE_AQUEOUS | PFU_PHASE_GAS | PFU_PHASE_SOLID;

void copy_state(const unit::InletState& from, unit::OutletState& to) {
  to.temperature = from.temperature;
  to.pressure = from.pressure;
  std::ranges::copy(from.flows, to.flows.begin());
}

double total_flow(const unit::InletState& state) {
  double total = 0.0;
  for (const double flow : state.flows) total += flow;
  return total;
}

class Passthrough {
 public:
  static constexpr const char* type = "passthrough";
  static constexpr const char* summary = "Copies its inlet to its outlet (a test module)";
  static constexpr std::array ports{unit::inlet("feed", all_phases, "stream in"),
                                    unit::outlet("product", all_phases, "the same stream out")};

  Passthrough(const unit::Parameters&, const unit::Slate&) {}

  void solve(std::span<const unit::InletState> inlets, std::span<unit::OutletState> outlets, unit::Results&,
             unit::Warnings&) const {
    copy_state(inlets[0], outlets[0]);
  }
};

class Mixer {
 public:
  static constexpr const char* type = "mixer";
  static constexpr const char* summary = "Mixes two streams, all phases (a test module)";
  static constexpr std::array ports{unit::inlet("feed_1", all_phases, "first stream in"),
                                    unit::inlet("feed_2", all_phases, "second stream in"),
                                    unit::outlet("product", all_phases, "the mixed stream")};
  static constexpr std::array<const char*, 2> pressure_rules{"lowest", "first"};
  static constexpr std::array parameters{
      unit::number("pressure_drop", "Pa", 0.0, 0.0, 1.0e7, "pressure lost across the mixer"),
      // 60 °C: a common-practice touch limit for hot surfaces and liquors.
      unit::number("warning_temperature", "K", 333.15, 273.15, 647.096, "outlet temperature above which it warns"),
      unit::choice("pressure_rule", pressure_rules, "lowest", "outlet pressure from the lowest inlet or from feed_1")};
  static constexpr std::array results{unit::result("total_flow", "mol/s", "molar flow out, all phases"),
                                      unit::result("temperature_spread", "K", "hottest minus coldest inlet")};

  Mixer(const unit::Parameters& parameters, const unit::Slate&)
      : pressure_drop_(parameters.number("pressure_drop")),
        warning_temperature_(parameters.number("warning_temperature")),
        from_lowest_(parameters.text("pressure_rule") == "lowest") {}

  void solve(std::span<const unit::InletState> inlets, std::span<unit::OutletState> outlets, unit::Results& results,
             unit::Warnings& warnings) const {
    const unit::InletState& a = inlets[0];
    const unit::InletState& b = inlets[1];
    unit::OutletState& out = outlets[0];
    for (std::size_t k = 0; k < out.flows.size(); ++k) out.flows[k] = a.flows[k] + b.flows[k];
    // Equal, constant molar heat capacities in both streams and no heat of mixing: the energy
    // balance sum n_i c (T_i - T) = 0 gives the flow-weighted mean. A test simplification only.
    const double n_a = total_flow(a);
    const double n_b = total_flow(b);
    out.temperature = n_a + n_b > 0.0 ? (n_a * a.temperature + n_b * b.temperature) / (n_a + n_b) : a.temperature;
    const double inlet_pressure = from_lowest_ ? std::min(a.pressure, b.pressure) : a.pressure;
    if (pressure_drop_ >= inlet_pressure) {
      throw unit::UnitError(PFU_BAD_INLET, "mixer: the pressure drop " + std::to_string(pressure_drop_) +
                                               " Pa is not less than the inlet pressure " +
                                               std::to_string(inlet_pressure) + " Pa");
    }
    out.pressure = inlet_pressure - pressure_drop_;
    results.set("total_flow", n_a + n_b);
    results.set("temperature_spread", std::abs(a.temperature - b.temperature));
    if (out.temperature > warning_temperature_) {
      warnings.add("mixer: outlet at " + std::to_string(out.temperature) + " K is above " +
                   std::to_string(warning_temperature_) + " K: hot liquor");
    }
  }

 private:
  double pressure_drop_;
  double warning_temperature_;
  bool from_lowest_;
};

class Probe {
 public:
  static constexpr const char* type = "probe";
  static constexpr const char* summary = "Copies its inlet; fails or warns on request (a test module)";
  static constexpr std::array ports{unit::inlet("feed", PFU_PHASE_AQUEOUS, "aqueous stream in"),
                                    unit::outlet("product", PFU_PHASE_AQUEOUS, "the same stream out")};
  static constexpr std::array<const char*, 8> failures{"none",          "invalid-parameter", "bad-inlet",
                                                       "not-converged", "runtime-error",     "unknown-exception",
                                                       "out-of-memory", "unset-outlet"};
  static constexpr std::array<const char*, 2> stages{"create", "solve"};
  static constexpr std::array parameters{
      unit::choice("failure", failures, "none", "what to fail with"),
      unit::choice("stage", stages, "solve", "where to fail"),
      unit::number("warning_count", "1", 0.0, 0.0, 100000.0, "warnings to emit per solve"),
      unit::text("label", nullptr, "any text; must be given"),
      unit::required_number("scale", "1", 0.0, 10.0, "a number that must be given")};
  static constexpr std::array results{unit::result("label_length", "1", "characters in label"),
                                      unit::result("scale", "1", "the scale parameter, echoed")};

  Probe(const unit::Parameters& parameters, const unit::Slate&)
      : failure_(parameters.text("failure")),
        label_(parameters.text("label")),
        scale_(parameters.number("scale")),
        warning_count_(static_cast<std::size_t>(parameters.number("warning_count"))) {
    if (parameters.text("stage") == "create") fail();
  }

  void solve(std::span<const unit::InletState> inlets, std::span<unit::OutletState> outlets, unit::Results& results,
             unit::Warnings& warnings) const {
    fail();
    copy_state(inlets[0], outlets[0]);
    if (failure_ == "unset-outlet") outlets[0].flows[0] = std::numeric_limits<double>::quiet_NaN();
    for (std::size_t i = 0; i < warning_count_; ++i) warnings.add("probe warning " + std::to_string(i + 1) + "\nof many");
    results.set("label_length", static_cast<double>(label_.size()));
    results[1] = scale_;
  }

 private:
  void fail() const {
    if (failure_ == "invalid-parameter") throw unit::UnitError(PFU_INVALID_PARAMETER, "probe: asked to reject");
    if (failure_ == "bad-inlet") throw unit::UnitError(PFU_BAD_INLET, "probe: asked to refuse the inlet");
    if (failure_ == "not-converged") throw unit::UnitError(PFU_NOT_CONVERGED, "probe: residual 1e-3 after 50 iterations");
    if (failure_ == "runtime-error") throw std::runtime_error("probe: a runtime error");
    if (failure_ == "unknown-exception") throw 42;
    if (failure_ == "out-of-memory") throw std::bad_alloc();
  }

  std::string failure_;
  std::string label_;
  double scale_;
  std::size_t warning_count_;
};

class Blender {
 public:
  static constexpr const char* type = "blender";
  static constexpr const char* summary = "Blends a list of streams into equal shares on a list of outlets (a test module)";
  static constexpr std::array ports{unit::inlet_list("feed", all_phases, 1, 8, "streams in, one to eight"),
                                    unit::outlet_list("share", all_phases, 1, PFU_UNBOUNDED_STREAMS, "equal shares out")};
  static constexpr std::array parameters{
      unit::number("profile_points", "1", 5.0, 2.0, 50.0, "points in the profile series, fixed at create")};
  static constexpr std::array results{unit::result("total_flow", "mol/s", "molar flow in, all phases")};
  static constexpr std::array series{
      unit::series("blend_temperature", "flow_blended", "mol/s", "temperature", "K", 8,
                   "temperature after each inlet is blended in, inlets in order"),
      unit::series("profile", "fraction", "1", "temperature", "K", 50,
                   "temperature from the first inlet's to the blend's, at evenly spaced fractions")};

  Blender(const unit::Parameters& parameters, const unit::Slate&)
      : profile_points_(static_cast<std::size_t>(parameters.number("profile_points"))) {}

  std::size_t series_length(std::size_t index) const { return index == 0 ? series[0].max_points : profile_points_; }
  // On a pass whose outlets alone are read it fills no series and no result.
  static constexpr bool outlets_only_passes = true;

  void solve(std::span<const unit::InletState> inlets, std::span<unit::OutletState> outlets, unit::Results& results,
             unit::Warnings&) const {
    constexpr std::size_t feed = unit::port_index(ports, "feed");
    constexpr std::size_t share = unit::port_index(ports, "share");
    const auto feeds = unit::on_port(inlets, feed);
    const auto shares = unit::on_port(outlets, share);
    unit::Series& blend = results.series("blend_temperature");
    // Equal, constant molar heat capacities, as the test mixer: the flow-weighted mean temperature.
    double flow = 0.0;
    double weighted = 0.0;
    double pressure = feeds[0].pressure;
    for (const unit::InletState& inlet : feeds) {
      const double n = total_flow(inlet);
      flow += n;
      weighted += n * inlet.temperature;
      pressure = std::min(pressure, inlet.pressure);
      if (!results.outlets_only()) blend.add(flow, flow > 0.0 ? weighted / flow : inlet.temperature);
    }
    const double temperature = flow > 0.0 ? weighted / flow : feeds[0].temperature;
    const double each = 1.0 / static_cast<double>(shares.size());
    for (unit::OutletState& out : shares) {
      out.temperature = temperature;
      out.pressure = pressure;
      std::ranges::fill(out.flows, 0.0);
      for (const unit::InletState& inlet : feeds) {
        for (std::size_t k = 0; k < out.flows.size(); ++k) out.flows[k] += inlet.flows[k] * each;
      }
    }
    if (results.outlets_only()) return;
    unit::Series& profile = results.series("profile");
    for (std::size_t i = 0; i < profile.capacity(); ++i) {
      const double fraction = static_cast<double>(i) / static_cast<double>(profile.capacity() - 1);
      profile.add(fraction, feeds[0].temperature + fraction * (temperature - feeds[0].temperature));
    }
    results.set("total_flow", flow);
  }

 private:
  std::size_t profile_points_;
};

}  // namespace

PROTONFLOW_EXPORT_UNITS("protonflow-abi-test-units", "1.0.0", Passthrough, Mixer, Probe, Blender)
