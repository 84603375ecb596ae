// A coordinate's sign as the trade writes it, or a refusal; never a minus read as a plus. The
// characters come from Unicode's character database through Python's unicodedata module (Debian's
// python3): every dash (general category Pd) and every character whose name holds MINUS. The
// accounting-style "(0.2)" and the trailing "0.2-" are conventions of spreadsheets and
// accounting printouts (common practice), which readers disagree on; envsift refuses them.
// Windows-1252 against Python's cp1252 codec.
#include <gtest/gtest.h>

#include <cmath>

#include "../support.hpp"
#include "envsift/read/coordinates.hpp"
#include "envsift/read/text_encoding.hpp"
#include "envsift/reason_codes.hpp"

namespace envsift {
namespace {

using namespace envsift::testing;

// The characters, each as its UTF-8 text, from Python's unicodedata.
std::vector<std::pair<std::string, std::string>> minus_and_dash_characters() {
  const auto r = run("python3 -c 'import sys, unicodedata\n"
                     "for c in map(chr, range(sys.maxunicode + 1)):\n"
                     "  n = unicodedata.name(c, \"\")\n"
                     "  if unicodedata.category(c) == \"Pd\" or \"MINUS\" in n: print(c.encode().hex(), n.replace(\" \", \"_\"))'");
  EXPECT_EQ(r.exit_code, 0) << r.output;
  std::vector<std::pair<std::string, std::string>> out;
  std::istringstream lines(r.output);
  for (std::string hex, name; lines >> hex >> name;) {
    std::string utf8;
    for (std::size_t i = 0; i + 1 < hex.size(); i += 2) utf8 += static_cast<char>(std::stoi(hex.substr(i, 2), nullptr, 16));
    out.emplace_back(utf8, name);
  }
  return out;
}

TEST(CoordinateSigns, NoMinusSignOrDashIsEverReadAsPlus) {
  const auto characters = minus_and_dash_characters();
  ASSERT_GT(characters.size(), 25u);  // Unicode 14 has 26 dashes alone
  std::size_t read_as_minus = 0;
  for (const auto& [c, name] : characters) {
    SCOPED_TRACE(name);
    for (const std::string& text : {c + "0.2", c + "12\u00B030'S", c + " 0.2"}) {
      const ParsedNumber p = parse_coordinate(text, Axis::latitude);
      if (p.problem.empty()) {
        EXPECT_LT(p.value, 0) << text;  // minus, or refused
      }
    }
    const ParsedNumber leading = parse_coordinate(c + "0.2", Axis::longitude);
    if (leading.problem.empty()) {
      ++read_as_minus;
      EXPECT_DOUBLE_EQ(leading.value, -0.2);
      EXPECT_EQ(leading.note, c == "-" ? "" : reason::read_dash_as_minus);
    }
    const ParsedNumber trailing = parse_coordinate("0.2" + c, Axis::longitude);  // after the number: never a plus
    EXPECT_FALSE(trailing.problem.empty()) << "0.2" << c << " read as " << trailing.value;
  }
  EXPECT_GE(read_as_minus, 8u);
  // the two the issue names: U+2212 MINUS SIGN and U+2013 EN DASH
  EXPECT_DOUBLE_EQ(parse_coordinate("\u22120.2", Axis::longitude).value, -0.2);
  EXPECT_DOUBLE_EQ(parse_coordinate("\u20130.2", Axis::longitude).value, -0.2);
}

TEST(CoordinateSigns, SignsReadersDisagreeOnAreRefused) {
  for (const char* text : {"(0.2)", "(12.5)", "0.2-", "12.5+", "12\u00B030'-"}) {
    SCOPED_TRACE(text);
    EXPECT_EQ(parse_coordinate(text, Axis::longitude).problem, reason::position_sign_unclear);
  }
  // characters between the numbers that are no degree, minute or second mark: not a coordinate
  for (const char* text : {"1_0", "1(0", "12-30-15", "12,30,15", "12\u00A730", "1/2", "0.2\u00960"}) {
    SCOPED_TRACE(text);
    EXPECT_EQ(parse_coordinate(text, Axis::longitude).problem, reason::position_not_number);
  }
  // the forms that were read before still are
  EXPECT_DOUBLE_EQ(parse_coordinate("-0.2", Axis::longitude).value, -0.2);
  EXPECT_DOUBLE_EQ(parse_coordinate("+0.2", Axis::longitude).value, 0.2);
  EXPECT_NEAR(parse_coordinate("12\u00B030\u203215\u2033S", Axis::latitude).value, -(12 + 30 / 60.0 + 15 / 3600.0), 1e-12);
  EXPECT_NEAR(parse_coordinate("12d 30m 15s", Axis::latitude).value, 12 + 30 / 60.0 + 15 / 3600.0, 1e-12);
  EXPECT_NEAR(parse_coordinate("12\u00B030\u2019 15\u201D W", Axis::longitude).value, -(12 + 30 / 60.0 + 15 / 3600.0), 1e-12);
  EXPECT_NEAR(parse_coordinate("-12:30:15", Axis::longitude).value, -(12 + 30 / 60.0 + 15 / 3600.0), 1e-12);
}

// A file written by a Windows program in "Latin-1" is Windows-1252: its en dash is the byte 0x96.
// Reference: Python's cp1252 codec (Debian's python3) for every byte 0x80-0xFF; the five bytes it
// leaves undefined keep their Latin-1 code points (WHATWG Encoding Standard, windows-1252 index).
TEST(CoordinateSigns, AWindowsFilesEnDashIsAMinus) {
  const auto r = run("python3 -c 'import sys\n"
                     "for b in range(0x80, 0x100):\n"
                     "  try: c = bytes([b]).decode(\"cp1252\")\n"
                     "  except UnicodeDecodeError: c = chr(b)\n"
                     "  print(b, c.encode().hex())'");
  ASSERT_EQ(r.exit_code, 0) << r.output;
  std::istringstream lines(r.output);
  std::size_t checked = 0;
  for (int byte; lines >> byte;) {
    std::string hex, expected;
    lines >> hex;
    for (std::size_t i = 0; i + 1 < hex.size(); i += 2) expected += static_cast<char>(std::stoi(hex.substr(i, 2), nullptr, 16));
    bool changed = false;
    EXPECT_EQ(to_utf8(std::string(1, static_cast<char>(byte)), changed), expected) << "byte " << byte;
    EXPECT_TRUE(changed);
    ++checked;
  }
  EXPECT_EQ(checked, 128u);
  const auto dir = temp_dir("cp1252-minus");
  write_file(dir + "/p.csv", "occurrenceID,scientificName,decimalLongitude,decimalLatitude\n"
                             "D,Oxmontia nivicola,\x96" "0.2,0.5\nE,Oxmontia nivicola,-0.2,0.5\n");
  const auto s = run(envsift_binary() + " sample -q" + demo_layers() + " --points " + dir + "/p.csv --out " + dir + "/o.csv");
  ASSERT_EQ(s.exit_code, 0) << s.output;
  const Table t = read_csv(dir + "/o.csv");
  const auto rows = by_id(t);
  EXPECT_EQ(rows.at("D")[t.column("decimalLongitude")], "\u20130.2");  // written back as UTF-8
  EXPECT_EQ(rows.at("D")[t.column("status")], "latin1_converted;read_dash_as_minus");
  EXPECT_EQ(rows.at("D")[t.column("dem")], rows.at("E")[t.column("dem")]);
}

// 0/0 is what broken exports write for "no coordinates" (common practice: data portals flag it);
// it is coded, not sampled. Through the whole reader, as a user's file.
TEST(CoordinateSigns, ZeroZeroIsCodedAndNotSampled) {
  const auto dir = temp_dir("zero-zero");
  write_file(dir + "/p.csv", "occurrenceID,scientificName,decimalLongitude,decimalLatitude\n"
                             "A,Oxmontia nivicola,0,0\nB,Oxmontia nivicola,0.0,-0.00\nC,Oxmontia nivicola,0.47831,0.6708\n"
                             "D,Oxmontia nivicola,\u22120.2,0.5\nE,Oxmontia nivicola,-0.2,0.5\n");
  const auto r = run(envsift_binary() + " sample -q" + demo_layers() + " --points " + dir + "/p.csv --out " + dir + "/o.csv");
  ASSERT_EQ(r.exit_code, 0) << r.output;
  const auto rows = by_id(read_csv(dir + "/o.csv"));
  const Table t = read_csv(dir + "/o.csv");
  EXPECT_EQ(rows.at("A")[t.column("status")], reason::position_zero_zero);
  EXPECT_EQ(rows.at("B")[t.column("status")], reason::position_zero_zero);
  EXPECT_EQ(rows.at("A")[t.column("dem")], "");
  EXPECT_EQ(rows.at("C")[t.column("status")], "ok");
  // the U+2212 record is sampled where the hyphen-minus record is
  EXPECT_EQ(rows.at("D")[t.column("status")].find(reason::read_dash_as_minus), 0u);
  for (const char* layer : {"dem", "temperature", "rainfall", "dry_months"})
    EXPECT_EQ(rows.at("D")[t.column(layer)], rows.at("E")[t.column(layer)]) << layer;
}

}  // namespace
}  // namespace envsift
