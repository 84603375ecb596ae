// The command line: distinct exit codes (documented in docs/reference.md) and one-line errors that say
// what to do.
#include <gtest/gtest.h>

#include "../support.hpp"

namespace envsift {
namespace {

using namespace envsift::testing;

TEST(Cli, HelpOnEverySubcommand) {
  for (const std::string cmd : {"sample", "screen"}) {
    auto r = run(envsift_binary() + " " + cmd + " --help");
    EXPECT_EQ(r.exit_code, 0);
    EXPECT_NE(r.output.find("--points"), std::string::npos) << r.output;
  }
  EXPECT_EQ(run(envsift_binary() + " --help").exit_code, 0);
}

TEST(Cli, BadUsageExitsTwo) {
  auto r = run(envsift_binary() + " screen --points x.csv");
  EXPECT_EQ(r.exit_code, 2) << r.output;
  EXPECT_NE(r.output.find("envsift: error:"), std::string::npos);
  EXPECT_EQ(run(envsift_binary() + " frobnicate").exit_code, 2);
  EXPECT_EQ(run(envsift_binary() + " sample --points a.csv --layers b.tif --out c.csv --method cubic").exit_code, 2);
}

TEST(Cli, BadInputExitsThreeWithFileLineAndAdvice) {
  const auto dir = temp_dir("cli-bad");
  write_file(dir + "/p.csv", "x,y\n1,2\n");
  auto r = run(envsift_binary() + " sample --points " + dir + "/p.csv --layers " +
               source_path("demo-rasters/dem.tif") + " --out " + dir + "/o.csv");
  EXPECT_EQ(r.exit_code, 3) << r.output;
  EXPECT_NE(r.output.find("p.csv:1: no longitude column"), std::string::npos) << r.output;
  EXPECT_EQ(std::count(r.output.begin(), r.output.end(), '\n'), 1) << r.output;  // one line
  auto missing = run(envsift_binary() + " sample --points " + dir + "/p.csv --layers " + dir + "/none.tif --out " +
                     dir + "/o.csv");
  EXPECT_EQ(missing.exit_code, 3) << missing.output;
  EXPECT_NE(missing.output.find("none.tif"), std::string::npos);
}

TEST(Cli, UnwritableOutputExitsFourAndLeavesNothing) {
  const auto dir = temp_dir("cli-out");
  auto r = run(envsift_binary() + " sample --points " + source_path("demo-points/occurrences.csv") + " --layers " +
               source_path("demo-rasters/dem.tif") + " --out " + dir + "/no/such/dir/o.csv");
  EXPECT_EQ(r.exit_code, 4) << r.output;
}

TEST(Cli, SampleWritesEveryRecordWithLayerColumnsAndStatus) {
  const auto dir = temp_dir("cli-sample");
  auto r = run(envsift_binary() + " sample --points " + source_path("demo-points/occurrences.csv") +
               " --layers elevation=" + source_path("demo-rasters/dem.tif") + " --out " + dir + "/o.csv");
  ASSERT_EQ(r.exit_code, 0) << r.output;
  const Table in = read_csv(source_path("demo-points/occurrences.csv"));
  const Table out = read_csv(dir + "/o.csv");
  EXPECT_EQ(out.rows.size(), in.rows.size());
  EXPECT_EQ(out.header.size(), in.header.size() + 5);  // the layer, its disc's min/mean/max, status
  EXPECT_EQ(out.header[in.header.size()], "elevation");
  EXPECT_EQ(out.header[in.header.size() + 3], "elevation_max");
  EXPECT_EQ(out.header.back(), "status");
}

}  // namespace
}  // namespace envsift
