// The splitter module, loaded as a host loads it: descriptors, parameter rejection, and the mass
// balance, which must close to round-off (exactly, in port order, where the arithmetic allows).
#include <catch2/catch.hpp>

#include <array>
#include <cmath>
#include <cstdint>
#include <filesystem>
#include <limits>
#include <random>
#include <string>
#include <vector>

#include "units_test_support.hpp"

using namespace units_test;
using host::ParameterValue;

namespace {

const host::Module& splitter_module() {
  static const host::Module module(UNITS_SPLITTER_MODULE);
  return module;
}

host::Instance create_splitter(const std::vector<ParameterValue>& parameters, const host::Slate& slate) {
  return splitter_module().create("splitter", parameters, slate);
}

// Components in every phase, and one solid phase, so that every row of a stream is exercised.
const host::Slate slate{{"H2O", "HCl", "NaOH", "CO2", "CaSO4.2H2O"}, {"gypsum"}};

host::StreamState three_phase_feed() {
  host::StreamState feed = stream(slate, 318.15, 2.5e5);
  flow(feed, slate, PFU_AQUEOUS_ROW, "H2O") = 55.508435061791985;
  flow(feed, slate, PFU_AQUEOUS_ROW, "HCl") = 0.1234567890123;
  flow(feed, slate, PFU_AQUEOUS_ROW, "NaOH") = 0.0987654321;
  flow(feed, slate, PFU_AQUEOUS_ROW, "CO2") = 3.3e-4;
  flow(feed, slate, PFU_GAS_ROW, "CO2") = 0.0271828;
  flow(feed, slate, PFU_GAS_ROW, "H2O") = 0.00314159;
  flow(feed, slate, PFU_FIRST_SOLID_ROW, "CaSO4.2H2O") = 0.0123;
  return feed;
}

// Spacing of doubles just above x (x >= 0).
double ulp(double x) { return std::nextafter(x, std::numeric_limits<double>::infinity()) - x; }

std::vector<host::StreamState> outlets_for(std::size_t count) { return std::vector<host::StreamState>(count); }

// One solve with the feed and as many outlets as the list port is given.
host::Solution split(host::Instance& unit, const host::StreamState& feed, std::vector<host::StreamState>& outlets) {
  const std::array<std::uint32_t, 1> one{1};
  const std::array<std::uint32_t, 1> count{static_cast<std::uint32_t>(outlets.size())};
  return unit.solve(std::span(&feed, 1), one, outlets, count);
}

std::string create_error(const std::vector<ParameterValue>& parameters) {
  try {
    splitter_module().create("splitter", parameters, slate);
  } catch (const host::CreateError& error) {
    return error.what();
  }
  return "created";
}

}  // namespace

TEST_CASE("splitter: the module sits in the host's built-in directory and describes itself") {
  CHECK(std::filesystem::path(UNITS_SPLITTER_MODULE).parent_path() == std::filesystem::path(UNITS_BUILT_IN_DIRECTORY));
  const host::UnitClassInfo* info = splitter_module().find("splitter");
  REQUIRE(info != nullptr);
  CHECK(splitter_module().classes().size() == 1);
  CHECK(info->inlet_count() == 1);
  CHECK(info->outlet_count() == 1);
  REQUIRE(info->ports.size() == 2);
  CHECK(info->ports[0].name == "feed");
  CHECK_FALSE(info->ports[0].list);
  // The branches are one list port of 2 to 8 streams (ABI 1.3).
  CHECK(info->ports[1].name == "outlets");
  CHECK(info->ports[1].list);
  CHECK(info->ports[1].min_streams == 2);
  CHECK(info->ports[1].max_streams == 8);
  for (const auto& port : info->ports) CHECK(port.phases == (PFU_PHASE_AQUEOUS | PFU_PHASE_GAS | PFU_PHASE_SOLID));

  const auto parameter = [&](const std::string& name) {
    const auto found = std::ranges::find(info->parameters, name, &host::ParameterInfo::name);
    REQUIRE(found != info->parameters.end());
    return *found;
  };
  CHECK(std::ranges::find(info->parameters, "outlets", &host::ParameterInfo::name) == info->parameters.end());
  CHECK(parameter("split_by").kind == host::ParameterKind::choice);
  CHECK(parameter("split_by").choices == std::vector<std::string>{"fractions", "flows"});
  CHECK(parameter("split_by").default_text == "fractions");
  CHECK(parameter("fraction_8").unit == "1");
  CHECK(parameter("fraction_8").upper == 1.0);
  CHECK(parameter("flow_7").unit == "mol/s");
  CHECK(std::ranges::find(info->parameters, "flow_8", &host::ParameterInfo::name) == info->parameters.end());
  REQUIRE(info->results.size() == 1);
  CHECK(info->results[0].name == "feed_flow");
  CHECK(info->results[0].unit == "mol/s");
  // The shares sent are a series, one point per outlet, rather than eight results mostly unused.
  REQUIRE(info->series.size() == 1);
  CHECK(info->series[0].name == "shares");
  CHECK(info->series[0].max_points == 8);
  CHECK(create_splitter({{"fraction_1", 0.5}, {"fraction_2", 0.25}, {"fraction_3", 0.25}}, slate).series_lengths() ==
        std::vector<std::uint32_t>{3});
}

TEST_CASE("splitter: parameters it cannot work with are refused at create, with the reason") {
  CHECK_THAT(create_error({{"fraction_1", 0.3}, {"fraction_2", 0.6}}),
             Catch::Contains("split fractions add up to 0.9 (0.3 + 0.6), not 1 within 1e-12"));
  // 1e-11 off is more than the tolerance; 1e-13 off is round-off and accepted.
  CHECK_THAT(create_error({{"fraction_1", 0.5}, {"fraction_2", 0.5 + 1e-11}}), Catch::Contains("add up to"));
  CHECK(create_error({{"fraction_1", 0.5}, {"fraction_2", 0.5 + 1e-13}}) == "created");
  CHECK_THAT(create_error({{"fraction_1", 1.0}}), Catch::Contains("needs parameter 'fraction_2'"));
  CHECK_THAT(create_error({{"fraction_1", 0.5}, {"fraction_3", 0.5}}),
             Catch::Contains("'fraction_3' is given without 'fraction_2'"));
  CHECK_THAT(create_error({{"outlets", 2.0}, {"fraction_1", 0.5}, {"fraction_2", 0.5}}),
             Catch::Contains("unknown parameter 'outlets'"));
  CHECK_THAT(create_error({{"fraction_1", 0.5}, {"fraction_2", 0.5}, {"flow_1", 1.0}}),
             Catch::Contains("'flow_1' does not apply with split_by fractions"));
  CHECK_THAT(create_error({{"fraction_1", 1.5}, {"fraction_2", -0.5}}), Catch::Contains("outside [0, 1]"));
  CHECK_THAT(create_error({{"split_by", std::string("flows")}}),
             Catch::Contains("needs parameter 'flow_1'") && Catch::Contains("the last, which takes the rest"));
  CHECK_THAT(create_error({{"split_by", std::string("flows")}, {"flow_2", 1.0}}),
             Catch::Contains("'flow_2' is given without 'flow_1'"));
  CHECK_THAT(create_error({{"split_by", std::string("flows")}, {"flow_1", 1.0}, {"fraction_1", 0.5}}),
             Catch::Contains("'fraction_1' does not apply with split_by flows"));
  CHECK_THAT(create_error({{"split_by", std::string("halves")}}), Catch::Contains("allowed: 'fractions', 'flows'"));
}

TEST_CASE("splitter: fractions split every phase and component alike, and the outlets add up to the feed exactly") {
  auto unit = create_splitter({{"fraction_1", 0.1}, {"fraction_2", 0.2}, {"fraction_3", 0.7}}, slate);
  const host::StreamState feed = three_phase_feed();
  auto outlets = outlets_for(3);
  const host::Solution solution = split(unit, feed, outlets);
  CHECK(solution.warnings.empty());
  const std::array<double, 3> fractions{0.1, 0.2, 0.7};
  for (std::size_t k = 0; k < feed.flows.size(); ++k) {
    // outlet_1 and outlet_2 are the given fraction of every cell, as one multiplication;
    CHECK(outlets[0].flows[k] == feed.flows[k] * fractions[0]);
    CHECK(outlets[1].flows[k] == feed.flows[k] * fractions[1]);
    // the last takes the rest, which is its fraction to round-off;
    CHECK(outlets[2].flows[k] == Approx(feed.flows[k] * fractions[2]).epsilon(1e-14).margin(0.0));
    // and the outlets, added in port order, give the feed back bit for bit.
    CHECK(outlets[0].flows[k] + outlets[1].flows[k] + outlets[2].flows[k] == feed.flows[k]);
  }
  for (const auto& outlet : outlets) {
    CHECK(outlet.temperature == feed.temperature);
    CHECK(outlet.pressure == feed.pressure);
  }
  CHECK(solution.results[0] == total_flow(feed));
  REQUIRE(solution.series.size() == 1);
  CHECK(solution.series[0].x == std::vector<double>{1.0, 2.0, 3.0});
  REQUIRE(solution.series[0].y.size() == 3);
  CHECK(solution.series[0].y[0] == Approx(0.1).epsilon(1e-14));
  CHECK(solution.series[0].y[1] == Approx(0.2).epsilon(1e-14));
  CHECK(solution.series[0].y[2] == Approx(0.7).epsilon(1e-14));

  // A flowsheet connecting another number of outlets than the fractions given is refused.
  auto two = outlets_for(2);
  try {
    split(unit, feed, two);
    FAIL("three fractions split into two outlets");
  } catch (const host::SolveError& error) {
    CHECK(error.status() == PFU_INVALID_PARAMETER);
    CHECK_THAT(error.what(), Catch::Contains("2 outlets are connected, but the fractions fraction_1..fraction_3 are for 3"));
  }
}

TEST_CASE("splitter: random feeds and fractions over 2 to 8 outlets close the balance to one ulp, cell by cell") {
  std::mt19937_64 random(20240601);  // fixed seed: the same cases on every run
  std::uniform_real_distribution<double> unit_interval(0.0, 1.0);
  std::uniform_int_distribution<int> outlet_count(2, 8);
  std::size_t cells_checked = 0;
  std::size_t cells_exact = 0;
  double worst_ratio_error = 0.0;
  for (int trial = 0; trial < 300; ++trial) {
    const int n = outlet_count(random);
    std::vector<double> weights(static_cast<std::size_t>(n));
    double weight_sum = 0.0;
    for (double& w : weights) weight_sum += (w = unit_interval(random));
    std::vector<ParameterValue> parameters;
    std::vector<double> fractions;
    double given = 0.0;
    for (int i = 0; i + 1 < n; ++i) {
      fractions.push_back(weights[static_cast<std::size_t>(i)] / weight_sum);
      given += fractions.back();
    }
    fractions.push_back(1.0 - given);  // within round-off of 1 in total, so accepted
    for (int i = 0; i < n; ++i) parameters.push_back({"fraction_" + std::to_string(i + 1), fractions[static_cast<std::size_t>(i)]});
    auto unit = splitter_module().create("splitter", parameters, slate);

    host::StreamState feed = stream(slate, 300.0, 1e5);
    for (double& f : feed.flows) f = unit_interval(random) < 0.3 ? 0.0 : std::exp(20.0 * unit_interval(random) - 12.0);
    auto outlets = outlets_for(static_cast<std::size_t>(n));
    split(unit, feed, outlets);
    for (std::size_t k = 0; k < feed.flows.size(); ++k) {
      double sum = 0.0;
      for (int i = 0; i < n; ++i) sum += outlets[static_cast<std::size_t>(i)].flows[k];
      // The last outlet is feed − (the others), so the sum in port order is the feed to within one
      // rounding of that difference and one of the sum: one ulp of the feed at most, and exactly
      // the feed unless the difference meets a rounding tie.
      CHECK(std::abs(sum - feed.flows[k]) <= ulp(feed.flows[k]));
      if (sum == feed.flows[k]) ++cells_exact;
      for (int i = 0; i < n; ++i) {
        const double part = outlets[static_cast<std::size_t>(i)].flows[k];
        CHECK(part >= 0.0);
        if (feed.flows[k] > 0.0) {
          worst_ratio_error = std::max(worst_ratio_error, std::abs(part - fractions[static_cast<std::size_t>(i)] * feed.flows[k]) / feed.flows[k]);
        }
      }
      ++cells_checked;
    }
  }
  CHECK(cells_checked == 300 * slate.components.size() * slate.phase_count());
  CHECK(cells_exact >= cells_checked * 95 / 100);  // ties are rare: about 0.5 % of cells in a 1e6-case trial
  // Each outlet is its fraction of the feed to round-off (the last, a difference, the loosest).
  CHECK(worst_ratio_error <= 1e-14);
}

TEST_CASE("splitter: outlet flows for all but the last, and the last takes the rest") {
  auto unit = create_splitter({{"split_by", std::string("flows")}, {"flow_1", 10.0}, {"flow_2", 0.0}, {"flow_3", 25.0}}, slate);
  const host::StreamState feed = three_phase_feed();
  const double total = total_flow(feed);
  auto outlets = outlets_for(4);
  const host::Solution solution = split(unit, feed, outlets);
  CHECK(total_flow(outlets[0]) == Approx(10.0).epsilon(1e-14));
  CHECK(total_flow(outlets[1]) == 0.0);
  CHECK(total_flow(outlets[2]) == Approx(25.0).epsilon(1e-14));
  CHECK(total_flow(outlets[3]) == Approx(total - 35.0).epsilon(1e-14));
  for (std::size_t k = 0; k < feed.flows.size(); ++k) {
    CHECK(outlets[0].flows[k] + outlets[1].flows[k] + outlets[2].flows[k] + outlets[3].flows[k] == feed.flows[k]);
    // Same proportion in every cell: each cell of outlet_1 is 10/total of the feed's.
    CHECK(outlets[0].flows[k] == Approx(feed.flows[k] * 10.0 / total).epsilon(1e-15).margin(0.0));
  }
  CHECK(solution.results[0] == total);
  REQUIRE(solution.series[0].y.size() == 4);
  CHECK(solution.series[0].y[0] == Approx(10.0 / total).epsilon(1e-14));
  CHECK(solution.series[0].y[3] == Approx((total - 35.0) / total).epsilon(1e-14));

  auto pair = outlets_for(2);

  // Asking for more than the feed has is refused at solve, naming both flows.
  auto greedy = create_splitter({{"split_by", std::string("flows")}, {"flow_1", 100.0}}, slate);
  try {
    split(greedy, feed, pair);
    FAIL("a flow above the feed was accepted");
  } catch (const host::SolveError& error) {
    CHECK(error.status() == PFU_INVALID_PARAMETER);
    CHECK_THAT(error.what(), Catch::Contains("add up to 100 mol/s, more than the feed's"));
  }

  // Exactly the whole feed to outlet_1 leaves nothing, not a negative round-off, for the last.
  auto all = create_splitter({{"split_by", std::string("flows")}, {"flow_1", total}}, slate);
  split(all, feed, pair);
  for (std::size_t k = 0; k < feed.flows.size(); ++k) {
    CHECK(pair[1].flows[k] >= 0.0);
    CHECK(pair[0].flows[k] + pair[1].flows[k] == Approx(feed.flows[k]).epsilon(1e-15).margin(0.0));
  }
}

TEST_CASE("splitter: a feed with no flow gives outlets with no flow") {
  auto unit = create_splitter({{"fraction_1", 0.25}, {"fraction_2", 0.75}}, slate);
  const host::StreamState feed = stream(slate, 290.0, 1e5);
  auto outlets = outlets_for(2);
  const host::Solution solution = split(unit, feed, outlets);
  for (const auto& outlet : outlets) CHECK(total_flow(outlet) == 0.0);
  CHECK(solution.results[0] == 0.0);
  CHECK(solution.series[0].y == std::vector<double>{0.25, 0.75});
}

TEST_CASE("splitter: solids_to sends every solid to one outlet, an ideal settler, and the rest is split as given") {
  auto unit = create_splitter({{"fraction_1", 0.3}, {"fraction_2", 0.7}, {"solids_to", 2.0}}, slate);
  const host::StreamState feed = three_phase_feed();
  auto outlets = outlets_for(2);
  split(unit, feed, outlets);
  const std::size_t columns = slate.components.size();
  for (std::size_t k = 0; k < feed.flows.size(); ++k) {
    if (k / columns >= PFU_FIRST_SOLID_ROW) {
      CHECK(outlets[0].flows[k] == 0.0);
      CHECK(outlets[1].flows[k] == feed.flows[k]);
    } else {
      CHECK(outlets[0].flows[k] == feed.flows[k] * 0.3);
      // the last outlet takes the rest: the sum is the feed to one ulp (docs/units.md, "mass balance")
      CHECK(std::abs(outlets[0].flows[k] + outlets[1].flows[k] - feed.flows[k]) <= ulp(feed.flows[k]));
    }
  }
  CHECK(flow(outlets[1], slate, PFU_FIRST_SOLID_ROW, "CaSO4.2H2O") == 0.0123);
  CHECK_THAT(create_error({{"fraction_1", 0.5}, {"fraction_2", 0.5}, {"solids_to", 3.0}}),
             Catch::Contains("'solids_to' is 3") && Catch::Contains("from 1 to 2, or 0"));
  CHECK_THAT(create_error({{"fraction_1", 0.5}, {"fraction_2", 0.5}, {"solids_to", 1.5}}), Catch::Contains("whole number"));
}
