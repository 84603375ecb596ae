// Points as they arrive: gzip-compressed (written by the gzip command, RFC 1952), inside a zip
// archive (written through GDAL's /vsizip/, the zip format of PKWARE's APPNOTE), through a pipe or
// standard input. Each must give exactly the output the plain CSV gives.
#include <cpl_vsi.h>
#include <gtest/gtest.h>

#include "../support.hpp"

namespace envsift {
namespace {

using namespace envsift::testing;

void write_zip(const std::string& archive, const std::vector<std::pair<std::string, std::string>>& members) {
  for (const auto& [name, content] : members) {
    VSILFILE* f = VSIFOpenL(("/vsizip/" + archive + "/" + name).c_str(), "wb");
    ASSERT_NE(f, nullptr);
    VSIFWriteL(content.data(), 1, content.size(), f);
    VSIFCloseL(f);
  }
}

TEST(CompressedInput, GzipZipPipeAndStandardInputReadAsThePlainFile) {
  const auto dir = temp_dir("compressed-input");
  const std::string plain = source_path("demo-points/occurrences.csv");
  const std::string screen = envsift_binary() + " screen -q" + demo_layers() + " --dem dem";
  ASSERT_EQ(run(screen + " --points " + plain + " --out " + dir + "/plain.csv").exit_code, 0);
  const std::string expected = read_file(dir + "/plain.csv");

  run("gzip -c " + plain + " > " + dir + "/points.csv.gz && cp " + dir + "/points.csv.gz " + dir + "/gzip-named.csv");
  write_zip(dir + "/points.zip", {{"occurrences.csv", read_file(plain)}});
  const std::vector<std::pair<std::string, std::string>> ways = {
      {"a .csv.gz", " --points " + dir + "/points.csv.gz"},
      {"gzip named .csv", " --points " + dir + "/gzip-named.csv"},
      {"a .zip with one CSV", " --points " + dir + "/points.zip"},
      {"standard input", " --points - < " + plain},
      {"a pipe", " --points <(gzip -dc " + dir + "/points.csv.gz)"},
  };
  for (const auto& [what, points] : ways) {
    SCOPED_TRACE(what);
    const std::string out = dir + "/out.csv";
    auto r = run("bash -c '" + screen + points + " --out " + out + "'");
    ASSERT_EQ(r.exit_code, 0) << r.output;
    EXPECT_TRUE(read_file(out) == expected);
  }
}

TEST(CompressedInput, UnusableArchivesAndCompressedPipesAreRefusedClearly) {
  const auto dir = temp_dir("compressed-refused");
  const std::string plain = source_path("demo-points/occurrences.csv");
  write_zip(dir + "/two.zip", {{"a.csv", read_file(plain)}, {"b.csv", read_file(plain)}});
  write_zip(dir + "/none.zip", {{"readme.md", "nothing"}});
  const std::string screen = envsift_binary() + " screen -q" + demo_layers() + " --out " + dir + "/out.csv";
  auto r = run(screen + " --points " + dir + "/two.zip");
  EXPECT_EQ(r.exit_code, 3) << r.output;
  EXPECT_NE(r.output.find("a zip archive with several CSV/TSV files (a.csv, b.csv)"), std::string::npos) << r.output;
  r = run(screen + " --points " + dir + "/none.zip");
  EXPECT_EQ(r.exit_code, 3) << r.output;
  EXPECT_NE(r.output.find("without a CSV/TSV file (it holds: readme.md)"), std::string::npos) << r.output;
  r = run("gzip -c " + plain + " | " + screen + " --points -");
  EXPECT_EQ(r.exit_code, 3) << r.output;
  EXPECT_NE(r.output.find("standard input:1: the input is gzip-compressed"), std::string::npos) << r.output;
}

}  // namespace
}  // namespace envsift
