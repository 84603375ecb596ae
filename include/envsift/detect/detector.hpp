// Step 4 of the pipeline: statistical tests. Every test sees only numbers — the values of one
// taxon's records on each layer — and knows nothing of files, CRS or the command line.
#pragma once
#include <cmath>
#include <algorithm>
#include <cstdint>
#include <optional>
#include <utility>
#include <string>
#include <vector>

#include <Eigen/Core>

#include "envsift/sample/landscape_values.hpp"

namespace envsift {

// The values of one taxon. `reference` holds the rows the taxon's statistics are estimated from
// (one row per distinct raster cell by default); `records` holds the rows to judge, one per
// record. Both are rows × layers with NaN for a missing value.
//
// Uncertainty discs: when `lower`/`upper` are given (records × layers, NaN = no disc), a record
// may lie anywhere in [lower, upper] on each layer, and a test judges the value in that range that
// fits the taxon best: a record is an outlier only when no value inside its disc fits.
struct TaxonValues {
  const Eigen::MatrixXd& reference;
  const Eigen::MatrixXd& records;
  const std::vector<std::string>& layer_names;
  std::uint64_t seed = 0;  // for randomised tests; derived from the run's seed and the taxon name
  const Eigen::MatrixXd* lower = nullptr;
  const Eigen::MatrixXd* upper = nullptr;
  const LandscapeValues* landscape = nullptr;  // given to tests that ask for it (uses_landscape)

  // The range record r may take on layer l: its disc (which holds its point value), else the point.
  std::pair<double, double> range(Eigen::Index r, Eigen::Index l) const {
    const double x = records(r, l);
    if (!lower || !upper || !std::isfinite((*lower)(r, l)) || !std::isfinite((*upper)(r, l))) return {x, x};
    return {std::min(x, (*lower)(r, l)), std::max(x, (*upper)(r, l))};
  }
};

// What one test says of one record.
struct Finding {
  bool tested = false;               // false: the test could not judge this record (see `untested_code`)
  double statistic = std::nan("");   // the test's own statistic (e.g. the largest |robust z|, D²)
  double threshold = std::nan("");   // the value beyond which the record is flagged
  double severity = std::nan("");    // on a common scale across tests: 1 at the threshold
  // How often a clean record of this taxon would look at least this unusual under the model the
  // test fits (its tail probability); NaN for a test that only ranks (reverse jackknife) or a
  // record check, which flag by their own cutoff. Flags are decided from it (score/flag_rule.hpp).
  double probability = std::nan("");
  bool flagged = false;              // beyond the test's own cutoff (or, once decided, at the knob)
  bool withheld = false;             // the population guard withheld this test's flags for the taxon
  std::vector<double> extras;        // values of the test's extra_columns(), NaN when unknown
  std::vector<std::string> reasons;  // plain words for a flagged record: which layer, how far
  std::string untested_code;       // a reason code when not tested, e.g. too_few_records:robust_z
  std::vector<std::string> codes;    // reason codes for a tested record (e.g. looks_multimodal:TEST)
};

class Detector {
 public:
  virtual ~Detector() = default;
  virtual std::string name() const = 0;  // the word written to `flags`, and the prefix of its columns
  virtual std::vector<std::string> extra_columns() const { return {}; }
  virtual std::vector<Finding> judge(const TaxonValues& taxon) const = 0;
  // True for a test that compares the taxon with its landscape (TaxonValues::landscape).
  virtual bool uses_landscape() const { return false; }
  // A one-layer test: the range it accepts on a layer, from that layer's reference values (the
  // report draws it), and whether that range's bounds are themselves flagged; nothing for a test
  // of all layers together.
  virtual std::optional<std::pair<double, double>> accepted_range(std::vector<double>, const std::string&) const {
    return std::nullopt;
  }
  virtual bool flags_its_bounds() const { return false; }
};

// A test words a record's finding (Finding::reasons) when it is beyond its own cutoff or its
// probability is at most this: the record may then be flagged by the tests' evidence together.
constexpr double kWorthWords = 0.05;

// Findings for a taxon no record of which can be judged.
inline std::vector<Finding> untested(std::size_t rows, const std::string& reason) {
  std::vector<Finding> f(rows);
  for (auto& x : f) x.untested_code = reason;
  return f;
}

}  // namespace envsift
