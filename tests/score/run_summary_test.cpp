// The one-line summaries on stderr (envsift's own format, docs/reference.md "Reason codes"): a 10-million
// record run must stay readable, so a code on many layers is one item counting records, not one
// item per layer; and counts carry thousands separators.
#include <gtest/gtest.h>

#include "envsift/run_summary.hpp"

namespace envsift {
namespace {

TEST(RunSummary, ThousandsSeparators) {
  EXPECT_EQ(with_thousands(0), "0");
  EXPECT_EQ(with_thousands(999), "999");
  EXPECT_EQ(with_thousands(1000), "1,000");
  EXPECT_EQ(with_thousands(187000), "187,000");
  EXPECT_EQ(with_thousands(10000000), "10,000,000");
}

TEST(RunSummary, ACodeOnManyLayersIsOneItemCountingRecords) {
  RunSummary s;
  std::vector<std::string> all_layers;
  for (int l = 1; l <= 19; ++l) all_layers.push_back("nodata:layer" + std::to_string(l));
  for (int r = 0; r < 1500; ++r) s.count_codes(all_layers);                 // sea: every layer
  for (int r = 0; r < 500; ++r) s.count_codes({"nodata:layer3", "read_dms"});  // one layer
  s.count_codes({"too_few_records:robust_z"});
  const std::string line = s.codes_line();
  EXPECT_EQ(line, "envsift: reason codes (records): nodata on 19 layers 2,000; read_dms 500; too_few_records:robust_z 1");
  EXPECT_EQ(s.codes.at("nodata:layer3"), 2000u);  // per code, as the summary file and report keep them
}

TEST(RunSummary, CodesOnSeveralTestsAreGroupedToo) {
  RunSummary s;
  s.count_codes({"too_few_records:robust_z", "too_few_records:mahalanobis"});
  s.count_codes({"too_few_records:robust_z"});
  EXPECT_EQ(s.codes_line(), "envsift: reason codes (records): too_few_records on 2 tests 2");
  EXPECT_EQ(RunSummary{}.codes_line(), "envsift: reason codes: none");
}

}  // namespace
}  // namespace envsift
