#include "envsift/evaluate/evaluation.hpp"

#include <cmath>
#include <cstdio>
#include <cstdlib>
#include <filesystem>
#include <fstream>
#include <algorithm>
#include <set>

#include "envsift/table/circular_layers.hpp"
#include "envsift/errors.hpp"
#include "envsift/evaluate/evaluation_slices.hpp"
#include "envsift/evaluate/injected_errors.hpp"
#include "envsift/run/run.hpp"
#include "envsift/settings/run_options.hpp"
#include "envsift/sample/raster_stack.hpp"
#include "envsift/write/csv_writer.hpp"
#include "envsift/write/value_format.hpp"

namespace envsift {
namespace {

// A private directory for the evaluation's points and screen output, removed afterwards.
struct ScratchDirectory {
  std::string path;
  ScratchDirectory() {
    std::string pattern = (std::filesystem::temp_directory_path() / "envsift-evaluate-XXXXXX").string();
    if (!mkdtemp(pattern.data())) throw OutputError(pattern, "cannot create a temporary directory; check $TMPDIR");
    path = pattern;
  }
  ~ScratchDirectory() {
    std::error_code ignored;
    std::filesystem::remove_all(path, ignored);
  }
};

// The screen's verdicts on the virtual records, judged as a reader of the output would: each test
// by its statistic and cutoff as written (a withheld flag still ranks by its statistic), the combined
// verdict by the score as written.
class VerdictTally : public RecordSink {
 public:
  VerdictTally(std::vector<JudgedRecord> truth, std::vector<std::string> tests)
      : truth_(std::move(truth)), tests_(std::move(tests)), judged_(tests_.size() + 1) {}
  std::string name() const override { return "evaluation"; }
  void begin(const RunContext& run) override {
    const auto names = run.tests->names();
    for (const auto& t : tests_) column_.push_back(static_cast<std::size_t>(std::find(names.begin(), names.end(), t) - names.begin()));
  }
  void record(const RecordOutcome& o) override {
    const Verdict& v = *o.verdict;
    const JudgedRecord& base = truth_.at(o.record);
    for (std::size_t t = 0; t < tests_.size(); ++t) {
      const TestResult& r = v.tests[column_[t]];
      JudgedRecord j = base;
      j.scored = r.tested && !std::isnan(r.statistic);  // as an empty statistic column reads
      j.flagged = std::find(v.flags.begin(), v.flags.end(), tests_[t]) != v.flags.end();
      if (j.scored) j.score = statistic_as_written(r.statistic) / statistic_as_written(r.threshold);
      judged_[t].push_back(j);
    }
    JudgedRecord all = base;
    all.scored = v.score.has_value();
    all.flagged = !v.flags.empty();
    all.score = all.scored ? score_as_written(*v.score) : 0;
    judged_.back().push_back(all);
  }
  void finish(const RunSummary&) override {}
  void commit() override {}
  const std::vector<JudgedRecord>& judged(std::size_t test) const { return judged_[test]; }

 private:
  std::vector<JudgedRecord> truth_;
  std::vector<std::string> tests_;
  std::vector<std::size_t> column_;
  std::vector<std::vector<JudgedRecord>> judged_;
};

std::string ratio_text(double v) {
  char buf[32];
  std::snprintf(buf, sizeof buf, "%.4f", v);
  return buf;
}

}  // namespace

Evaluation run_evaluation(const EvaluateOptions& o) {
  validate(o);
  std::vector<std::string> layer_names;
  for (const auto& spec : expand_layer_arguments(o.screen.input.layers)) layer_names.push_back(spec.name);
  refuse_circular_layers(layer_names);
  const StudyArea area = study_area(o.screen.input.layers, o.study_cells, o.taxa.seed, o.screen.input.assume_crs);
  const auto taxa = make_virtual_taxa(area, o.taxa);
  std::vector<VirtualRecord> records;
  std::vector<const VirtualTaxon*> taxon_of;
  std::vector<RecordTruth> truth_of;
  for (std::size_t t = 0; t < taxa.size(); ++t) {
    std::vector<VirtualRecord> mine;
    for (std::size_t cell : taxa[t].cells) {
      char id[32];
      std::snprintf(id, sizeof id, "V%07zu", records.size() + mine.size() + 1);
      mine.push_back({id, taxa[t].name, area.longitude[cell], area.latitude[cell], ""});
    }
    SeededRandom random(o.taxa.seed * 0xd1b54a32d192ed03ull + t + 7);
    inject_errors(mine, area, o.error_share, random);
    SeededRandom batch_random(o.taxa.seed * 0x8cb92ba72f3d8dd7ull + t + 11);  // its own stream: single errors stay as they were
    if (batch_random.uniform() < o.batch_taxa_share) {
      const double share = batch_random.uniform(o.batch_share_low, o.batch_share_high);
      const std::size_t places = o.batch_places_low + batch_random.below(o.batch_places_high - o.batch_places_low + 1);
      inject_batch(mine, area, share, places, batch_random);
    }
    std::set<std::pair<double, double>> places;
    for (const auto& r : mine) places.emplace(r.longitude, r.latitude);
    for (std::size_t k = 0; k < mine.size(); ++k)
      truth_of.push_back({mine[k].error, mine[k].error.empty() && taxa[t].population[k] == 1, places.size()});
    for (auto& r : mine) records.push_back(std::move(r)), taxon_of.push_back(&taxa[t]);
  }

  // The suitability where each record now lies (the layers sampled as the screen will sample them).
  std::vector<double> suitability(records.size());
  {
    RasterStack stack(expand_layer_arguments(o.screen.input.layers), std::size_t(256) << 20, o.screen.input.assume_crs);
    std::vector<double> lon, lat;
    for (const auto& r : records) {
      const bool valid = std::fabs(r.latitude) <= 90 && std::fabs(r.longitude) <= 180;
      lon.push_back(valid ? r.longitude : std::nan("")), lat.push_back(valid ? r.latitude : std::nan(""));
    }
    const Samples s = stack.sample(lon, lat, sampling_plan(o.screen.sampling).method);
    for (std::size_t i = 0; i < records.size(); ++i)
      suitability[i] = taxon_of[i]->suitability(s.values.row(static_cast<Eigen::Index>(i)).transpose());
  }
  ScratchDirectory scratch;
  ScreenSettings screen = o.screen;
  screen.input.points = scratch.path + "/virtual.csv";
  screen.outputs.out = o.keep_screened;  // empty: only the tally below
  screen.outputs.order = RowOrder::input;
  {
    std::ofstream points(screen.input.points, std::ios::binary);
    points << "occurrenceID,scientificName,decimalLongitude,decimalLatitude,virtual_error,virtual_suitability\n";
    for (std::size_t i = 0; i < records.size(); ++i) {
      const VirtualRecord& r = records[i];
      points << r.id << "," << r.taxon << "," << format_value(r.longitude) << "," << format_value(r.latitude) << "," << r.error << ","
             << format_value(suitability[i]) << "\n";
    }
    if (!points) throw OutputError(screen.input.points, "cannot write the virtual records; check free space in $TMPDIR");
  }
  Evaluation e;
  e.taxa = taxa.size();
  e.records = records.size();
  std::vector<JudgedRecord> truth(records.size());
  for (std::size_t i = 0; i < records.size(); ++i) {
    truth[i].error = !records[i].error.empty();
    truth[i].unsuitable = truth[i].error && suitability[i] < o.unsuitable_below;
    if (truth[i].error) ++e.errors, e.errors_off_layers += std::isnan(suitability[i]), e.batch_errors += records[i].error == "batch";
  }
  VerdictTally tally(truth, screen.tests.tests);
  e.screen = run_screen(screen, {&tally});
  auto names = screen.tests.tests;
  names.push_back("combined");
  for (std::size_t t = 0; t < names.size(); ++t)
    for (const auto& slice : evaluation_slices())
      e.rows.push_back({names[t], slice.name, measure_slice(slice, truth_of, tally.judged(t))});
  return e;
}

void validate(const EvaluateOptions& e) {
  const VirtualTaxaOptions& t = e.taxa;
  if (t.min_records < 3 || t.max_records < t.min_records)
    throw UsageError("--taxon-records must be MIN-MAX with 3 <= MIN <= MAX, e.g. 12-3000, not " +
                     std::to_string(t.min_records) + "-" + std::to_string(t.max_records));
  if (!(t.width_low > 0) || !(t.width_high >= t.width_low))
    throw UsageError("--response-width must be LOW-HIGH with 0 < LOW <= HIGH, e.g. 0.1-0.4");
  if (t.taxa < 1) throw UsageError("--taxa must be at least 1");
  if (!(e.error_share > 0 && e.error_share < 0.5)) throw UsageError("--error-share must be above 0 and below 0.5");
  if (!(t.two_population_share >= 0 && t.two_population_share <= 1))
    throw UsageError("--two-population-share must be between 0 and 1");
  if (!(e.unsuitable_below > 0 && e.unsuitable_below < 1)) throw UsageError("--unsuitable-below must be between 0 and 1");
  if (e.study_cells < 100) throw UsageError("--study-cells must be at least 100");
  if (!(e.batch_taxa_share >= 0 && e.batch_taxa_share <= 1)) throw UsageError("--batch-taxa-share must be between 0 and 1");
  if (!(e.batch_share_low > 0 && e.batch_share_high >= e.batch_share_low && e.batch_share_high <= 0.5))
    throw UsageError("--batch-share must be LOW-HIGH with 0 < LOW <= HIGH <= 0.5, e.g. 0.12-0.25");
  if (e.batch_places_low < 1 || e.batch_places_high < e.batch_places_low)
    throw UsageError("--batch-places must be MIN-MAX with 1 <= MIN <= MAX, e.g. 1-3");
}

void write_evaluation(const std::string& path, const Evaluation& e) {
  CsvWriter out(path);
  out.row({"test", "slice", "errors", "errors_unsuitable", "clean", "flagged_errors", "flagged_unsuitable", "flagged_clean",
           "recall_unsuitable", "recall_all", "false_flag_rate", "precision", "average_precision"});
  for (const auto& r : e.rows) {
    const DetectionMetrics& m = r.metrics;
    out.row({r.test, r.slice, std::to_string(m.errors), std::to_string(m.errors_unsuitable), std::to_string(m.clean),
             std::to_string(m.flagged_errors), std::to_string(m.flagged_unsuitable), std::to_string(m.flagged_clean),
             ratio_text(m.recall_unsuitable), ratio_text(m.recall_all), ratio_text(m.false_flag_rate),
             ratio_text(m.precision), ratio_text(m.average_precision)});
  }
  out.commit();
}

}  // namespace envsift
