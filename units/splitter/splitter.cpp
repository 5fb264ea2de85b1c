// splitter: one feed divided among 2 to 8 outlets, every phase and every component in the same
// proportion, temperature and pressure unchanged. Equations and limits: docs/units.md.
//
// The outlets are one list port (unit ABI 1.3): a flowsheet connects as many branches as it
// uses ('outlets: [recycle, bleed]'), and the parameters say how the feed is shared among them.
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
      unit::outlet_list("outlets", all_phases, 2, max_outlets, "the branches, 2 to 8, as a list: outlets: [a, b]")};
  static constexpr std::array<const char*, 2> split_modes{"fractions", "flows"};
  static constexpr std::array parameters{
      unit::choice("split_by", split_modes, "fractions",
                   "fractions: give fraction_i for every outlet; flows: give flow_i for all but the last"),
      unit::number("fraction_1", "1", 0.0, 0.0, 1.0, "share of the feed to the first outlet (split_by fractions)"),
      unit::number("fraction_2", "1", 0.0, 0.0, 1.0, "share of the feed to the second outlet (split_by fractions)"),
      unit::number("fraction_3", "1", 0.0, 0.0, 1.0, "share of the feed to the third outlet (split_by fractions)"),
      unit::number("fraction_4", "1", 0.0, 0.0, 1.0, "share of the feed to the fourth outlet (split_by fractions)"),
      unit::number("fraction_5", "1", 0.0, 0.0, 1.0, "share of the feed to the fifth outlet (split_by fractions)"),
      unit::number("fraction_6", "1", 0.0, 0.0, 1.0, "share of the feed to the sixth outlet (split_by fractions)"),
      unit::number("fraction_7", "1", 0.0, 0.0, 1.0, "share of the feed to the seventh outlet (split_by fractions)"),
      unit::number("fraction_8", "1", 0.0, 0.0, 1.0, "share of the feed to the eighth outlet (split_by fractions)"),
      unit::number("flow_1", "mol/s", 0.0, 0.0, unit::unbounded, "total molar flow to the first outlet, all phases (split_by flows)"),
      unit::number("flow_2", "mol/s", 0.0, 0.0, unit::unbounded, "total molar flow to the second outlet (split_by flows)"),
      unit::number("flow_3", "mol/s", 0.0, 0.0, unit::unbounded, "total molar flow to the third outlet (split_by flows)"),
      unit::number("flow_4", "mol/s", 0.0, 0.0, unit::unbounded, "total molar flow to the fourth outlet (split_by flows)"),
      unit::number("flow_5", "mol/s", 0.0, 0.0, unit::unbounded, "total molar flow to the fifth outlet (split_by flows)"),
      unit::number("flow_6", "mol/s", 0.0, 0.0, unit::unbounded, "total molar flow to the sixth outlet (split_by flows)"),
      unit::number("flow_7", "mol/s", 0.0, 0.0, unit::unbounded, "total molar flow to the seventh outlet (split_by flows)"),
      unit::number("solids_to", "1", 0.0, 0.0, double(max_outlets),
                   "the outlet (1 to 8, by its place in the list) that takes every solid, as an ideal settler's underflow; 0: solids split like the rest")};
  static constexpr std::array results{
      unit::result("feed_flow", "mol/s", "total molar flow of the feed, all phases and components")};
  static constexpr std::array series{unit::series("shares", "outlet", "1", "share", "1", max_outlets,
                                                  "share of the feed sent to each outlet, by its place in the list")};

  // The shares series holds one point per outlet, a number fixed by the parameters at create.
  std::size_t series_length(std::size_t) const { return outlets_; }

  Splitter(const unit::Parameters& parameters, const unit::Slate& slate) : columns_(slate.components.size()) {
    by_fractions_ = parameters.text("split_by") == "fractions";
    const char* const own = by_fractions_ ? "fraction_" : "flow_";
    const char* const other = by_fractions_ ? "flow_" : "fraction_";
    const std::size_t own_declared = by_fractions_ ? max_outlets : max_outlets - 1;
    // The parameters given, fraction_1..fraction_n (or flow_1..flow_n-1), fix the outlets' number n.
    std::size_t own_count = 0;
    while (own_count < own_declared && parameters.given(own + std::to_string(own_count + 1))) ++own_count;
    for (std::size_t i = own_count + 1; i <= own_declared; ++i) {
      if (parameters.given(own + std::to_string(i))) {
        throw unit::UnitError(PFU_INVALID_PARAMETER, "unit 'splitter': parameter '" + std::string(own) + std::to_string(i) +
                                                         "' is given without '" + own + std::to_string(own_count + 1) +
                                                         "'; give them from the first outlet on, one per outlet");
      }
    }
    const std::size_t needed = by_fractions_ ? 2 : 1;
    if (own_count < needed) {
      throw unit::UnitError(PFU_INVALID_PARAMETER,
                            "unit 'splitter': split_by " + std::string(by_fractions_ ? "fractions" : "flows") +
                                " needs parameter '" + own + std::to_string(own_count + 1) + "'" +
                                (by_fractions_ ? " (one fraction per outlet, at least two)"
                                               : " (one flow per outlet but the last, which takes the rest)"));
    }
    outlets_ = by_fractions_ ? own_count : own_count + 1;
    for (std::size_t i = 0; i < own_count; ++i) given_[i] = parameters.number(own + std::to_string(i + 1));
    for (std::size_t i = 1; i <= (by_fractions_ ? max_outlets - 1 : max_outlets); ++i) {
      const std::string theirs = other + std::to_string(i);
      if (parameters.given(theirs)) {
        throw unit::UnitError(PFU_INVALID_PARAMETER, "unit 'splitter': parameter '" + theirs + "' does not apply with split_by " +
                                                         std::string(by_fractions_ ? "fractions" : "flows"));
      }
    }
    const double solids_to = parameters.number("solids_to");
    if (solids_to != std::floor(solids_to) || solids_to > double(outlets_)) {
      throw unit::UnitError(PFU_INVALID_PARAMETER, "unit 'splitter': parameter 'solids_to' is " + number_text(solids_to) +
                                                       "; give the place of an outlet, a whole number from 1 to " +
                                                       std::to_string(outlets_) + ", or 0");
    }
    solids_to_ = static_cast<std::size_t>(solids_to);
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
    if (outlets.size() != outlets_) {
      throw unit::UnitError(PFU_INVALID_PARAMETER,
                            "unit 'splitter': " + std::to_string(outlets.size()) + " outlets are connected, but the " +
                                (by_fractions_ ? "fractions fraction_1..fraction_" + std::to_string(outlets_)
                                               : "flows flow_1..flow_" + std::to_string(outlets_ - 1)) +
                                " are for " + std::to_string(outlets_));
    }
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

    for (std::size_t i = 0; i < outlets_; ++i) {
      outlets[i].temperature = feed.temperature;
      outlets[i].pressure = feed.pressure;
    }
    const std::size_t last = outlets_ - 1;
    for (std::size_t k = 0; k < feed.flows.size(); ++k) {
      const double in = feed.flows[k];
      if (solids_to_ > 0 && k / columns_ >= PFU_FIRST_SOLID_ROW) {
        // An ideal settler: every solid to its underflow outlet, none elsewhere.
        for (std::size_t i = 0; i < outlets_; ++i) outlets[i].flows[k] = i + 1 == solids_to_ ? in : 0.0;
        continue;
      }
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
    }

    results.set("feed_flow", feed_flow);
    unit::Series& shares = results.series("shares");
    for (std::size_t i = 0; i < outlets_; ++i) {
      double flow = 0.0;
      for (const double f : outlets[i].flows) flow += f;
      // The share actually sent: the given one, or for the last outlet what is left (1 − the others).
      shares.add(static_cast<double>(i + 1),
                 feed_flow > 0.0 ? flow / feed_flow : (by_fractions_ ? given_[i] : (i == last ? 1.0 : 0.0)));
    }
  }

 private:
  std::size_t columns_ = 0;  // components of the slate: the flows of a phase row
  std::size_t solids_to_ = 0;  // 1-based outlet taking every solid; 0: solids split like the rest
  std::size_t outlets_ = 2;  // fixed by the parameters given; the flowsheet must connect as many
  bool by_fractions_ = true;
  std::array<double, max_outlets> given_{};  // fractions (1) or flows (mol/s), in outlet order
};

}  // namespace

PROTONFLOW_EXPORT_UNITS("protonflow-splitter", "0.1.0", Splitter)
