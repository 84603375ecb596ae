// The run's central table, built by steps 1-2 (read points, sample the layers) and read by every
// later step: each record with its values on every layer (sampled from rasters, with uncertainty
// discs, or read from the input's own columns), the facts of each layer, and the reason codes
// each record has collected so far.
#pragma once
#include <cstdint>
#include <map>
#include <memory>
#include <string>
#include <vector>

#include <Eigen/Core>

#include "envsift/read/occurrence.hpp"
#include "envsift/sample/raster_stack.hpp"

namespace envsift {

// The reason codes of every record. Few distinct lists occur (most records have none), so each
// list is stored once and a record holds its index: 4 bytes a record instead of a vector.
class ReasonCodeStore {
 public:
  void resize(std::size_t records) { index_.assign(records, 0); }
  const std::vector<std::string>& of(std::size_t record) const { return lists_[index_[record]]; }
  void set(std::size_t record, const std::vector<std::string>& codes);
  void add(std::size_t record, const std::string& code);  // unless it is there already

 private:
  std::vector<std::uint32_t> index_;
  std::vector<std::vector<std::string>> lists_{{}};
  std::map<std::vector<std::string>, std::uint32_t> lookup_{{{}, 0}};
};

struct RecordTable {
  PointTable points;                // the records as read, original fields on disk
  std::vector<LayerInfo> layers;    // each layer's facts, read once (only the name for value columns)
  bool layers_are_columns = false;  // values came from input columns: no layer columns are added
  ValueTable values;                // records × layers, NaN = missing (floats where exact)
  std::vector<std::uint64_t> cells; // equal keys = same cells (or same values)
  bool has_discs = false;
  DiscSamples discs;                // valid when has_discs
  std::vector<double> radius_m;     // disc radius used per record (0 = none); empty without discs
  ReasonCodeStore codes;            // reason codes per record (the `status` column)
  std::map<std::size_t, std::vector<std::string>> notes;  // per record, rare: words for `reasons` (a capped disc)
  std::vector<std::string> warnings;                      // for stderr
  std::vector<std::pair<std::string, double>> seconds;    // time per stage
  std::string memory;                                     // the run's memory estimate, in words (--timings)
  // The layers, still open (with their block cache) for the landscape test's sample; released
  // after sampling when no test needs it. Empty for value columns.
  std::shared_ptr<RasterStack> stack;

  std::size_t size() const { return points.records.size(); }
  std::vector<std::string> layer_names() const;
  std::optional<std::size_t> layer_index(const std::string& name) const;
  bool has_any_value(std::size_t record) const;
  // The range record i may take on layer l: its disc (which holds its point value), else the point.
  std::pair<double, double> range(std::size_t record, std::size_t layer) const;
};

// Refuses an output whose columns (input, layers, envsift's) would repeat a name.
void check_unique_columns(const std::vector<std::string>& columns);

}  // namespace envsift
