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
namespace {

Eigen::MatrixXd pick(const Eigen::MatrixXd& m, const std::vector<Eigen::Index>& at) {
  Eigen::MatrixXd out(static_cast<Eigen::Index>(at.size()), m.cols());
  for (std::size_t r = 0; r < at.size(); ++r) out.row(static_cast<Eigen::Index>(r)) = m.row(at[r]);
  return out;
}

// One taxon's rows: its records' values (and discs) on the judged columns, the rows its
// statistics use (one per distinct cell unless every record), one row per place.
struct TaxonRows {
  Eigen::MatrixXd records, lower, upper;
  std::vector<Eigen::Index> reference_rows, place_rows;
  Eigen::MatrixXd reference;
};

// Judges taxa one at a time (from several threads): gathers its rows, splits two populations,
// runs every detector, times them.
class TaxonJudge {
 public:
  TaxonJudge(const JudgingInput& in, const std::vector<std::unique_ptr<Detector>>& detectors, bool distinct_cells,
             std::uint64_t seed, std::vector<double>* test_seconds, const PopulationOptions& populations)
      : in_(in), detectors_(detectors), distinct_cells_(distinct_cells), seed_(seed), test_seconds_(test_seconds),
        populations_(populations) {
    if (test_seconds_) test_seconds_->assign(detectors.size(), 0.0);
  }

  // The findings of every detector for each of the taxon's records; `screened` is told its
  // reference and whether it was split.
  std::vector<std::vector<Finding>> judge(const TaxonGroup& g, const LandscapeValues* landscape, JudgedTaxon& screened) {
    const TaxonRows t = rows_of(g, screened);
    const std::uint64_t taxon_seed = stable_hash(g.taxon, seed_ ^ kFnvBasis);
    const Eigen::MatrixXd* lower = in_.lower ? &t.lower : nullptr;
    const Eigen::MatrixXd* upper = in_.upper ? &t.upper : nullptr;
    // Populations are told by places, not records (even with --all-records): a batch of records at
    // a few wrong places is a few rows here, never a population.
    const Populations split = find_populations(distinct_cells_ ? t.reference : pick(t.records, t.place_rows), populations_);
    if (!split.split) return run({t.reference, t.records, in_.layer_names, taxon_seed, lower, upper}, landscape);
    // each population judged on its own; findings go back to the taxon's record order
    screened.two_populations = true;
    std::vector<std::vector<Finding>> findings(detectors_.size(), std::vector<Finding>(g.records.size()));
    for (std::uint8_t k = 0; k < 2; ++k) {
      std::vector<Eigen::Index> mine, my_reference;
      for (Eigen::Index r = 0; r < t.records.rows(); ++r)
        if (split.population_of(t.records.row(r)) == k) mine.push_back(r);
      for (Eigen::Index r = 0; r < t.reference.rows(); ++r)
        if (split.population_of(t.reference.row(r)) == k) my_reference.push_back(r);
      const Eigen::MatrixXd part_reference = pick(t.reference, my_reference), part_records = pick(t.records, mine);
      Eigen::MatrixXd part_lower, part_upper;
      if (in_.lower) part_lower = pick(t.lower, mine), part_upper = pick(t.upper, mine);
      const auto found = run({part_reference, part_records, in_.layer_names, taxon_seed + k,
                              in_.lower ? &part_lower : nullptr, in_.upper ? &part_upper : nullptr},
                             landscape);
      for (std::size_t d = 0; d < detectors_.size(); ++d)
        for (std::size_t i = 0; i < mine.size(); ++i) findings[d][static_cast<std::size_t>(mine[i])] = found[d][i];
    }
    return findings;
  }

 private:
  TaxonRows rows_of(const TaxonGroup& g, JudgedTaxon& screened) const {
    const auto L = static_cast<Eigen::Index>(in_.columns.size());
    const auto rows = static_cast<Eigen::Index>(g.records.size());
    TaxonRows t;
    t.records.resize(rows, L);
    if (in_.lower) t.lower.resize(rows, L), t.upper.resize(rows, L);
    std::unordered_set<std::uint64_t> seen;
    for (Eigen::Index r = 0; r < rows; ++r) {
      const auto i = static_cast<Eigen::Index>(g.records[static_cast<std::size_t>(r)]);
      for (Eigen::Index c = 0; c < L; ++c) t.records(r, c) = in_.values(i, in_.columns[static_cast<std::size_t>(c)]);
      if (in_.lower) t.lower.row(r) = in_.lower->row(i), t.upper.row(r) = in_.upper->row(i);
      const bool kept_out = in_.left_out && (*in_.left_out)[static_cast<std::size_t>(i)];
      const bool new_place = !kept_out && seen.insert(in_.cells[static_cast<std::size_t>(i)]).second;
      if (new_place) t.place_rows.push_back(r);
      if (!kept_out && (!distinct_cells_ || new_place)) {
        t.reference_rows.push_back(r);
        screened.reference.push_back(static_cast<std::size_t>(i));
      }
    }
    t.reference = pick(t.records, t.reference_rows);
    return t;
  }

  std::vector<std::vector<Finding>> run(TaxonValues values, const LandscapeValues* landscape) {
    values.landscape = landscape;
    std::vector<std::vector<Finding>> found;
    for (std::size_t d = 0; d < detectors_.size(); ++d) {
      const Stopwatch clock;
      found.push_back(detectors_[d]->judge(values));
      if (test_seconds_) {
        const double s = clock.seconds();
        std::lock_guard<std::mutex> lock(timing_);
        (*test_seconds_)[d] += s;
      }
    }
    return found;
  }

  const JudgingInput& in_;
  const std::vector<std::unique_ptr<Detector>>& detectors_;
  bool distinct_cells_;
  std::uint64_t seed_;
  std::vector<double>* test_seconds_;
  PopulationOptions populations_;
  std::mutex timing_;
};

// The order taxa are judged in: runs of `batch` taxa (by landscape key when given), largest taxa
// first within each batch, so that no thread is left with a big one at the end.
std::vector<std::size_t> judging_order(const std::vector<TaxonGroup>& groups, const JudgingInput& in, bool landscapes,
                                       std::size_t batch) {
  std::vector<std::size_t> order(groups.size());
  std::iota(order.begin(), order.end(), 0);
  if (landscapes && in.landscape_key && batch < order.size()) {
    std::vector<std::uint64_t> key(groups.size());
    for (std::size_t k = 0; k < groups.size(); ++k) key[k] = in.landscape_key(groups[k]);
    std::stable_sort(order.begin(), order.end(), [&](std::size_t a, std::size_t b) { return key[a] < key[b]; });
  }
  for (std::size_t first = 0; first < order.size(); first += batch) {
    const std::size_t last = std::min(order.size(), first + batch);
    std::stable_sort(order.begin() + static_cast<std::ptrdiff_t>(first), order.begin() + static_cast<std::ptrdiff_t>(last),
                     [&](std::size_t a, std::size_t b) { return groups[a].records.size() > groups[b].records.size(); });
  }
  return order;
}

}  // namespace

void judge_taxa(const JudgingInput& in, const std::vector<std::unique_ptr<Detector>>& detectors,
                bool distinct_cells, std::uint64_t seed, const TaxonFindingsSink& sink, std::vector<double>* test_seconds,
                const PopulationOptions& population_options) {
  TaxonJudge judge(in, detectors, distinct_cells, seed, test_seconds, population_options);
  const auto groups = group_by_taxon(in.taxon_of, in.taxon_names, in.eligible);
  std::vector<std::exception_ptr> errors(groups.size());
  const bool wants_landscape =
      in.landscape && std::any_of(detectors.begin(), detectors.end(), [](const auto& d) { return d->uses_landscape(); });
  const std::size_t batch =
      wants_landscape ? std::max<std::size_t>(in.landscape_batch, 1) : std::max<std::size_t>(groups.size(), 1);
  const std::vector<std::size_t> order = judging_order(groups, in, wants_landscape, batch);
  for (std::size_t first = 0; first < order.size(); first += batch) {
    const std::size_t last = std::min(order.size(), first + batch);
    std::vector<LandscapeValues> landscapes;  // only one batch's at a time
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
        JudgedTaxon screened;  // handed to the sink, then gone: nothing per record outlives its taxon
        screened.index = index;
        screened.taxon = g.taxon;
        screened.records = g.records;
        auto findings = judge.judge(g, landscape, screened);
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
