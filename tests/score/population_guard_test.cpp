// The population guard (population_guard.hpp) — envsift's own rule, checked on hand-made
// findings: it counts distinct places (cells), not records; withheld only above the share and the
// minimum number of places; statistics and severities kept; the code added.
#include <gtest/gtest.h>

#include "envsift/score/population_guard.hpp"

namespace envsift {
namespace {

// `judged` tested records (and one untested), the first `flagged` flagged; record r at place
// place_of(r).
template <class Place>
std::vector<Finding> findings(std::size_t judged, std::size_t flagged, Place place_of, std::vector<std::uint64_t>& places) {
  std::vector<Finding> f(judged + 1);
  places.assign(judged + 1, 999999);
  for (std::size_t i = 0; i < judged; ++i) {
    f[i].tested = true;
    f[i].statistic = i < flagged ? 5.0 + static_cast<double>(i) : 1.0;
    f[i].threshold = 3.0;
    f[i].severity = f[i].statistic / 3.0;
    f[i].flagged = i < flagged;
    if (f[i].flagged) f[i].reasons = {"far"};
    places[i] = place_of(i);
  }
  return f;
}
const auto own_place = [](std::size_t i) { return static_cast<std::uint64_t>(i); };

TEST(PopulationGuard, WithholdsOnlyAboveTheShareAndCountOfPlaces) {
  const PopulationGuard guard{0.15, 5};
  std::vector<std::uint64_t> places;
  auto few = findings(100, 15, own_place, places);  // 15 % of places exactly: stands
  EXPECT_FALSE(withhold_population_flags(few, places, "robust_z", guard).withheld);
  EXPECT_TRUE(few[0].flagged);
  auto small = findings(20, 4, own_place, places);  // 20 % but only 4 places: stands
  EXPECT_FALSE(withhold_population_flags(small, places, "robust_z", guard).withheld);
  auto many = findings(100, 30, own_place, places);
  const GuardOutcome g = withhold_population_flags(many, places, "mahalanobis", guard);
  EXPECT_TRUE(g.withheld);
  EXPECT_EQ(g.flagged_places, 30u);
  EXPECT_EQ(g.judged_places, 100u);
  EXPECT_EQ(g.flagged_records, 30u);
  EXPECT_DOUBLE_EQ(g.share(), 0.30);
  for (std::size_t i = 0; i < 30; ++i) {
    EXPECT_FALSE(many[i].flagged);
    EXPECT_DOUBLE_EQ(many[i].statistic, 5.0 + static_cast<double>(i));  // the statistic stays
    EXPECT_DOUBLE_EQ(many[i].severity, (5.0 + static_cast<double>(i)) / 3.0);  // and its own severity: the ranking keeps its order
    EXPECT_TRUE(many[i].reasons.empty());
    EXPECT_EQ(many[i].codes, std::vector<std::string>{"looks_multimodal:mahalanobis"});
  }
  EXPECT_TRUE(many[50].codes.empty());  // records it never flagged carry no code
}

TEST(PopulationGuard, ABatchAtAFewPlacesStaysFlaggedHoweverManyRecords) {
  const PopulationGuard guard{0.15, 5};
  std::vector<std::uint64_t> places;
  // 100 records at 80 places; the first 25 (25 % of the records) flagged, all at three places
  auto batch = findings(100, 25, [](std::size_t i) { return i < 25 ? static_cast<std::uint64_t>(1000 + i % 3) : i; }, places);
  const GuardOutcome g = withhold_population_flags(batch, places, "robust_z", guard);
  EXPECT_FALSE(g.withheld);
  EXPECT_EQ(g.flagged_places, 3u);
  EXPECT_EQ(g.flagged_records, 25u);
  for (std::size_t i = 0; i < 25; ++i) EXPECT_TRUE(batch[i].flagged);
  // the same 25 records at 25 places of 78: a spread-out group, withheld
  auto spread = findings(78, 25, own_place, places);
  EXPECT_TRUE(withhold_population_flags(spread, places, "robust_z", guard).withheld);
}

TEST(PopulationGuard, UntestedRecordsAndTheirPlacesAreNotCounted) {
  const PopulationGuard guard{0.15, 5};
  std::vector<std::uint64_t> places;
  auto f = findings(30, 5, own_place, places);  // 5 of 30 places = 16.7 %: withheld
  EXPECT_TRUE(withhold_population_flags(f, places, "robust_z", guard).withheld);
  auto g = findings(40, 5, own_place, places);  // 5 of 40 = 12.5 %: stands
  EXPECT_FALSE(withhold_population_flags(g, places, "robust_z", guard).withheld);
}

}  // namespace
}  // namespace envsift
