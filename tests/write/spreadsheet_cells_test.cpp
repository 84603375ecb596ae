// Files made for spreadsheets never carry a live formula. Reference: OWASP, "CSV Injection" (from
// memory): spreadsheet programs evaluate a cell that begins with =, +, -, @, a tab or a carriage
// return; the remedy is a leading apostrophe, which they show as text. The points below carry
// the cases (=HYPERLINK, =IMPORTXML, @SUM) and more in the taxon, the ID and a
// reviewer's note; the decisions template and the summary must neutralise every one, the main
// output must keep the input's fields byte for byte, and the template must read back as it was.
#include <gtest/gtest.h>

#include "../support.hpp"
#include "envsift/spreadsheet_cells.hpp"

namespace envsift {
namespace {

using namespace envsift::testing;

// A cell a spreadsheet would run: begins with a formula character and is not a plain number.
bool live_formula(const std::string& cell) {
  if (cell.empty() || std::string("=+-@\t\r").find(cell[0]) == std::string::npos) return false;
  try {
    std::size_t used = 0;
    std::stod(cell, &used);
    return used != cell.size();
  } catch (...) {
    return true;
  }
}

const std::vector<std::string> kFormulas = {"=HYPERLINK(\"http://example.invalid\",\"open\")",
                                            "=IMPORTXML(\"http://example.invalid\",\"//a\")",
                                            "@SUM(1)", "+1+2", "-2+3", "\tTAB", "'=already quoted"};

TEST(SpreadsheetCells, NeutralisedCellsReadBackExactly) {
  for (const std::string& cell : kFormulas) {
    SCOPED_TRACE(cell);
    const std::string safe = spreadsheet_safe(cell);
    EXPECT_FALSE(live_formula(safe)) << safe;
    EXPECT_EQ(from_spreadsheet_safe(safe), cell);
  }
  for (const char* plain : {"-12.5", "+3", "1e-3", "Oxmontia nivicola", "'quoted", ""}) {
    EXPECT_EQ(spreadsheet_safe(plain), plain);  // numbers stay numbers, text stays as it is
    EXPECT_EQ(from_spreadsheet_safe(plain), plain);
  }
}

TEST(SpreadsheetCells, TemplateAndSummaryCarryNoFormulaAndReadBack) {
  const auto dir = temp_dir("spreadsheet-cells");
  // the demo points with one taxon renamed to a formula and five IDs turned into formulas
  Table demo = read_csv(source_path("demo-points/occurrences.csv"));
  const std::size_t id = demo.column("occurrenceID"), taxon = demo.column("scientificName");
  const std::string renamed = demo.rows[0][taxon];
  std::string csv = "occurrenceID,scientificName,decimalLongitude,decimalLatitude,coordinateUncertaintyInMeters,"
                    "minimumElevationInMeters,locality\n";
  std::vector<std::string> formula_ids;
  for (std::size_t r = 0; r < demo.rows.size(); ++r) {
    auto row = demo.rows[r];
    if (row[taxon] == renamed) row[taxon] = kFormulas[0];
    if (r < 6) {
      row[id] = kFormulas[1 + r];
      formula_ids.push_back(row[id]);
    }
    for (std::size_t c = 0; c < row.size(); ++c) {
      std::string f = row[c];
      const bool quote = f.find_first_of(",\"\t") != std::string::npos;
      std::string q;
      for (char ch : f) q += ch == '"' ? std::string("\"\"") : std::string(1, ch);
      csv += (c ? "," : "") + (quote ? "\"" + q + "\"" : f);
    }
    csv += "\n";
  }
  write_file(dir + "/points.csv", csv);
  // an earlier round: a note that is a formula, on a record whose ID is one
  write_file(dir + "/decisions.csv", "occurrenceID,decision,note\n\"" + std::string("@SUM(1)") + "\",unsure,=IMPORTXML(\"x\")\n");
  const std::string screen = envsift_binary() + " screen -q" + demo_layers() + " --points " + dir + "/points.csv";
  auto r = run(screen + " --decisions " + dir + "/decisions.csv --out " + dir + "/out.csv --summary " + dir +
               "/summary.csv --decisions-template " + dir + "/template.csv --decisions-template-top 1000");
  ASSERT_EQ(r.exit_code, 0) << r.output;

  for (const char* file : {"/template.csv", "/summary.csv"}) {
    const Table t = read_csv(dir + file);
    ASSERT_FALSE(t.rows.empty()) << file;
    for (const auto& row : t.rows)
      for (const auto& cell : row) EXPECT_FALSE(live_formula(cell)) << file << ": " << cell;
  }
  // the summary names the formula taxon, neutralised
  bool taxon_listed = false;
  for (const auto& row : read_csv(dir + "/summary.csv").rows) taxon_listed |= row[0] == "'" + kFormulas[0];
  EXPECT_TRUE(taxon_listed);
  // the main output keeps the input's own fields byte for byte
  const Table out = read_csv(dir + "/out.csv"), in = read_csv(dir + "/points.csv");
  ASSERT_EQ(out.rows.size(), in.rows.size());
  for (std::size_t i = 0; i < in.rows.size(); ++i)
    EXPECT_TRUE(std::equal(in.rows[i].begin(), in.rows[i].end(), out.rows[i].begin())) << "row " << i;

  // the template, filled in as a reviewer would (each formula ID decided `error`), read back
  const Table t = read_csv(dir + "/template.csv");
  std::string filled = "occurrenceID,decision,note\n";
  std::size_t carried_note = 0;
  for (const auto& row : t.rows) {
    const std::string original = from_spreadsheet_safe(row[0]);
    if (original == "@SUM(1)") carried_note += row[t.column("note")] == "'=IMPORTXML(\"x\")";
    if (std::find(formula_ids.begin(), formula_ids.end(), original) == formula_ids.end()) continue;
    std::string q;
    for (char ch : row[0]) q += ch == '"' ? std::string("\"\"") : std::string(1, ch);
    filled += "\"" + q + "\",error,\n";
  }
  EXPECT_EQ(carried_note, 1u);  // the earlier note, carried over and neutralised
  write_file(dir + "/filled.csv", filled);
  r = run(screen + " --decisions " + dir + "/filled.csv --out " + dir + "/round2.csv");
  ASSERT_EQ(r.exit_code, 0) << r.output;
  EXPECT_EQ(r.output.find("not in the points"), std::string::npos) << r.output;  // every ID matched
  const Table round2 = read_csv(dir + "/round2.csv");
  std::size_t errors = 0;
  for (const auto& row : round2.rows)
    if (std::find(formula_ids.begin(), formula_ids.end(), row[id]) != formula_ids.end())
      errors += row[round2.column("decision")] == "error";
  EXPECT_GE(errors, 1u);
  EXPECT_EQ(errors, std::count(filled.begin(), filled.end(), '\n') - 1);
}

TEST(SpreadsheetCells, ALayerNamedLikeAFormulaIsRefused) {
  const auto dir = temp_dir("formula-layer");
  const auto r = run(envsift_binary() + " sample -q --points " + source_path("demo-points/occurrences.csv") +
                     " --layers '@SUM(1)=" + demo_layer_paths()[0] + "' --out " + dir + "/o.csv");
  EXPECT_EQ(r.exit_code, 2) << r.output;
  EXPECT_NE(r.output.find("begins like a spreadsheet formula"), std::string::npos) << r.output;
}

}  // namespace
}  // namespace envsift
