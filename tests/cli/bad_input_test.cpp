// One test per row of docs/usage.md's bad-input table: what envsift does with each kind of broken
// input, the exact reason code or error it gives, and that no record is lost. Points lie on the
// demo island (demo-rasters/dem.tif covers longitude and latitude -1…1).
#include <gtest/gtest.h>

#include "../support.hpp"

namespace envsift {
namespace {

using namespace envsift::testing;

const std::string kHeader = "occurrenceID,scientificName,decimalLongitude,decimalLatitude\n";

struct Outcome {
  CommandResult run;
  Table table;
};

// `envsift sample` of `content` (written as FILE) against the demo DEM.
Outcome sample(const std::string& name, const std::string& content, const std::string& extra = "",
               const std::string& file = "points.csv") {
  const auto dir = temp_dir("bad-" + name);
  write_file(dir + "/" + file, content);
  Outcome o{run(envsift_binary() + " sample --points " + dir + "/" + file + " --layers " +
                source_path("demo-rasters/dem.tif") + " --out " + dir + "/out.csv " + extra),
            {}};
  if (o.run.exit_code == 0) o.table = read_csv(dir + "/out.csv");
  return o;
}

std::string status(const Outcome& o, std::size_t row) { return o.table.rows.at(row)[o.table.column("status")]; }

TEST(BadInput, MissingFile) {
  auto r = run(envsift_binary() + " sample --points /nonexistent/p.csv --layers " + source_path("demo-rasters/dem.tif") +
               " --out /tmp/o.csv");
  EXPECT_EQ(r.exit_code, 3);
  EXPECT_NE(r.output.find("/nonexistent/p.csv: cannot open the points file; check the path"), std::string::npos) << r.output;
}

TEST(BadInput, UnreadableFileADirectory) {
  const auto dir = temp_dir("bad-dir");
  ASSERT_EQ(run("mkdir " + dir + "/p.csv").exit_code, 0);
  auto r = run(envsift_binary() + " sample --points " + dir + "/p.csv --layers " + source_path("demo-rasters/dem.tif") +
               " --out " + dir + "/o.csv");
  EXPECT_EQ(r.exit_code, 3);
  EXPECT_NE(r.output.find("is not a file"), std::string::npos) << r.output;
}

TEST(BadInput, MissingRequiredColumnListsTheColumnsFound) {
  auto o = sample("column", "id,lon,lat\n1,0.1,0.1\n");
  EXPECT_EQ(o.run.exit_code, 3);
  EXPECT_NE(o.run.output.find("points.csv:1: no longitude column 'decimalLongitude' (columns found: 'id', 'lon', 'lat')"),
            std::string::npos) << o.run.output;
}

TEST(BadInput, RaggedRowsAreKeptAndMarked) {
  auto o = sample("ragged", kHeader + "a,T,0.1,0.1\nb,T,0.1\nc,T,0.1,0.1,extra\n");
  ASSERT_EQ(o.run.exit_code, 0) << o.run.output;
  ASSERT_EQ(o.table.rows.size(), 3u);
  EXPECT_EQ(status(o, 0), "ok");
  EXPECT_EQ(status(o, 1), "ragged_row;position_empty");
  EXPECT_EQ(status(o, 2), "ragged_row");
}

TEST(BadInput, UnbalancedQuoteIsAnErrorWithItsLine) {
  auto o = sample("quote", kHeader + "a,T,0.1,0.1\nb,\"T,0.1,0.1\nc,T,0.1,0.1\n");
  EXPECT_EQ(o.run.exit_code, 3);
  EXPECT_NE(o.run.output.find("points.csv:3: quote opened here is never closed"), std::string::npos) << o.run.output;
}

TEST(BadInput, EmbeddedNulIsAnError) {
  auto o = sample("nul", kHeader + "a,T,0.1,0.1\nb,T" + std::string(1, '\0') + ",0.1,0.1\n");
  EXPECT_EQ(o.run.exit_code, 3);
  EXPECT_NE(o.run.output.find("points.csv:3: a NUL byte"), std::string::npos) << o.run.output;
}

TEST(BadInput, Utf16IsAnError) {
  auto o = sample("utf16", std::string("\xFF\xFE", 2) + "o\0c\0", "", "points.csv");
  EXPECT_EQ(o.run.exit_code, 3);
  EXPECT_NE(o.run.output.find("the file is UTF-16"), std::string::npos) << o.run.output;
}

TEST(BadInput, NonUtf8BytesAreReadAsLatin1) {
  // "Ménétriés" in Latin-1: é is the single byte 0xE9; written back as UTF-8 C3 A9
  auto o = sample("latin1", kHeader + "a,M\xE9n\xE9tri\xE9s,0.1,0.1\n");
  ASSERT_EQ(o.run.exit_code, 0) << o.run.output;
  EXPECT_EQ(o.table.rows[0][1], "M\xC3\xA9n\xC3\xA9tri\xC3\xA9s");
  EXPECT_EQ(status(o, 0), "latin1_converted");
}

TEST(BadInput, EmptyFileIsAnError) {
  auto o = sample("empty", "");
  EXPECT_EQ(o.run.exit_code, 3);
  EXPECT_NE(o.run.output.find("points.csv:1: the file is empty"), std::string::npos) << o.run.output;
}

TEST(BadInput, HeaderOnlyGivesAnEmptyResult) {
  auto o = sample("header", kHeader);
  ASSERT_EQ(o.run.exit_code, 0) << o.run.output;
  EXPECT_EQ(o.table.rows.size(), 0u);
  EXPECT_EQ(o.table.header.back(), "status");
  EXPECT_NE(o.run.output.find("0 records read"), std::string::npos);
}

TEST(BadInput, DuplicateIdsAreKeptAndReported) {
  auto o = sample("dup", kHeader + "a,T,0.1,0.1\nb,T,0.2,0.2\na,T,0.3,0.3\n");
  ASSERT_EQ(o.run.exit_code, 0);
  ASSERT_EQ(o.table.rows.size(), 3u);
  EXPECT_EQ(status(o, 0), "duplicate_id");
  EXPECT_EQ(status(o, 1), "ok");
  EXPECT_EQ(status(o, 2), "duplicate_id");
  EXPECT_NE(o.run.output.find("duplicate_id 2"), std::string::npos) << o.run.output;
}

TEST(BadInput, DecimalCommaIsReadAndNoted) {
  auto o = sample("comma", kHeader + "a,T,\"0,1\",\"0,1\"\nb,T,0.1,0.1\n");
  ASSERT_EQ(o.run.exit_code, 0);
  EXPECT_EQ(status(o, 0), "read_decimal_comma");
  EXPECT_EQ(o.table.rows[0][4], o.table.rows[1][4]);  // the same cell as 0.1, 0.1
}

TEST(BadInput, DegreesMinutesSecondsAreReadAndNoted) {
  // 0°30'36" = 0.51°; 0°6'0" = 0.1°; the same cells as the decimal forms
  auto o = sample("dms", kHeader + "a,T,0°30'36\",0°6'0\"\nb,T,0.51,0.1\nc,T,0 30 36,0 6\n");
  ASSERT_EQ(o.run.exit_code, 0);
  EXPECT_EQ(status(o, 0), "read_dms");
  EXPECT_EQ(status(o, 2), "read_dms");
  EXPECT_EQ(o.table.rows[0][4], o.table.rows[1][4]);
  EXPECT_EQ(o.table.rows[2][4], o.table.rows[1][4]);
}

TEST(BadInput, HemisphereLettersAreReadAndNoted) {
  auto o = sample("hemisphere", kHeader + "a,T,0.5W,0.2S\nb,T,-0.5,-0.2\nc,T,0.5N,0.2\nd,T,-0.5W,0.2\n");
  ASSERT_EQ(o.run.exit_code, 0);
  EXPECT_EQ(status(o, 0), "read_hemisphere_letter");
  EXPECT_EQ(o.table.rows[0][4], o.table.rows[1][4]);
  EXPECT_EQ(status(o, 2), "position_hemisphere_conflict");  // N on a longitude
  EXPECT_EQ(status(o, 3), "position_hemisphere_conflict");  // a sign and a letter at once
}

TEST(BadInput, NanInfAndOverflowAreNotFinite) {
  auto o = sample("finite", kHeader + "a,T,NaN,0.1\nb,T,0.1,inf\nc,T,1e999,0.1\n");
  ASSERT_EQ(o.run.exit_code, 0);
  ASSERT_EQ(o.table.rows.size(), 3u);
  for (std::size_t i = 0; i < 3; ++i) EXPECT_EQ(status(o, i), "position_not_finite") << i;
}

TEST(BadInput, LatitudeOutOfRange) {
  auto o = sample("range", kHeader + "a,T,120.5,91\n");
  ASSERT_EQ(o.run.exit_code, 0);
  EXPECT_EQ(status(o, 0), "position_off_globe");
}

TEST(BadInput, ProbableSwapIsReportedNotCorrected) {
  // (0.3, 95.2): an impossible latitude that is a fine longitude, and 0.3 a fine latitude.
  auto o = sample("swap", kHeader + "a,T,0.3,95.2\n");
  ASSERT_EQ(o.run.exit_code, 0);
  EXPECT_EQ(status(o, 0), "position_off_globe;position_maybe_swapped");
  EXPECT_EQ(o.table.rows[0][2], "0.3");  // the original coordinates are untouched
  // Off every layer, but on one with latitude and longitude swapped: a grid west of 0°, south of
  // the equator, and a record at (-0.5, -10) whose swap (-10, -0.5) falls on it.
  const auto dir = temp_dir("bad-swap");
  write_file(dir + "/grid.asc", "ncols 4\nnrows 4\nxllcorner -12\nyllcorner -2\ncellsize 1\n"
                                "1 2 3 4\n5 6 7 8\n9 10 11 12\n13 14 15 16\n");
  write_file(dir + "/p.csv", kHeader + "a,T,-0.5,-10\nb,T,-11.5,-0.5\n");
  auto r = run(envsift_binary() + " sample --assume-crs EPSG:4326 --points " + dir + "/p.csv --layers " + dir +
               "/grid.asc --out " + dir + "/o.csv");
  ASSERT_EQ(r.exit_code, 0) << r.output;
  const Table t = read_csv(dir + "/o.csv");
  EXPECT_EQ(t.rows[0][t.column("status")], "outside_layer:grid;position_maybe_swapped");
  EXPECT_EQ(t.rows[1][t.column("status")], "ok");
}

TEST(BadInput, RasterTruncatedOrNotARaster) {
  const auto dir = temp_dir("bad-raster");
  const std::string dem = read_file(source_path("demo-rasters/dem.tif"));
  write_file(dir + "/truncated.tif", dem.substr(0, dem.size() / 2));
  write_file(dir + "/notes.tif", "these are field notes, not a raster\n");
  write_file(dir + "/p.csv", kHeader + "a,T,0.1,0.1\nb,T,-0.9,-0.9\nc,T,0.9,0.9\n");
  for (const std::string name : {"truncated.tif", "notes.tif"}) {
    auto r = run(envsift_binary() + " sample --points " + dir + "/p.csv --layers " + dir + "/" + name + " --out " + dir + "/o.csv");
    EXPECT_EQ(r.exit_code, 3) << name << ": " << r.output;
    EXPECT_NE(r.output.find(dir + "/" + name + ": cannot"), std::string::npos) << r.output;
    EXPECT_FALSE(std::ifstream(dir + "/o.csv").good());
  }
}

TEST(BadInput, RasterWithoutCrsUnlessAssumed) {
  // an ESRI ASCII grid without a .prj file has no CRS
  const auto dir = temp_dir("bad-crs");
  write_file(dir + "/nocrs.asc", "ncols 2\nnrows 2\nxllcorner -1\nyllcorner -1\ncellsize 1\n1 2\n3 4\n");
  write_file(dir + "/p.csv", kHeader + "a,T,0.1,0.1\n");
  const std::string base = envsift_binary() + " sample --points " + dir + "/p.csv --layers " + dir + "/nocrs.asc --out " + dir + "/o.csv";
  auto refused = run(base);
  EXPECT_EQ(refused.exit_code, 3);
  EXPECT_NE(refused.output.find("has no coordinate reference system"), std::string::npos) << refused.output;
  EXPECT_NE(refused.output.find("--assume-crs"), std::string::npos);
  auto assumed = run(base + " --assume-crs EPSG:4326");
  EXPECT_EQ(assumed.exit_code, 0) << assumed.output;
}

TEST(BadInput, LayerWithNoOverlapWarns) {
  auto o = sample("overlap", kHeader + "a,T,10.1,20.1\nb,T,-30,5\n");
  ASSERT_EQ(o.run.exit_code, 0);
  EXPECT_NE(o.run.output.find("envsift: warning: layer dem"), std::string::npos) << o.run.output;
  EXPECT_NE(o.run.output.find("no record falls inside it"), std::string::npos);
  EXPECT_EQ(status(o, 0), "outside_layer:dem");
  EXPECT_EQ(o.table.rows.size(), 2u);
}

TEST(BadInput, OutputDirectoryNotWritable) {
  auto o = sample("outdir", kHeader + "a,T,0.1,0.1\n", "--out /nonexistent/dir/o.csv");
  EXPECT_EQ(o.run.exit_code, 2);  // --out given twice is a usage error: use a dedicated run
  auto r = run(envsift_binary() + " sample --points " + source_path("demo-points/occurrences.csv") + " --layers " +
               source_path("demo-rasters/dem.tif") + " --out /nonexistent/dir/o.csv");
  EXPECT_EQ(r.exit_code, 4);
  EXPECT_NE(r.output.find("/nonexistent/dir/o.csv: cannot create output"), std::string::npos) << r.output;
}

// Disk full, simulated by a file-size limit (ulimit -f, in 1 KiB blocks): the write fails,
// envsift exits 4 and leaves neither the output nor its temporary file.
TEST(BadInput, DiskFullLeavesNothing) {
  const auto dir = temp_dir("bad-full");
  auto r = run("bash -c 'ulimit -f 8; exec " + envsift_binary() + " sample --points " +
               source_path("demo-points/occurrences.csv") + " --layers " + source_path("demo-rasters/dem.tif") +
               " --out " + dir + "/o.csv'");
  EXPECT_EQ(r.exit_code, 4) << r.output;
  EXPECT_NE(r.output.find("o.csv:"), std::string::npos) << r.output;
  EXPECT_EQ(run("ls -A " + dir).output, "");
}

}  // namespace
}  // namespace envsift
