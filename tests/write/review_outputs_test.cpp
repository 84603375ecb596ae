// Review outputs checked with outside tools: the run manifest's checksums equal coreutils'
// sha256sum of the inputs (SHA-256, FIPS 180-4); the GeoPackage passes GDAL's `ogrinfo -al -so`
// with the expected layers, feature counts and field types; the GeoJSON parses as JSON
// (RFC 8259, read with nlohmann::json).
#include <sstream>

#include <gtest/gtest.h>
#include <nlohmann/json.hpp>

#include "../support.hpp"

namespace envsift {
namespace {

using namespace envsift::testing;

std::string screen(const std::string& extra) {
  return envsift_binary() + " screen --quiet --points " + source_path("demo-points/occurrences.csv") + demo_layers() +
         " --dem dem " + extra;
}

std::string sha256sum(const std::string& path) {
  const auto r = run("sha256sum " + path);
  return r.output.substr(0, 64);
}

TEST(ReviewOutputs, ManifestChecksumsEqualSha256sum) {
  const auto dir = temp_dir("manifest");
  auto r = run(screen("--seed 7 --out " + dir + "/out.csv --manifest " + dir + "/run.json"));
  ASSERT_EQ(r.exit_code, 0) << r.output;
  const auto m = nlohmann::json::parse(read_file(dir + "/run.json"));
  EXPECT_EQ(m["command_line"].get<std::string>().rfind("envsift screen --quiet --points", 0), 0u);
  EXPECT_EQ(m["seed"], 7);
  EXPECT_EQ(m["options"]["z-cutoff"], "4");
  EXPECT_EQ(m["points"]["sha256"], sha256sum(source_path("demo-points/occurrences.csv")));
  ASSERT_EQ(m["layers"].size(), 4u);
  for (const auto& layer : m["layers"]) {
    EXPECT_EQ(layer["sha256"], sha256sum(layer["path"].get<std::string>())) << layer["name"];
    EXPECT_NE(layer["crs_wkt"].get<std::string>().find("WGS"), std::string::npos);
  }
  EXPECT_EQ(m["layers"][0]["width"], 400);  // dem.tif
  EXPECT_EQ(m["layers"][0]["nodata"], -32768);
  EXPECT_TRUE(m["seconds"].contains("screen"));
}

TEST(ReviewOutputs, GeoPackageHasEveryRecordAndItsDiscs) {
  const auto dir = temp_dir("gpkg");
  auto r = run(screen("--out " + dir + "/out.csv --gis " + dir + "/records.gpkg"));
  ASSERT_EQ(r.exit_code, 0) << r.output;
  auto info = run("ogrinfo -al -so " + dir + "/records.gpkg");
  ASSERT_EQ(info.exit_code, 0) << info.output;
  const std::string& o = info.output;
  EXPECT_NE(o.find("Layer name: records\nGeometry: Point\nFeature Count: 915"), std::string::npos) << o;
  // every record with coordinates has a disc (the demo gives each an uncertainty)
  EXPECT_NE(o.find("Layer name: uncertainty_discs\nGeometry: Polygon\nFeature Count: 912"), std::string::npos) << o;
  for (const char* field : {"occurrenceID: String", "dem: Real", "rank: Integer64", "score: Real", "reasons: String",
                            "mahalanobis_stat: Real", "mahalanobis_dims: Real", "elevation_mismatch_stat: Real"})
    EXPECT_NE(o.find(field), std::string::npos) << field;
}

TEST(ReviewOutputs, GeoJsonIsJsonWithEveryRecord) {
  const auto dir = temp_dir("geojson");
  auto r = run(screen("--out " + dir + "/out.csv --gis " + dir + "/records.geojson"));
  ASSERT_EQ(r.exit_code, 0) << r.output;
  const auto j = nlohmann::json::parse(read_file(dir + "/records.geojson"));
  EXPECT_EQ(j["type"], "FeatureCollection");
  ASSERT_EQ(j["features"].size(), 915u);
  const auto& first = j["features"][0];
  EXPECT_EQ(first["properties"]["occurrenceID"], "QM-0001");
  EXPECT_EQ(first["geometry"]["type"], "Point");
  EXPECT_EQ(run("ls " + dir).output, "out.csv\nrecords.geojson\n");  // no temporary left
}

}  // namespace
}  // namespace envsift
