// Reported elevations as people write them: "1200", "1200 m", "3900 ft", "1 200 m".
#pragma once
#include <string>
#include <string_view>

namespace envsift {

struct ParsedElevation {
  double metres = 0;
  bool present = false;      // false for an empty field or a missing-value marker (NA, null, ...)
  bool approximate = false;  // written with ca., c., ~, approx. or (approx.): read, and noted
  std::string problem;       // empty when usable, else a reason code (elevation_unreadable, elevation_ambiguous)
};

// A number with an optional unit: m, metre(s), meter(s), masl, m a.s.l. (metres); ft, ft., feet,
// foot, ' or ′ (international feet, 1 ft = 0.3048 m exactly). Spaces between thousands are
// allowed; an approximate marker before or after the number is read and noted. Refused as
// ambiguous (elevation_ambiguous): a thousands separator that may be a decimal mark — "1,200"
// and "1.200" are 1.2 in some locales and 1200 in others. Refused as unreadable: several
// numbers, unknown units. docs/usage.md lists every accepted form.
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
