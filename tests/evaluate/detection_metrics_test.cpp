// Detection metrics against hand computation from their definitions (recall, false-positive
// rate, precision: common practice; average precision as in Manning, Raghavan & Schütze 2008,
// Introduction to Information Retrieval, §8.4 — the mean of the precision at each relevant item).
#include <gtest/gtest.h>

#include "envsift/evaluate/detection_metrics.hpp"

namespace envsift {
namespace {

JudgedRecord error(double score, bool flagged, bool unsuitable = true) { return {true, unsuitable, true, flagged, score}; }
JudgedRecord clean(double score, bool flagged) { return {false, false, true, flagged, score}; }

TEST(DetectionMetrics, WorkedExample) {
  // ranked by score: E(9) C(8) E(7) C(6) C(5) E(4); one suitable error (3) and one unscored record
  std::vector<JudgedRecord> r{clean(6, false), error(9, true), error(4, false), clean(8, true), error(7, true),
                              clean(5, false), error(3, false, false), {false, false, false, false, 0}};
  const DetectionMetrics m = measure_detection(r);
  EXPECT_EQ(m.errors, 4u);
  EXPECT_EQ(m.errors_unsuitable, 3u);
  EXPECT_EQ(m.clean, 3u);
  EXPECT_DOUBLE_EQ(m.recall_unsuitable, 2.0 / 3);
  EXPECT_DOUBLE_EQ(m.recall_all, 2.0 / 4);
  EXPECT_DOUBLE_EQ(m.false_flag_rate, 1.0 / 3);
  EXPECT_DOUBLE_EQ(m.precision, 2.0 / 3);
  // hits at ranks 1, 3 and 6 of E C E C C E: (1/1 + 2/3 + 3/6) / 3
  EXPECT_NEAR(m.average_precision, (1.0 + 2.0 / 3 + 0.5) / 3, 1e-15);
}

TEST(DetectionMetrics, PerfectAndWorstRankings) {
  EXPECT_DOUBLE_EQ(measure_detection({error(3, true), error(2, true), clean(1, false)}).average_precision, 1.0);
  // both errors below both clean records: (1/3 + 2/4) / 2
  EXPECT_NEAR(measure_detection({clean(4, true), clean(3, true), error(2, false), error(1, false)}).average_precision,
              (1.0 / 3 + 0.5) / 2, 1e-15);
}

TEST(DetectionMetrics, TiesKeepInputOrder) {
  // equal scores: the clean record listed first ranks first
  EXPECT_DOUBLE_EQ(measure_detection({clean(1, false), error(1, false)}).average_precision, 0.5);
  EXPECT_DOUBLE_EQ(measure_detection({error(1, false), clean(1, false)}).average_precision, 1.0);
}

}  // namespace
}  // namespace envsift
