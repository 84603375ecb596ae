// Steps 3-4 glued: group the records by taxon, split a taxon with two populations, and judge
// each taxon with every detector (in parallel, largest taxa first).
#pragma once
#include <cstdint>
#include <functional>
#include <memory>
#include <string>
#include <vector>

#include <Eigen/Core>

#include "envsift/detect/detector.hpp"
#include "envsift/detect/judged_taxon.hpp"
#include "envsift/group/populations.hpp"
#include "envsift/group/taxon_groups.hpp"
#include "envsift/value_table.hpp"

namespace envsift {

// Draws the landscape of each of a batch of taxa (one LandscapeValues per taxon, in order).
// Called from one thread at a time, between batches.
using LandscapeSource = std::function<std::vector<LandscapeValues>(const std::vector<const TaxonGroup*>&)>;

struct JudgingInput {
  const ValueTable& values;                 // records × table columns, NaN = missing
  const std::vector<Eigen::Index>& columns; // the columns the tests judge, in their order
  const std::vector<std::uint64_t>& cells;  // per record: equal keys = same raster cells
  const std::vector<std::uint32_t>& taxon_of;  // per record: index into `taxon_names`
  const std::vector<std::string>& taxon_names;
  const std::vector<bool>& eligible;        // records to judge
  const std::vector<std::string>& layer_names;
  const Eigen::MatrixXd* lower = nullptr;  // uncertainty discs, judged columns only (see TaxonValues)
  const Eigen::MatrixXd* upper = nullptr;
  // Records judged like the others but kept out of their taxon's reference, population split and
  // landscape places (a reviewer confirmed them wrong); null: none.
  const std::vector<bool>* left_out = nullptr;
  // When a detector uses_landscape(): taxa are judged in batches of `landscape_batch`, each
  // batch's landscapes drawn first, so only one batch's landscape is held at a time. With a
  // `landscape_key` (e.g. where the taxon lives on a space-filling curve), batches are runs of
  // taxa in key order, so that each batch's draws touch fewer raster blocks. Results depend on
  // neither the batch size nor the key.
  LandscapeSource landscape = {};
  std::size_t landscape_batch = 256;
  std::function<std::uint64_t(const TaxonGroup&)> landscape_key = {};
};


// Receives each taxon's findings as soon as they are known — `findings[t][r]` is test t's
// finding for the taxon's r-th record — so that nothing per record and test need be kept for the
// whole file. Called from several threads at once: it must be thread-safe.
using TaxonFindingsSink = std::function<void(const JudgedTaxon&, std::vector<std::vector<Finding>>&)>;

// distinct_cells: each taxon's statistics are estimated from one row per distinct cell key, so
// that many records in one cell neither zero the spread nor hide an outlier; every record is
// still judged. seed: randomised tests get a seed derived from it and the taxon's name, so a
// taxon's result depends on neither thread count nor which other taxa are in the file.
// `test_seconds` (optional) receives each test's computing time, summed over threads.
// populations: a taxon with two separate populations (group/populations.hpp) is judged as two.
void judge_taxa(const JudgingInput& input, const std::vector<std::unique_ptr<Detector>>& detectors,
                bool distinct_cells, std::uint64_t seed, const TaxonFindingsSink& sink,
                std::vector<double>* test_seconds = nullptr, const PopulationOptions& populations = {false});

}  // namespace envsift
