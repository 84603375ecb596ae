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
  for (const char* text : {"about 1200 m", "1200-1500 m", "1200 yd", "high", "12OO"})
    EXPECT_EQ(parse_elevation(text).problem, "elevation_unreadable") << text;
  // a comma or a point before three digits is a thousands separator in many locales and a decimal
  // mark in others (common practice; the SI Brochure, 9th ed. §5.4.4, allows either decimal mark)
  for (const char* text : {"1,200", "1,2 m", "1.200", "1.200 m", "12.500 ft"})
    EXPECT_EQ(parse_elevation(text).problem, "elevation_ambiguous") << text;
  // not ambiguous: a leading zero, or other than three decimals
  EXPECT_DOUBLE_EQ(parse_elevation("0.500 m").metres, 0.5);
  EXPECT_DOUBLE_EQ(parse_elevation("1200.5").metres, 1200.5);
}

// docs/usage.md's table of accepted forms, row by row (1 ft = 0.3048 m exactly: NIST SP 811).
TEST(ElevationText, EveryFormOfTheReadmeTable) {
  struct Form {
    const char* text;
    double metres;
    bool approximate;
  };
  const Form forms[] = {{"1200", 1200, false},          {"1200 m", 1200, false},          {"1 200 m", 1200, false},
                        {"1200 masl", 1200, false},     {"1200 m a.s.l.", 1200, false},   {"3900 ft", 1188.72, false},
                        {"3900 ft.", 1188.72, false},   {"3900'", 1188.72, false},        {"3900\xE2\x80\xB2", 1188.72, false},
                        {"3900 feet", 1188.72, false},  {"ca. 1200 m", 1200, true},       {"c. 1200", 1200, true},
                        {"~1200", 1200, true},          {"1200 m (approx.)", 1200, true}, {"approx. 1200 m", 1200, true},
                        {"ca 1200", 1200, true},        {"1200 (approx)", 1200, true}};
  for (const auto& f : forms) {
    const ParsedElevation e = parse_elevation(f.text);
    EXPECT_EQ(e.problem, "") << f.text;
    EXPECT_NEAR(e.metres, f.metres, 1e-9) << f.text;
    EXPECT_EQ(e.approximate, f.approximate) << f.text;
  }
  for (const char* missing : {"NA", "null", "NULL", "\\N", "-"}) {
    EXPECT_FALSE(parse_elevation(missing).present) << missing;
    EXPECT_EQ(parse_elevation(missing).problem, "") << missing;
  }
}

}  // namespace
}  // namespace envsift
