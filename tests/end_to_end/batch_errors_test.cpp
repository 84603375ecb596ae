// A batch of records at one wrong locality (score/population_guard.hpp): the commonest serious
// error in collections — a lot labelled with the town it was shipped from — is flagged and ranked
// first in its taxon, not withheld as a second population; and when the guard does withhold a
// test's flags, the records keep their own order. envsift's own contract, on a virtual taxon
// (evaluate/virtual_taxa.hpp) over the demo terrain.
#include <algorithm>
#include <fstream>
#include <iomanip>

#include <gtest/gtest.h>

#include "envsift/evaluate/virtual_taxa.hpp"
#include "../support.hpp"

namespace envsift {
namespace {

using namespace envsift::testing;

struct Planted {
  std::string dir;
  std::size_t genuine = 0, batch = 0;
};

// `genuine` records of one virtual taxon, then `batch` records spread over `places` study-area
// cells where the taxon's suitability is below 0.001 (the taxon is never found in that environment).
Planted batch_of_errors(const std::string& name, std::size_t genuine, std::size_t batch, std::size_t places = 1) {
  const StudyArea area = study_area(demo_layer_paths(), 200000, 5);
  VirtualTaxaOptions o;
  o.taxa = 1, o.min_records = o.max_records = genuine, o.two_population_share = 0, o.seed = 11;
  const VirtualTaxon taxon = make_virtual_taxa(area, o).at(0);
  std::vector<std::size_t> wrong;
  for (std::size_t c = 0; wrong.size() < places; c += 97)
    if (taxon.suitability(area.values.row(static_cast<Eigen::Index>(c)).transpose()) < 1e-3) wrong.push_back(c);
  Planted p{temp_dir(name), genuine, batch};
  std::ofstream points(p.dir + "/points.csv");
  points << std::setprecision(12) << "occurrenceID,scientificName,decimalLongitude,decimalLatitude\n";
  for (std::size_t i = 0; i < genuine + batch; ++i) {
    const std::size_t cell = i < genuine ? taxon.cells[i] : wrong[(i - genuine) % places];
    points << "R" << i << ",Virgata lotis," << area.longitude[cell] << "," << area.latitude[cell] << "\n";
  }
  return p;
}

TEST(BatchErrors, ABatchOfAFifthAtOneWrongCellIsFlaggedAndRankedFirst) {
  const Planted p = batch_of_errors("batch-one-cell", 240, 60);  // 60 of 300 = 20 %
  const auto r = run(envsift_binary() + " screen --points " + p.dir + "/points.csv" + demo_layers() + " --out " + p.dir + "/out.csv");
  ASSERT_EQ(r.exit_code, 0) << r.output;
  EXPECT_EQ(r.output.find("looks_multimodal"), std::string::npos) << r.output;  // no test's flags withheld
  const Table out = read_csv(p.dir + "/out.csv");
  ASSERT_EQ(out.rows.size(), p.genuine + p.batch);
  std::vector<std::size_t> batch_ranks;
  for (std::size_t i = p.genuine; i < out.rows.size(); ++i) {
    EXPECT_FALSE(out.rows[i][out.column("flags")].empty()) << "batch record " << i;
    batch_ranks.push_back(std::stoul(out.rows[i][out.column("rank")]));
  }
  std::sort(batch_ranks.begin(), batch_ranks.end());
  for (std::size_t k = 0; k < batch_ranks.size(); ++k) EXPECT_EQ(batch_ranks[k], k + 1);  // ranks 1..60
}

TEST(BatchErrors, WithheldFlagsKeepTheirOwnRanking) {
  const Planted p = batch_of_errors("batch-withheld", 240, 8, 8);
  // Every test's flags withheld (eight places are more than 0.1 % of the taxon's places; the guard
  // needs 5 flagged places, which the one-layer and Mahalanobis tests reach here)…
  const auto r = run(envsift_binary() + " screen --tests robust_z,mahalanobis --max-flagged-share 0.001 --points " + p.dir + "/points.csv" + demo_layers() +
                     " --out " + p.dir + "/out.csv");
  ASSERT_EQ(r.exit_code, 0) << r.output;
  const Table out = read_csv(p.dir + "/out.csv");
  ASSERT_EQ(out.rows.size(), p.genuine + p.batch);
  std::vector<double> score(out.rows.size());
  std::size_t withheld = 0;
  for (std::size_t i = 0; i < out.rows.size(); ++i) {
    EXPECT_TRUE(out.rows[i][out.column("flags")].empty());
    score[i] = std::stod(out.rows[i][out.column("score")]);
    withheld += out.rows[i][out.column("status")].find("looks_multimodal:") != std::string::npos;
  }
  EXPECT_GE(withheld, p.batch);
  // …yet the scores are the tests' own severities, not cut to the cutoff: the batch is still on
  // top, far above 1, and the ranking follows the scores.
  for (std::size_t i = p.genuine; i < out.rows.size(); ++i) {
    EXPECT_GT(score[i], 1.1);  // the old guard cut it to 1.000
    EXPECT_LE(std::stoul(out.rows[i][out.column("rank")]), p.batch);
  }
  for (std::size_t i = 0; i < out.rows.size(); ++i)
    for (std::size_t j = 0; j < out.rows.size(); ++j)
      if (score[i] > score[j]) {
        EXPECT_LT(std::stoul(out.rows[i][out.column("rank")]), std::stoul(out.rows[j][out.column("rank")]));
      }
}

}  // namespace
}  // namespace envsift
