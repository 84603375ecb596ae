#include "envsift/spreadsheet_cells.hpp"

#include <charconv>

namespace envsift {
namespace {

bool formula_character(char c) { return c == '=' || c == '+' || c == '-' || c == '@' || c == '\t' || c == '\r'; }

bool plain_number(std::string_view cell) {
  std::string_view digits = cell;
  if (!digits.empty() && digits.front() == '+') digits.remove_prefix(1);
  double value;
  const auto [end, ec] = std::from_chars(digits.data(), digits.data() + digits.size(), value);
  return ec == std::errc() && end == digits.data() + digits.size() && !digits.empty();
}

// The cell after its leading apostrophes begins with a formula character.
bool quoted_formula(std::string_view cell) {
  const auto first = cell.find_first_not_of('\'');
  return first != 0 && first != std::string_view::npos && formula_character(cell[first]);
}

}  // namespace

bool starts_like_formula(std::string_view cell) {
  return !cell.empty() && formula_character(cell.front()) && !plain_number(cell);
}

std::string spreadsheet_safe(std::string_view cell) {
  if (starts_like_formula(cell) || quoted_formula(cell)) return "'" + std::string(cell);
  return std::string(cell);
}

std::string from_spreadsheet_safe(std::string_view cell) {
  if (quoted_formula(cell)) cell.remove_prefix(1);
  return std::string(cell);
}

}  // namespace envsift
