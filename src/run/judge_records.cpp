#include <algorithm>
#include <cstdio>
#include <mutex>
#include <unordered_set>

#include "envsift/detect/judge_taxa.hpp"
#include "envsift/sample/landscape_sample.hpp"
#include "envsift/settings/run_options.hpp"
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

}  // namespace

Judgement judge_records(RecordTable& t, const ActiveTests& tests, const Membership& m, const ScreenSettings& s,
                        const std::vector<RecordSink*>& outputs) {
  const std::size_t n = t.size();
  const auto names = tests.names();
  const auto extras = tests.extra_columns();
  for (const auto& check : tests.checks) check->prepare(t);
  Judgement j;
  j.verdicts = std::make_unique<VerdictStore>(n, sampling_plan(s.sampling).verdict_bytes);
  j.scores.resize(n);
  if (!m.decisions.of.empty())
    for (Decision d : m.decisions.of) j.tiers.push_back(review_tier(d));

  // A record's verdict: the taxon tests' findings (if any), then every record check's.
  auto judge_record = [&](std::size_t i, std::vector<const Finding*> findings) {
    std::vector<Finding> checked(tests.checks.size());
    for (std::size_t c = 0; c < tests.checks.size(); ++c) {
      if (m.mine[i]) checked[c] = tests.checks[c]->judge(i);
      findings.push_back(&checked[c]);
    }
    Verdict v = combine(findings, names, s.tests.combine == "mean" ? CombineRule::mean : CombineRule::max);
    if (const auto note = t.notes.find(i); note != t.notes.end())
      v.reasons.insert(v.reasons.end(), note->second.begin(), note->second.end());
    v.codes.erase(std::remove(v.codes.begin(), v.codes.end(), std::string()), v.codes.end());
    for (std::size_t k = 0; k < v.tests.size(); ++k) v.tests[k].extras.resize(extras[k].size(), std::nan(""));
    if (!m.decisions.of.empty() && m.decisions.of[i] != Decision::none)
      apply_decision(v, m.decisions.of[i], m.decisions.row.at(i)->note);
    if (v.score) j.scores[i] = score_as_written(*v.score);
    j.verdicts->put(i, v);
    return v;
  };

  PopulationGuard guard;
  guard.max_share = s.tests.max_flagged_share;
  std::mutex lock;
  std::vector<std::pair<std::size_t, std::string>> withheld;  // (taxon index, words)
  std::size_t eligible_taxa = 0;
  {
    std::vector<bool> seen(m.taxon_names.size());
    for (std::size_t i = 0; i < n; ++i)
      if (m.eligible[i] && !seen[m.taxon_of[i]]) seen[m.taxon_of[i]] = true, ++eligible_taxa;
  }
  if (s.progress) s.progress->stage("screening", eligible_taxa, "taxa");
  PopulationOptions populations;
  populations.enabled = s.tests.populations == "split";
  populations.min_rows = s.tests.min_records;
  std::vector<double> test_seconds;
  // The layers the tests judge: every one but a circular layer, whose sine and cosine stand for it.
  std::vector<Eigen::Index> judged;
  std::vector<std::string> layer_names;
  for (std::size_t l = 0; l < t.layers.size(); ++l)
    if (t.layers[l].judged) judged.push_back(static_cast<Eigen::Index>(l)), layer_names.push_back(t.layers[l].spec.name);
  const bool every_layer = judged.size() == t.layers.size();
  Eigen::MatrixXd lower, upper;  // copies only when some layer is left out
  if (!every_layer && t.has_discs) lower = t.discs.min(Eigen::all, judged), upper = t.discs.max(Eigen::all, judged);
  const Eigen::MatrixXd* judged_lower = !t.has_discs ? nullptr : every_layer ? &t.discs.min : &lower;
  const Eigen::MatrixXd* judged_upper = !t.has_discs ? nullptr : every_layer ? &t.discs.max : &upper;
  JudgingInput input{t.values, judged, t.cells, m.taxon_of, m.taxon_names, m.eligible, layer_names, judged_lower, judged_upper};
  if (!m.left_out.empty()) input.left_out = &m.left_out;
  std::unique_ptr<LandscapeSampler> sampler;
  double landscape_seconds = 0;
  if (t.stack) {  // layers, not value columns: the landscape test can be given its landscape
    LandscapeOptions o;
    o.area = s.tests.landscape_area;
    o.spread_factor = s.tests.landscape_spread;
    o.min_radius_km = s.tests.landscape_min_km;
    o.cells = s.tests.landscape_cells;
    o.seed = s.tests.seed;
    std::vector<std::size_t> judged_columns(judged.begin(), judged.end());
    const SamplingPlan plan = sampling_plan(s.sampling);
    sampler = std::make_unique<LandscapeSampler>(*t.stack, t.layers, judged_columns, plan.method, o);
    auto places_of = [&t, &m](const TaxonGroup& taxon) {
      TaxonPlaces places;
      places.taxon = taxon.taxon;
      std::unordered_set<std::uint64_t> seen;
      for (std::size_t i : taxon.records) {
        const auto& r = t.points.records[i];
        if (!std::isfinite(r.longitude) || !std::isfinite(r.latitude) || (!m.left_out.empty() && m.left_out[i]) ||
            !seen.insert(t.cells[i]).second)
          continue;
        places.longitude.push_back(r.longitude), places.latitude.push_back(r.latitude);
      }
      return places;
    };
    input.landscape = [&, places_of](const std::vector<const TaxonGroup*>& taxa) {
      const Stopwatch clock;
      std::vector<TaxonPlaces> places;
      for (const TaxonGroup* taxon : taxa) places.push_back(places_of(*taxon));
      auto drawn = sampler->sample(places);
      landscape_seconds += clock.seconds();
      return drawn;
    };
    input.landscape_batch = std::max<std::size_t>(1, plan.landscape_bytes / sampler->bytes_per_taxon());
    input.landscape_key = [places_of](const TaxonGroup& taxon) { return locality_key(places_of(taxon)); };
  }
  judge_taxa(
      input,
      tests.detectors, !s.tests.all_records, s.tests.seed,
      [&](const JudgedTaxon& taxon, std::vector<std::vector<Finding>>& findings) {
        std::vector<std::uint64_t> places;
        for (std::size_t i : taxon.records) places.push_back(t.cells[i]);
        for (std::size_t d = 0; d < tests.detectors.size(); ++d) {
          const GuardOutcome g = withhold_population_flags(findings[d], places, names[d], guard);
          if (!g.withheld) continue;
          std::lock_guard<std::mutex> hold(lock);
          withheld.emplace_back(taxon.index, withheld_words(taxon.taxon, names[d], g));
        }
        std::vector<Verdict> verdicts;
        for (std::size_t r = 0; r < taxon.records.size(); ++r) {
          std::vector<const Finding*> per_test;
          for (const auto& f : findings) per_test.push_back(&f[r]);
          verdicts.push_back(judge_record(taxon.records[r], per_test));
        }
        for (RecordSink* out : outputs) out->taxon(taxon, verdicts);
        if (s.progress) s.progress->advance(1);
      },
      &test_seconds, populations);
  for (std::size_t d = 0; d < tests.detectors.size(); ++d)
    j.test_seconds.emplace_back("test " + names[d] + " (CPU)", test_seconds[d]);
  if (sampler) j.test_seconds.emplace_back("landscape draws", landscape_seconds);
  // Records outside every taxon: only the record checks can judge them.
  const std::vector<Finding> none(tests.detectors.size());
  std::vector<const Finding*> no_findings;
  for (const auto& f : none) no_findings.push_back(&f);
  for (std::size_t i = 0; i < n; ++i)
    if (!j.verdicts->has(i)) judge_record(i, no_findings);
  std::sort(withheld.begin(), withheld.end());  // by taxon, whatever the threads
  for (auto& w : withheld) j.warnings.push_back(std::move(w.second));
  return j;
}

}  // namespace envsift::run
