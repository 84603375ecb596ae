#include "envsift/read/elevation_text.hpp"

#include <algorithm>
#include <cctype>

#include "envsift/read/coordinates.hpp"

namespace envsift {

ParsedElevation parse_elevation(std::string_view text) {
  ParsedElevation out;
  text = trim(text);
  if (text.empty()) return out;
  out.present = true;
  out.problem = "elevation_unreadable";
  // split number and unit at the first letter or apostrophe
  std::size_t cut = 0;
  while (cut < text.size() && !std::isalpha(static_cast<unsigned char>(text[cut])) && text[cut] != '\'') ++cut;
  std::string number;
  for (char c : text.substr(0, cut))
    if (c != ' ') number += c;  // "1 200" → "1200"
  std::string unit;
  for (char c : text.substr(cut))
    if (c != ' ' && c != '.') unit += static_cast<char>(std::tolower(static_cast<unsigned char>(c)));
  if (number.find(',') != std::string::npos) return out;
  const ParsedNumber n = parse_number(number);
  if (!n.problem.empty()) return out;
  double factor;
  if (unit.empty() || unit == "m" || unit == "metre" || unit == "metres" || unit == "meter" || unit == "meters" ||
      unit == "masl" || unit == "mabovesealevel")
    factor = 1.0;
  else if (unit == "ft" || unit == "feet" || unit == "foot" || unit == "'")
    factor = 0.3048;  // international foot
  else
    return out;
  out.metres = n.value * factor;
  out.problem.clear();
  return out;
}

}  // namespace envsift
