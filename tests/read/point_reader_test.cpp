// Reading occurrence records. Column names are Darwin Core terms (TDWG standard). Vector inputs
// are made from a CSV by GDAL's own ogr2ogr (gdal-bin), the reference for what a GeoPackage or
// GeoJSON of the same records holds.
#include "envsift/read/point_reader.hpp"

#include <cmath>

#include <gtest/gtest.h>

#include "../support.hpp"
#include "envsift/errors.hpp"

namespace envsift {
namespace {

using namespace envsift::testing;

const std::string kRecords =
    "occurrenceID,scientificName,decimalLongitude,decimalLatitude,coordinateUncertaintyInMeters,note\n"
    "A1,Alpha one,12.5,-3.25,100,\"plain\"\n"
    "A2,Alpha one,-179.999,89.5,,\"with, comma\"\n"
    "A3,Beta two,0.000001,-0.5,30,\"two\nlines\"\n";

TEST(PointReader, CsvKeepsEveryColumnAndParsesDarwinCoreFields) {
  auto dir = temp_dir("reader-csv");
  write_file(dir + "/p.csv", kRecords);
  PointTable t = read_points(dir + "/p.csv", {});
  ASSERT_EQ(t.records.size(), 3u);
  EXPECT_EQ(t.columns.size(), 6u);
  EXPECT_EQ(t.fields.read(1)[5], "with, comma");
  EXPECT_EQ(t.fields.read(2)[5], "two\nlines");
  EXPECT_EQ(t.fields.read(0)[0], "A1");
  EXPECT_NE(t.records[0].id_hash, 0u);
  EXPECT_EQ(t.taxon(2), "Beta two");
  EXPECT_EQ(t.taxa.size(), 3u);  // "", Alpha one, Beta two: each name stored once
  EXPECT_DOUBLE_EQ(t.records[1].longitude, -179.999);
  EXPECT_DOUBLE_EQ(t.records[0].latitude, -3.25);
  EXPECT_EQ(*t.records[0].uncertainty_m, 100);
  EXPECT_FALSE(t.records[1].uncertainty_m.has_value());
  EXPECT_EQ(t.records[2].line, 4u);
}

TEST(PointReader, BomCrlfAndTsvGiveTheSameRecords) {
  auto dir = temp_dir("reader-variants");
  std::string crlf;
  for (char c : kRecords) {
    if (c == '\n') crlf += '\r';
    crlf += c;
  }
  write_file(dir + "/bom.csv", "\xEF\xBB\xBF" + crlf);
  std::string tsv = "occurrenceID\tscientificName\tdecimalLongitude\tdecimalLatitude\n"
                    "A1\tAlpha one\t12.5\t-3.25\n";
  write_file(dir + "/p.tsv", tsv);
  PointTable a = read_points(dir + "/bom.csv", {});
  ASSERT_EQ(a.records.size(), 3u);
  EXPECT_EQ(a.columns[0], "occurrenceID");
  EXPECT_EQ(a.columns.back(), "note");
  EXPECT_EQ(a.fields.read(2)[5], "two\r\nlines");  // inside quotes, bytes are data
  EXPECT_DOUBLE_EQ(a.records[0].longitude, 12.5);
  PointTable b = read_points(dir + "/p.tsv", {});
  ASSERT_EQ(b.records.size(), 1u);
  EXPECT_EQ(b.taxon(0), "Alpha one");
}

TEST(PointReader, BadCoordinatesAreKeptWithReasonCodes) {
  auto dir = temp_dir("reader-bad");
  write_file(dir + "/p.csv",
             "decimalLongitude,decimalLatitude\n"
             ",1\n"        // empty
             "abc,1\n"     // words
             "NaN,1\n"     // not finite
             "1,inf\n"     // not finite
             "1e999,1\n"   // overflows a double
             "181,1\n"     // out of range
             "1,-90.5\n"   // out of range; as (lon -90.5, lat 1) it would fit: possibly swapped
             "+1.5, 2 \n"  // fine: sign and spaces
             "1\n");       // ragged: latitude missing
  PointTable t = read_points(dir + "/p.csv", {});
  ASSERT_EQ(t.records.size(), 9u);  // none dropped
  const std::vector<std::vector<std::string>> expected = {
      {"position_empty"}, {"position_not_number"}, {"position_not_finite"}, {"position_not_finite"}, {"position_not_finite"},
      {"position_off_globe"}, {"position_off_globe", "position_maybe_swapped"}, {}, {"ragged_row", "position_empty"}};
  for (std::size_t i = 0; i < expected.size(); ++i) EXPECT_EQ(t.problems(i), expected[i]) << "row " << i;
  EXPECT_DOUBLE_EQ(t.records[7].longitude, 1.5);
  EXPECT_DOUBLE_EQ(t.records[7].latitude, 2);
  EXPECT_FALSE(t.records[0].has_coordinates());
}

TEST(PointReader, MissingCoordinateColumnListsTheColumnsFound) {
  auto dir = temp_dir("reader-missing");
  write_file(dir + "/p.csv", "id,lon,lat\n1,2,3\n");
  try {
    read_points(dir + "/p.csv", {});
    FAIL();
  } catch (const InputError& e) {
    const std::string m = e.what();
    EXPECT_NE(m.find("p.csv:1: no longitude column 'decimalLongitude'"), std::string::npos) << m;
    EXPECT_NE(m.find("'id', 'lon', 'lat'"), std::string::npos) << m;
    EXPECT_NE(m.find("--longitude-column"), std::string::npos) << m;
  }
  ReaderOptions o;
  o.columns.longitude = "lon";
  o.columns.latitude = "lat";
  EXPECT_EQ(read_points(dir + "/p.csv", o).records.size(), 1u);
}

TEST(PointReader, ColumnNamesMatchIgnoringCaseWhenUnambiguous) {
  auto dir = temp_dir("reader-case");
  write_file(dir + "/p.csv", "DECIMALLONGITUDE,decimallatitude\n1,2\n");
  EXPECT_DOUBLE_EQ(read_points(dir + "/p.csv", {}).records[0].latitude, 2);
}

TEST(PointReader, EmptyFileIsAnError) {
  auto dir = temp_dir("reader-empty");
  write_file(dir + "/p.csv", "");
  EXPECT_THROW(read_points(dir + "/p.csv", {}), InputError);
  EXPECT_THROW(read_points(dir + "/absent.csv", {}), InputError);
}

// GeoPackage and GeoJSON written by ogr2ogr from the same CSV: point geometry in WGS 84, in a
// projected CRS (reprojected back by envsift), and attribute-only.
TEST(PointReader, VectorSourcesMatchTheCsvTheyWereMadeFrom) {
  auto dir = temp_dir("reader-vector");
  write_file(dir + "/p.csv", kRecords);
  const std::string geom = " -oo X_POSSIBLE_NAMES=decimalLongitude -oo Y_POSSIBLE_NAMES=decimalLatitude "
                           "-oo KEEP_GEOM_COLUMNS=NO ";
  for (const std::string& cmd : std::vector<std::string>{
           "ogr2ogr -f GPKG -a_srs EPSG:4326 " + dir + "/geom.gpkg " + dir + "/p.csv" + geom,
           "ogr2ogr -f GeoJSON -a_srs EPSG:4326 " + dir + "/geom.geojson " + dir + "/p.csv" + geom,
           "ogr2ogr -f GPKG -s_srs EPSG:4326 -t_srs EPSG:3857 " + dir + "/mercator.gpkg " + dir + "/p.csv" + geom,
           "ogr2ogr -f GPKG " + dir + "/attributes.gpkg " + dir + "/p.csv",
       }) {
    auto r = run(cmd);
    ASSERT_EQ(r.exit_code, 0) << cmd << "\n" << r.output;
  }
  const PointTable csv = read_points(dir + "/p.csv", {});
  for (const std::string name : {"geom.gpkg", "geom.geojson", "mercator.gpkg", "attributes.gpkg"}) {
    SCOPED_TRACE(name);
    const PointTable t = read_points(dir + "/" + name, {});
    ASSERT_EQ(t.records.size(), csv.records.size());
    for (std::size_t i = 0; i < t.records.size(); ++i) {
      EXPECT_EQ(t.records[i].id_hash, csv.records[i].id_hash);
      EXPECT_EQ(t.taxon(i), csv.taxon(i));
      EXPECT_NEAR(t.records[i].longitude, csv.records[i].longitude, 1e-9);
      EXPECT_NEAR(t.records[i].latitude, csv.records[i].latitude, 1e-9);
      EXPECT_TRUE(t.problems(i).empty());
    }
    // every original attribute is carried, geometry-derived coordinates appended as columns
    EXPECT_NE(std::find(t.columns.begin(), t.columns.end(), "note"), t.columns.end());
    EXPECT_NE(std::find(t.columns.begin(), t.columns.end(), "decimalLatitude"), t.columns.end());
  }
}

}  // namespace
}  // namespace envsift
