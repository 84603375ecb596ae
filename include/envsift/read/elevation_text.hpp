// Reported elevations as people write them: "1200", "1200 m", "3900 ft", "1 200 m".
#pragma once
#include <string>
#include <string_view>

namespace envsift {

struct ParsedElevation {
  double metres = 0;
  bool present = false;   // false for an empty field
  std::string problem;    // empty when usable, else a reason code (elevation_unreadable)
};

// A number with an optional unit: m, metre(s), meter(s), masl, m a.s.l. (metres); ft, feet,
// foot, ' (international feet, 1 ft = 0.3048 m exactly). Spaces between thousands are allowed.
// Refused as ambiguous: a comma ("1,200" may be 1.2 or 1200), several numbers, unknown units.
ParsedElevation parse_elevation(std::string_view text);

}  // namespace envsift

namespace envsift {

// An elevation or a range as Darwin Core's verbatimElevation holds it: "1200 m", "1200-1400 m",
// "1200 – 1400 m", "1200 to 1400 ft" (a unit written once applies to both ends).
struct ParsedElevationRange {
  double low_m = 0, high_m = 0;
  bool present = false;
  std::string problem;  // as for parse_elevation
};
ParsedElevationRange parse_elevation_range(std::string_view text);

}  // namespace envsift
