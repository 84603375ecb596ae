// One row per taxon (--summary): records, judged, flagged per test, and with --dem the taxon's
// robust elevation band, with --decisions the records decided per decision (write/taxon_summary.hpp).
#include <map>
#include <mutex>

#include "envsift/detect/reported_elevation.hpp"
#include "envsift/write/csv_writer.hpp"
#include "envsift/write/output_registry.hpp"
#include "envsift/write/taxon_summary.hpp"

namespace envsift {
namespace {

class SummaryOutput : public RecordSink {
 public:
  explicit SummaryOutput(const std::string& path) : out_(path) {}
  std::string name() const override { return "summary"; }
  void begin(const RunContext& run) override {
    names_ = run.tests ? run.tests->names() : std::vector<std::string>{};
    const auto& dem_layer = run.settings.elevation.dem_layer;
    const auto dem = dem_layer.empty() ? std::nullopt : run.table.layer_index(dem_layer);
    if (dem) {
      for (std::size_t i = 0; i < run.table.size(); ++i) {
        const DemRange r = dem_range(run.table, i, *dem);
        low_.push_back(r.low), high_.push_back(r.high);
        point_.push_back(run.table.values(static_cast<Eigen::Index>(i), static_cast<Eigen::Index>(*dem)));
      }
      band_ = ElevationBand{&low_, &high_, &point_, run.settings.tests.z_cutoff};
    }
    decisions_ = !run.settings.review.decisions.empty();
    out_.row(taxon_summary_header(names_, band_.has_value(), decisions_));
    const auto& p = run.table.points;
    for (std::size_t k = 0; k < p.taxa.size() && k < p.similar_names.size(); ++k)
      if (!p.similar_names[k].empty()) similar_[p.taxa[k]] = p.similar_names[k];
  }
  void taxon(const JudgedTaxon& taxon, const std::vector<Verdict>& verdicts) override {
    const auto similar = similar_.find(taxon.taxon);
    auto row = taxon_summary_row(taxon, verdicts, names_, band_ ? &*band_ : nullptr,
                                 similar == similar_.end() ? std::string() : similar->second, decisions_);
    std::lock_guard<std::mutex> guard(lock_);
    rows_[taxon.index] = std::move(row);
  }
  void record(const RecordOutcome&) override {}
  void finish(const RunSummary&) override {
    for (const auto& [index, row] : rows_) out_.row(row);  // taxa in name order
    out_.finish();
  }
  void commit() override { out_.commit(); }

 private:
  CsvWriter out_;
  std::vector<std::string> names_;
  std::vector<double> low_, high_, point_;
  std::optional<ElevationBand> band_;
  bool decisions_ = false;
  std::mutex lock_;
  std::map<std::size_t, std::vector<std::string>> rows_;
  std::map<std::string, std::string> similar_;  // taxon → names that look like it
};

}  // namespace

std::unique_ptr<RecordSink> make_summary_output(const std::string& path, const ScreenSettings&) {
  return std::make_unique<SummaryOutput>(path);
}

}  // namespace envsift
