#include "envsift/score/screen_taxa.hpp"

#include <algorithm>
#include <chrono>
#include <exception>
#include <mutex>
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

std::vector<ScreenedTaxon> screen_taxa(const ScreeningInput& in, const std::vector<std::unique_ptr<Detector>>& detectors,
                                       bool distinct_cells, std::uint64_t seed, const TaxonSink& sink,
                                       std::vector<double>* test_seconds) {
  std::mutex timing;
  if (test_seconds) test_seconds->assign(detectors.size(), 0.0);
  const auto L = in.values.cols();
  const auto groups = group_by_taxon(in.taxon_of, in.taxon_names, in.eligible);
  std::vector<ScreenedTaxon> result(groups.size());
  std::vector<std::size_t> order(groups.size());
  std::iota(order.begin(), order.end(), 0);
  std::stable_sort(order.begin(), order.end(),
                   [&](std::size_t a, std::size_t b) { return groups[a].records.size() > groups[b].records.size(); });
  std::vector<std::exception_ptr> errors(groups.size());
#pragma omp parallel for schedule(dynamic, 1)
  for (std::ptrdiff_t k = 0; k < static_cast<std::ptrdiff_t>(order.size()); ++k) {
   const std::size_t index = order[static_cast<std::size_t>(k)];
   try {
    const TaxonGroup& g = groups[index];
    const auto rows = static_cast<Eigen::Index>(g.records.size());
    Eigen::MatrixXd records(rows, L), lower, upper;
    if (in.lower) lower.resize(rows, L), upper.resize(rows, L);
    std::vector<Eigen::Index> reference_rows;
    std::unordered_set<std::uint64_t> seen;
    ScreenedTaxon& screened = result[index];
    screened.index = index;
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
    std::vector<std::vector<Finding>> findings;
    for (std::size_t t = 0; t < detectors.size(); ++t) {
      const auto start = std::chrono::steady_clock::now();
      findings.push_back(detectors[t]->judge(taxon));
      if (test_seconds) {
        const double s = std::chrono::duration<double>(std::chrono::steady_clock::now() - start).count();
        std::lock_guard<std::mutex> lock(timing);
        (*test_seconds)[t] += s;
      }
    }
    sink(screened, findings);
   } catch (...) {
    errors[index] = std::current_exception();
   }
  }
  for (auto& e : errors)
    if (e) std::rethrow_exception(e);  // the first taxon's, by name: the same for any thread count
  return result;
}

}  // namespace envsift
