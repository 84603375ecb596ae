// Delimited-text parsing. Reference: RFC 4180 "Common Format and MIME Type for Comma-Separated
// Values (CSV) Files" (IETF, 2005) — quoting rules in its section 2, items 5-7.
#include "envsift/read/csv_reader.hpp"

#include <sstream>

#include <gtest/gtest.h>

#include "envsift/errors.hpp"

namespace envsift {
namespace {

std::vector<std::vector<std::string>> parse(const std::string& text, char delimiter = ',') {
  std::istringstream in(text);
  CsvReader reader(in, delimiter, "test.csv");
  std::vector<std::vector<std::string>> rows;
  std::vector<std::string> fields;
  std::size_t line;
  while (reader.next(fields, line)) rows.push_back(fields);
  return rows;
}

using Rows = std::vector<std::vector<std::string>>;

TEST(CsvReader, QuotedFieldsHoldDelimitersQuotesAndLineBreaks) {
  // RFC 4180 §2.6 (line breaks, commas, quotes inside quotes) and §2.7 (doubled quote)
  EXPECT_EQ(parse("a,b\n\"x,y\",\"say \"\"hi\"\"\"\n\"two\nlines\",z\n"),
            (Rows{{"a", "b"}, {"x,y", "say \"hi\""}, {"two\nlines", "z"}}));
}

TEST(CsvReader, CrlfAndLfBothEndRecordsAndLastLineMayLackOne) {
  // RFC 4180 §2.1-2.2: CRLF line ends; the last record may have none
  EXPECT_EQ(parse("a,b\r\n1,2\r\n3,4"), (Rows{{"a", "b"}, {"1", "2"}, {"3", "4"}}));
}

TEST(CsvReader, EmptyFieldsAreKept) { EXPECT_EQ(parse(",,\n"), (Rows{{"", "", ""}})); }

TEST(CsvReader, Utf8ByteOrderMarkIsSkipped) {
  // Unicode standard: U+FEFF encoded in UTF-8 is EF BB BF
  EXPECT_EQ(parse("\xEF\xBB\xBFid,x\n1,2\n"), (Rows{{"id", "x"}, {"1", "2"}}));
  EXPECT_EQ(parse("\xC3\xA9t\xC3\xA9,x\n"), (Rows{{"\xC3\xA9t\xC3\xA9", "x"}}));  // no BOM: bytes kept
}

TEST(CsvReader, TabSeparated) { EXPECT_EQ(parse("a\tb\n1,5\t2\n", '\t'), (Rows{{"a", "b"}, {"1,5", "2"}})); }

TEST(CsvReader, LineNumbersCountEmbeddedLineBreaks) {
  std::istringstream in("h\n\"a\nb\"\nc\n");
  CsvReader reader(in, ',', "t.csv");
  std::vector<std::string> f;
  std::size_t line;
  reader.next(f, line);
  EXPECT_EQ(line, 1u);
  reader.next(f, line);
  EXPECT_EQ(line, 2u);
  reader.next(f, line);
  EXPECT_EQ(line, 4u);
}

TEST(CsvReader, UnterminatedQuoteIsAnErrorNamingTheLine) {
  try {
    parse("a,b\n1,2\n3,\"open\n4,5\n");
    FAIL() << "expected an error";
  } catch (const InputError& e) {
    EXPECT_NE(std::string(e.what()).find("test.csv:3:"), std::string::npos) << e.what();
    EXPECT_NE(std::string(e.what()).find("never closed"), std::string::npos) << e.what();
  }
}

TEST(SniffDelimiter, PicksTheMostFrequentOutsideQuotes) {
  EXPECT_EQ(sniff_delimiter("a,b,c"), ',');
  EXPECT_EQ(sniff_delimiter("a\tb\tc"), '\t');
  EXPECT_EQ(sniff_delimiter("a;b;\"c,d,e\""), ';');
  EXPECT_EQ(sniff_delimiter("single"), ',');
}

}  // namespace
}  // namespace envsift
