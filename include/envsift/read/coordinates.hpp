// Turning coordinate text into numbers, with a reason code instead of a crash for bad values.
#pragma once
#include <string>
#include <string_view>

namespace envsift {

enum class Axis { longitude, latitude };

struct ParsedNumber {
  double value = 0;
  std::string problem;  // empty when `value` is usable, else a reason code
  std::string note;     // a usable value read from an unusual form (reason code, e.g. read_dms)
};

// Coordinates as people write them. Read, with a note code on the record:
//   decimal degrees            "-12.5", "+12.5", " 12.5 "
//   hemisphere letters         "12.5S", "S 12.5", "12.5 w"            note read_hemisphere_letter
//   degrees-minutes-seconds    "12°30'15\"S", "12 30 15 S", "12d30m", "12°30.25'"   note read_dms
//   a decimal comma            "12,5" (one comma, no point)            note read_decimal_comma
//   a minus sign or dash       "−12.5" (U+2212), "–12.5" (en dash) ... note read_dash_as_minus
// Refused, with a problem code: empty → position_empty; not a coordinate → position_not_number;
// a sign in brackets or after the number, "(12.5)", "12.5-" → position_sign_unclear (never read as
// plus); other characters between the numbers ("1_0") → position_not_number;
// N/S on a longitude or E/W on a latitude → position_hemisphere_conflict; NaN, inf or overflow →
// position_not_finite; outside [-90, 90] / [-180, 180] → position_off_globe.
ParsedNumber parse_coordinate(std::string_view text, Axis axis);

// A plain decimal number (no range check). Empty text, or a marker of a missing value, gives
// problem "empty".
ParsedNumber parse_number(std::string_view text);

// What databases and statistics packages write for a missing value: NA, N/A, null, NULL, \N, -.
bool is_missing_marker(std::string_view text);

std::string_view trim(std::string_view text);

}  // namespace envsift
