// Every way a run stops says what happened and what to do, in one line, and leaves nothing behind
// (envsift's own contract; the exit codes are docs/reference.md's table). The cases are the ones seen by
// a new user, and more of each class: words that belong to no option, an option without its value,
// numbers that are no count, columns that cannot be told apart, bytes a terminal would obey,
// a file that is no points file, a temporary directory that cannot take the spill, memory that
// runs out, and temporary files left by a process that was killed outright.
#include <gtest/gtest.h>
#include <unistd.h>

#include <filesystem>

#include "../support.hpp"

namespace envsift {
namespace {

using namespace envsift::testing;

const std::string kPoints = source_path("demo-points/occurrences.csv");
const std::string kDem = source_path("demo-rasters/dem.tif");

void expect_one_line(const CommandResult& r, int code, const std::string& words) {
  EXPECT_EQ(r.exit_code, code) << r.output;
  EXPECT_NE(r.output.find(words), std::string::npos) << r.output;
  EXPECT_EQ(std::count(r.output.begin(), r.output.end(), '\n'), 1) << "one line: " << r.output;
}

TEST(ClearErrors, ArgumentsThatBelongToNoOptionOrMissTheirValue) {
  const auto dir = temp_dir("clear-arguments");
  const std::string sample = envsift_binary() + " sample -q";
  expect_one_line(run(sample + " stray --points " + kPoints + " --layers " + kDem + " --out " + dir + "/o.csv"), 2,
                  "unexpected argument 'stray'");
  expect_one_line(run(envsift_binary() + " screen -q --points " + kPoints + " --layers " + kDem + " --no-discs 5 --out " + dir +
                      "/o.csv"),
                  2, "unexpected argument '5'");
  expect_one_line(run(sample + " --points --layers " + kDem + " --out " + dir + "/o.csv"), 2,
                  "--points has no value: --layers follows it");
  expect_one_line(run(sample + " --points " + kPoints + " --layers " + kDem + " --out --quiet"), 2, "--out has no value");
  for (const char* records : {"-1", "1e6", "12abc", "99999999999999999999", "0"}) {
    SCOPED_TRACE(records);
    const auto r = run(envsift_binary() + " estimate --layers " + kDem + " --records " + records);
    expect_one_line(r, 2, "--records");
    EXPECT_EQ(r.output.find("18,446,744"), std::string::npos) << r.output;
  }
  EXPECT_FALSE(std::filesystem::exists(dir + "/o.csv"));
}

TEST(ClearErrors, ColumnsThatCannotBeToldApartAreNamedWithFileAndLine) {
  const auto dir = temp_dir("clear-columns");
  const std::string sample = envsift_binary() + " sample -q --layers " + kDem + " --out " + dir + "/o.csv --points ";
  write_file(dir + "/repeated.csv", "occurrenceID,scientificName,decimalLongitude,decimalLatitude,note,note\nA,X y,0.5,0.5,a,b\n");
  expect_one_line(run(sample + dir + "/repeated.csv"), 3,
                  "repeated.csv:1: the header names two columns 'note' (columns 5 and 6); rename one of them");
  write_file(dir + "/cases.csv", "occurrenceID,scientificName,decimalLongitude,Latitude,LATITUDE\nA,X y,0.5,0.5,0.6\n");
  expect_one_line(run(sample + dir + "/cases.csv --latitude-column latitude"), 3,
                  "cases.csv:1: columns 'Latitude', 'LATITUDE' could each be the latitude column 'latitude'");
  write_file(dir + "/ids.csv", "OccurrenceID,occurrenceid,scientificName,decimalLongitude,decimalLatitude\nA,B,X y,0.5,0.5\n");
  expect_one_line(run(sample + dir + "/ids.csv"), 3, "could each be the record identifier column 'occurrenceID'");
}

TEST(ClearErrors, ControlBytesFromAFileNeverReachTheTerminal) {
  const auto dir = temp_dir("clear-control");
  // an ANSI colour sequence, a bell and a C1 control (U+009B, a one-byte escape) in a column name
  write_file(dir + "/p.csv", "occurrenceID,scientificName,decimalLongitude,lat\x1b[31mRED\x07\xc2\x9b" "2J\nA,X y,0.5,0.5\n");
  const auto r = run(envsift_binary() + " sample -q --layers " + kDem + " --out " + dir + "/o.csv --points " + dir + "/p.csv");
  EXPECT_EQ(r.exit_code, 3) << r.output;
  EXPECT_NE(r.output.find("lat\\x1b[31mRED\\x07\\x9b2J"), std::string::npos) << r.output;
  for (char c : r.output) EXPECT_TRUE(static_cast<unsigned char>(c) >= 0x20 || c == '\n') << int(c);
  EXPECT_EQ(r.output.find("\xc2\x9b"), std::string::npos);
}

TEST(ClearErrors, NoPointsFileNoTemporarySpaceNoMemory) {
  const auto dir = temp_dir("clear-resources");
  // 95 KB of gzip holding one line of 100 MB: refused at the record, not by exhausting memory
  ASSERT_EQ(run("head -c 100000000 /dev/zero | tr '\\0' a | gzip -c > " + dir + "/line.csv.gz").exit_code, 0);
  expect_one_line(run(envsift_binary() + " sample -q --layers " + kDem + " --out " + dir + "/o.csv --points " + dir + "/line.csv.gz"),
                  3, "line.csv.gz:1: a record longer than 64 MiB");
  // 4 million records: their spill cannot be written (a file-size limit stands in for a full disk),
  // then their parsed table does not fit in a 500 MB address space
  ASSERT_EQ(run("(echo occurrenceID,scientificName,decimalLongitude,decimalLatitude; yes A,X_y,0.5,0.5 | head -4000000) | "
                "gzip -1 > " + dir + "/many.csv.gz").exit_code, 0);
  std::filesystem::create_directory(dir + "/spill");
  const std::string many = " sample -q --layers " + kDem + " --out " + dir + "/o.csv --points " + dir + "/many.csv.gz";
  expect_one_line(run("bash -c 'ulimit -f 100; TMPDIR=" + dir + "/spill " + envsift_binary() + many + " --memory-limit 16'"), 4,
                  dir + "/spill (TMPDIR): cannot write the temporary copy of the records (File too large)");
  expect_one_line(run("TMPDIR=" + dir + "/missing " + envsift_binary() + many), 4,
                  dir + "/missing (TMPDIR): cannot create a temporary file there (No such file or directory)");
#if !defined(__SANITIZE_ADDRESS__)  // AddressSanitizer reserves terabytes of address space at start
  expect_one_line(run("bash -c 'ulimit -v 400000; " + envsift_binary() + many + "'"), 6, "out of memory");
#endif
  for (const auto& f : std::filesystem::directory_iterator(dir)) EXPECT_NE(f.path().filename(), "o.csv");
}

TEST(ClearErrors, TemporaryFilesOfKilledRunsAreRemovedByTheNextRun) {
  const auto dir = temp_dir("clear-stale");
  char host[256] = {};
  ASSERT_EQ(::gethostname(host, sizeof host - 1), 0);
  std::string tag = host;
  for (char& c : tag)
    if (c == '-' || c == '/') c = '_';
  // a run killed with SIGKILL (held, finished, before its rename) leaves its file; so do a run on
  // another machine sharing the folder and a live process here, either of which may still be writing
  const auto r = run("bash -c 'sleep 30 >/dev/null 2>&1 & echo $!; ENVSIFT_TEST_PAUSE_BEFORE_COMMIT=30 " + envsift_binary() +
                     " sample -q --points " + kPoints + " --layers " + kDem + " --out " + dir +
                     "/o.csv >/dev/null 2>&1 & pid=$!; while ! ls " + dir + " | grep -q partial; do sleep 0.01; done; kill -9 $pid; wait $pid'");
  const std::string live = r.output.substr(0, r.output.find('\n'));
  write_file(dir + "/o.csv.partial-otherhost-12345", "another machine's");
  write_file(dir + "/o.csv.partial-" + tag + "-" + live, "a live process's");
  std::size_t killed = 0;
  for (const auto& f : std::filesystem::directory_iterator(dir)) killed += f.path().filename().string().find("partial-" + tag) != std::string::npos;
  ASSERT_EQ(killed, 2u) << run("ls " + dir).output;  // the killed run's and the live one's
  ASSERT_EQ(run(envsift_binary() + " sample -q --points " + kPoints + " --layers " + kDem + " --out " + dir + "/o.csv").exit_code, 0);
  EXPECT_EQ(run("ls " + dir).output, "o.csv\no.csv.partial-otherhost-12345\no.csv.partial-" + tag + "-" + live + "\n");
  run("kill " + live);
}

}  // namespace
}  // namespace envsift
