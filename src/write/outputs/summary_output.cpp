// One row per taxon (--summary): records, judged, flagged per test, and with --dem the taxon's
// robust elevation band, with --decisions the records decided per decision (write/taxon_summary.hpp).
#include <algorithm>
#include <map>
#include <mutex>

#include "envsift/detect/reported_elevation.hpp"
#include "envsift/detect/robust_z.hpp"
#include "envsift/detect/test_registry.hpp"
#include "envsift/write/csv_writer.hpp"
#include "envsift/write/output_registry.hpp"
#include "envsift/write/taxon_summary.hpp"

namespace envsift {
namespace {

class SummaryOutput : public RecordSink {
 public:
  explicit SummaryOutput(const std::string& path) : out_(path, CellStyle::spreadsheet_safe) {}
  std::string name() const override { return "summary"; }
  void begin(const RunContext& run) override {
    names_ = run.tests ? run.tests->names() : std::vector<std::string>{};
    const std::string dem_layer = run.test_settings ? elevation_layer(*run.test_settings) : "";
    const auto dem = dem_layer.empty() ? std::nullopt : run.table.layer_index(dem_layer);
    if (dem) {
      for (std::size_t i = 0; i < run.table.size(); ++i) {
        const DemRange r = dem_range(run.table, i, *dem);
        low_.push_back(r.low), high_.push_back(r.high);
        point_.push_back(run.table.values(static_cast<Eigen::Index>(i), static_cast<Eigen::Index>(*dem)));
      }
      band_ = ElevationBand{&low_, &high_, &point_, run.test_settings->own.get<RobustZSettings>().z_cutoff};
    }
    decisions_ = !run.inputs.decisions.empty();
    const auto header = taxon_summary_header(names_, band_.has_value(), decisions_);
    out_.row(header);
    table_ = &run.table;
    for (const auto& name : names_)
      flag_columns_.emplace_back(name, std::find(header.begin(), header.end(), "flagged_" + name) - header.begin());
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
  // Flags are counted over every record of the taxon, not only those its taxon tests judged: a
  // record check (the range) also judges records off every layer or on nodata.
  void record(const RecordOutcome& o) override {
    if (!o.verdict || !o.verdict->open() || o.verdict->flags.empty()) return;
    std::vector<std::size_t>& n = flagged_[table_->points.records[o.record].taxon];
    n.resize(flag_columns_.size() + 1, 0);
    ++n[0];
    for (std::size_t c = 0; c < flag_columns_.size(); ++c)
      n[c + 1] += std::find(o.verdict->flags.begin(), o.verdict->flags.end(), flag_columns_[c].first) != o.verdict->flags.end();
  }
  void finish(const RunSummary&) override {
    for (auto& [index, row] : rows_) {  // taxa in name order
      const auto& taxa = table_->points.taxa;
      const auto it = flagged_.find(static_cast<std::uint32_t>(std::find(taxa.begin(), taxa.end(), row[0]) - taxa.begin()));
      const std::vector<std::size_t> none(flag_columns_.size() + 1, 0);
      const auto& n = it == flagged_.end() ? none : it->second;
      row[kFlaggedColumn] = std::to_string(n[0]);
      for (std::size_t c = 0; c < flag_columns_.size(); ++c)
        row[static_cast<std::size_t>(flag_columns_[c].second)] = std::to_string(n[c + 1]);
      out_.row(row);
    }
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
  static constexpr std::size_t kFlaggedColumn = 4;  // taxon_summary_header: taxon, records, reference_cells, scored, flagged
  const RecordTable* table_ = nullptr;
  std::vector<std::pair<std::string, std::ptrdiff_t>> flag_columns_;  // (test, its flagged_ column)
  std::map<std::uint32_t, std::vector<std::size_t>> flagged_;  // taxon → open records flagged: in all, per test
};

}  // namespace

std::unique_ptr<RecordSink> make_summary_output(const std::string& path) {
  return std::make_unique<SummaryOutput>(path);
}

}  // namespace envsift
