// Private to the pipeline: records and the values to judge them by — sampled from rasters (with
// uncertainty discs) or read from the input's own columns — plus reason codes per record.
#pragma once
#include <cstdint>
#include <functional>
#include <map>
#include <string>
#include <vector>

#include <Eigen/Core>

#include "envsift/detect/reported_elevation.hpp"
#include "envsift/pipeline.hpp"

namespace envsift::detail {

// The reason codes of every record. Few distinct lists occur (most records have none), so each
// list is stored once and a record holds its index: 4 bytes a record instead of a vector.
class CodeLists {
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

struct Gathered {
  PointTable table;
  std::vector<std::string> layer_names;
  std::vector<bool> float32;        // per layer: print as 32-bit float
  bool layers_are_columns = false;  // values came from input columns: no layer columns are added
  Eigen::MatrixXd values;           // records × layers, NaN = missing
  std::vector<std::uint64_t> cells; // equal keys = same cells (or same values)
  bool has_discs = false;
  DiscSamples discs;                // valid when has_discs
  std::vector<double> radius_m;     // disc radius used per record (0 = none)
  CodeLists status;                              // reason codes per record
  std::map<std::size_t, std::vector<std::string>> notes;  // per record, rare: words for `reasons` (a capped disc)
  std::vector<std::string> warnings;             // for stderr
  std::vector<std::pair<std::string, double>> seconds;  // time per stage
};

// `added_columns`: what the caller will append, checked against the input's and layers' names.
// `keep` (when given) chooses the records to sample; the others get no values (shards).
Gathered sample_rasters(const SampleOptions& o, const std::vector<std::string>& added_columns,
                        const std::function<bool(const PointTable&, std::size_t)>& keep = nullptr);
Gathered read_value_columns(const ScreenOptions& o, const std::vector<std::string>& added_columns);

// Reported elevations of every record (problems go to `status`).
std::vector<ReportedElevation> reported_elevations(Gathered& g, const ColumnNames& columns);


}  // namespace envsift::detail
