#include "envsift/evaluate/evaluation_slices.hpp"

namespace envsift {
namespace {

EvaluationSlice places(std::size_t low, std::size_t high, const std::string& name) {
  return {name, [=](const RecordTruth& t) { return t.taxon_places >= low && t.taxon_places <= high; }};
}

}  // namespace

const std::vector<EvaluationSlice>& evaluation_slices() {
  static const std::vector<EvaluationSlice> slices = {
      {"all", [](const RecordTruth&) { return true; }},
      {"single_errors", [](const RecordTruth& t) { return t.error != "batch"; }},
      {"relocations", [](const RecordTruth& t) { return t.error.empty() || t.error == "relocated"; }},
      {"batch_errors", [](const RecordTruth& t) { return t.error.empty() || t.error == "batch"; }},
      {"second_population", [](const RecordTruth& t) { return t.second_population; }},
      places(0, 9, "places_under_10"),
      places(10, 15, "places_10_15"),
      places(16, 30, "places_16_30"),
      places(31, 100, "places_31_100"),
      places(101, static_cast<std::size_t>(-1), "places_over_100"),
  };
  return slices;
}

DetectionMetrics measure_slice(const EvaluationSlice& slice, const std::vector<RecordTruth>& truth,
                               const std::vector<JudgedRecord>& judged) {
  std::vector<JudgedRecord> in;
  for (std::size_t i = 0; i < judged.size(); ++i)
    if (slice.counts(truth[i])) in.push_back(judged[i]);
  return measure_detection(in);
}

}  // namespace envsift
