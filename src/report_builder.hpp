// Private to the pipeline: feeds the HTML report (write/report/html_report.hpp) from what the
// screening has in hand — each taxon's values, reference rows, verdicts and the one-layer tests'
// cutoffs — and collects the top suspects while the output is written.
#pragma once
#include <memory>
#include <mutex>
#include <string>
#include <vector>

#include "envsift/detect/detector.hpp"
#include "envsift/pipeline.hpp"
#include "envsift/score/scoring.hpp"
#include "envsift/score/screen_taxa.hpp"
#include "envsift/write/report/html_report.hpp"
#include "gather_values.hpp"

namespace envsift::detail {

class ReportBuilder {
 public:
  static constexpr std::size_t kTopSuspects = 100;

  ReportBuilder(const ScreenOptions& options, const Gathered& gathered,
                const std::vector<std::unique_ptr<Detector>>& detectors);

  // Thread-safe; called once per screened taxon.
  void taxon(const ScreenedTaxon& taxon, const std::vector<Verdict>& verdicts);
  // Called for every record as it is written (single thread), with its rank (0 = none).
  void written(std::size_t record, std::size_t rank, const std::string& score, const std::string& flags,
               const std::string& reasons);
  void finish(const RunSummary& summary);

 private:
  std::string label(std::size_t record) const;  // its ID, or "line N"

  const ScreenOptions& o_;
  const Gathered& g_;
  const std::vector<std::unique_ptr<Detector>>& detectors_;
  std::vector<std::string> units_;
  std::optional<std::size_t> id_column_;
  mutable std::mutex fields_lock_;  // FieldStore reads are not thread-safe
  std::mutex taxa_lock_;
  std::map<std::string, std::size_t> taxon_index_;
  std::vector<ReportSuspect> top_;
  HtmlReport report_;
};

}  // namespace envsift::detail
