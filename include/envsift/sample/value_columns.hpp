// Steps 1-2 when the values are already in the input (--value-columns): read the points and
// take each record's values from the named columns instead of sampling rasters.
#pragma once
#include <string>
#include <vector>

#include "envsift/record_table.hpp"
#include "envsift/settings/settings.hpp"

namespace envsift {

RecordTable read_value_columns(const ScreenSettings& settings, const std::vector<std::string>& added_columns);

}  // namespace envsift
