#include <algorithm>
#include <cstdio>
#include <mutex>
#include <unordered_set>

#include "envsift/detect/judge_taxa.hpp"
#include "envsift/sample/landscape_sample.hpp"
#include "envsift/score/flag_rule.hpp"
#include "envsift/score/population_guard.hpp"
#include "envsift/write/value_format.hpp"
#include "steps.hpp"

namespace envsift::run {
namespace {

std::string withheld_words(const std::string& taxon, const std::string& test, const GuardOutcome& g) {
  char words[400];
  std::snprintf(words, sizeof words,
                "taxon '%s': %s flagged %zu records at %zu of its %zu places (%.0f%%), so it may have several "
                "populations; those flags are withheld (looks_multimodal:%s), the records keep their rank - review "
                "the taxon as a whole",
                taxon.c_str(), test.c_str(), g.flagged_records, g.flagged_places, g.judged_places, 100 * g.share(),
                test.c_str());
  return words;
}

// The layers the tests judge: every one but a circular layer, whose sine and cosine stand for it;
// their discs (copies only when some layer is left out).
struct JudgedLayers {
  std::vector<Eigen::Index> columns;
  std::vector<std::string> names;
  Eigen::MatrixXd lower, upper;
  const Eigen::MatrixXd* lower_of = nullptr;
  const Eigen::MatrixXd* upper_of = nullptr;

  explicit JudgedLayers(const RecordTable& t) {
    for (std::size_t l = 0; l < t.layers.size(); ++l)
      if (t.layers[l].judged) columns.push_back(static_cast<Eigen::Index>(l)), names.push_back(t.layers[l].spec.name);
    if (!t.has_discs) return;
    if (columns.size() == t.layers.size()) {
      lower_of = &t.discs.min, upper_of = &t.discs.max;
      return;
    }
    lower = t.discs.min(Eigen::all, columns), upper = t.discs.max(Eigen::all, columns);
    lower_of = &lower, upper_of = &upper;
  }
};

std::size_t eligible_taxa(const Membership& m) {
  std::vector<bool> seen(m.taxon_names.size());
  std::size_t count = 0;
  for (std::size_t i = 0; i < m.eligible.size(); ++i)
    if (m.eligible[i] && !seen[m.taxon_of[i]]) seen[m.taxon_of[i]] = true, ++count;
  return count;
}

// Draws the landscapes the tests ask for (a test's entry declares it needs one), a batch of taxa
// at a time, from the taxa's distinct places (records decided `error` left out).
class Landscapes {
 public:
  Landscapes(const RecordTable& t, const Membership& m, const JudgedLayers& judged, const LandscapeOptions& options,
             const SamplingPlan& plan)
      : t_(t), m_(m),
        sampler_(*t.stack, t.layers, std::vector<std::size_t>(judged.columns.begin(), judged.columns.end()), plan.method,
                 options),
        landscape_bytes_(plan.landscape_bytes) {}

  void provide(JudgingInput& input) {
    input.landscape = [this](const std::vector<const TaxonGroup*>& taxa) {
      const Stopwatch clock;
      std::vector<TaxonPlaces> places;
      for (const TaxonGroup* taxon : taxa) places.push_back(places_of(*taxon));
      auto drawn = sampler_.sample(places);
      seconds_ += clock.seconds();
      return drawn;
    };
    input.landscape_batch = std::max<std::size_t>(1, landscape_bytes_ / sampler_.bytes_per_taxon());
    input.landscape_key = [this](const TaxonGroup& taxon) { return locality_key(places_of(taxon)); };
  }
  double seconds() const { return seconds_; }

 private:
  TaxonPlaces places_of(const TaxonGroup& taxon) const {
    TaxonPlaces places;
    places.taxon = taxon.taxon;
    std::unordered_set<std::uint64_t> seen;
    for (std::size_t i : taxon.records) {
      const auto& r = t_.points.records[i];
      if (!std::isfinite(r.longitude) || !std::isfinite(r.latitude) || (!m_.left_out.empty() && m_.left_out[i]) ||
          !seen.insert(t_.cells[i]).second)
        continue;
      places.longitude.push_back(r.longitude), places.latitude.push_back(r.latitude);
    }
    return places;
  }

  const RecordTable& t_;
  const Membership& m_;
  LandscapeSampler sampler_;
  std::size_t landscape_bytes_;
  double seconds_ = 0;
};

// Turns findings into verdicts: a record's verdict is the taxon tests' findings (if any), then
// every record check's, combined; a reviewer's decision applied; kept in the verdict store.
class VerdictMaker {
 public:
  VerdictMaker(const RecordTable& t, const ActiveTests& tests, const Membership& m, CombineRule rule, FlagRule flag_rule,
               Judgement& j)
      : t_(t), tests_(tests), m_(m), rule_(rule), flag_rule_(flag_rule), names_(tests.names()),
        extras_(tests.extra_columns()), j_(j) {}

  Verdict judge(std::size_t i, std::vector<const Finding*> findings, const RecordFlag& flag = {}) const {
    std::vector<Finding> checked(tests_.checks.size());
    for (std::size_t c = 0; c < tests_.checks.size(); ++c) {
      if (m_.mine[i]) checked[c] = tests_.checks[c]->judge(i);
      findings.push_back(&checked[c]);
    }
    Verdict v = combine(findings, names_, rule_, flag, flag_rule_);
    if (const auto note = t_.notes.find(i); note != t_.notes.end())
      v.reasons.insert(v.reasons.end(), note->second.begin(), note->second.end());
    v.codes.erase(std::remove(v.codes.begin(), v.codes.end(), std::string()), v.codes.end());
    for (std::size_t k = 0; k < v.tests.size(); ++k) v.tests[k].extras.resize(extras_[k].size(), std::nan(""));
    if (!m_.decisions.of.empty() && m_.decisions.of[i] != Decision::none)
      apply_decision(v, m_.decisions.of[i], m_.decisions.row.at(i)->note);
    if (v.score) j_.scores[i] = score_as_written(*v.score);
    j_.verdicts->put(i, v);
    return v;
  }
  const std::vector<std::string>& names() const { return names_; }

 private:
  const RecordTable& t_;
  const ActiveTests& tests_;
  const Membership& m_;
  CombineRule rule_;
  FlagRule flag_rule_;
  std::vector<std::string> names_;
  std::vector<std::vector<std::string>> extras_;
  Judgement& j_;
};

}  // namespace

Judgement judge_records(RecordTable& t, const ActiveTests& tests, const Membership& m, const ScreenSettings& s,
                        const std::vector<RecordSink*>& outputs) {
  const std::size_t n = t.size();
  for (const auto& check : tests.checks) check->prepare(t);
  Judgement j;
  const SamplingPlan plan = sampling_plan(s.sampling);
  j.verdicts = std::make_unique<VerdictStore>(n, plan.verdict_bytes);
  j.scores.resize(n);
  if (!m.decisions.of.empty())
    for (Decision d : m.decisions.of) j.tiers.push_back(review_tier(d));
  const FlagSettings flag_settings{s.tests.flag_rule, s.tests.flag_share};
  const VerdictMaker verdicts(t, tests, m, s.tests.combine == Combine::mean ? CombineRule::mean : CombineRule::max,
                              flag_settings.rule, j);
  const auto& names = verdicts.names();

  PopulationGuard guard;
  guard.max_share = s.tests.max_flagged_share;
  std::mutex lock;
  std::vector<std::pair<std::size_t, std::string>> withheld;  // (taxon index, words)
  if (s.progress) s.progress->stage("screening", eligible_taxa(m), "taxa");
  PopulationOptions populations;
  populations.enabled = s.tests.populations == PopulationMode::split;
  populations.min_rows = s.tests.min_records;
  std::vector<double> test_seconds;
  const JudgedLayers judged(t);
  JudgingInput input{t.values, judged.columns, t.cells, m.taxon_of, m.taxon_names, m.eligible, judged.names,
                     judged.lower_of, judged.upper_of};
  if (!m.left_out.empty()) input.left_out = &m.left_out;
  std::unique_ptr<Landscapes> landscapes;
  if (const auto wanted = tests.landscape(s.tests); wanted && t.stack) {  // layers, not value columns
    landscapes = std::make_unique<Landscapes>(t, m, judged, *wanted, plan);
    landscapes->provide(input);
  }
  auto on_taxon = [&](const JudgedTaxon& taxon, std::vector<std::vector<Finding>>& findings) {
    std::vector<std::uint64_t> places;
    for (std::size_t i : taxon.records) places.push_back(t.cells[i]);
    flag_tests_at_knob(findings, flag_settings);
    for (std::size_t d = 0; d < tests.detectors.size(); ++d) {
      const GuardOutcome g = withhold_population_flags(findings[d], places, names[d], guard);
      if (!g.withheld) continue;
      std::lock_guard<std::mutex> hold(lock);
      withheld.emplace_back(taxon.index, withheld_words(taxon.taxon, names[d], g));
    }
    const std::vector<RecordFlag> flags = decide_flags(findings, flag_settings);
    std::vector<Verdict> taxon_verdicts;
    for (std::size_t r = 0; r < taxon.records.size(); ++r) {
      std::vector<const Finding*> per_test;
      for (const auto& f : findings) per_test.push_back(&f[r]);
      taxon_verdicts.push_back(verdicts.judge(taxon.records[r], per_test, flags[r]));
    }
    for (RecordSink* out : outputs) out->taxon(taxon, taxon_verdicts);
    if (s.progress) s.progress->advance(1);
  };
  judge_taxa(input, tests.detectors, !s.tests.all_records, s.tests.seed, on_taxon, &test_seconds, populations);
  for (std::size_t d = 0; d < tests.detectors.size(); ++d)
    j.test_seconds.emplace_back("test " + names[d] + " (CPU)", test_seconds[d]);
  if (landscapes) j.test_seconds.emplace_back("landscape draws", landscapes->seconds());
  // Records outside every taxon: only the record checks can judge them.
  const std::vector<Finding> none(tests.detectors.size());
  std::vector<const Finding*> no_findings;
  for (const auto& f : none) no_findings.push_back(&f);
  for (std::size_t i = 0; i < n; ++i)
    if (!j.verdicts->has(i)) verdicts.judge(i, no_findings);
  std::sort(withheld.begin(), withheld.end());  // by taxon, whatever the threads
  for (auto& w : withheld) j.warnings.push_back(std::move(w.second));
  return j;
}

}  // namespace envsift::run
