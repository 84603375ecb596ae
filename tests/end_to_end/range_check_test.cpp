// The range check in a run (--ranges). On the demo: the record off every layer (QM-0914, at 5.5 E,
// 0.2 N, where a typo put it) is judged by its range alone, flagged, and ranked near the top; its
// distance is checked against PROJ's geod (Debian proj-bin) on the same sphere — the Evrandia
// vulgaris range is the island's square, so the nearest point is on its east edge, 1.0 E.
// Also envsift's own contract: taxa without a range get no_range; a filter keeps only some parts;
// names that look alike are said; a layer that cannot be used stops the run with its file; the
// range file is never an output; the summary and the GeoPackage (read by GDAL's ogrinfo) carry
// the counts and the distance; the output is the same for any thread count.
#include <gtest/gtest.h>

#include "../report_support.hpp"

namespace envsift {
namespace {

using namespace envsift::testing;

std::string demo_screen(const std::string& more) {
  return envsift_binary() + " screen -q --points " + source_path("demo-points/occurrences.csv") + demo_layers() +
         " --ranges " + source_path("demo-points/ranges.geojson") + more;
}

TEST(RangeCheck, ARecordOffEveryLayerIsJudgedByItsRangeAndRankedHigh) {
  const auto dir = temp_dir("range-demo");
  const auto r = run(demo_screen(" --out " + dir + "/out.csv --summary " + dir + "/taxa.csv --gis " + dir +
                                 "/out.gpkg --report " + dir + "/report.html"));
  ASSERT_EQ(r.exit_code, 0) << r.output;
  const Table out = read_csv(dir + "/out.csv");
  auto rows = by_id(out);
  const auto& off = rows["QM-0914"];
  EXPECT_NE(off[out.column("status")].find("outside_layer:dem"), std::string::npos);
  EXPECT_EQ(off[out.column("flags")], "outside_range");
  EXPECT_LE(std::stoi(off[out.column("rank")]), 3);
  // geod +a=6371008.8 +b=6371008.8 -I: (5.5 E, 0.2 N) to (1.0 E, 0.2 N) is 500 374.8 m; less its
  // 30 m uncertainty, in km
  const auto g = run("echo '0.2 5.5 0.2 1.0' | geod +a=6371008.8 +b=6371008.8 -I +units=m -f %.3f");
  ASSERT_EQ(g.exit_code, 0) << g.output;
  const double geod_m = std::stod(g.output.substr(g.output.rfind('\t') + 1));
  EXPECT_NEAR(std::stod(off[out.column("outside_range_stat")]), (geod_m - 30) / 1000, 0.01);
  EXPECT_NE(off[out.column("reasons")].find("500 km outside the range of Evrandia vulgaris"), std::string::npos)
      << off[out.column("reasons")];
  // a record inside its range: measured, 0; every taxon of the demo has a range
  EXPECT_EQ(rows["QM-0002"][out.column("outside_range_stat")], "0");
  for (const auto& row : out.rows) EXPECT_EQ(row[out.column("status")].find("no_range"), std::string::npos);
  // the summary counts it with its taxon, though no taxon test could judge it
  const Table taxa = read_csv(dir + "/taxa.csv");
  for (const auto& row : taxa.rows)
    EXPECT_EQ(row[taxa.column("flagged_outside_range")], row[taxa.column("taxon")] == "Evrandia vulgaris" ? "1" : "0");
  // the GeoPackage has the distance, as GDAL reads it
  const auto info = run("ogrinfo -q -where \"occurrenceID = 'QM-0914'\" " + dir + "/out.gpkg records");
  EXPECT_NE(info.output.find("outside_range_stat"), std::string::npos) << info.output;
  // the report's map of the taxon draws its range, and the record off every layer on it
  std::size_t maps = 0;
  for (const auto& section : report_sections(read_file(dir + "/report.html"), dir)) {
    const std::string& map = section.pictures.at(0);
    EXPECT_NE(map.find("<title>published range</title>"), std::string::npos) << section.taxon;
    if (section.taxon == "Evrandia vulgaris") {
      EXPECT_NE(mark_of(map, "QM-0914").find("href=\"#suspect\""), std::string::npos);
    }
    ++maps;
  }
  EXPECT_EQ(maps, 4u);
}

TEST(RangeCheck, SameOutputForAnyThreadCount) {
  const auto dir = temp_dir("range-threads");
  ASSERT_EQ(run(demo_screen(" --threads 1 --out " + dir + "/one.csv")).exit_code, 0);
  ASSERT_EQ(run(demo_screen(" --threads 2 --out " + dir + "/two.csv")).exit_code, 0);
  EXPECT_TRUE(read_file(dir + "/one.csv") == read_file(dir + "/two.csv"));
}

TEST(RangeCheck, ShardsMergeToTheSingleRun) {
  const auto dir = temp_dir("range-shards");
  ASSERT_EQ(run(demo_screen(" --out " + dir + "/single.csv")).exit_code, 0);
  std::string shards;
  for (int i = 0; i < 3; ++i) {
    const std::string out = dir + "/shard-" + std::to_string(i) + ".csv";
    ASSERT_EQ(run(demo_screen(" --shard " + std::to_string(i) + "/3 --out " + out)).exit_code, 0);
    shards += " " + out;
  }
  ASSERT_EQ(run(envsift_binary() + " merge" + shards + " --out " + dir + "/merged.csv").exit_code, 0);
  EXPECT_TRUE(read_file(dir + "/single.csv") == read_file(dir + "/merged.csv"));
}

// Two taxa on a small grid; the range layer written here as GeoJSON.
struct Small {
  std::string dir, points, ranges;
};

Small small(const std::string& name, const std::string& features) {
  Small s{temp_dir(name), "", ""};
  s.points = s.dir + "/points.csv", s.ranges = s.dir + "/ranges.geojson";
  write_file(s.points,
             "occurrenceID,scientificName,decimalLongitude,decimalLatitude,x\n"
             "A1,Alpha one,0.5,0.5,1\nA2,Alpha one,0.0,0.0,2\nA3,Alpha one,3.0,0.0,3\n"
             "B1,Beta two,0.5,0.5,1\n");
  write_file(s.ranges, "{\"type\":\"FeatureCollection\",\"features\":[" + features + "]}");
  return s;
}

std::string square(const std::string& taxon, double west, double south, double size, const std::string& more = "") {
  char g[400];
  std::snprintf(g, sizeof g,
                "{\"type\":\"Feature\",\"properties\":{\"scientificName\":\"%s\"%s},\"geometry\":{\"type\":\"Polygon\","
                "\"coordinates\":[[[%g,%g],[%g,%g],[%g,%g],[%g,%g],[%g,%g]]]}}",
                taxon.c_str(), more.c_str(), west, south, west + size, south, west + size, south + size, west, south + size,
                west, south);
  return g;
}

std::string screen_small(const Small& s, const std::string& more) {
  return envsift_binary() + " screen -q --value-columns x --tests robust_z --points " + s.points + " --ranges " + s.ranges +
         " --out " + s.dir + "/out.csv" + more;
}

TEST(RangeCheck, PartsFiltersAndTaxaWithoutARange) {
  // Alpha one: a resident part around the origin and a breeding part around (3, 0)
  const Small s = small("range-parts", square("Alpha one", -1, -1, 2, ",\"season\":\"resident\"") + "," +
                                            square("Alpha one", 2.5, -0.5, 1, ",\"season\":\"breeding\""));
  ASSERT_EQ(run(screen_small(s, "")).exit_code, 0);
  Table out = read_csv(s.dir + "/out.csv");
  auto rows = by_id(out);
  EXPECT_EQ(rows["A3"][out.column("outside_range_stat")], "0");  // inside the second part
  EXPECT_NE(rows["B1"][out.column("status")].find("no_range"), std::string::npos);  // no verdict from the range
  EXPECT_EQ(rows["B1"][out.column("outside_range_stat")], "");
  // only the resident part: A3 is 2 degrees of the equator (222 km) from it
  ASSERT_EQ(run(screen_small(s, " --range-filter \"season = 'resident'\"")).exit_code, 0);
  out = read_csv(s.dir + "/out.csv");
  rows = by_id(out);
  EXPECT_NEAR(std::stod(rows["A3"][out.column("outside_range_stat")]), 2 * M_PI / 180 * 6371.0088, 0.01);
  EXPECT_EQ(rows["A3"][out.column("flags")], "outside_range");
}

TEST(RangeCheck, NamesThatLookAlikeAreSaidNotMatched) {
  const Small s = small("range-alike", square("Alpha one Vend.", -1, -1, 2));
  const auto r = run(screen_small(s, ""));
  ASSERT_EQ(r.exit_code, 0) << r.output;
  EXPECT_NE(r.output.find("no range for taxon 'Alpha one', but the range layer has 'Alpha one Vend.'"), std::string::npos)
      << r.output;
  const Table out = read_csv(s.dir + "/out.csv");
  EXPECT_NE(by_id(out)["A1"][out.column("status")].find("no_range"), std::string::npos);
}

TEST(RangeCheck, FeaturesWithoutPolygonsAreSaidAndLeaveTheTaxonWithoutARange) {
  const Small s = small("range-points", "{\"type\":\"Feature\",\"properties\":{\"scientificName\":\"Alpha one\"},"
                                        "\"geometry\":{\"type\":\"Point\",\"coordinates\":[0.5,0.5]}}," +
                                            square("Beta two", 0, 0, 1));
  const auto r = run(screen_small(s, ""));
  ASSERT_EQ(r.exit_code, 0) << r.output;
  EXPECT_NE(r.output.find("1 feature(s) of 1 taxa hold no polygon"), std::string::npos) << r.output;
  const Table out = read_csv(s.dir + "/out.csv");
  auto rows = by_id(out);
  EXPECT_NE(rows["A1"][out.column("status")].find("no_range"), std::string::npos);
  EXPECT_EQ(rows["B1"][out.column("outside_range_stat")], "0");
}

TEST(RangeCheck, ALayerThatCannotBeUsedStopsTheRunWithItsFile) {
  const Small s = small("range-bad", square("Alpha one", -1, -1, 2));
  auto r = run(screen_small(s, " --range-taxon-field species"));
  EXPECT_EQ(r.exit_code, 3) << r.output;
  EXPECT_NE(r.output.find(s.ranges + ": no taxon field 'species' (fields found: 'scientificName')"), std::string::npos)
      << r.output;
  r = run(screen_small(s, " --range-filter \"season ==== 1\""));
  EXPECT_EQ(r.exit_code, 3) << r.output;
  EXPECT_NE(r.output.find("OGR rejects the filter"), std::string::npos) << r.output;
  write_file(s.dir + "/not-vectors.geojson", "this is not a layer");
  r = run(envsift_binary() + " screen -q --value-columns x --points " + s.points + " --ranges " + s.dir +
          "/not-vectors.geojson --out " + s.dir + "/out.csv");
  EXPECT_EQ(r.exit_code, 3) << r.output;
  EXPECT_NE(r.output.find("cannot read it as a vector layer"), std::string::npos) << r.output;
  EXPECT_EQ(r.output.find("ERROR"), std::string::npos) << r.output;  // one line of ours, not GDAL's
  r = run(envsift_binary() + " screen -q --value-columns x --points " + s.points + " --ranges " + s.dir +
          "/typo.gpkg --out " + s.dir + "/out.csv");
  EXPECT_EQ(r.exit_code, 3) << r.output;
  EXPECT_NE(r.output.find(s.dir + "/typo.gpkg: no such file; check the path given to --ranges"), std::string::npos) << r.output;
  // the range file named as an output: refused, and left as it was
  const std::string before = read_file(s.ranges);
  r = run(envsift_binary() + " screen -q --value-columns x --points " + s.points + " --ranges " + s.ranges + " --out " + s.ranges);
  EXPECT_EQ(r.exit_code, 2) << r.output;
  EXPECT_EQ(read_file(s.ranges), before);
}

}  // namespace
}  // namespace envsift
