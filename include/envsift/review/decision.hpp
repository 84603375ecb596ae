// What a reviewer decided about a record (review/decisions.hpp reads them from a file).
#pragma once
#include <cstdint>

namespace envsift {

enum class Decision : std::uint8_t { none, error, valid, unsure };
const char* decision_name(Decision d);  // "", "error", "valid", "unsure"

}  // namespace envsift
