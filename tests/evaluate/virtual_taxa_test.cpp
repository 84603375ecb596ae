// Virtual taxa and injected errors. The study area's values are checked against GDAL's own
// `gdallocationinfo -valonly -wgs84` (gdal-bin) at cell centres; the Gaussian response and the
// errors against their definitions (virtual_taxa.hpp, injected_errors.hpp; the response shape is
// envsift's choice after Hirzel et al. 2001); drawing in proportion to suitability against its
// expected frequencies (a fact of sampling: counts within 4 binomial SDs).
#include <cmath>

#include <gtest/gtest.h>

#include "envsift/evaluate/injected_errors.hpp"
#include "envsift/evaluate/virtual_taxa.hpp"
#include "../support.hpp"

namespace envsift {
namespace {

using namespace envsift::testing;

TEST(StudyArea, ValuesEqualGdallocationinfoAtCellCentres) {
  const StudyArea area = study_area(demo_layer_paths(), 2000, 3);
  ASSERT_GT(area.values.rows(), 1000);
  ASSERT_LE(area.values.rows(), 2000);
  const auto paths = demo_layer_paths();
  for (Eigen::Index i : {Eigen::Index(0), area.values.rows() / 2, area.values.rows() - 1})
    for (std::size_t l = 0; l < paths.size(); ++l) {
      const auto r = run("gdallocationinfo -valonly -wgs84 " + paths[l] + " " + std::to_string(area.longitude[i]) + " " +
                         std::to_string(area.latitude[i]));
      ASSERT_EQ(r.exit_code, 0) << r.output;
      // gdallocationinfo prints the raw cell; temperature is stored × 0.1 (scale)
      const double expected = std::stod(r.output) * (l == 1 ? 0.1 : 1.0);
      EXPECT_NEAR(area.values(i, static_cast<Eigen::Index>(l)), expected, 1e-4) << paths[l] << " cell " << i;
    }
  // the same seed, the same area
  EXPECT_EQ(study_area(demo_layer_paths(), 2000, 3).values, area.values);
}

TEST(VirtualTaxa, GaussianResponseAndProportionalDraws) {
  StudyArea area;
  area.values.resize(2, 1);
  area.values << 0, 1;  // two cells
  area.longitude = {0, 1};
  area.latitude = {0, 0};
  area.sd = Eigen::VectorXd::Constant(1, 1.0);
  area.resolution = Eigen::VectorXd::Constant(1, 0.0);
  area.layer_names = {"x"};
  VirtualTaxon v;
  v.responses.push_back({Eigen::VectorXd::Constant(1, 0.0), Eigen::VectorXd::Constant(1, 1 / std::sqrt(2 * std::log(4.0)))});
  // exp(−1 / (2σ²)) with 2σ² = 1 / ln 4: 1/4 at the second cell
  EXPECT_NEAR(v.suitability(Eigen::VectorXd::Constant(1, 1.0)), 0.25, 1e-12);
  EXPECT_DOUBLE_EQ(v.suitability(Eigen::VectorXd::Constant(1, 0.0)), 1.0);
  EXPECT_TRUE(std::isnan(v.suitability(Eigen::VectorXd::Constant(1, std::nan("")))));
  VirtualTaxaOptions o;
  o.taxa = 30;
  o.min_records = o.max_records = 1000;
  o.width_low = o.width_high = 1 / std::sqrt(2 * std::log(4.0));
  o.two_population_share = 0;
  std::size_t second = 0, total = 0;
  for (const auto& t : make_virtual_taxa(area, o))
    if (t.responses[0].optimum[0] == 0) {  // optimum at cell 0: cell 1 has suitability 1/4
      for (std::size_t c : t.cells) second += c, ++total;
    }
  ASSERT_GT(total, 5000u);
  const double p = 0.25 / 1.25, expected = p * static_cast<double>(total);
  EXPECT_NEAR(static_cast<double>(second), expected, 4 * std::sqrt(expected * (1 - p)));
}

TEST(InjectedErrors, EachKindMovesTheRecordAsDefined) {
  StudyArea area;
  area.longitude = {5.0};
  area.latitude = {6.0};
  std::vector<VirtualRecord> records(100, VirtualRecord{"id", "t", 12.34, -3.5, ""});
  SeededRandom random(11);
  inject_errors(records, area, 0.2, random);
  std::size_t errors = 0;
  for (const auto& r : records) {
    if (r.error.empty()) {
      EXPECT_EQ(r.longitude, 12.34);
      continue;
    }
    ++errors;
    if (r.error == "relocated") EXPECT_TRUE(r.longitude == 5.0 && r.latitude == 6.0);
    else if (r.error == "swapped") EXPECT_TRUE(r.longitude == -3.5 && r.latitude == 12.34);
    else if (r.error == "longitude_sign") EXPECT_TRUE(r.longitude == -12.34 && r.latitude == -3.5);
    else if (r.error == "latitude_sign") EXPECT_TRUE(r.longitude == 12.34 && r.latitude == 3.5);
    else if (r.error == "decimal_shift") EXPECT_TRUE((r.longitude == 12.34 / 10 && r.latitude == -3.5) || (r.longitude == 12.34 && r.latitude == -3.5 / 10));
    else ADD_FAILURE() << r.error;
  }
  EXPECT_EQ(errors, 20u);
  // a taxon of two records: exactly one error; of one: none
  std::vector<VirtualRecord> two(2, VirtualRecord{"id", "t", 1, 2, ""});
  inject_errors(two, area, 0.01, random);
  EXPECT_EQ((two[0].error.empty() ? 0 : 1) + (two[1].error.empty() ? 0 : 1), 1);
}

}  // namespace
}  // namespace envsift
