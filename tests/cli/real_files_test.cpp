// Reading files as the trade writes them. References: RFC 4180 (CSV quoting); the TDWG Darwin
// Core Text Guide and data-portal exports, whose tab-separated files use no quoting at all (a
// quote is a character) — common practice; Darwin Core's verbatimElevation term (TDWG Darwin Core
// standard). Each case runs the binary as a user would and checks every record's fields in the
// output against the input, field by field.
#include <gtest/gtest.h>

#include "../support.hpp"

namespace envsift {
namespace {

using namespace envsift::testing;

// Writes `content` to DIR/NAME, samples it on the demo layers (with `options`) into DIR/out.csv
// and returns what the run printed; the test fails here when the run does not succeed.
std::string sample_file(const std::string& dir, const std::string& name, const std::string& content,
                        const std::string& options = "") {
  write_file(dir + name, content);
  const auto r = run(envsift_binary() + " sample -q " + options + " --points " + dir + name + demo_layers() + " --out " + dir +
                     "/out.csv");
  EXPECT_EQ(r.exit_code, 0) << r.output;
  return r.output;
}

const std::string kHeader = "occurrenceID\tscientificName\tdecimalLongitude\tdecimalLatitude\tlocality\n";

// A tab-separated export whose localities hold quotes at a field's start, inside, unclosed, and a
// quote-comma sequence: literal text, one record per line.
std::vector<std::vector<std::string>> tsv_rows() {
  return {{"T1", "Oxmontia nivicola", "0.47831", "0.6708", "ridge 5\" north"},
          {"T2", "Oxmontia nivicola", "0.42082", "0.41779", "\"Old mill\" road"},
          {"T3", "Oxmontia nivicola", "0.5125", "0.26933", "\"Big rock, near hut"},
          {"T4", "Oxmontia nivicola", "0.48159", "0.61887", "stream \"\", below"},
          {"T5", "Oxmontia nivicola", "0.5496", "0.5767", "\","},
          {"T6", "Oxmontia nivicola", "0.43217", "0.44899", "plain"}};
}

std::string as_tsv(const std::vector<std::vector<std::string>>& rows) {
  std::string text = kHeader;
  for (const auto& r : rows) {
    for (std::size_t i = 0; i < r.size(); ++i) text += (i ? "\t" : "") + r[i];
    text += "\n";
  }
  return text;
}

TEST(RealFiles, TabSeparatedExportIsReadLiterallyEveryLineOneRecord) {
  const auto dir = temp_dir("tsv-literal");
  const auto rows = tsv_rows();
  for (const char* name : {"/export.tsv", "/occurrence.txt"}) {  // by extension, and sniffed
    SCOPED_TRACE(name);
    const std::string said = sample_file(dir, name, as_tsv(rows));
    EXPECT_EQ(said.find("warning"), std::string::npos) << said;
    const Table out = read_csv(dir + "/out.csv");
    ASSERT_EQ(out.rows.size(), rows.size());
    for (std::size_t i = 0; i < rows.size(); ++i) {
      for (std::size_t c = 0; c < rows[i].size(); ++c) EXPECT_EQ(out.rows[i][c], rows[i][c]) << "row " << i;
      EXPECT_EQ(out.rows[i][out.column("status")], "ok") << "row " << i;
    }
  }
}

TEST(RealFiles, TheSameFileAsRfc4180MergesOnlyWithACodeAndAWarning) {
  const auto dir = temp_dir("tsv-rfc4180");
  const std::string said = sample_file(dir, "/export.tsv", as_tsv(tsv_rows()), "--quoting rfc4180");
  // RFC 4180: "Old mill" road → Old mill road; "Big rock, near hut… opens a quoted field that runs
  // on over the following lines to the next quote, so those lines become one record
  const Table out = read_csv(dir + "/out.csv");
  ASSERT_LT(out.rows.size(), 6u);
  EXPECT_EQ(out.rows[1][4], "Old mill road");
  bool flagged_merge = false;
  for (const auto& row : out.rows) flagged_merge |= row[out.column("status")].find("spans_lines") != std::string::npos;
  EXPECT_TRUE(flagged_merge);
  EXPECT_NE(said.find("1 record(s) span several lines, a quoted field holding a line break (lines 4-6"), std::string::npos)
      << said;
  EXPECT_NE(said.find("--quoting literal"), std::string::npos) << said;
}

TEST(RealFiles, CsvKeepsRfc4180Quoting) {
  const auto dir = temp_dir("csv-rfc4180");
  sample_file(dir, "/p.csv",
              "occurrenceID,scientificName,decimalLongitude,decimalLatitude,locality\n"
              "C1,Oxmontia nivicola,0.47831,0.6708,\"plot 1, \"\"upper\"\" meadow\"\n"
              "C2,Oxmontia nivicola,0.42082,0.41779,\"two\nlines\"\n");
  const Table out = read_csv(dir + "/out.csv");
  ASSERT_EQ(out.rows.size(), 2u);
  EXPECT_EQ(out.rows[0][4], "plot 1, \"upper\" meadow");
  EXPECT_EQ(out.rows[1][4], "two\nlines");
  EXPECT_EQ(out.rows[1][out.column("status")], "spans_lines");  // merged lines never go unsaid
}

TEST(RealFiles, EveryColumnOptionNamingAMissingColumnIsAnError) {
  const std::string points = " --points " + source_path("demo-points/occurrences.csv") + demo_layers();
  const auto dir = temp_dir("missing-columns");
  for (const std::string option : {"--id-column catalogNumber", "--uncertainty-column coordUncertainty",
                                   "--taxon-column species", "--longitude-column lon", "--latitude-column lat",
                                   "--min-elevation-column elevaton --dem dem", "--max-elevation-column maxElev --dem dem"}) {
    SCOPED_TRACE(option);
    auto r = run(envsift_binary() + " screen -q" + points + " " + option + " --out " + dir + "/out.csv");
    EXPECT_EQ(r.exit_code, 3) << r.output;
    const std::string wrong = option.substr(option.find(' ') + 1, option.find(' ', option.find(' ') + 1) - option.find(' ') - 1);
    EXPECT_NE(r.output.find("column '" + wrong + "' (columns found: 'occurrenceID'"), std::string::npos) << r.output;
    EXPECT_NE(r.output.find(option.substr(0, option.find(' '))), std::string::npos) << r.output;
    EXPECT_FALSE(std::ifstream(dir + "/out.csv")) << "nothing written";
  }
}

TEST(RealFiles, DemWithoutElevationColumnsSaysSoAndReadsVerbatimElevation) {
  const auto dir = temp_dir("verbatim-elevation");
  // QM-0002's DEM is 1642 m and QM-0003's 161 m (the demo's fixtures, gdallocationinfo)
  write_file(dir + "/none.csv", "occurrenceID,scientificName,decimalLongitude,decimalLatitude\n"
                                "V1,Oxmontia nivicola,0.42082,0.41779\n");
  auto r = run(envsift_binary() + " screen -q --points " + dir + "/none.csv" + demo_layers() + " --dem dem --out " + dir + "/a.csv");
  ASSERT_EQ(r.exit_code, 0) << r.output;
  EXPECT_NE(r.output.find("no reported elevation"), std::string::npos) << r.output;

  write_file(dir + "/verbatim.csv", "occurrenceID,scientificName,decimalLongitude,decimalLatitude,verbatimElevation\n"
                                    "V1,Oxmontia nivicola,0.42082,0.41779,1600-1700 m\n"
                                    "V2,Oxmontia nivicola,0.81,0.33,1767 m\n"
                                    "V3,Oxmontia nivicola,0.42082,0.41779,5000 to 5400 ft\n"
                                    "V4,Oxmontia nivicola,0.42082,0.41779,high up\n");
  r = run(envsift_binary() + " screen -q --points " + dir + "/verbatim.csv" + demo_layers() + " --dem dem --out " + dir + "/b.csv");
  ASSERT_EQ(r.exit_code, 0) << r.output;
  EXPECT_NE(r.output.find("read from verbatimElevation"), std::string::npos) << r.output;
  const Table out = read_csv(dir + "/b.csv");
  const std::size_t stat = out.column("elevation_mismatch_stat"), status = out.column("status");
  EXPECT_EQ(out.rows[0][stat], "0");     // 1642 m lies inside 1600-1700 m
  EXPECT_EQ(out.rows[1][stat], "1606");  // 1767 m against 161 m
  EXPECT_EQ(out.rows[2][stat], "0");     // 1524-1645.92 m holds 1642 m
  EXPECT_EQ(out.rows[3][status].rfind("elevation_unreadable:verbatimElevation;", 0), 0u) << out.rows[3][status];
}

TEST(RealFiles, NotScoredBreakdownNamesTheReasonThatPreventedScoring) {
  const auto dir = temp_dir("not-scored");
  write_file(dir + "/p.csv", "occurrenceID;scientificName;decimalLongitude;decimalLatitude\n"
                             "N1;Oxmontia nivicola;0,47831;95,5\n"   // decimal comma, out of range
                             "N2;Oxmontia nivicola;0,5;\n"           // decimal comma, missing latitude
                             "N3;Oxmontia nivicola\n"                // ragged, no coordinates
                             "N4;Oxmontia nivicola;5,0;5,0\n");      // decimal comma, off every layer
  auto r = run(envsift_binary() + " screen -q --points " + dir + "/p.csv" + demo_layers() + " --out " + dir + "/out.csv");
  ASSERT_EQ(r.exit_code, 0) << r.output;
  EXPECT_NE(r.output.find("4 not scored (outside_layer:dem 1, position_empty 2, position_off_globe 1)"), std::string::npos)
      << r.output;
  EXPECT_EQ(r.output.find("not scored (read_decimal_comma"), std::string::npos) << r.output;
}

// Old Mac files end lines with a lone CR; databases and statistics packages write NA, null, NULL,
// \N or - for a missing value (common practice: R's NA, SQL's NULL, MySQL's \N in its dumps).
TEST(RealFiles, CrOnlyLineEndingsAndMissingValueMarkers) {
  const auto dir = temp_dir("cr-and-markers");
  sample_file(dir, "/mac.csv", "occurrenceID,scientificName,decimalLongitude,decimalLatitude\r"
                               "M1,Oxmontia nivicola,0.47831,0.6708\r"
                               "M2,Oxmontia nivicola,NA,0.41779\r"
                               "M3,Oxmontia nivicola,0.5125,null\r"
                               "M4,Oxmontia nivicola,\\N,NULL\r"
                               "M5,Oxmontia nivicola,-,0.61887\r");
  const Table out = read_csv(dir + "/out.csv");
  ASSERT_EQ(out.rows.size(), 5u);
  EXPECT_EQ(out.header[1], "scientificName");
  const std::size_t status = out.column("status");
  EXPECT_EQ(out.rows[0][status], "ok");
  for (std::size_t i = 1; i < 5; ++i) EXPECT_EQ(out.rows[i][status], "position_empty") << out.rows[i][0];
  EXPECT_EQ(out.rows[3][2], "\\N");  // the original text is kept

  write_file(dir + "/values.csv", "occurrenceID,scientificName,t\nV1,Oxmontia nivicola,NA\nV2,Oxmontia nivicola,12.5\n");
  const auto r = run(envsift_binary() + " screen -q --single-taxon --points " + dir + "/values.csv --value-columns t --out " +
                     dir + "/v.csv");
  ASSERT_EQ(r.exit_code, 0) << r.output;
  EXPECT_EQ(read_csv(dir + "/v.csv").rows[0][3].rfind("value_missing:t", 0), 0u);
}

// A file with its own `status` and `rank` columns (a collection database's export): refused with
// the way out, then screened with --column-prefix; shards of it merge into the single run.
TEST(RealFiles, InputColumnsNamedLikeEnvsiftsGetAPrefixedOutput) {
  const auto dir = temp_dir("column-prefix");
  run("awk -F, 'BEGIN{OFS=\",\"} NR==1{print $0,\"status\",\"rank\"; next} {print $0,\"checked\",NR}' " +
      source_path("demo-points/occurrences.csv") + " > " + dir + "/own.csv");
  const std::string base = envsift_binary() + " screen -q --points " + dir + "/own.csv" + demo_layers();
  auto r = run(base + " --out " + dir + "/refused.csv");
  EXPECT_EQ(r.exit_code, 2) << r.output;
  EXPECT_NE(r.output.find("two columns named 'status'"), std::string::npos) << r.output;
  EXPECT_NE(r.output.find("--column-prefix"), std::string::npos) << r.output;

  r = run(base + " --column-prefix envsift_ --gis " + dir + "/all.geojson --out " + dir + "/single.csv");
  ASSERT_EQ(r.exit_code, 0) << r.output;
  const Table out = read_csv(dir + "/single.csv");
  EXPECT_EQ(out.rows[0][out.column("status")], "checked");  // the input's own, untouched
  EXPECT_EQ(out.rows[0][out.column("envsift_status")], "ok");
  EXPECT_FALSE(out.rows[0][out.column("envsift_rank")].empty());
  out.column("envsift_robust_z_stat");
  EXPECT_NE(read_file(dir + "/all.geojson").find("\"envsift_rank\": "), std::string::npos);  // an integer field

  for (const char* i : {"0", "1"})
    ASSERT_EQ(run(base + " --column-prefix envsift_ --shard " + i + "/2 --out " + dir + "/shard" + i + ".csv").exit_code, 0);
  r = run(envsift_binary() + " merge " + dir + "/shard0.csv " + dir + "/shard1.csv --out " + dir + "/merged.csv");
  ASSERT_EQ(r.exit_code, 0) << r.output;
  EXPECT_TRUE(read_file(dir + "/merged.csv") == read_file(dir + "/single.csv"));
}

}  // namespace
}  // namespace envsift
