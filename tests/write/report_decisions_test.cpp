// Decisions from an earlier round in the report and the per-taxon summary. The demo run with
// three of its top suspects decided (error, valid, unsure): every decided record appears in each
// picture of its taxon in its own mark, pictures stay well-formed for libxml2's `xmllint` (XML
// 1.0) and their marks resolve; the marks' colours come from the Okabe & Ito palette (Color
// Universal Design, 2008; its hex values from memory) and differ in shape; the counts per taxon
// in the report and in the summary equal those counted here from the output CSV; the notes are
// shown; decided error and valid records are not among the top suspects, an unsure one is.
#include <map>
#include <set>
#include <unistd.h>

#include <gtest/gtest.h>

#include "../report_support.hpp"

namespace envsift {
namespace {

using namespace envsift::testing;

class ReportDecisionsTest : public ::testing::Test {
 protected:
  static void SetUpTestSuite() {
    dir_ = temp_dir("report-decisions-" + std::to_string(::getpid()));
    // QM-0332 and QM-0003 are the demo's two worst suspects, QM-0025 the third (the demo fixture)
    write_file(dir_ + "/decisions.csv",
               "occurrenceID,decision,note,reviewer\n"
               "QM-0332,error,label gives the shipping town,Reviewer A\n"
               "QM-0003,valid,specimen seen: a true summit record,\n"
               "QM-0025,unsure,asked the collector,\n");
    const auto r = run(envsift_binary() + " screen --quiet --points " + source_path("demo-points/occurrences.csv") +
                       demo_layers() + " --dem dem --out " + dir_ + "/out.csv --report " + dir_ +
                       "/report.html --summary " + dir_ + "/summary.csv --decisions " + dir_ + "/decisions.csv");
    ASSERT_EQ(r.exit_code, 0) << r.output;
    html_ = read_file(dir_ + "/report.html");
  }
  static std::string dir_, html_;
  const std::map<std::string, std::string> decided_{{"QM-0332", "error"}, {"QM-0003", "valid"}, {"QM-0025", "unsure"}};
};
std::string ReportDecisionsTest::dir_, ReportDecisionsTest::html_;

TEST_F(ReportDecisionsTest, DecidedRecordsHaveTheirOwnMarkInEveryPictureOfTheirTaxon) {
  const Table out = read_csv(dir_ + "/out.csv");
  std::map<std::string, std::string> taxon_of;
  for (const auto& row : out.rows) taxon_of[row[out.column("occurrenceID")]] = row[out.column("scientificName")];
  std::string files;
  std::size_t checked = 0;
  for (const auto& s : report_sections(html_, dir_)) {
    for (std::size_t k = 0; k < s.pictures.size(); ++k) {
      const std::string& svg = s.pictures[k];
      write_file(dir_ + "/" + std::to_string(checked) + "-" + std::to_string(k) + ".svg", svg);
      files += " " + dir_ + "/" + std::to_string(checked) + "-" + std::to_string(k) + ".svg";
      EXPECT_TRUE(unresolved_references(svg).empty()) << s.taxon;
      for (const auto& [id, decision] : decided_) {
        if (taxon_of[id] != s.taxon) continue;
        EXPECT_NE(mark_of(svg, id).find("href=\"#" + decision + "\""), std::string::npos) << s.taxon << " " << id;
        ++checked;
      }
    }
  }
  EXPECT_GE(checked, 6u);  // three records, each in its taxon's map and pair plot at least
  const auto r = run("xmllint --noout" + files);
  EXPECT_EQ(r.exit_code, 0) << r.output;
}

TEST_F(ReportDecisionsTest, MarksUseThePaletteAndDifferInShape) {
  // Okabe & Ito (2008): orange, yellow, sky blue, vermillion; black outlines
  const std::map<std::string, std::string> colour{
      {"suspect", "#E69F00"}, {"unsure", "#F0E442"}, {"valid", "#56B4E9"}, {"error", "#D55E00"}};
  std::map<std::string, std::string> shape;  // mark → its symbol without its colour
  for (const auto& s : report_sections(html_, dir_))
    for (const auto& svg : s.pictures)
      for (const auto& [id, hex] : colour) {
        const std::size_t at = svg.find("<g id=\"" + id + "\">");
        if (at == std::string::npos) continue;
        std::string symbol = svg.substr(at + id.size() + 9, svg.find("</g>", at) - at - id.size() - 9);
        EXPECT_NE(symbol.find(hex), std::string::npos) << id;
        EXPECT_NE(symbol.find("stroke=\"#000\""), std::string::npos) << id;  // outlined: reads on any background
        for (std::size_t c; (c = symbol.find(hex)) != std::string::npos;) symbol.erase(c, hex.size());
        shape[id] = symbol;
      }
  ASSERT_EQ(shape.size(), 4u);  // all four marks are drawn in this report
  std::set<std::string> distinct;
  for (const auto& [id, symbol] : shape) distinct.insert(symbol);
  EXPECT_EQ(distinct.size(), 4u);  // without colour, no two look alike
}

TEST_F(ReportDecisionsTest, CountsPerTaxonEqualTheOutput) {
  const Table out = read_csv(dir_ + "/out.csv");
  std::map<std::string, std::map<std::string, int>> decided;  // taxon → decision → records
  std::map<std::string, int> open_flagged;
  for (const auto& row : out.rows) {
    const std::string taxon = row[out.column("scientificName")], d = row[out.column("decision")];
    if (!d.empty()) ++decided[taxon][d];
    if (d != "error" && d != "valid" && !row[out.column("flags")].empty()) ++open_flagged[taxon];
  }
  ASSERT_EQ(decided.size(), 2u);  // the three records are of two taxa
  auto count = [&](const std::string& taxon, const std::string& d) {
    const auto t = decided.find(taxon);
    return t == decided.end() || !t->second.count(d) ? 0 : t->second.at(d);
  };
  const Table summary = read_csv(dir_ + "/summary.csv");
  for (const auto& row : summary.rows) {
    const std::string taxon = row[summary.column("taxon")];
    for (const char* d : {"error", "valid", "unsure"})
      EXPECT_EQ(row[summary.column(std::string("decided_") + d)], std::to_string(count(taxon, d))) << taxon << " " << d;
    EXPECT_EQ(row[summary.column("flagged")], std::to_string(open_flagged[taxon])) << taxon;
  }
  for (const auto& s : report_sections(html_, dir_)) {
    const int open = open_flagged[s.taxon];
    std::string words;
    for (const char* d : {"error", "valid", "unsure"})
      if (count(s.taxon, d)) words += (words.empty() ? "" : ", ") + std::to_string(count(s.taxon, d)) + " " + d;
    if (words.empty()) {  // a taxon without decisions: all its suspects are open
      EXPECT_NE(s.html.find(std::to_string(open) + (open == 1 ? " suspect<" : " suspects<")), std::string::npos) << s.taxon;
    } else {
      EXPECT_NE(s.html.find(std::to_string(open) + " open suspects</span>; decided in earlier rounds: " + words + ";"),
                std::string::npos) << s.taxon;
    }
  }
  // overall: one of each
  EXPECT_NE(html_.find("<td class=\"n\">3 (1 error, 1 valid, 1 unsure)</td>"), std::string::npos);
}

TEST_F(ReportDecisionsTest, NotesAreShownAndDecidedRecordsLeaveTheTopSuspects) {
  EXPECT_NE(html_.find("<td>label gives the shipping town</td>"), std::string::npos);
  EXPECT_NE(html_.find("<td>specimen seen: a true summit record</td>"), std::string::npos);
  const std::size_t top = html_.find("id=\"suspects\""), index = html_.find("id=\"index\"");
  ASSERT_LT(top, index);
  const std::string table = html_.substr(top, index - top);
  EXPECT_EQ(table.find("<td>QM-0332</td>"), std::string::npos);
  EXPECT_EQ(table.find("<td>QM-0003</td>"), std::string::npos);
  EXPECT_NE(table.find("<td>QM-0025</td>"), std::string::npos);  // unsure: still open
  // what a valid record would have been flagged for is in its taxon's table
  EXPECT_NE(html_.find("<td>set aside: "), std::string::npos);
}

TEST(ReportWithoutDecisions, SummaryHasNoDecisionColumns) {
  const auto dir = temp_dir("summary-no-decisions");
  const auto r = run(envsift_binary() + " screen --quiet --points " + source_path("demo-points/occurrences.csv") +
                     demo_layers() + " --out " + dir + "/out.csv --summary " + dir + "/summary.csv");
  ASSERT_EQ(r.exit_code, 0) << r.output;
  EXPECT_EQ(read_file(dir + "/summary.csv").find("decided_"), std::string::npos);
}

}  // namespace
}  // namespace envsift
