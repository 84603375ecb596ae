// envsift's own contract, checked against envsift itself (the unlimited, two-thread run is the
// reference). The synthetic clustered workload of the benchmark tool (60 000 records in 40 taxa of skewed
// sizes over the demo island — large taxa take FAST-MCD's nested-subset path): a small
// --memory-limit (sampling in chunks, a 1 MB block cache that must evict and re-read) and the
// thread count change nothing in the output.
#include <gtest/gtest.h>

#include "../support.hpp"

namespace envsift {
namespace {

using namespace envsift::testing;

TEST(SyntheticWorkload, MemoryLimitAndThreadCountDoNotChangeTheOutput) {
  const auto dir = temp_dir("synthetic");
  const std::string bench = std::string(ENVSIFT_BENCH_BINARY);
  ASSERT_EQ(run(bench + " points " + dir + "/points.csv 60000 40 11 -0.95 -0.95 0.95 0.95").exit_code, 0);
  const std::string base = envsift_binary() + " screen --points " + dir + "/points.csv" + demo_layers() + " --quiet ";
  auto unlimited = run(base + "--threads 2 --out " + dir + "/unlimited.csv");
  ASSERT_EQ(unlimited.exit_code, 0) << unlimited.output;
  auto limited = run(base + "--threads 2 --memory-limit 16 --block-cache-mb 1 --out " + dir + "/limited.csv");
  ASSERT_EQ(limited.exit_code, 0) << limited.output;
  auto one_thread = run(base + "--threads 1 --out " + dir + "/one-thread.csv");
  ASSERT_EQ(one_thread.exit_code, 0) << one_thread.output;
  const std::string a = read_file(dir + "/unlimited.csv");
  EXPECT_GT(a.size(), 1000000u);
  EXPECT_EQ(a, read_file(dir + "/limited.csv"));
  EXPECT_EQ(a, read_file(dir + "/one-thread.csv"));
}

// Values are kept as 32-bit floats where a float holds the layer's cells exactly (dem Int16,
// rainfall Float32, dry_months Byte here, at the nearest cell) and as doubles otherwise (Float64
// layers, scaled integers such as temperature, bilinear). Either way the output must be the same:
// the same run on Float64 copies of those three layers, made by GDAL's own `gdal_translate -ot
// Float64` (which holds every Int16, Byte and Float32 value exactly), keeps every value as a
// double and must write the same output: byte for byte, except that rainfall's values are written
// as the shortest text of its Float32 cell ("920.73224") from the original and of the double
// ("920.7322387695312") from the copy — the same number once read as a float. (This replaces SHA-256s of the output recorded
// on one machine: last bits of rounding differ between machines, see landscape.cpp.)
TEST(SyntheticWorkload, FloatStorageWritesWhatDoubleStorageWrites) {
  const auto dir = temp_dir("synthetic-float");
  const std::string bench = std::string(ENVSIFT_BENCH_BINARY);
  ASSERT_EQ(run(bench + " points " + dir + "/points.csv 60000 40 11 -0.95 -0.95 0.95 0.95").exit_code, 0);
  std::string as_doubles = " --layers";
  for (const char* name : {"dem", "temperature", "rainfall", "dry_months"}) {
    const std::string original = source_path(std::string("demo-rasters/") + name + ".tif");
    if (std::string(name) == "temperature") {  // Int16 × 0.1: doubles already
      as_doubles += " " + original;
      continue;
    }
    const std::string copy = dir + "/" + name + ".tif";  // the same layer names as the originals
    const auto r = run("gdal_translate -q -ot Float64 " + original + " " + copy);
    ASSERT_EQ(r.exit_code, 0) << r.output;
    as_doubles += " " + copy;
  }
  const std::string points = envsift_binary() + " screen --quiet --points " + dir + "/points.csv";
  for (const std::string method : {"nearest", "bilinear"}) {
    SCOPED_TRACE(method);
    ASSERT_EQ(run(points + demo_layers() + " --method " + method + " --out " + dir + "/floats.csv").exit_code, 0);
    ASSERT_EQ(run(points + as_doubles + " --method " + method + " --out " + dir + "/doubles.csv").exit_code, 0);
    const Table floats = read_csv(dir + "/floats.csv"), doubles = read_csv(dir + "/doubles.csv");
    ASSERT_EQ(floats.header, doubles.header);
    ASSERT_EQ(floats.rows.size(), 60000u);
    ASSERT_EQ(floats.rows.size(), doubles.rows.size());
    std::size_t differing = 0, rainfall_text = 0;
    for (std::size_t r = 0; r < floats.rows.size(); ++r)
      for (std::size_t c = 0; c < floats.header.size(); ++c) {
        const std::string &a = floats.rows[r][c], &b = doubles.rows[r][c];
        if (a == b) continue;
        const bool rainfall_value = floats.header[c].rfind("rainfall", 0) == 0 && !a.empty() && !b.empty() &&
                                    static_cast<float>(std::stod(a)) == static_cast<float>(std::stod(b));
        rainfall_value ? ++rainfall_text : ++differing;
      }
    EXPECT_EQ(differing, 0u);
    if (method == "nearest") {
      EXPECT_GT(rainfall_text, 100000u);  // the comparison above did run
    }
  }
}

}  // namespace
}  // namespace envsift
