#include "envsift/detect/judge_taxa.hpp"

#include <algorithm>
#include <exception>
#include <mutex>
#include <numeric>
#include <unordered_set>

#include "envsift/group/taxon_groups.hpp"
#include "envsift/stable_hash.hpp"
#include "envsift/stopwatch.hpp"

namespace envsift {

void judge_taxa(const JudgingInput& in, const std::vector<std::unique_ptr<Detector>>& detectors,
                bool distinct_cells, std::uint64_t seed, const TaxonFindingsSink& sink, std::vector<double>* test_seconds,
                const PopulationOptions& population_options) {
  std::mutex timing;
  if (test_seconds) test_seconds->assign(detectors.size(), 0.0);
  const auto L = static_cast<Eigen::Index>(in.columns.size());
  const auto groups = group_by_taxon(in.taxon_of, in.taxon_names, in.eligible);
  std::vector<std::size_t> order(groups.size());
  std::iota(order.begin(), order.end(), 0);
  std::vector<std::exception_ptr> errors(groups.size());
  const bool wants_landscape =
      in.landscape && std::any_of(detectors.begin(), detectors.end(), [](const auto& d) { return d->uses_landscape(); });
  const std::size_t batch = wants_landscape ? std::max<std::size_t>(in.landscape_batch, 1) : std::max<std::size_t>(order.size(), 1);
  if (wants_landscape && in.landscape_key && batch < order.size()) {
    std::vector<std::uint64_t> key(groups.size());
    for (std::size_t k = 0; k < groups.size(); ++k) key[k] = in.landscape_key(groups[k]);
    std::stable_sort(order.begin(), order.end(), [&](std::size_t a, std::size_t b) { return key[a] < key[b]; });
  }
  for (std::size_t first = 0; first < order.size(); first += batch) {
   const std::size_t last = std::min(order.size(), first + batch);
   // largest taxa first within the batch, so that no thread is left with a big one at the end
   std::stable_sort(order.begin() + static_cast<std::ptrdiff_t>(first), order.begin() + static_cast<std::ptrdiff_t>(last),
                    [&](std::size_t a, std::size_t b) { return groups[a].records.size() > groups[b].records.size(); });
   std::vector<LandscapeValues> landscapes;
   if (wants_landscape) {
    std::vector<const TaxonGroup*> taxa;
    for (std::size_t k = first; k < last; ++k) taxa.push_back(&groups[order[k]]);
    landscapes = in.landscape(taxa);
   }
#pragma omp parallel for schedule(dynamic, 1)
  for (std::ptrdiff_t k = static_cast<std::ptrdiff_t>(first); k < static_cast<std::ptrdiff_t>(last); ++k) {
   const std::size_t index = order[static_cast<std::size_t>(k)];
   const LandscapeValues* landscape = wants_landscape ? &landscapes[static_cast<std::size_t>(k) - first] : nullptr;
   try {
    const TaxonGroup& g = groups[index];
    const auto rows = static_cast<Eigen::Index>(g.records.size());
    Eigen::MatrixXd records(rows, L), lower, upper;
    if (in.lower) lower.resize(rows, L), upper.resize(rows, L);
    std::vector<Eigen::Index> reference_rows, place_rows;  // rows the statistics use; one row per place
    std::unordered_set<std::uint64_t> seen;
    JudgedTaxon screened;  // handed to the sink, then gone: nothing per record outlives its taxon
    screened.index = index;
    screened.taxon = g.taxon;
    screened.records = g.records;
    for (Eigen::Index r = 0; r < rows; ++r) {
      const auto i = static_cast<Eigen::Index>(g.records[static_cast<std::size_t>(r)]);
      for (Eigen::Index c = 0; c < L; ++c) records(r, c) = in.values(i, in.columns[static_cast<std::size_t>(c)]);
      if (in.lower) lower.row(r) = in.lower->row(i), upper.row(r) = in.upper->row(i);
      const bool kept_out = in.left_out && (*in.left_out)[static_cast<std::size_t>(i)];
      const bool new_place = !kept_out && seen.insert(in.cells[static_cast<std::size_t>(i)]).second;
      if (new_place) place_rows.push_back(r);
      if (!kept_out && (!distinct_cells || new_place)) {
        reference_rows.push_back(r);
        screened.reference.push_back(static_cast<std::size_t>(i));
      }
    }
    auto pick = [](const Eigen::MatrixXd& m, const std::vector<Eigen::Index>& at) {
      Eigen::MatrixXd out(static_cast<Eigen::Index>(at.size()), m.cols());
      for (std::size_t r = 0; r < at.size(); ++r) out.row(static_cast<Eigen::Index>(r)) = m.row(at[r]);
      return out;
    };
    const Eigen::MatrixXd reference = pick(records, reference_rows);

    const std::uint64_t taxon_seed = stable_hash(g.taxon, seed ^ kFnvBasis);
    auto judge = [&](TaxonValues values) {
      values.landscape = landscape;
      std::vector<std::vector<Finding>> found;
      for (std::size_t t = 0; t < detectors.size(); ++t) {
        const Stopwatch clock;
        found.push_back(detectors[t]->judge(values));
        if (test_seconds) {
          const double s = clock.seconds();
          std::lock_guard<std::mutex> lock(timing);
          (*test_seconds)[t] += s;
        }
      }
      return found;
    };
    // Populations are told by places, not records (even with --all-records): a batch of records at
    // a few wrong places is a few rows here, never a population.
    const Populations split = find_populations(distinct_cells ? reference : pick(records, place_rows), population_options);
    std::vector<std::vector<Finding>> findings;
    if (!split.split) {
      findings = judge({reference, records, in.layer_names, taxon_seed, in.lower ? &lower : nullptr, in.upper ? &upper : nullptr});
    } else {
      // each population judged on its own; findings go back to the taxon's record order
      screened.two_populations = true;
      findings.assign(detectors.size(), std::vector<Finding>(static_cast<std::size_t>(rows)));
      for (std::uint8_t k = 0; k < 2; ++k) {
        std::vector<Eigen::Index> mine, my_reference;
        for (Eigen::Index r = 0; r < rows; ++r)
          if (split.population_of(records.row(r)) == k) mine.push_back(r);
        for (Eigen::Index r = 0; r < reference.rows(); ++r)
          if (split.population_of(reference.row(r)) == k) my_reference.push_back(r);
        const Eigen::MatrixXd part_reference = pick(reference, my_reference), part_records = pick(records, mine);
        Eigen::MatrixXd part_lower, part_upper;
        if (in.lower) part_lower = pick(lower, mine), part_upper = pick(upper, mine);
        const auto found = judge({part_reference, part_records, in.layer_names, taxon_seed + k,
                                  in.lower ? &part_lower : nullptr, in.upper ? &part_upper : nullptr});
        for (std::size_t t = 0; t < detectors.size(); ++t)
          for (std::size_t i = 0; i < mine.size(); ++i) findings[t][static_cast<std::size_t>(mine[i])] = found[t][i];
      }
    }
    sink(screened, findings);
   } catch (...) {
    errors[index] = std::current_exception();
   }
  }
  }
  for (auto& e : errors)
    if (e) std::rethrow_exception(e);  // the first taxon's, by name: the same for any thread count
}

}  // namespace envsift
