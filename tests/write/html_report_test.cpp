// The HTML report of the demo run, checked with outside tools: every embedded picture is
// base64 that coreutils' `base64 -d` decodes (RFC 4648) into SVG that libxml2's `xmllint`
// parses as well-formed XML (XML 1.0); every suspect of a taxon (a record with flags in the screen
// output) appears in each of its taxon's pictures; the maps carry a PNG (relief from the DEM); the
// embedded manifest's checksum equals `sha256sum`. Also envsift's own contract: nothing outside
// the manifest changes with the thread count, the caution comes before any result, and the file
// holds no script and no reference to anything outside it.
#include <map>
#include <unistd.h>
#include <set>

#include <gtest/gtest.h>

#include "envsift/write/report/svg_canvas.hpp"
#include "../report_support.hpp"

namespace envsift {
namespace {

using namespace envsift::testing;

class HtmlReportTest : public ::testing::Test {
 protected:
  static void SetUpTestSuite() {
    dir_ = temp_dir("report-" + std::to_string(::getpid()));  // ctest runs tests in parallel processes
    const auto r = run(envsift_binary() + " screen --quiet --threads 2 --points " +
                       source_path("demo-points/occurrences.csv") + demo_layers() + " --dem dem --out " + dir_ +
                       "/out.csv --report " + dir_ + "/report.html");
    ASSERT_EQ(r.exit_code, 0) << r.output;
    html_ = read_file(dir_ + "/report.html");
  }
  static std::string dir_, html_;

  std::vector<ReportSection> sections() const { return report_sections(html_, dir_); }
};
std::string HtmlReportTest::dir_, HtmlReportTest::html_;

TEST_F(HtmlReportTest, EveryPictureIsWellFormedSvg) {
  const auto all = sections();
  ASSERT_EQ(all.size(), 4u);  // the demo's four taxa
  std::string files;
  int pictures = 0;
  for (const auto& s : all)
    for (const auto& svg : s.pictures) {
      const std::string path = dir_ + "/check" + std::to_string(pictures++) + ".svg";
      write_file(path, svg);
      files += " " + path;
      EXPECT_EQ(svg.rfind("<svg xmlns=\"http://www.w3.org/2000/svg\"", 0), 0u);
      EXPECT_TRUE(unresolved_references(svg).empty()) << s.taxon;
    }
  EXPECT_GE(pictures, 4);
  const auto r = run("xmllint --noout" + files);
  EXPECT_EQ(r.exit_code, 0) << r.output;
  // the control: xmllint does reject a broken picture
  write_file(dir_ + "/broken.svg", "<svg><g></svg>");
  EXPECT_NE(run("xmllint --noout " + dir_ + "/broken.svg").exit_code, 0);
}

TEST_F(HtmlReportTest, EverySuspectAppearsInEachPictureOfItsTaxon) {
  const Table out = read_csv(dir_ + "/out.csv");
  std::map<std::string, std::set<std::string>> suspects;  // taxon → record IDs
  for (const auto& row : out.rows)
    if (!row[out.column("flags")].empty())
      suspects[row[out.column("scientificName")]].insert(row[out.column("occurrenceID")]);
  ASSERT_FALSE(suspects.empty());
  std::size_t checked = 0;
  for (const auto& s : sections()) {
    ASSERT_FALSE(s.pictures.empty()) << s.taxon;
    for (const auto& id : suspects[s.taxon])
      for (const auto& svg : s.pictures) {
        EXPECT_NE(svg.find("data-record=\"" + id + "\""), std::string::npos) << s.taxon << " " << id;
        ++checked;
      }
    // map, and with suspects the pair plot (and a plot of each layer where one is beyond a one-layer
    // test's cutoff; suspects of the tests of all layers together may have none)
    EXPECT_GE(s.pictures.size(), suspects[s.taxon].empty() ? 1u : 2u) << s.taxon;
  }
  EXPECT_GT(checked, 100u);
  // the worst demo record is in the top-suspects table, linked to its taxon
  EXPECT_NE(html_.find("<td>QM-0332</td><td><a href=\"#taxon-"), std::string::npos);
}

TEST_F(HtmlReportTest, MapsHaveShadedReliefFromTheDem) {
  for (const auto& s : sections()) {
    const std::string& map = s.pictures.at(0);
    EXPECT_NE(map.find("longitude (°)"), std::string::npos);
    EXPECT_NE(map.find("href=\"data:image/png;base64,iVBORw0KGgo"), std::string::npos) << s.taxon;  // PNG signature
  }
}

TEST_F(HtmlReportTest, SelfContainedWithTheCautionFirst) {
  EXPECT_EQ(html_.find("<script"), std::string::npos);
  EXPECT_EQ(html_.find("src=\"http"), std::string::npos);
  EXPECT_EQ(html_.find("href=\"http"), std::string::npos);
  EXPECT_NE(html_.find("default-src 'none'; img-src data:"), std::string::npos);
  const auto caution = html_.find("Flags are reasons to look, not proof of error");
  ASSERT_NE(caution, std::string::npos);
  EXPECT_LT(caution, html_.find("id=\"overview\""));
}

TEST_F(HtmlReportTest, ManifestIsEmbeddedWithTheInputsChecksum) {
  const auto r = run("sha256sum " + source_path("demo-points/occurrences.csv"));
  ASSERT_EQ(r.exit_code, 0);
  const std::string manifest = html_.substr(html_.find("id=\"manifest\""));
  EXPECT_NE(manifest.find("&quot;sha256&quot;: &quot;" + r.output.substr(0, 64) + "&quot;"), std::string::npos);
}

TEST_F(HtmlReportTest, SameReportWithOneThreadApartFromTheManifest) {
  const auto r = run(envsift_binary() + " screen --quiet --threads 1 --points " + source_path("demo-points/occurrences.csv") +
                     demo_layers() + " --dem dem --out " + dir_ + "/out1.csv --report " + dir_ + "/report1.html");
  ASSERT_EQ(r.exit_code, 0) << r.output;
  const std::string one = read_file(dir_ + "/report1.html");
  auto before_manifest = [](const std::string& html, const std::string& out_name) {
    std::string s = html.substr(0, html.find("<h2 id=\"manifest\">"));
    for (std::size_t at; (at = s.find(out_name)) != std::string::npos;) s.erase(at, out_name.size());
    return s;
  };
  EXPECT_EQ(before_manifest(one, "out1.csv"), before_manifest(html_, "out.csv"));
}

TEST(DataUri, Base64EqualsCoreutils) {
  const auto dir = temp_dir("base64");
  // lengths 0..5 cover every padding case; bytes above 0x7f check sign handling
  for (const std::string& bytes : {std::string(""), std::string("f"), std::string("fo"), std::string("foo"),
                                  std::string("\xff\xfe\x80\x00\x7f", 5), std::string("envsift report")}) {
    write_file(dir + "/in", bytes);
    const auto r = run("base64 -w0 " + dir + "/in");
    ASSERT_EQ(r.exit_code, 0);
    EXPECT_EQ(svg::data_uri("x", bytes), "data:x;base64," + r.output);
  }
}

}  // namespace
}  // namespace envsift
