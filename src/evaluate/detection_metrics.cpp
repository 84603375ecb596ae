#include "envsift/evaluate/detection_metrics.hpp"

#include <algorithm>
#include <numeric>

namespace envsift {
namespace {
double ratio(std::size_t a, std::size_t b) { return b ? static_cast<double>(a) / static_cast<double>(b) : 0.0; }
}  // namespace

DetectionMetrics measure_detection(const std::vector<JudgedRecord>& records) {
  DetectionMetrics m;
  std::vector<std::size_t> ranked;  // unsuitable errors and clean records, to rank
  for (std::size_t i = 0; i < records.size(); ++i) {
    const JudgedRecord& r = records[i];
    if (!r.scored) continue;
    if (r.error) {
      ++m.errors;
      m.flagged_errors += r.flagged;
      if (r.unsuitable) ++m.errors_unsuitable, m.flagged_unsuitable += r.flagged, ranked.push_back(i);
    } else {
      ++m.clean;
      m.flagged_clean += r.flagged;
      ranked.push_back(i);
    }
  }
  m.recall_unsuitable = ratio(m.flagged_unsuitable, m.errors_unsuitable);
  m.recall_all = ratio(m.flagged_errors, m.errors);
  m.false_flag_rate = ratio(m.flagged_clean, m.clean);
  m.precision = ratio(m.flagged_errors, m.flagged_errors + m.flagged_clean);
  std::stable_sort(ranked.begin(), ranked.end(), [&](std::size_t a, std::size_t b) { return records[a].score > records[b].score; });
  double sum = 0;
  std::size_t hits = 0;
  for (std::size_t k = 0; k < ranked.size(); ++k)
    if (records[ranked[k]].error) sum += static_cast<double>(++hits) / static_cast<double>(k + 1);
  m.average_precision = m.errors_unsuitable ? sum / static_cast<double>(m.errors_unsuitable) : 0.0;
  return m;
}

}  // namespace envsift
