// Reported elevations in text. Conversion: 1 international foot = 0.3048 m exactly (International
// Yard and Pound Agreement, 1959; NIST Special Publication 811, appendix B).
#include "envsift/read/elevation_text.hpp"

#include <gtest/gtest.h>

namespace envsift {
namespace {

TEST(ElevationText, MetresAndFeetWhereUnambiguous) {
  EXPECT_DOUBLE_EQ(parse_elevation("1200").metres, 1200);
  EXPECT_DOUBLE_EQ(parse_elevation(" 1200 m ").metres, 1200);
  EXPECT_DOUBLE_EQ(parse_elevation("1200m").metres, 1200);
  EXPECT_DOUBLE_EQ(parse_elevation("1 200 metres").metres, 1200);
  EXPECT_DOUBLE_EQ(parse_elevation("850 m a.s.l.").metres, 850);
  EXPECT_DOUBLE_EQ(parse_elevation("-28").metres, -28);
  EXPECT_DOUBLE_EQ(parse_elevation("3900 ft").metres, 3900 * 0.3048);  // 1188.72 m
  EXPECT_DOUBLE_EQ(parse_elevation("3900 feet").metres, 1188.72);
  EXPECT_DOUBLE_EQ(parse_elevation("3900'").metres, 1188.72);
  EXPECT_TRUE(parse_elevation("3900 ft").problem.empty());
}

TEST(ElevationText, EmptyIsAbsentNotAProblem) {
  const ParsedElevation e = parse_elevation("  ");
  EXPECT_FALSE(e.present);
  EXPECT_TRUE(e.problem.empty());
}

TEST(ElevationText, AmbiguousOrUnknownIsAReasonCode) {
  for (const char* text : {"1,200", "1,2 m", "about 1200 m", "1200-1500 m", "1200 yd", "high", "12OO"})
    EXPECT_EQ(parse_elevation(text).problem, "elevation_unreadable") << text;
}

}  // namespace
}  // namespace envsift
