// Step 4 of the pipeline: statistical tests. Every test sees only numbers — the values of one
// taxon's records on each layer — and knows nothing of files, CRS or the command line.
#pragma once
#include <cmath>
#include <string>
#include <vector>

#include <Eigen/Core>

namespace envsift {

// The values of one taxon. `reference` holds the rows the taxon's statistics are estimated from
// (e.g. one row per distinct raster cell); `records` holds the rows to judge, one per record.
// Both are rows × layers with NaN for a missing value.
struct TaxonValues {
  const Eigen::MatrixXd& reference;
  const Eigen::MatrixXd& records;
  const std::vector<std::string>& layer_names;
};

// What one test says of one record.
struct Finding {
  bool tested = false;             // false: the test could not judge this record (see `untested_reason`)
  double statistic = std::nan(""); // the test's own statistic (e.g. the largest |robust z|)
  double threshold = std::nan(""); // the value beyond which the record is flagged
  bool flagged = false;
  std::vector<std::string> reasons;  // plain words for a flagged record: which layer, how far
  std::string untested_reason;       // a reason code when not tested, e.g. too_few_records:robust_z

  double severity() const { return tested ? statistic / threshold : std::nan(""); }
};

class Detector {
 public:
  virtual ~Detector() = default;
  virtual std::string name() const = 0;  // the word written to the `flags` column
  virtual std::vector<Finding> judge(const TaxonValues& taxon) const = 0;
};

}  // namespace envsift
