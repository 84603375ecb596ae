// Every record as a point with all its attributes (--gis), for a desktop GIS.
#include "envsift/write/gis_writer.hpp"
#include "envsift/write/output_registry.hpp"

namespace envsift {
namespace {

class GisOutput : public RecordSink {
 public:
  explicit GisOutput(std::string path) : path_(std::move(path)) {}
  std::string name() const override { return "gis"; }
  void begin(const RunContext& run) override {
    table_ = &run.table;
    // originals and words are text; sampled values and statistics are numbers; rank an integer
    std::vector<FieldKind> kinds(run.header.size(), FieldKind::real);
    for (std::size_t c = 0; c < run.table.points.columns.size(); ++c) kinds[c] = FieldKind::text;
    const std::string& p = run.outputs.column_prefix;
    for (std::size_t c = run.table.points.columns.size(); c < run.header.size(); ++c) {
      if (run.header[c] == p + "status" || run.header[c] == p + "flags" || run.header[c] == p + "reasons") kinds[c] = FieldKind::text;
      if (run.header[c] == p + "rank") kinds[c] = FieldKind::integer;
    }
    out_ = std::make_unique<GisWriter>(path_, run.header, kinds);
  }
  bool wants_row() const override { return true; }
  void record(const RecordOutcome& o) override {
    const auto& r = table_->points.records[o.record];
    out_->add(*o.row, r.longitude, r.latitude, table_->has_discs ? table_->radius_m[o.record] : 0.0);
  }
  void finish(const RunSummary&) override { out_->finish(); }
  void commit() override { out_->commit(); }

 private:
  std::string path_;
  std::unique_ptr<GisWriter> out_;
  const RecordTable* table_ = nullptr;
};

}  // namespace

std::unique_ptr<RecordSink> make_gis_output(const std::string& path) {
  return std::make_unique<GisOutput>(path);
}

}  // namespace envsift
