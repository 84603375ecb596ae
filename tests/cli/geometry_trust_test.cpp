// Geometry is checked, not taken on trust. References: GDAL's own tools make the files (ogr2ogr
// from the demo CSV, an UPDATE through ogrinfo's SQL, a reprojection to UTM zone 31N, EPSG:32631,
// written as a Shapefile whose .prj is then removed) and judge them (ogrinfo's SQLite dialect:
// ST_IsValid, which asks GEOS; OGC Simple Features: a polygon's ring may not cross itself).
#include <gtest/gtest.h>

#include <filesystem>

#include "../support.hpp"

namespace envsift {
namespace {

using namespace envsift::testing;

const std::string kPoints = source_path("demo-points/occurrences.csv");

void ok(const std::string& command) {
  const auto r = run(command);
  ASSERT_EQ(r.exit_code, 0) << command << "\n" << r.output;
}

// A GeoPackage of the demo points (geometry from the coordinate columns, which stay as attributes),
// with three records' longitude attribute made stale and one rounded to two decimals.
TEST(GeometryTrust, AttributesThatDisagreeWithTheGeometryAreCodedNotUsed) {
  const auto dir = temp_dir("geometry-attributes");
  const std::string gpkg = dir + "/points.gpkg";
  ok("ogr2ogr -f GPKG " + gpkg + " " + kPoints + " -oo X_POSSIBLE_NAMES=decimalLongitude -oo Y_POSSIBLE_NAMES=decimalLatitude "
     "-oo KEEP_GEOM_COLUMNS=YES -a_srs EPSG:4326 -nln points 2>/dev/null");
  ok("ogrinfo -q " + gpkg + " -sql \"UPDATE points SET decimalLongitude = '0.9' WHERE occurrenceID IN ('QM-0001', 'QM-0002')\"");
  // QM-0005 lies at 0.48159: its attribute rounded to two decimals still agrees, to one it does not
  ok("ogrinfo -q " + gpkg + " -sql \"UPDATE points SET decimalLongitude = '0.48' WHERE occurrenceID = 'QM-0005'\"");
  ok("ogrinfo -q " + gpkg + " -sql \"UPDATE points SET decimalLongitude = '0.4' WHERE occurrenceID = 'QM-0004'\"");
  const auto r = run(envsift_binary() + " sample -q --points " + gpkg + " --layers " + source_path("demo-rasters/dem.tif") +
                     " --out " + dir + "/o.csv");
  ASSERT_EQ(r.exit_code, 0) << r.output;
  EXPECT_NE(r.output.find("3 record(s) have decimalLongitude/decimalLatitude attributes that disagree with their point geometry "
                          "(first: feature 1: attributes 0.9, 0.6708; geometry 0.47831, 0.6708)"),
            std::string::npos)
      << r.output;
  const Table t = read_csv(dir + "/o.csv");
  ASSERT_EQ(t.rows.size(), 915u);  // every record, once
  const auto rows = by_id(t);
  for (const char* id : {"QM-0001", "QM-0002"}) {
    EXPECT_EQ(rows.at(id)[t.column("status")], "position_geometry_disagrees") << id;
    EXPECT_EQ(rows.at(id)[t.column("dem")], "") << id << " is not sampled at either place";
    EXPECT_EQ(rows.at(id)[t.column("decimalLongitude")], "0.9") << "the attribute is kept as written";
  }
  EXPECT_EQ(rows.at("QM-0005")[t.column("status")], "ok");                      // |0.48 - 0.48159| < 0.005
  EXPECT_EQ(rows.at("QM-0004")[t.column("status")], "position_geometry_disagrees");  // |0.4 - 0.5125| > 0.05
  std::size_t coded = 0;
  for (const auto& row : t.rows) coded += row[t.column("status")].find("position_geometry_disagrees") != std::string::npos;
  EXPECT_EQ(coded, 3u);
}

TEST(GeometryTrust, ARangeShapefileInMetresWithoutItsPrjIsRefused) {
  const auto dir = temp_dir("geometry-no-prj");
  ok("ogr2ogr -f 'ESRI Shapefile' -t_srs EPSG:32631 -lco ENCODING=UTF-8 " + dir + "/ranges.shp " +
     source_path("demo-points/ranges.geojson") + " 2>/dev/null");
  std::filesystem::remove(dir + "/ranges.prj");
  ASSERT_EQ(run("ogrinfo -so " + dir + "/ranges.shp ranges").output.find("PROJCRS"), std::string::npos);  // GDAL sees no CRS
  const auto r = run(envsift_binary() + " screen -q --points " + kPoints + demo_layers() + " --ranges " + dir +
                     "/ranges.shp --range-taxon-field scientific --out " + dir + "/o.csv");
  EXPECT_EQ(r.exit_code, 3) << r.output;
  EXPECT_NE(r.output.find("ranges.shp: has no CRS (a Shapefile without its .prj?) and coordinates up to"), std::string::npos)
      << r.output;
  EXPECT_FALSE(std::filesystem::exists(dir + "/o.csv"));
}

TEST(GeometryTrust, ASelfIntersectingRangeIsUsedAndWarnedOf) {
  const auto dir = temp_dir("geometry-bowtie");
  // a bow tie over the demo island: its ring crosses itself at (0.5, 0.5)
  write_file(dir + "/bowtie.geojson",
             "{\"type\":\"FeatureCollection\",\"features\":[{\"type\":\"Feature\",\"properties\":{\"scientificName\":"
             "\"Oxmontia nivicola\"},\"geometry\":{\"type\":\"Polygon\",\"coordinates\":[[[0,0],[1,1],[1,0],[0,1],[0,0]]]}}]}");
  const auto valid = run("ogrinfo -q " + dir + "/bowtie.geojson -dialect SQLite -sql 'SELECT ST_IsValid(geometry) AS v FROM bowtie'");
  ASSERT_NE(valid.output.find("v (Integer) = 0"), std::string::npos) << valid.output;
  const auto r = run(envsift_binary() + " screen -q --points " + kPoints + demo_layers() + " --ranges " + dir +
                     "/bowtie.geojson --out " + dir + "/o.csv");
  ASSERT_EQ(r.exit_code, 0) << r.output;
  EXPECT_NE(r.output.find("1 feature(s) of 1 taxa are not valid polygons (a ring crosses itself or another, as GEOS finds) "
                          "('Oxmontia nivicola'): distances near their edges may be wrong"),
            std::string::npos)
      << r.output;
  // the demo's own ranges are valid for GEOS, and envsift says nothing of them
  const auto demo = run(envsift_binary() + " screen -q --points " + kPoints + demo_layers() + " --ranges " +
                        source_path("demo-points/ranges.geojson") + " --out " + dir + "/o2.csv");
  ASSERT_EQ(demo.exit_code, 0) << demo.output;
  EXPECT_EQ(demo.output.find("not valid polygons"), std::string::npos) << demo.output;
}

}  // namespace
}  // namespace envsift
