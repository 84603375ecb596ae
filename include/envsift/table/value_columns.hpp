// The record table when the values are already in the input (--value-columns): each record's
// values taken from the named columns of the points as read, instead of sampling rasters.
#pragma once
#include <string>
#include <vector>

#include "envsift/table/record_table.hpp"
#include "envsift/read/input_settings.hpp"

namespace envsift {

RecordTable read_value_columns(PointTable points, const InputSettings& input, const std::vector<std::string>& added_columns);

}  // namespace envsift
