#include "envsift/score/screen_taxa.hpp"

#include <algorithm>
#include <numeric>
#include <unordered_set>

#include "envsift/group/taxon_groups.hpp"

namespace envsift {

std::uint64_t stable_hash(const std::string& text, std::uint64_t basis) {
  std::uint64_t h = basis;
  for (unsigned char c : text) {
    h ^= c;
    h *= 0x100000001b3ull;
  }
  return h;
}

ScreeningResult screen_taxa(const ScreeningInput& in, const std::vector<std::unique_ptr<Detector>>& detectors,
                            bool distinct_cells, std::uint64_t seed) {
  const std::size_t n = in.taxa.size();
  const auto L = in.values.cols();
  ScreeningResult result;
  result.findings.assign(detectors.size(), std::vector<Finding>(n));
  const auto groups = group_by_taxon(in.taxa, in.eligible);
  result.taxa.resize(groups.size());
  std::vector<std::size_t> order(groups.size());
  std::iota(order.begin(), order.end(), 0);
  std::stable_sort(order.begin(), order.end(),
                   [&](std::size_t a, std::size_t b) { return groups[a].records.size() > groups[b].records.size(); });
#pragma omp parallel for schedule(dynamic, 1)
  for (std::ptrdiff_t k = 0; k < static_cast<std::ptrdiff_t>(order.size()); ++k) {
    const std::size_t index = order[static_cast<std::size_t>(k)];
    const TaxonGroup& g = groups[index];
    const auto rows = static_cast<Eigen::Index>(g.records.size());
    Eigen::MatrixXd records(rows, L), lower, upper;
    if (in.lower) lower.resize(rows, L), upper.resize(rows, L);
    std::vector<Eigen::Index> reference_rows;
    std::unordered_set<std::uint64_t> seen;
    ScreenedTaxon& screened = result.taxa[index];
    screened.taxon = g.taxon;
    screened.records = g.records;
    for (Eigen::Index r = 0; r < rows; ++r) {
      const auto i = static_cast<Eigen::Index>(g.records[static_cast<std::size_t>(r)]);
      records.row(r) = in.values.row(i);
      if (in.lower) lower.row(r) = in.lower->row(i), upper.row(r) = in.upper->row(i);
      if (!distinct_cells || seen.insert(in.cells[static_cast<std::size_t>(i)]).second) {
        reference_rows.push_back(r);
        screened.reference.push_back(static_cast<std::size_t>(i));
      }
    }
    Eigen::MatrixXd reference(static_cast<Eigen::Index>(reference_rows.size()), L);
    for (std::size_t r = 0; r < reference_rows.size(); ++r) reference.row(static_cast<Eigen::Index>(r)) = records.row(reference_rows[r]);

    const TaxonValues taxon{reference, records, in.layer_names, stable_hash(g.taxon, seed ^ 0xcbf29ce484222325ull),
                            in.lower ? &lower : nullptr, in.upper ? &upper : nullptr};
    for (std::size_t t = 0; t < detectors.size(); ++t) {
      std::vector<Finding> f = detectors[t]->judge(taxon);
      for (std::size_t r = 0; r < g.records.size(); ++r) result.findings[t][g.records[r]] = std::move(f[r]);
    }
  }
  return result;
}

}  // namespace envsift
