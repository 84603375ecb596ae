// Circular layers: a direction in degrees enters the tests as its sine and cosine, so that 359°
// and 1° are neighbours — the usual treatment of directional data (Mardia & Jupp 2000,
// Directional Statistics, ch. 2 — from memory; that aspect is circular is a fact of the trade).
// sin/cos of the test's angles are checked against the C library's (common practice).
#include <cmath>

#include <gtest/gtest.h>

#include "envsift/table/circular_layers.hpp"
#include "../support.hpp"

namespace envsift {
namespace {

using namespace envsift::testing;

TEST(CircularLayers, NamesThatSayDirection) {
  for (const char* name : {"aspect", "Slope_Aspect", "wind_direction", "AZIMUTH", "bearing_deg", "orientation"})
    EXPECT_TRUE(looks_circular(name)) << name;
  for (const char* name : {"dem", "slope", "bio12", "dry_months"}) EXPECT_FALSE(looks_circular(name)) << name;
  EXPECT_EQ(circular_layers({"dem", "aspect", "north"}, {"north"}), (std::vector<std::size_t>{1, 2}));
  EXPECT_THROW(circular_layers({"dem"}, {"aspekt"}), std::exception);
}

// A taxon of north-facing slopes: aspects from 350° through 0° to 10°. Judged on a line (as one
// population) the records past north lie some 350° from the others; judged as a direction, the
// 355° and 5° records are neighbours of the rest, and none is out.
TEST(CircularLayers, NorthFacingRecordsAreNotFlaggedAcrossZero) {
  const auto dir = temp_dir("circular-north");
  std::string csv = "occurrenceID,scientificName,north,slope\n";
  std::vector<int> aspects;
  for (int twice = 0; twice < 2; ++twice)
    for (int a = -10; a <= 10; ++a) aspects.push_back((a + 360) % 360);
  for (std::size_t k = 0; k < aspects.size(); ++k)
    csv += "N" + std::to_string(k + 1) + ",Oxmontia nivicola," + std::to_string(aspects[k]) + "," + std::to_string(20 + k % 7) + "\n";
  write_file(dir + "/p.csv", csv);
  const std::string screen = envsift_binary() + " screen -q --single-taxon --points " + dir + "/p.csv --value-columns north,slope";
  // as a line, one population (the population split would rescue it by luck: two groups)
  auto r = run(screen + " --populations one --out " + dir + "/linear.csv");
  ASSERT_EQ(r.exit_code, 0) << r.output;
  const Table linear = read_csv(dir + "/linear.csv");
  // robust z of the 355° record: far beyond the cutoff (half the taxon is that far out, so the
  // population guard withholds the flags; either way the line misjudges it)
  std::size_t far_out = 0;
  for (const auto& row : linear.rows)
    far_out += row[2] == "355" && std::stod(row[linear.column("robust_z_stat")]) > 3 * std::stod(row[linear.column("robust_z_cutoff")]);
  EXPECT_EQ(far_out, 2u);
  // as a direction: none, and the components are written
  r = run(screen + " --populations one --circular north --out " + dir + "/circular.csv");
  ASSERT_EQ(r.exit_code, 0) << r.output;
  EXPECT_NE(r.output.find("layer north is circular"), std::string::npos) << r.output;
  const Table circular = read_csv(dir + "/circular.csv");
  for (const auto& row : circular.rows) {
    EXPECT_TRUE(row[circular.column("flags")].empty()) << row[0] << " at " << row[2] << "°";
    EXPECT_EQ(row[circular.column("status")], "ok") << row[0];
    if (row[2] == "355" || row[2] == "5") {
      EXPECT_LT(std::stod(row[circular.column("robust_z_stat")]), std::stod(row[circular.column("robust_z_cutoff")]));
    }
    const double radians = std::stod(row[2]) * M_PI / 180;
    EXPECT_NEAR(std::stod(row[circular.column("north_sin")]), std::sin(radians), 1e-15);
    EXPECT_NEAR(std::stod(row[circular.column("north_cos")]), std::cos(radians), 1e-15);
  }
  // a record facing south is still found
  write_file(dir + "/south.csv", csv + "S1,Oxmontia nivicola,180,22\n");
  r = run(envsift_binary() + " screen -q --single-taxon --points " + dir + "/south.csv --value-columns north,slope --circular north --out " +
          dir + "/south-out.csv");
  ASSERT_EQ(r.exit_code, 0) << r.output;
  const Table south = read_csv(dir + "/south-out.csv");
  EXPECT_FALSE(south.rows.back()[south.column("flags")].empty());
  EXPECT_EQ(south.rows.back()[south.column("rank")], "1");
}

TEST(CircularLayers, RasterLayersNamedAsDirectionsAreHandledAndEvaluateRefusesThem) {
  const auto dir = temp_dir("circular");
  const std::string layer = " --layers aspect=" + source_path("demo-rasters/dem.tif");
  auto r = run(envsift_binary() + " screen -q --points " + source_path("demo-points/occurrences.csv") + layer + " --out " + dir + "/o.csv");
  EXPECT_EQ(r.exit_code, 0) << r.output;
  const Table out = read_csv(dir + "/o.csv");
  out.column("aspect_sin"), out.column("aspect_cos");
  r = run(envsift_binary() + " evaluate" + layer + " --out " + dir + "/e.csv");
  EXPECT_EQ(r.exit_code, 2) << r.output;
  EXPECT_NE(r.output.find("sine and cosine"), std::string::npos);
  r = run(envsift_binary() + " screen -q --points " + source_path("demo-points/occurrences.csv") + layer +
          " --circular aspekt --out " + dir + "/o.csv");
  EXPECT_EQ(r.exit_code, 2) << r.output;
  EXPECT_NE(r.output.find("--circular aspekt is not one of the layers (aspect)"), std::string::npos) << r.output;
}

}  // namespace
}  // namespace envsift
