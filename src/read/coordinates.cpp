#include "envsift/read/coordinates.hpp"

#include <cctype>
#include <charconv>
#include <cmath>
#include <vector>

#include "envsift/reason_codes.hpp"

namespace envsift {

std::string_view trim(std::string_view t) {
  const char* space = " \t\r\n\v\f";
  auto b = t.find_first_not_of(space);
  if (b == std::string_view::npos) return {};
  auto e = t.find_last_not_of(space);
  return t.substr(b, e - b + 1);
}

bool is_missing_marker(std::string_view text) {
  text = trim(text);
  for (std::string_view marker : {"NA", "N/A", "na", "n/a", "null", "NULL", "Null", "\\N", "-", "--"})
    if (text == marker) return true;
  return false;
}

ParsedNumber parse_number(std::string_view text) {
  ParsedNumber out;
  text = trim(text);
  if (text.empty() || is_missing_marker(text)) {
    out.problem = "empty";
    return out;
  }
  std::string_view digits = text;
  if (digits.front() == '+') digits.remove_prefix(1);  // from_chars rejects a leading '+'
  auto [end, ec] = std::from_chars(digits.data(), digits.data() + digits.size(), out.value);
  if (ec == std::errc::result_out_of_range) {
    out.problem = reason::position_not_finite;
  } else if (ec != std::errc() || end != digits.data() + digits.size()) {
    out.problem = reason::position_not_number;
  } else if (!std::isfinite(out.value)) {
    out.problem = reason::position_not_finite;
  }
  return out;
}

namespace {

// Removes a leading or trailing hemisphere letter; returns it (upper case) or 0.
char take_hemisphere(std::string& s) {
  auto letter = [](char c) {
    c = static_cast<char>(std::toupper(static_cast<unsigned char>(c)));
    return c == 'N' || c == 'S' || c == 'E' || c == 'W' ? c : 0;
  };
  if (s.empty()) return 0;
  const bool designators = s.find_first_of("dm") != std::string::npos;
  if (char c = letter(s.back()); c && !(s.back() == 's' && designators)) {  // "12d30m15s": seconds, not south
    s.pop_back();
    s = std::string(trim(s));
    return c;
  }
  if (char c = letter(s.front())) {
    s.erase(0, 1);
    s = std::string(trim(s));
    return c;
  }
  return 0;
}

// The UTF-8 separator at s[i] of degrees, minutes and seconds, or 0: spaces, :, d m s, ' ",
// ° º ˚ (degree, ordinal, ring), ′ ″ (prime, double prime) and ’ ” (the quotes word processors
// put in their place). Anything else (_ ( ) - , or a stray symbol) makes the text no coordinate.
std::size_t dms_separator(const std::string& s, std::size_t i) {
  static const std::string_view marks[] = {" ", "\t", ":", "d", "m", "s", "D", "M", "S", "'", "\"", "\u00B0", "\u00BA",
                                           "\u02DA", "\u2032", "\u2033", "\u2019", "\u201D"};
  for (std::string_view m : marks)
    if (s.compare(i, m.size(), m) == 0) return m.size();
  return 0;
}

// Degrees, minutes and seconds split by the separators above.
bool parse_dms(const std::string& s, double& value) {
  std::vector<std::string> parts(1);
  bool negative = false;
  std::size_t i = 0;
  if (!s.empty() && (s[0] == '-' || s[0] == '+')) negative = s[0] == '-', i = 1;
  while (i < s.size()) {
    const unsigned char c = static_cast<unsigned char>(s[i]);
    if (std::isdigit(c) || c == '.') {
      parts.back() += static_cast<char>(c);
      ++i;
      continue;
    }
    const std::size_t separator = dms_separator(s, i);
    if (!separator) return false;
    if (!parts.back().empty()) parts.emplace_back();
    i += separator;
  }
  if (parts.back().empty()) parts.pop_back();
  if (parts.empty() || parts.size() > 3) return false;
  double v[3] = {0, 0, 0};
  for (std::size_t k = 0; k < parts.size(); ++k) {
    auto [end, ec] = std::from_chars(parts[k].data(), parts[k].data() + parts[k].size(), v[k]);
    if (ec != std::errc() || end != parts[k].data() + parts[k].size()) return false;
  }
  if (parts.size() > 1 && (v[1] >= 60 || v[2] >= 60 || std::floor(v[0]) != v[0])) return false;
  if (parts.size() > 2 && std::floor(v[1]) != v[1]) return false;
  value = (negative ? -1 : 1) * (v[0] + v[1] / 60 + v[2] / 3600);
  return true;
}

bool only_digits_and_one(std::string_view s, char separator) {
  std::size_t seps = 0;
  for (std::size_t i = 0; i < s.size(); ++i) {
    if (s[i] == separator) ++seps;
    else if (!std::isdigit(static_cast<unsigned char>(s[i])) && !(i == 0 && (s[i] == '-' || s[i] == '+'))) return false;
  }
  return seps == 1 && s.back() != separator && std::isdigit(static_cast<unsigned char>(s[s[0] == '-' || s[0] == '+'])) ;
}

// Characters that are written for a minus sign (Unicode's character database: U+2212 MINUS SIGN,
// the dashes U+2010-U+2014, U+FE63 SMALL HYPHEN-MINUS, U+FF0D FULLWIDTH HYPHEN-MINUS, U+02D7
// MODIFIER LETTER MINUS SIGN, U+2796 HEAVY MINUS SIGN), as UTF-8.
constexpr std::string_view kMinusLike[] = {"\u2212", "\u2010", "\u2011", "\u2012", "\u2013", "\u2014",
                                           "\uFE63", "\uFF0D", "\u02D7", "\u2796"};

// A minus-like character at the start becomes '-'; true when one was replaced.
bool replace_minus_like(std::string& s) {
  for (std::string_view m : kMinusLike)
    if (s.compare(0, m.size(), m) == 0) {
      s.replace(0, m.size(), "-");
      return true;
    }
  return false;
}

// A sign written where readers disagree on it: accounting brackets "(0.2)" and a trailing sign
// "0.2-" (or a minus-like character at the end). Read as anything, one reader's minus is another's
// plus; refused.
bool unclear_sign(const std::string& s) {
  if (s.size() >= 2 && s.front() == '(' && s.back() == ')') return true;
  if (s.size() >= 2 && (s.back() == '-' || s.back() == '+')) return true;
  for (std::string_view m : kMinusLike)
    if (s.size() > m.size() && s.compare(s.size() - m.size(), m.size(), m) == 0) return true;
  return false;
}

}  // namespace

ParsedNumber parse_coordinate(std::string_view text, Axis axis) {
  ParsedNumber out = parse_number(text);
  if (out.problem == "empty") {
    out.problem = reason::position_empty;
    return out;
  }
  if (out.problem == reason::position_not_number) {
    std::string s(trim(text));
    if (unclear_sign(s)) {
      out.problem = reason::position_sign_unclear;
      return out;
    }
    const bool unicode_minus = replace_minus_like(s);
    const char hemisphere = take_hemisphere(s);
    double value = 0;
    bool read = false;
    if (only_digits_and_one(s, ',')) {  // "12,5": a decimal comma
      std::string dotted = s;
      dotted[dotted.find(',')] = '.';
      const ParsedNumber n = parse_number(dotted);
      read = n.problem.empty();
      value = n.value;
      out.note = reason::read_decimal_comma;
    } else if (const ParsedNumber n = parse_number(s); n.problem.empty()) {
      read = true;
      value = n.value;
    } else if (parse_dms(s, value)) {
      read = true;
      out.note = reason::read_dms;
    }
    if (!read) return out;  // position_not_number
    if (unicode_minus) out.note = reason::read_dash_as_minus;  // the sign matters more than the form
    if (hemisphere) {
      const bool fits = axis == Axis::latitude ? (hemisphere == 'N' || hemisphere == 'S') : (hemisphere == 'E' || hemisphere == 'W');
      if (!fits || value < 0) {  // a letter for the other axis, or a sign and a letter at once
        out.problem = reason::position_hemisphere_conflict;
        return out;
      }
      if (hemisphere == 'S' || hemisphere == 'W') value = -value;
      if (out.note.empty()) out.note = reason::read_hemisphere_letter;
    }
    out.value = value;
    out.problem.clear();
  }
  if (out.problem.empty()) {
    const double limit = axis == Axis::latitude ? 90.0 : 180.0;
    if (std::fabs(out.value) > limit) out.problem = reason::position_off_globe;
  }
  return out;
}

}  // namespace envsift
