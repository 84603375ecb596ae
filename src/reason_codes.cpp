#include "envsift/reason_codes.hpp"

#include <algorithm>

namespace envsift::reason {

bool prevents_scoring(const std::string& code) {
  // notes: the record was read (or judged) all the same
  static const std::string notes[] = {read_dms, read_dash_as_minus,         read_hemisphere_letter,        read_decimal_comma, latin1_converted,
                                      duplicate_id,      ragged_row,              spans_lines,              uncertainty_not_numeric,
                                      uncertainty_capped, position_maybe_swapped, elevation_unreadable, elevation_ambiguous,
                                      elevation_approximate, looks_multimodal, no_range};
  const std::string base = code.substr(0, code.find(':'));
  return std::find(std::begin(notes), std::end(notes), base) == std::end(notes);
}

std::string why_not_scored(const std::vector<std::string>& codes) {
  for (const auto& c : codes)
    if (prevents_scoring(c)) return c;
  return no_values;
}

}  // namespace envsift::reason
