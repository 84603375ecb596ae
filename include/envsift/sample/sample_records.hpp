// Steps 1-2 of the pipeline: read the points, then sample every layer at every record (and over
// its uncertainty disc), collecting each record's reason codes (outside a layer, nodata, a
// possible latitude/longitude swap, a capped disc) into the run's RecordTable.
#pragma once
#include <functional>
#include <string>
#include <vector>

#include "envsift/record_table.hpp"
#include "envsift/settings/settings.hpp"

namespace envsift {

// `added_columns`: what the caller will append, checked against the input's and layers' names.
// `keep` (when given) chooses the records to sample; the others get no values (shards).
RecordTable sample_records(const ScreenSettings& settings, const std::vector<std::string>& added_columns,
                           const std::function<bool(const PointTable&, std::size_t)>& keep = nullptr);

}  // namespace envsift
