// envsift's own contract (no outside reference; checksums by coreutils sha256sum): an output never
// destroys an input or another output, and a path that is not a regular file (a symbolic link to
// /dev/null, a directory) is refused before anything runs. Every file is as it was afterwards.
#include <gtest/gtest.h>

#include "../support.hpp"

namespace envsift {
namespace {

using namespace envsift::testing;

std::string checksums(const std::string& dir) {
  return run("cd " + dir + " && find . -type f | sort | xargs -r sha256sum; ls -la --time-style=+ " + dir +
             " | grep -v ' \\.\\.*$'").output;
}

TEST(OutputSafety, CollisionsAreRefusedAndLeaveEveryFileAsItWas) {
  const auto dir = temp_dir("output-safety");
  run("cp " + source_path("demo-points/occurrences.csv") + " " + dir + "/in.csv && cp " +
      source_path("demo-rasters/dem.tif") + " " + dir + "/dem.tif && ln -s /dev/null " + dir + "/null.csv && mkdir " + dir +
      "/folder");
  const std::string base = envsift_binary() + " screen -q --points " + dir + "/in.csv --layers " + dir + "/dem.tif ";
  const std::string before = checksums(dir);
  struct Case {
    std::string options, words;
  };
  const Case cases[] = {
      {"--out " + dir + "/in.csv", "--out " + dir + "/in.csv is the input --points"},
      {"--out " + dir + "/./in.csv", "is the input --points"},               // another name, the same file
      {"--out " + dir + "/dem.tif", "is the input --layers"},
      {"--out " + dir + "/a.csv --summary " + dir + "/dem.tif", "--summary " + dir + "/dem.tif is the input --layers"},
      {"--out " + dir + "/a.csv --manifest " + dir + "/a.csv", "--out and --manifest are the same file"},
      {"--out " + dir + "/a.csv --report " + dir + "/../envsift-output-safety/a.csv", "--out and --report are the same file"},
      {"--out " + dir + "/null.csv", "is not a regular file (a symbolic link)"},
      {"--out " + dir + "/folder", "is not a regular file (a directory)"},
      {"--out /dev/full", "is not a regular file (a device or FIFO)"},
  };
  for (const auto& c : cases) {
    SCOPED_TRACE(c.options);
    auto r = run(base + c.options);
    EXPECT_EQ(r.exit_code, 2) << r.output;
    EXPECT_NE(r.output.find(c.words), std::string::npos) << r.output;
    EXPECT_EQ(std::count(r.output.begin(), r.output.end(), '\n'), 1) << "one line: " << r.output;
    EXPECT_EQ(checksums(dir), before);
  }
  // a layer given twice is no collision, and a fresh output next to the inputs is written
  auto r = run(base + "--out " + dir + "/fresh.csv");
  EXPECT_EQ(r.exit_code, 0) << r.output;
}

// Every file an input is made of is an input. Reference: GDAL's own listing of a dataset's files
// (`gdalinfo` prints them under "Files:"; GDALDataset::GetFileList) and the ESRI Shapefile
// Technical Description (1998: .shp, .shx and .dbf make one Shapefile; .prj holds its CRS), on
// real files in their native formats: terra's R raster test.grd/.gri and its Luxembourg Shapefile
// (Debian's r-cran-terra); the .aux.xml side file GDAL writes beside a raster (GDAL's PAM, common practice);
// a Darwin Core Archive folder's meta.xml and core (TDWG Darwin Core Text Guide).
TEST(OutputSafety, NoFileOfAnInputIsEverWritten) {
  const auto dir = temp_dir("output-safety-companions");
  const std::string terra = "/usr/lib/R/site-library/terra/ex";
  run("cp " + terra + "/test.grd " + terra + "/test.gri " + terra + "/lux.* " + dir + "/ && mkdir " + dir + "/dwca && cp " +
      source_path("demo-rasters/dem.tif") + " " + dir);
  write_file(dir + "/dwca/meta.xml",
             "<archive xmlns=\"http://rs.tdwg.org/dwc/text/\"><core fieldsTerminatedBy=\",\" ignoreHeaderLines=\"1\">"
             "<files><location>occurrence.txt</location></files><id index=\"0\"/>"
             "<field index=\"1\" term=\"http://rs.tdwg.org/dwc/terms/scientificName\"/>"
             "<field index=\"2\" term=\"http://rs.tdwg.org/dwc/terms/decimalLongitude\"/>"
             "<field index=\"3\" term=\"http://rs.tdwg.org/dwc/terms/decimalLatitude\"/></core></archive>");
  run("cp " + source_path("demo-points/occurrences.csv") + " " + dir + "/dwca/occurrence.txt");
  // GDAL's listing of the real files, to check envsift against
  const std::string grd_files = run("gdalinfo " + dir + "/test.grd").output;
  ASSERT_NE(grd_files.find(dir + "/test.gri"), std::string::npos) << grd_files;
  const std::string before = checksums(dir);
  const std::string grd = envsift_binary() + " screen -q --points " + dir + "/dwca --layers " + dir + "/test.grd " + dir + "/dem.tif";
  struct Case {
    std::string options, words;
  };
  const Case cases[] = {
      {"--out " + dir + "/test.gri", "test.gri, a file of the input --layers " + dir + "/test.grd"},
      {"--out " + dir + "/o.csv --report " + dir + "/test.grd.aux.xml", "a file of the input --layers"},
      {"--out " + dir + "/o.csv --summary " + dir + "/dem.tif.aux.xml", "a file of the input --layers " + dir + "/dem.tif"},
      {"--out " + dir + "/o.csv --ranges " + dir + "/lux.shp --range-taxon-field NAME_2 --summary " + dir + "/lux.dbf",
       "lux.dbf, a file of the input --ranges"},
      {"--out " + dir + "/o.csv --ranges " + dir + "/lux.shp --range-taxon-field NAME_2 --manifest " + dir + "/lux.prj",
       "lux.prj, a file of the input --ranges"},
      {"--out " + dir + "/o.csv --ranges " + dir + "/lux.shp --range-taxon-field NAME_2 --report " + dir + "/lux.shx",
       "lux.shx, a file of the input --ranges"},
      {"--out " + dir + "/dwca/occurrence.txt", "a file of the input --points " + dir + "/dwca"},
      {"--out " + dir + "/o.csv --summary " + dir + "/dwca/meta.xml", "meta.xml, a file of the input --points"},
  };
  for (const auto& c : cases) {
    SCOPED_TRACE(c.options);
    auto r = run(grd + " " + c.options);
    EXPECT_EQ(r.exit_code, 2) << r.output;
    EXPECT_NE(r.output.find(c.words), std::string::npos) << r.output;
    EXPECT_EQ(checksums(dir), before);
  }
}

TEST(OutputSafety, SampleRefusesToOverwriteItsInputToo) {
  const auto dir = temp_dir("output-safety-sample");
  run("cp " + source_path("demo-points/occurrences.csv") + " " + dir + "/in.csv");
  const std::string before = checksums(dir);
  auto r = run(envsift_binary() + " sample -q --points " + dir + "/in.csv" + demo_layers() + " --out " + dir + "/in.csv");
  EXPECT_EQ(r.exit_code, 2) << r.output;
  EXPECT_EQ(checksums(dir), before);
}

TEST(OutputSafety, MergeRefusesToOverwriteAShard) {
  const auto dir = temp_dir("output-safety-merge");
  for (const char* i : {"0", "1"}) {
    auto r = run(envsift_binary() + " screen -q --points " + source_path("demo-points/occurrences.csv") + demo_layers() +
                 " --shard " + i + "/2 --out " + dir + "/shard" + i + ".csv");
    ASSERT_EQ(r.exit_code, 0) << r.output;
  }
  const std::string before = checksums(dir);
  auto r = run(envsift_binary() + " merge " + dir + "/shard0.csv " + dir + "/shard1.csv --out " + dir + "/shard1.csv");
  EXPECT_EQ(r.exit_code, 2) << r.output;
  EXPECT_NE(r.output.find("is the input a shard output"), std::string::npos) << r.output;
  EXPECT_EQ(checksums(dir), before);
}

}  // namespace
}  // namespace envsift
