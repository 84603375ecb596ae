// The record table as CSV (--out): every input record once, its original fields untouched.
#include "envsift/write/csv_writer.hpp"
#include "envsift/write/output_registry.hpp"

namespace envsift {
namespace {

class CsvOutput : public RecordSink {
 public:
  explicit CsvOutput(const std::string& path) : out_(path) {}
  std::string name() const override { return "csv"; }
  void begin(const RunContext& run) override { out_.row(run.header); }
  bool wants_csv_line() const override { return true; }
  void record(const RecordOutcome& o) override { out_.lines(*o.csv_line); }
  void finish(const RunSummary&) override { out_.finish(); }
  void commit() override { out_.commit(); }

 private:
  CsvWriter out_;
};

}  // namespace

std::unique_ptr<RecordSink> make_csv_output(const std::string& path) {
  return std::make_unique<CsvOutput>(path);
}

}  // namespace envsift
