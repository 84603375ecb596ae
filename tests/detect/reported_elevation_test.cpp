// Reported elevation against the DEM range, in metres and in feet (1 ft = 0.3048 m exactly:
// International Yard and Pound Agreement, 1959; NIST Special Publication 811, appendix B).
// Expected gaps are hand-computed from the numbers in each test.
#include "envsift/detect/reported_elevation.hpp"

#include <gtest/gtest.h>

#include "envsift/read/elevation_text.hpp"

namespace envsift {
namespace {

TEST(ReportedElevation, AgreesWithinTheToleranceOfTheDemRange) {
  const Finding f = check_reported_elevation({1750.0, std::nullopt}, {1600, 1700, 1000}, 100, "dem");
  EXPECT_TRUE(f.tested);
  EXPECT_DOUBLE_EQ(f.statistic, 50);  // 1750 is 50 m above the disc's highest cell
  EXPECT_FALSE(f.flagged);
}

TEST(ReportedElevation, MetresFarFromTheDemAreFlaggedWithBothNumbers) {
  // the demo's planted montane record in the dry valley: label 1767 m, DEM 162 m at the point
  const Finding f = check_reported_elevation({1767.0, std::nullopt}, {162, 162, 0}, 100, "dem");
  EXPECT_TRUE(f.flagged);
  EXPECT_DOUBLE_EQ(f.statistic, 1605);
  EXPECT_DOUBLE_EQ(f.severity, 16.05);
  ASSERT_EQ(f.reasons.size(), 1u);
  EXPECT_EQ(f.reasons[0], "reported elevation 1767 m, but dem at the point is 162 m (1605 m apart)");
}

TEST(ReportedElevation, FeetAreConvertedBeforeComparing) {
  // 3900 ft = 1188.72 m: fits a DEM range of 1150-1250 m; read as metres it would not
  const double feet = parse_elevation("3900 ft").metres;
  EXPECT_FALSE(check_reported_elevation({feet, std::nullopt}, {1150, 1250, 500}, 100, "dem").flagged);
  EXPECT_TRUE(check_reported_elevation({3900.0, std::nullopt}, {1150, 1250, 500}, 100, "dem").flagged);
  // 6000 ft = 1828.8 m is 578.8 m above 1250
  const Finding f = check_reported_elevation({parse_elevation("6000 feet").metres, std::nullopt}, {1150, 1250, 500}, 100, "dem");
  EXPECT_NEAR(f.statistic, 578.8, 1e-9);
  EXPECT_EQ(f.reasons[0], "reported elevation 1829 m, but dem within 500 m of the point spans 1150 to 1250 m (579 m apart)");
}

TEST(ReportedElevation, ARangeOverlappingTheDemFits) {
  EXPECT_FALSE(check_reported_elevation({900.0, 1400.0}, {1300, 1500, 0}, 100, "dem").flagged);
  EXPECT_TRUE(check_reported_elevation({200.0, 400.0}, {1300, 1500, 0}, 100, "dem").flagged);
}

TEST(ReportedElevation, NothingReportedOrNoDemIsNotTested) {
  EXPECT_FALSE(check_reported_elevation({}, {100, 200, 0}, 100, "dem").tested);
  EXPECT_FALSE(check_reported_elevation({500.0, std::nullopt}, {NAN, NAN, 0}, 100, "dem").tested);
}

}  // namespace
}  // namespace envsift
