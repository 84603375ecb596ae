// The HTML report as an output (--report): every judged taxon is listed, and the --report-taxa
// taxa whose worst suspect scores highest are kept (their records, reference rows and verdicts)
// to be drawn when the report is finished — pictures (values, the one-layer tests' cutoffs, the
// robust ellipse, the map) cost time, so only the sections written are drawn, and their time is
// the report's. The top suspects are taken as the records are written (write/report/html_report.hpp).
#include <algorithm>
#include <cmath>
#include <exception>
#include <iterator>
#include <map>
#include <mutex>

#include "envsift/detect/range_check.hpp"
#include "envsift/detect/test_registry.hpp"
#include "envsift/read/range_layer.hpp"
#include "envsift/write/output_registry.hpp"
#include "envsift/write/report/html_report.hpp"
#include "envsift/write/run_manifest.hpp"
#include "envsift/write/value_format.hpp"

namespace envsift {
namespace {

constexpr std::size_t kTopSuspects = 100;

ReliefSource relief_of(const RunContext& run) {
  const std::string dem = run.test_settings ? elevation_layer(*run.test_settings) : "";
  if (dem.empty() || run.table.layers_are_columns) return {};
  if (const auto l = run.table.layer_index(dem)) return {run.table.layers[*l].spec.path, run.table.layers[*l].spec.band};
  return {};
}

std::string joined(const std::vector<std::string>& parts, const char* separator) {
  std::string s;
  for (const auto& p : parts) s += (s.empty() ? "" : separator) + p;
  return s;
}

// A withheld flag is shown as such, so the group a taxon-level warning withheld is seen together.
std::string flags_text(const Verdict& v) {
  std::string s = joined(v.flags, ";");
  for (const auto& w : v.withheld()) s += (s.empty() ? "" : ";") + ("withheld " + w);
  return s;
}
std::string reasons_text(const Verdict& v) {
  std::string s = joined(v.reasons, "; ");
  const auto withheld = v.withheld();
  if (!withheld.empty())
    s += (s.empty() ? "" : "; ") + ("beyond the cutoff of " + joined(withheld, ", ") +
                                   ", whose flags were withheld for this taxon (looks_multimodal)");
  return s;
}

class ReportOutput : public RecordSink {
 public:
  explicit ReportOutput(std::string path) : path_(std::move(path)) {}
  std::string name() const override { return "report"; }

  void begin(const RunContext& run) override {
    run_ = &run;
    const TestSettings& s = *run.test_settings;
    report_ = std::make_unique<HtmlReport>(path_, relief_of(run), s.seed, s.min_records);
    const auto& columns = run.table.points.columns;
    if (const auto it = std::find(columns.begin(), columns.end(), run.inputs.id_column); it != columns.end())
      id_column_ = static_cast<std::size_t>(it - columns.begin());
  }

  void taxon(const JudgedTaxon& taxon, const std::vector<Verdict>& verdicts) override {
    TaxonListing listing{taxon.taxon, taxon.records.size(), judged(verdicts), 0, 0};
    double worst = 0;
    for (const auto& v : verdicts) {
      if (v.for_review()) ++listing.suspects, worst = std::max(worst, v.score.value_or(0));
      listing.decided += v.decision != Decision::none;
    }
    report_->list_taxon(taxon.index, listing);
    std::lock_guard<std::mutex> guard(lock_);
    taxon_index_[taxon.taxon] = taxon.index;
    // keep the report-taxa worst: highest worst score first, ties by index (the same set in any thread order)
    const Key key{-worst, taxon.index};
    if (kept_.size() == run_->outputs.report_taxa && (kept_.empty() || !(key < kept_.rbegin()->first))) return;
    kept_.emplace(key, Kept{taxon, verdicts, listing.judged});
    if (kept_.size() > run_->outputs.report_taxa) kept_.erase(std::prev(kept_.end()));
  }

  void record(const RecordOutcome& o) override {
    keep_if_off_every_layer(o);
    if (o.rank == 0 || o.rank > kTopSuspects || !o.verdict->for_review()) return;
    const Verdict& v = *o.verdict;
    ReportSuspect s{o.rank, label(o.record, o.fields), taxon_name(o.record), format_score(*v.score), flags_text(v),
                    reasons_text(v)};
    if (const auto it = taxon_index_.find(s.taxon); it != taxon_index_.end()) s.taxon_index = it->second;
    top_.push_back(std::move(s));
  }

  void finish(const RunSummary& summary) override {
    const RunInputs& in = run_->inputs;
    const TestSettings& s = *run_->test_settings;
    ReportOverview v;
    v.title = "envsift screening report: " + in.points;
    v.inputs.emplace_back("points", in.points);
    if (!run_->table.layers_are_columns)
      for (const auto& l : run_->table.layers)
        v.inputs.emplace_back("layer " + l.spec.name, l.spec.path + (l.spec.band > 1 ? " (band " + std::to_string(l.spec.band) + ")" : ""));
    else
      for (const auto& c : in.value_columns) v.inputs.emplace_back("value column", c);
    if (!in.decisions.empty()) v.inputs.emplace_back("decisions from earlier rounds", in.decisions);
    v.inputs.emplace_back("output", run_->outputs.out);
    v.inputs.emplace_back("statistics from", s.all_records ? "every record of each taxon"
                                                                  : "one row per distinct raster cell of each taxon");
    v.inputs.emplace_back("minimum records per test", std::to_string(s.min_records));
    for (const auto* entry : run_->tests->entries) v.tests.push_back(entry->describe(s));
    v.read = summary.read;
    v.scored = summary.scored;
    v.flagged = summary.flagged;
    v.with_decisions = !in.decisions.empty();
    v.decided = summary.decided;
    v.not_scored = summary.not_scored;
    v.codes = summary.codes;
    v.warnings = summary.warnings;
    std::sort(top_.begin(), top_.end(), [](const ReportSuspect& a, const ReportSuspect& b) { return a.rank < b.rank; });
    v.top = top_;
    v.manifest_json = manifest_json(make_manifest(*run_, summary));
    draw_kept();
    report_->finish(v);
  }
  void commit() override { report_->commit(); }

 private:
  static std::size_t judged(const std::vector<Verdict>& verdicts) {
    return static_cast<std::size_t>(std::count_if(verdicts.begin(), verdicts.end(), [](const Verdict& v) { return v.score.has_value(); }));
  }
  std::string taxon_name(std::size_t i) const {
    return run_->inputs.single_taxon ? "*" : run_->table.points.taxon(i);
  }
  // Its ID, or "line N".
  std::string label(std::size_t i, const std::vector<std::string>* fields = nullptr) const {
    if (id_column_) {
      std::string id;
      if (fields) id = fields->at(*id_column_);
      else {
        std::lock_guard<std::mutex> guard(fields_lock_);  // FieldStore reads are not thread-safe
        id = run_->table.points.fields.read(i).at(*id_column_);
      }
      if (!id.empty()) return id;
    }
    return "line " + std::to_string(run_->table.points.records[i].line);
  }
  TaxonPicture picture(const JudgedTaxon& taxon, const std::vector<Verdict>& verdicts) const;
  void draw_kept();
  // A suspect (or decided record) with no value on any layer is in no taxon's statistics, but a
  // check of its coordinates alone (the range) may judge it: it is kept for its taxon's map.
  void keep_if_off_every_layer(const RecordOutcome& o) {
    const Verdict& v = *o.verdict;
    if (!v.for_review() && v.decision == Decision::none) return;
    const RecordTable& t = run_->table;
    const auto row = static_cast<Eigen::Index>(o.record);
    for (Eigen::Index l = 0; l < static_cast<Eigen::Index>(t.layers.size()); ++l)
      if (std::isfinite(t.values(row, l))) return;
    PlotRecord r;
    r.suspect = v.for_review();
    r.decision = v.decision;
    r.note = v.decision_note;
    r.label = label(o.record, o.fields);
    r.longitude = t.points.records[o.record].longitude;
    r.latitude = t.points.records[o.record].latitude;
    r.score = v.score.value_or(0);
    r.reasons = v.set_aside.empty() ? reasons_text(v) : "set aside: " + v.set_aside;
    r.value.assign(t.layers.size(), NAN), r.low = r.value, r.high = r.value;
    off_layers_[taxon_name(o.record)].push_back(std::move(r));
  }
  std::map<std::string, std::vector<PlotRecord>> off_layers_;  // taxon → its marked records off every layer

  using Key = std::pair<double, std::size_t>;  // (−worst score, taxon index)
  struct Kept {
    JudgedTaxon taxon;
    std::vector<Verdict> verdicts;
    std::size_t judged = 0;
  };
  std::map<Key, Kept> kept_;
  std::string path_;
  const RunContext* run_ = nullptr;
  std::unique_ptr<HtmlReport> report_;
  std::optional<std::size_t> id_column_;
  mutable std::mutex fields_lock_;
  std::mutex lock_;
  std::map<std::string, std::size_t> taxon_index_;
  std::vector<ReportSuspect> top_;
};

// The kept taxa's sections, drawn in parallel and added in index order.
void ReportOutput::draw_kept() {
  std::vector<const Kept*> taxa;
  for (const auto& [key, kept] : kept_) taxa.push_back(&kept);
  std::sort(taxa.begin(), taxa.end(), [](const Kept* a, const Kept* b) { return a->taxon.index < b->taxon.index; });
  std::vector<std::string> sections(taxa.size());
  std::vector<std::exception_ptr> errors(taxa.size());
  const RangeSource ranges = run_->test_settings->own.get<RangeSettings>().source();
#pragma omp parallel
  {
    std::unique_ptr<RangeLayer> layer;  // GDAL handles are per thread
#pragma omp for schedule(dynamic, 1)
    for (std::ptrdiff_t k = 0; k < static_cast<std::ptrdiff_t>(taxa.size()); ++k) {
      const Kept& t = *taxa[static_cast<std::size_t>(k)];
      try {
        TaxonPicture p = picture(t.taxon, t.verdicts);
        if (!ranges.path.empty()) {
          if (!layer) layer = std::make_unique<RangeLayer>(ranges);
          const auto box = map_box(p);
          if (const auto range = layer->load(t.taxon.taxon); range && box) p.range = rings_for_map(range->rings(), *box);
        }
        sections[static_cast<std::size_t>(k)] = report_->section(t.taxon.index, p, t.judged);
      } catch (...) {
        errors[static_cast<std::size_t>(k)] = std::current_exception();
      }
    }
  }
  for (std::size_t k = 0; k < taxa.size(); ++k) {
    if (errors[k]) std::rethrow_exception(errors[k]);  // the first taxon's: the same for any thread count
    report_->add_section(taxa[k]->taxon.index, sections[k]);
  }
}

TaxonPicture ReportOutput::picture(const JudgedTaxon& taxon, const std::vector<Verdict>& verdicts) const {
  const RecordTable& t = run_->table;
  const std::size_t layers = t.layers.size();
  TaxonPicture p;
  p.taxon = taxon.taxon;
  p.reference_label = run_->test_settings->all_records ? "records" : "distinct cells";
  p.two_populations = taxon.two_populations;
  p.reference.resize(static_cast<Eigen::Index>(taxon.reference.size()), static_cast<Eigen::Index>(layers));
  for (std::size_t r = 0; r < taxon.reference.size(); ++r)
    p.reference.row(static_cast<Eigen::Index>(r)) = t.values.row(static_cast<Eigen::Index>(taxon.reference[r]));
  for (std::size_t l = 0; l < layers; ++l) {
    PlotLayer layer{t.layers[l].spec.name, t.layers[l].unit, {}};
    std::vector<double> column(p.reference.col(static_cast<Eigen::Index>(l)).data(),
                               p.reference.col(static_cast<Eigen::Index>(l)).data() + p.reference.rows());
    const auto& entries = run_->tests->entries;
    for (std::size_t d = 0; d < run_->tests->detectors.size() && t.layers[l].judged; ++d) {
      const Detector* test = run_->tests->detectors[d].get();
      if (!entries[d]->cutoffs) continue;
      if (const auto range = test->accepted_range(column, layer.name))
        layer.cutoffs.push_back({entries[d]->cutoffs->label, entries[d]->cutoffs->slot, range->first, range->second,
                                 test->flags_its_bounds(), entries[d]->cutoffs->words});
    }
    p.layers.push_back(std::move(layer));
  }
  for (std::size_t k = 0; k < taxon.records.size(); ++k) {
    const std::size_t i = taxon.records[k];
    const Verdict& v = verdicts[k];
    PlotRecord r;
    r.suspect = v.for_review();
    r.decision = v.decision;
    r.note = v.decision_note;
    r.label = r.marked() ? label(i) : std::string();
    r.longitude = t.points.records[i].longitude;
    r.latitude = t.points.records[i].latitude;
    r.score = v.score.value_or(0);
    r.reasons = v.set_aside.empty() ? reasons_text(v) : "set aside: " + v.set_aside;
    for (const auto& w : v.withheld())
      if (std::find(p.withheld_tests.begin(), p.withheld_tests.end(), w) == p.withheld_tests.end()) p.withheld_tests.push_back(w);
    for (std::size_t l = 0; l < layers; ++l) {
      const auto [low, high] = t.range(i, l);
      r.value.push_back(t.values(static_cast<Eigen::Index>(i), static_cast<Eigen::Index>(l)));
      r.low.push_back(low);
      r.high.push_back(high);
    }
    p.records.push_back(std::move(r));
  }
  if (const auto off = off_layers_.find(taxon.taxon); off != off_layers_.end())
    p.records.insert(p.records.end(), off->second.begin(), off->second.end());
  // open suspects first, then decided records, worst first, so that the labelled ones are the worst
  auto order = [](const PlotRecord& r) { return r.suspect ? 0 : r.marked() ? 1 : 2; };
  std::stable_sort(p.records.begin(), p.records.end(), [&](const PlotRecord& a, const PlotRecord& b) {
    return order(a) != order(b) ? order(a) < order(b) : order(a) < 2 && a.score > b.score;
  });
  return p;
}

}  // namespace

std::unique_ptr<RecordSink> make_report_output(const std::string& path) {
  return std::make_unique<ReportOutput>(path);
}

}  // namespace envsift
