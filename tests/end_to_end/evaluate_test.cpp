// `envsift evaluate` end to end. The published table (docs/evaluation/demo.csv, shown in the
// docs/evaluation.md) is reproduced byte for byte by the same command — envsift's own contract of
// determinism, also across thread counts. A taxon with two populations in different
// environments (virtual_taxa.hpp) keeps both under the default settings: neither is flagged as
// a whole: it is split into two populations (group/populations.hpp), and judged as one taxon the
// population guard (score/population_guard.hpp) still keeps the smaller one unflagged.
#include <algorithm>
#include <fstream>

#include <gtest/gtest.h>

#include "envsift/evaluate/virtual_taxa.hpp"
#include "../support.hpp"

namespace envsift {
namespace {

using namespace envsift::testing;

TEST(Evaluate, ReproducesThePublishedDemoTable) {
  const auto dir = temp_dir("evaluate");
  for (const char* threads : {"1", "2"}) {
    const auto r = run(envsift_binary() + " evaluate --threads " + threads + demo_layers() + " --out " + dir + "/table.csv");
    ASSERT_EQ(r.exit_code, 0) << r.output;
    EXPECT_EQ(read_file(dir + "/table.csv"), read_file(source_path("docs/evaluation/demo.csv"))) << threads << " threads";
  }
  // and docs/evaluation.md shows the combined row's numbers
  const Table t = read_csv(source_path("docs/evaluation/demo.csv"));
  const auto combined_all = std::find_if(t.rows.begin(), t.rows.end(), [](const std::vector<std::string>& row) {
    return row[0] == "combined" && row[1] == "all";
  });
  ASSERT_NE(combined_all, t.rows.end());
  const auto& combined = *combined_all;
  const std::string readme = read_file(source_path("docs/evaluation.md"));
  for (const char* column : {"recall_unsuitable", "false_flag_rate", "average_precision"})
    EXPECT_NE(readme.find(combined[t.column(column)]), std::string::npos) << column;
}

TEST(Evaluate, NeitherOfTwoPopulationsIsFlaggedAsAWhole) {
  const StudyArea area = study_area(demo_layer_paths(), 200000, 5);
  const std::size_t records = 400;
  const VirtualTaxon taxon = two_population_taxon(area, records, 0.4, 3.0, 0.25, 17, "Dyomonta bimontana");
  const auto dir = temp_dir("two-populations");
  {
    std::ofstream points(dir + "/points.csv");
    points << "occurrenceID,scientificName,decimalLongitude,decimalLatitude\n";
    for (std::size_t i = 0; i < records; ++i)
      points << "P" << i << ",Dyomonta bimontana," << area.longitude[taxon.cells[i]] << "," << area.latitude[taxon.cells[i]] << "\n";
  }
  const auto r = run(envsift_binary() + " screen --points " + dir + "/points.csv" + demo_layers() + " --out " + dir + "/out.csv");
  ASSERT_EQ(r.exit_code, 0) << r.output;
  const Table out = read_csv(dir + "/out.csv");
  ASSERT_EQ(out.rows.size(), records);
  // the first 60 % of the records come from the first population, the rest from the second
  const std::size_t first = records - 160;
  std::size_t flagged_first = 0, flagged_second = 0;
  for (std::size_t i = 0; i < records; ++i)
    if (!out.rows[i][out.column("flags")].empty()) ++(i < first ? flagged_first : flagged_second);
  EXPECT_LT(flagged_first, first / 4) << r.output;
  EXPECT_LT(flagged_second, (records - first) / 4) << r.output;
  auto second_flagged = [&](const std::string& options) {
    const auto other = run(envsift_binary() + " screen " + options + " --points " + dir + "/points.csv" + demo_layers() +
                           " --out " + dir + "/other.csv");
    EXPECT_EQ(other.exit_code, 0) << other.output;
    const Table o = read_csv(dir + "/other.csv");
    std::size_t flagged = 0;
    for (std::size_t i = first; i < records; ++i) flagged += !o.rows[i][o.column("flags")].empty();
    return flagged;
  };
  // judged as one taxon, the population guard alone keeps the second population unflagged…
  EXPECT_LT(second_flagged("--populations one"), (records - first) / 4);
  // …and the populations really differ: as one taxon without the guard, the second is flagged
  EXPECT_GT(second_flagged("--populations one --max-flagged-share 1"), (records - first) * 3 / 4);
}

}  // namespace
}  // namespace envsift
