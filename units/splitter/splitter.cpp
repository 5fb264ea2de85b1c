// splitter: one feed divided among 2 to 8 outlets, every phase and every component in the same
// proportion, temperature and pressure unchanged. Equations and limits: docs/units.md.
//
// The ABI fixes a class's ports, so the class declares eight outlets, the last six optional (ABI
// 1.2): a flowsheet connects only those it uses; `outlets` says how many
// are used, and the unused ones carry zero flow at the feed's temperature and pressure.
#include <protonflow/unit_module.hpp>

#include <array>
#include <charconv>
#include <cmath>
#include <cstddef>
#include <span>
#include <string>

namespace {

namespace unit = protonflow::unit;

constexpr std::uint32_t all_phases = PFU_PHASE_AQUEOUS | PFU_PHASE_GAS | PFU_PHASE_SOLID;
constexpr std::size_t max_outlets = 8;

// Split fractions must add up to 1 within this (absolute, dimensionless): a sum off by more is a
// typing error, not round-off (the brief; 1e-12 is about 4500 ulp of 1).
constexpr double fraction_sum_tolerance = 1e-12;

// Flows in `flows` mode may exceed the feed by this much (relative) and count as all of it: the
// round-off of a host adding up the same feed in another order.
constexpr double flow_excess_tolerance = 1e-12;

// 15 significant digits: enough to show a sum 1e-12 off 1, without the noise of the 17th digit.
std::string number_text(double value) {
  std::array<char, 32> text{};
  const auto written = std::to_chars(text.data(), text.data() + text.size(), value, std::chars_format::general, 15);
  return std::string(text.data(), written.ptr);
}

class Splitter {
 public:
  static constexpr const char* type = "splitter";
  static constexpr const char* summary = "Divides one stream among 2 to 8 outlets in fixed proportion, all phases alike";
  static constexpr std::array ports{
      unit::inlet("feed", all_phases, "the stream to divide, any phases"),
      unit::outlet("outlet_1", all_phases, "first branch"),
      unit::outlet("outlet_2", all_phases, "second branch"),
      unit::outlet("outlet_3", all_phases, "third branch; zero flow unless outlets >= 3; may stay unconnected", PFU_PORT_OPTIONAL),
      unit::outlet("outlet_4", all_phases, "fourth branch; zero flow unless outlets >= 4; may stay unconnected", PFU_PORT_OPTIONAL),
      unit::outlet("outlet_5", all_phases, "fifth branch; zero flow unless outlets >= 5; may stay unconnected", PFU_PORT_OPTIONAL),
      unit::outlet("outlet_6", all_phases, "sixth branch; zero flow unless outlets >= 6; may stay unconnected", PFU_PORT_OPTIONAL),
      unit::outlet("outlet_7", all_phases, "seventh branch; zero flow unless outlets >= 7; may stay unconnected", PFU_PORT_OPTIONAL),
      unit::outlet("outlet_8", all_phases, "eighth branch; zero flow unless outlets = 8; may stay unconnected", PFU_PORT_OPTIONAL)};
  static constexpr std::array<const char*, 2> split_modes{"fractions", "flows"};
  static constexpr std::array parameters{
      unit::number("outlets", "1", 2.0, 2.0, 8.0, "number of outlets used, a whole number from 2 to 8"),
      unit::choice("split_by", split_modes, "fractions",
                   "fractions: give fraction_i for every used outlet; flows: give flow_i for all but the last"),
      unit::number("fraction_1", "1", 0.0, 0.0, 1.0, "share of the feed to outlet_1 (split_by fractions)"),
      unit::number("fraction_2", "1", 0.0, 0.0, 1.0, "share of the feed to outlet_2 (split_by fractions)"),
      unit::number("fraction_3", "1", 0.0, 0.0, 1.0, "share of the feed to outlet_3 (split_by fractions)"),
      unit::number("fraction_4", "1", 0.0, 0.0, 1.0, "share of the feed to outlet_4 (split_by fractions)"),
      unit::number("fraction_5", "1", 0.0, 0.0, 1.0, "share of the feed to outlet_5 (split_by fractions)"),
      unit::number("fraction_6", "1", 0.0, 0.0, 1.0, "share of the feed to outlet_6 (split_by fractions)"),
      unit::number("fraction_7", "1", 0.0, 0.0, 1.0, "share of the feed to outlet_7 (split_by fractions)"),
      unit::number("fraction_8", "1", 0.0, 0.0, 1.0, "share of the feed to outlet_8 (split_by fractions)"),
      unit::number("flow_1", "mol/s", 0.0, 0.0, unit::unbounded, "total molar flow to outlet_1, all phases (split_by flows)"),
      unit::number("flow_2", "mol/s", 0.0, 0.0, unit::unbounded, "total molar flow to outlet_2, all phases (split_by flows)"),
      unit::number("flow_3", "mol/s", 0.0, 0.0, unit::unbounded, "total molar flow to outlet_3, all phases (split_by flows)"),
      unit::number("flow_4", "mol/s", 0.0, 0.0, unit::unbounded, "total molar flow to outlet_4, all phases (split_by flows)"),
      unit::number("flow_5", "mol/s", 0.0, 0.0, unit::unbounded, "total molar flow to outlet_5, all phases (split_by flows)"),
      unit::number("flow_6", "mol/s", 0.0, 0.0, unit::unbounded, "total molar flow to outlet_6, all phases (split_by flows)"),
      unit::number("flow_7", "mol/s", 0.0, 0.0, unit::unbounded, "total molar flow to outlet_7, all phases (split_by flows)")};
  static constexpr std::array results{
      unit::result("feed_flow", "mol/s", "total molar flow of the feed, all phases and components"),
      unit::result("fraction_1", "1", "share of the feed sent to outlet_1"),
      unit::result("fraction_2", "1", "share of the feed sent to outlet_2"),
      unit::result("fraction_3", "1", "share of the feed sent to outlet_3; NaN if unused"),
      unit::result("fraction_4", "1", "share of the feed sent to outlet_4; NaN if unused"),
      unit::result("fraction_5", "1", "share of the feed sent to outlet_5; NaN if unused"),
      unit::result("fraction_6", "1", "share of the feed sent to outlet_6; NaN if unused"),
      unit::result("fraction_7", "1", "share of the feed sent to outlet_7; NaN if unused"),
      unit::result("fraction_8", "1", "share of the feed sent to outlet_8; NaN if unused")};

  Splitter(const unit::Parameters& parameters, const unit::Slate&) {
    const double count = parameters.number("outlets");
    if (count != std::floor(count)) {
      throw unit::UnitError(PFU_INVALID_PARAMETER, "unit 'splitter': parameter 'outlets' = " + number_text(count) +
                                                       " is not a whole number");
    }
    outlets_ = static_cast<std::size_t>(count);
    by_fractions_ = parameters.text("split_by") == "fractions";
    const char* const own = by_fractions_ ? "fraction_" : "flow_";
    const char* const other = by_fractions_ ? "flow_" : "fraction_";
    const std::size_t own_count = by_fractions_ ? outlets_ : outlets_ - 1;  // flows: the last takes the rest
    const std::size_t own_declared = by_fractions_ ? max_outlets : max_outlets - 1;
    for (std::size_t i = 1; i <= max_outlets; ++i) {
      const std::string mine = own + std::to_string(i);
      const std::string theirs = other + std::to_string(i);
      if (i <= own_declared) {
        if (i <= own_count && !parameters.given(mine)) {
          throw unit::UnitError(PFU_INVALID_PARAMETER,
                                "unit 'splitter': split_by " + std::string(by_fractions_ ? "fractions" : "flows") +
                                    " with " + std::to_string(outlets_) + " outlets needs parameter '" + mine + "'" +
                                    (by_fractions_ ? "" : " (the last outlet takes the rest of the feed)"));
        }
        if (i > own_count && parameters.given(mine)) {
          throw unit::UnitError(PFU_INVALID_PARAMETER, "unit 'splitter': parameter '" + mine + "' is given, but " +
                                                           (by_fractions_ ? "only " + std::to_string(outlets_) +
                                                                                " outlets are used"
                                                                          : "with split_by flows outlet_" +
                                                                                std::to_string(outlets_) +
                                                                                " takes the rest and outlets beyond "
                                                                                "it are unused"));
        }
        if (i <= own_count) given_[i - 1] = parameters.number(mine);
      }
      if (i <= (by_fractions_ ? max_outlets - 1 : max_outlets) && parameters.given(theirs)) {
        throw unit::UnitError(PFU_INVALID_PARAMETER, "unit 'splitter': parameter '" + theirs + "' does not apply with split_by " +
                                                         std::string(by_fractions_ ? "fractions" : "flows"));
      }
    }
    if (by_fractions_) {
      double sum = 0.0;
      for (std::size_t i = 0; i < outlets_; ++i) sum += given_[i];
      if (!(std::abs(sum - 1.0) <= fraction_sum_tolerance)) {
        std::string terms;
        for (std::size_t i = 0; i < outlets_; ++i) terms += (i == 0 ? "" : " + ") + number_text(given_[i]);
        throw unit::UnitError(PFU_INVALID_PARAMETER, "unit 'splitter': the split fractions add up to " + number_text(sum) +
                                                         " (" + terms + "), not 1 within " +
                                                         number_text(fraction_sum_tolerance));
      }
    }
  }

  void solve(std::span<const unit::InletState> inlets, std::span<unit::OutletState> outlets, unit::Results& results,
             unit::Warnings&) const {
    const unit::InletState& feed = inlets[0];
    double feed_flow = 0.0;
    for (const double flow : feed.flows) feed_flow += flow;

    // Share of each used outlet but the last; the last takes what is left, cell by cell, so that
    // the outlets added in port order give the feed back to within one ulp, and bit for bit
    // unless the last subtraction meets a rounding tie (docs/units.md, "mass balance").
    std::array<double, max_outlets> share{};
    if (by_fractions_) {
      share = given_;
    } else {
      double asked = 0.0;
      for (std::size_t i = 0; i + 1 < outlets_; ++i) asked += given_[i];
      if (asked > feed_flow * (1.0 + flow_excess_tolerance)) {
        throw unit::UnitError(PFU_INVALID_PARAMETER, "unit 'splitter': the outlet flows flow_1..flow_" +
                                                         std::to_string(outlets_ - 1) + " add up to " +
                                                         number_text(asked) + " mol/s, more than the feed's " +
                                                         number_text(feed_flow) + " mol/s");
      }
      for (std::size_t i = 0; i + 1 < outlets_; ++i) share[i] = feed_flow > 0.0 ? given_[i] / feed_flow : 0.0;
    }

    for (std::size_t i = 0; i < max_outlets; ++i) {
      outlets[i].temperature = feed.temperature;
      outlets[i].pressure = feed.pressure;
    }
    const std::size_t last = outlets_ - 1;
    for (std::size_t k = 0; k < feed.flows.size(); ++k) {
      const double in = feed.flows[k];
      double sent = 0.0;
      std::size_t largest = 0;
      for (std::size_t i = 0; i < last; ++i) {
        const double part = in * share[i];
        outlets[i].flows[k] = part;
        if (part > outlets[largest].flows[k]) largest = i;
        sent += part;
      }
      double rest = in - sent;
      if (rest < 0.0) {
        // Only where the shares before the last add up to 1 and their products round up: take the
        // excess (a few ulp) from the largest part so that no flow is negative.
        outlets[largest].flows[k] += rest;
        rest = 0.0;
      }
      outlets[last].flows[k] = rest;
      for (std::size_t i = outlets_; i < max_outlets; ++i) outlets[i].flows[k] = 0.0;
    }

    results.set("feed_flow", feed_flow);
    for (std::size_t i = 0; i < outlets_; ++i) {
      double flow = 0.0;
      for (const double f : outlets[i].flows) flow += f;
      // The share actually sent: the given one, or for the last outlet what is left (1 − the others).
      results[1 + i] = feed_flow > 0.0 ? flow / feed_flow : (by_fractions_ ? given_[i] : (i == last ? 1.0 : 0.0));
    }
  }

 private:
  std::size_t outlets_ = 2;
  bool by_fractions_ = true;
  std::array<double, max_outlets> given_{};  // fractions (1) or flows (mol/s), in outlet order
};

}  // namespace

PROTONFLOW_EXPORT_UNITS("protonflow-splitter", "0.1.0", Splitter)
