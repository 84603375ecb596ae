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
