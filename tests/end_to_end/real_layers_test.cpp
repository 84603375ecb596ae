// envsift over real open data in its native formats and CRSs, with default threads and with more
// threads than cores. Data: the Meuse soil samples (155 points in the Dutch national grid,
// EPSG:28992, with their relative elevation; Rikken & Van Rijn 1993, as shipped with R's terra
// package in Debian's r-cran-terra, read here with R itself), terra's `test.grd` (an R raster,
// .grd/.gri, in an oblique stereographic projection) and `meuse.tif` (GeoTIFF). From them, with
// GDAL's own tools: the same grid warped to UTM on the International 1924 ellipsoid
// (+ellps=intl, gdalwarp) and to WGS 84 longitude/latitude written as a bound CRS (+towgs84, as R
// writes WGS 84) in R's raster format. These CRSs are the ones whose coordinate transformations
// raced between threads ("double free or corruption"); EPSG:4326 layers never showed it.
// Checked: every run succeeds, every record appears once with a status, the output is the same
// byte for byte on every run and thread count, and a layer value equals gdallocationinfo's.
#include <gtest/gtest.h>
#include <unistd.h>

#include <filesystem>
#include <set>

#include "../support.hpp"

namespace envsift {
namespace {

using namespace envsift::testing;

const std::string kTerra = "/usr/lib/R/site-library/terra/ex";

class RealLayers : public ::testing::Test {
 protected:
  static void SetUpTestSuite() {
    dir_ = temp_dir("real-layers-" + std::to_string(::getpid()));  // ctest runs each test in a process of its own
    const auto points = run("Rscript -e 'm <- readRDS(\"" + kTerra + "/meuse.rds\"); write.csv(data.frame(occurrenceID = "
                            "paste0(\"meuse-\", seq_len(nrow(m))), scientificName = paste(\"soil type\", m$soil), x = m$x, "
                            "y = m$y, elev = m$elev), \"" + dir_ + "/meuse.csv\", row.names = FALSE)'");
    ASSERT_EQ(points.exit_code, 0) << points.output << " (scripts/install-deps installs r-cran-terra)";
    const std::string intl = "+proj=utm +zone=31 +ellps=intl +units=m +no_defs",
                      bound = "+proj=longlat +ellps=WGS84 +towgs84=0,0,0 +no_defs";
    for (const std::string& cmd :
         {"gdalwarp -q -overwrite -t_srs '" + intl + "' " + kTerra + "/meuse.tif " + dir_ + "/intl.tif",
          "gdalwarp -q -overwrite -of RRASTER -t_srs '" + bound + "' " + kTerra + "/meuse.tif " + dir_ + "/bound.grd"}) {
      const auto r = run(cmd);
      ASSERT_EQ(r.exit_code, 0) << cmd << "\n" << r.output;
    }
    ASSERT_NE(run("gdalinfo " + dir_ + "/bound.grd").output.find("BOUNDCRS"), std::string::npos);
  }
  static std::string layers() {
    return " --layers test=" + kTerra + "/test.grd meuse=" + kTerra + "/meuse.tif intl=" + dir_ + "/intl.tif bound=" + dir_ +
           "/bound.grd";
  }
  static std::string screen(const std::string& more) {
    return envsift_binary() + " screen -q --points " + dir_ + "/meuse.csv --points-crs EPSG:28992 --longitude-column x "
           "--latitude-column y" + layers() + more;
  }
  static std::string dir_;
};
std::string RealLayers::dir_;

TEST_F(RealLayers, ManyRunsWithThreadsNeverCrashAndAgreeByteForByte) {
  // the landscape test drawn over the layers' extent and 60 m discs: both transform in parallel
  const std::string options = " --landscape-area extent --default-uncertainty 60 --out ";
  const auto first = run(screen(" --threads 1" + options + dir_ + "/one.csv"));
  ASSERT_EQ(first.exit_code, 0) << first.output;
  const std::string expected = read_file(dir_ + "/one.csv");
  for (int k = 0; k < 12; ++k) {
    const std::string threads = k % 3 == 0 ? "" : k % 3 == 1 ? " --threads 2" : " --threads 8";  // default: every core
    const std::string out = dir_ + "/run" + std::to_string(k) + ".csv";
    const auto r = run(screen(threads + options + out));
    ASSERT_EQ(r.exit_code, 0) << "run " << k << threads << ": " << r.output;
    EXPECT_TRUE(read_file(out) == expected) << "run " << k << threads;
  }
  for (const auto& entry : std::filesystem::directory_iterator(dir_))
    EXPECT_EQ(entry.path().filename().string().find(".partial"), std::string::npos) << entry.path();
}

TEST_F(RealLayers, EveryRecordIsAccountedForAndValuesAreGdals) {
  const auto r = run(screen(" --out " + dir_ + "/accounted.csv"));
  ASSERT_EQ(r.exit_code, 0) << r.output;
  EXPECT_NE(r.output.find("155 records read, 155 scored"), std::string::npos) << r.output;
  const Table in = read_csv(dir_ + "/meuse.csv"), out = read_csv(dir_ + "/accounted.csv");
  ASSERT_EQ(out.rows.size(), in.rows.size());
  std::set<std::string> ids;
  for (std::size_t i = 0; i < out.rows.size(); ++i) {
    EXPECT_TRUE(std::equal(in.rows[i].begin(), in.rows[i].end(), out.rows[i].begin())) << "row " << i;
    EXPECT_FALSE(out.rows[i][out.column("status")].empty());
    ids.insert(out.rows[i][0]);
  }
  EXPECT_EQ(ids.size(), 155u);
  // the first sample's value on the native R raster and GeoTIFF: what gdallocationinfo reads at
  // its point (given in the points' own CRS, EPSG:28992)
  const auto& row = out.rows[0];
  for (const std::string layer : {"test", "meuse"}) {
    const std::string file = kTerra + "/" + layer + (layer == "test" ? ".grd" : ".tif");
    const auto g = run("gdallocationinfo -valonly -l_srs EPSG:28992 " + file + " " + row[2] + " " + row[3]);
    ASSERT_EQ(g.exit_code, 0) << g.output;
    EXPECT_FLOAT_EQ(std::stof(row[out.column(layer)]), std::stof(g.output)) << layer;  // Float32 cells
  }
}

// A reserve-scale study area: the Meuse grids cover 3.2 × 4.6 km at 40 m, with nodata outside the
// floodplain. With the default buffer (20 km at least before) every landscape cell fell off the
// layers and every record got no_landscape:landscape; the radius is now bounded by what the
// layers cover and cells are drawn only where both layers have a value, so the landscape test
// judges both soil types with at least 20 samples (soil type 3 has 12: too_few_records).
TEST_F(RealLayers, TheLandscapeTestRunsOnAReserveScaleStudyArea) {
  const std::string out = dir_ + "/reserve.csv";
  const auto r = run(envsift_binary() + " screen -q --points " + dir_ + "/meuse.csv --points-crs EPSG:28992 "
                     "--longitude-column x --latitude-column y --layers test=" + kTerra + "/test.grd meuse=" + kTerra +
                     "/meuse.tif --out " + out);
  ASSERT_EQ(r.exit_code, 0) << r.output;
  const Table t = read_csv(out);
  std::size_t judged = 0;
  for (const auto& row : t.rows) {
    EXPECT_EQ(row[t.column("status")].find("no_landscape"), std::string::npos) << row[0];
    const bool small_taxon = row[1] == "soil type 3";
    EXPECT_EQ(row[t.column("landscape_p")].empty(), small_taxon) << row[0] << " " << row[t.column("status")];
    judged += !row[t.column("landscape_p")].empty();
  }
  EXPECT_EQ(judged, 143u);  // 97 + 46
}

TEST_F(RealLayers, EvaluateOnProjectedLayersNeverCrashes) {
  const std::string cmd = envsift_binary() + " evaluate --taxa 8 --layers " + kTerra + "/test.grd " + dir_ + "/intl.tif --out ";
  const auto first = run(cmd + dir_ + "/eval0.csv");
  ASSERT_EQ(first.exit_code, 0) << first.output;
  for (int k = 1; k < 8; ++k) {
    const std::string out = dir_ + "/eval" + std::to_string(k) + ".csv";
    const auto r = run(cmd + out + (k % 2 ? " --threads 4" : ""));
    ASSERT_EQ(r.exit_code, 0) << "run " << k << ": " << r.output;
    EXPECT_TRUE(read_file(out) == read_file(dir_ + "/eval0.csv")) << "run " << k;
  }
}

}  // namespace
}  // namespace envsift
