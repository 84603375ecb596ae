// The run manifest (--manifest FILE.json): what a later reader needs to know and repeat the run.
#include "envsift/write/atomic_file.hpp"
#include "envsift/write/output_registry.hpp"
#include "envsift/write/run_manifest.hpp"

namespace envsift {
namespace {

class ManifestOutput : public RecordSink {
 public:
  explicit ManifestOutput(const std::string& path) : out_(path) {}
  std::string name() const override { return "manifest"; }
  void begin(const RunContext& run) override { run_ = &run; }
  void record(const RecordOutcome&) override {}
  void finish(const RunSummary& summary) override {
    out_.write(manifest_json(make_manifest(*run_, summary)));
    out_.finish();
  }
  void commit() override { out_.commit(); }

 private:
  AtomicFile out_;
  const RunContext* run_ = nullptr;
};

}  // namespace

std::unique_ptr<RecordSink> make_manifest_output(const std::string& path) {
  return std::make_unique<ManifestOutput>(path);
}

}  // namespace envsift
