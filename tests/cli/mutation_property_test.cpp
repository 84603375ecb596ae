// Property: however the demo CSV is damaged, envsift never crashes, and either refuses the file
// with a clean input error (exit 3) or writes every record exactly once, in input order, with its
// original fields. Records are counted by the CSV tokenizer (RFC 4180 rules, tested on its own
// in tests/read/csv_reader_test.cpp), independently of the pipeline that writes them.
#include <random>
#include <sstream>

#include <gtest/gtest.h>

#include "../support.hpp"
#include "envsift/errors.hpp"
#include "envsift/read/text_encoding.hpp"

namespace envsift {
namespace {

using namespace envsift::testing;

std::string mutate(std::string text, std::mt19937_64& rng) {
  std::uniform_int_distribution<int> kind(0, 6), count(1, 8);
  const char pieces[] = {',', '"', '\n', '\r', ';', '\t', ' ', '-', '.', 'N', 'S', '9'};
  for (int m = count(rng); m > 0; --m) {
    std::uniform_int_distribution<std::size_t> at(60, text.size() - 1);  // keep the header intact
    const std::size_t i = at(rng);
    switch (kind(rng)) {
      case 0: text[i] = pieces[rng() % sizeof pieces]; break;
      case 1: text.insert(i, 1, pieces[rng() % sizeof pieces]); break;
      case 2: text.erase(i, 1 + rng() % 20); break;
      case 3: text.insert(i, 1, static_cast<char>(0x80 + rng() % 0x80)); break;  // not UTF-8
      case 4: text.insert(i, "\"\""); break;
      case 5: text.insert(i, "1e999"); break;
      default: text.insert(i, text.substr(at(rng), 1 + rng() % 200)); break;  // a stray copy of a span
    }
  }
  return text;
}

std::vector<std::vector<std::string>> records_of(const std::string& text) {
  std::istringstream in(text);
  CsvReader reader(in, ',', "mutated.csv");
  std::vector<std::vector<std::string>> rows;
  std::vector<std::string> fields;
  std::size_t line;
  reader.next(fields, line);  // header
  while (reader.next(fields, line))
    if (!(fields.size() == 1 && fields[0].empty())) rows.push_back(fields);
  return rows;
}

TEST(MutationProperty, NoRecordLostOrDuplicatedAndNoCrash) {
  const std::string original = read_file(source_path("demo-points/occurrences.csv"));
  const auto dir = temp_dir("mutations");
  std::mt19937_64 rng(20261201);
  int accepted = 0, refused = 0;
  for (int trial = 0; trial < 40; ++trial) {
    const std::string text = mutate(original, rng);
    write_file(dir + "/m.csv", text);
    const std::string command = trial % 2 ? "screen" : "sample";
    auto r = run(envsift_binary() + " " + command + " --points " + dir + "/m.csv --layers " +
                 source_path("demo-rasters/dem.tif") + " " + source_path("demo-rasters/rainfall.tif") +
                 " --out " + dir + "/o.csv");
    ASSERT_TRUE(r.exit_code == 0 || r.exit_code == 3) << "trial " << trial << ": exit " << r.exit_code << "\n" << r.output;
    if (r.exit_code == 3) {
      ++refused;
      EXPECT_EQ(std::count(r.output.begin(), r.output.end(), '\n'), 1) << r.output;  // one clear line
      continue;
    }
    ++accepted;
    std::vector<std::vector<std::string>> in;
    try {
      in = records_of(text);
    } catch (const InputError&) {
      FAIL() << "trial " << trial << ": envsift accepted a file the tokenizer refuses";
    }
    const Table out = read_csv(dir + "/o.csv");
    ASSERT_EQ(out.rows.size(), in.size()) << "trial " << trial;
    for (std::size_t i = 0; i < in.size(); ++i) {  // same order, none lost (bytes not UTF-8 read as Latin-1)
      bool changed;
      EXPECT_EQ(out.rows[i][0], to_utf8(in[i][0], changed)) << "trial " << trial << " record " << i;
    }
  }
  EXPECT_GT(accepted, 10);
  RecordProperty("refused", refused);
}

}  // namespace
}  // namespace envsift
