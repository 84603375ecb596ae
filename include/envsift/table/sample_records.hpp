// The record table from the points as read (step 1) and the layers sampled (step 2) at every
// record and over its uncertainty disc, with each record's reason codes (outside a layer, nodata,
// a possible latitude/longitude swap, a capped disc).
#pragma once
#include <functional>
#include <string>
#include <vector>

#include "envsift/table/record_table.hpp"
#include "envsift/progress.hpp"
#include "envsift/read/input_settings.hpp"
#include "envsift/sample/sampling_settings.hpp"

namespace envsift {

// `added_columns`: what the caller will append, checked against the input's and layers' names.
// `keep` (when given) chooses the records to sample; the others get no values (shards).
// `input`: the layers (--layers, --assume-crs) to sample.
RecordTable sample_records(PointTable points, const InputSettings& input, const SamplingSettings& sampling,
                           Progress* progress, const std::vector<std::string>& added_columns,
                           const std::function<bool(const PointTable&, std::size_t)>& keep = nullptr);

}  // namespace envsift
