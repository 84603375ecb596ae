#include "envsift/read/elevation_text.hpp"

#include <algorithm>
#include <cctype>

#include "envsift/read/coordinates.hpp"

namespace envsift {

namespace {

// Removes an approximate marker (ca., c., ~, approx., (approx.)) from either end.
bool strip_approximate(std::string& s) {
  bool found = false;
  for (bool again = true; again;) {
    again = false;
    const std::string_view t = trim(s);
    s = std::string(t);
    for (const char* marker : {"(approx.)", "(approx)", "approx.", "approx", "ca.", "ca ", "c.", "~"}) {
      const std::string m = marker;
      if (s.size() > m.size() && s.compare(0, m.size(), m) == 0) s.erase(0, m.size()), again = found = true;
      else if (s.size() > m.size() && s.compare(s.size() - m.size(), m.size(), m) == 0)
        s.erase(s.size() - m.size()), again = found = true;
    }
  }
  return found;
}

// "1.200", "12.500": a point followed by exactly three digits after one to three digits — a
// thousands separator in many locales.
bool looks_like_thousands_point(const std::string& number) {
  const auto dot = number.find('.');
  if (dot == std::string::npos || dot == 0 || dot > 3 || number.size() - dot - 1 != 3) return false;
  if (number[0] == '0' || (number[0] == '-' && dot > 1 && number[1] == '0')) return false;
  return number.find_first_not_of("0123456789.-") == std::string::npos;
}

void replace_all(std::string& s, const std::string& from, const std::string& to) {
  for (std::size_t at = s.find(from); at != std::string::npos; at = s.find(from, at + to.size())) s.replace(at, from.size(), to);
}

}  // namespace

ParsedElevation parse_elevation(std::string_view raw) {
  ParsedElevation out;
  std::string owned(trim(raw));
  if (owned.empty() || is_missing_marker(owned)) return out;
  out.present = true;
  out.problem = "elevation_unreadable";
  replace_all(owned, "\xE2\x80\xB2", "'");  // the prime sign: feet
  out.approximate = strip_approximate(owned);
  const std::string_view text = owned;
  // split number and unit at the first letter or apostrophe
  std::size_t cut = 0;
  while (cut < text.size() && !std::isalpha(static_cast<unsigned char>(text[cut])) && text[cut] != '\'') ++cut;
  std::string number;
  for (char c : text.substr(0, cut))
    if (c != ' ') number += c;  // "1 200" → "1200"
  std::string unit;
  for (char c : text.substr(cut))
    if (c != ' ' && c != '.') unit += static_cast<char>(std::tolower(static_cast<unsigned char>(c)));
  if (number.find(',') != std::string::npos || looks_like_thousands_point(number)) {
    out.problem = "elevation_ambiguous";
    return out;
  }
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

namespace envsift {

ParsedElevationRange parse_elevation_range(std::string_view text) {
  ParsedElevationRange r;
  const ParsedElevation one = parse_elevation(text);
  if (one.problem.empty()) {
    r.present = one.present, r.low_m = r.high_m = one.metres;
    return r;
  }
  r.problem = one.problem;
  const std::string s(text);
  std::size_t at = std::string::npos, width = 0;
  for (const char* separator : {" to ", "\xE2\x80\x93", "\xE2\x80\x94", "-"}) {  // en dash, em dash, hyphen
    const std::size_t found = s.find(separator, 1);  // not a leading minus
    if (found != std::string::npos) {
      at = found, width = std::string(separator).size();
      break;
    }
  }
  if (at == std::string::npos) return r;
  std::string first = s.substr(0, at), second = s.substr(at + width);
  const std::size_t last_digit = second.find_last_of("0123456789");
  const bool first_has_unit = first.find_first_not_of("0123456789 .") != std::string::npos;
  if (last_digit != std::string::npos && !first_has_unit) first += second.substr(last_digit + 1);
  const ParsedElevation a = parse_elevation(first), b = parse_elevation(second);
  if (!a.problem.empty() || !b.problem.empty() || !a.present || !b.present) return r;
  r.problem.clear();
  r.present = true;
  r.low_m = std::min(a.metres, b.metres), r.high_m = std::max(a.metres, b.metres);
  return r;
}

}  // namespace envsift
