// Steps 3-4 glued: group records by taxon and run every test on each taxon (in parallel,
// largest taxa first).
#pragma once
#include <cstdint>
#include <memory>
#include <string>
#include <vector>

#include <Eigen/Core>

#include "envsift/detect/detector.hpp"

namespace envsift {

struct ScreeningInput {
  const Eigen::MatrixXd& values;            // records × layers, NaN = missing
  const std::vector<std::uint64_t>& cells;  // per record: equal keys = same raster cells
  const std::vector<std::string>& taxa;     // per record
  const std::vector<bool>& eligible;        // records to judge
  const std::vector<std::string>& layer_names;
  const Eigen::MatrixXd* lower = nullptr;  // uncertainty discs (see TaxonValues)
  const Eigen::MatrixXd* upper = nullptr;
};

struct ScreenedTaxon {
  std::string taxon;
  std::vector<std::size_t> records;    // ascending
  std::vector<std::size_t> reference;  // the records its statistics were estimated from
};

struct ScreeningResult {
  std::vector<ScreenedTaxon> taxa;             // sorted by name
  std::vector<std::vector<Finding>> findings;  // [test][record]; untested for records not eligible
};

// distinct_cells: each taxon's statistics are estimated from one row per distinct cell key, so
// that many records in one cell neither zero the spread nor hide an outlier; every record is
// still judged. seed: randomised tests get a seed derived from it and the taxon's name, so a
// taxon's result depends on neither thread count nor which other taxa are in the file.
ScreeningResult screen_taxa(const ScreeningInput& input, const std::vector<std::unique_ptr<Detector>>& detectors,
                            bool distinct_cells, std::uint64_t seed);

// A 64-bit FNV-1a hash: stable across machines, compilers and runs.
std::uint64_t stable_hash(const std::string& text, std::uint64_t basis = 0xcbf29ce484222325ull);

}  // namespace envsift
