// Compressed points are read completely or refused. References: RFC 1952 (gzip: each member ends
// with the CRC-32 and length of its data; members may follow one another) checked with the gzip
// command's own test (`gzip -t`); PKWARE APPNOTE.TXT (zip: the central directory records each
// member's CRC-32, size and, for Unix archives, its file mode) checked with Info-ZIP's `unzip -t`
// and `zipinfo`; archives written by Python's zipfile module (Debian's python3). Every damaged file
// below is first shown damaged by the outside tool, then envsift must refuse it with the file's
// name, exit 3 and no output.
#include <gtest/gtest.h>

#include <filesystem>

#include "../support.hpp"

namespace envsift {
namespace {

using namespace envsift::testing;

const std::string kPlain = source_path("demo-points/occurrences.csv");
// A Darwin Core Archive's descriptor (TDWG Darwin Core Text Guide) naming occurrence.txt as its core.
const char* kMinimalMeta =
    "<archive xmlns=\"http://rs.tdwg.org/dwc/text/\"><core fieldsTerminatedBy=\"\\t\" fieldsEnclosedBy=\"\" "
    "ignoreHeaderLines=\"1\"><files><location>occurrence.txt</location></files><id index=\"0\"/>"
    "<field index=\"1\" term=\"http://rs.tdwg.org/dwc/terms/scientificName\"/>"
    "<field index=\"2\" term=\"http://rs.tdwg.org/dwc/terms/decimalLongitude\"/>"
    "<field index=\"3\" term=\"http://rs.tdwg.org/dwc/terms/decimalLatitude\"/></core></archive>";

// `python3 -c SCRIPT` in `dir`; the test fails when it does.
void python(const std::string& dir, const std::string& script) {
  const auto r = run("cd " + dir + " && python3 -c '" + script + "'");
  ASSERT_EQ(r.exit_code, 0) << r.output;
}

CommandResult sample(const std::string& points, const std::string& out) {
  return run(envsift_binary() + " sample -q" + demo_layers() + " --points " + points + " --out " + out);
}

void expect_refused(const std::string& points, const std::string& dir, const std::string& words) {
  SCOPED_TRACE(points);
  const auto r = sample(points, dir + "/out.csv");
  EXPECT_EQ(r.exit_code, 3) << r.output;
  EXPECT_NE(r.output.find(words), std::string::npos) << r.output;
  EXPECT_NE(r.output.find(std::filesystem::path(points).filename().string()), std::string::npos) << r.output;
  EXPECT_FALSE(std::filesystem::exists(dir + "/out.csv"));
}

TEST(DamagedInput, GzipCutShortOrWithAWrongCrcIsRefused) {
  const auto dir = temp_dir("damaged-gzip");
  ASSERT_EQ(run("gzip -c " + kPlain + " > " + dir + "/full.csv.gz").exit_code, 0);
  // the case seen: cut after 9,000 bytes; and cut inside the 8-byte trailer (all data there, CRC gone)
  ASSERT_EQ(run("head -c 9000 " + dir + "/full.csv.gz > " + dir + "/cut.csv.gz").exit_code, 0);
  const auto size = std::filesystem::file_size(dir + "/full.csv.gz");
  ASSERT_EQ(run("head -c " + std::to_string(size - 3) + " " + dir + "/full.csv.gz > " + dir + "/no-trailer.csv.gz").exit_code, 0);
  // one bit of the stored CRC-32 flipped; and one byte of the stored length
  python(dir, "b=bytearray(open(\"full.csv.gz\",\"rb\").read()); b[-6]^=1; open(\"crc.csv.gz\",\"wb\").write(b); "
              "b=bytearray(open(\"full.csv.gz\",\"rb\").read()); b[-2]^=1; open(\"length.csv.gz\",\"wb\").write(b)");
  for (const char* name : {"cut", "no-trailer", "crc", "length"})
    EXPECT_NE(run("gzip -t " + dir + "/" + name + ".csv.gz").exit_code, 0) << name << " should be damaged for gzip -t";
  expect_refused(dir + "/cut.csv.gz", dir, "the gzip stream stops before its end");
  expect_refused(dir + "/no-trailer.csv.gz", dir, "the gzip stream stops before its end");
  expect_refused(dir + "/crc.csv.gz", dir, "CRC-32 does not match");
  expect_refused(dir + "/length.csv.gz", dir, "recorded length does not match");
}

TEST(DamagedInput, GzipMembersOneAfterAnotherAreReadAsZcatReadsThem) {
  const auto dir = temp_dir("gzip-members");
  // two members: the header and first half, then the rest (RFC 1952 §2.2: a file is a series of members)
  ASSERT_EQ(run("head -n 400 " + kPlain + " | gzip -c > " + dir + "/two.csv.gz && tail -n +401 " + kPlain + " | gzip -c >> " +
                dir + "/two.csv.gz && printf '\\0\\0\\0\\0' >> " + dir + "/two.csv.gz").exit_code, 0);
  EXPECT_EQ(run("zcat " + dir + "/two.csv.gz | cmp - " + kPlain).exit_code, 0);
  ASSERT_EQ(sample(dir + "/two.csv.gz", dir + "/two.csv").exit_code, 0);
  ASSERT_EQ(sample(kPlain, dir + "/plain.csv").exit_code, 0);
  EXPECT_TRUE(read_file(dir + "/two.csv") == read_file(dir + "/plain.csv"));
}

TEST(DamagedInput, ZipMemberWithAWrongCrcOrDamagedDataIsRefused) {
  const auto dir = temp_dir("damaged-zip");
  python(dir, "import zipfile\n"
              "src=open(\"" + kPlain + "\",\"rb\").read()\n"
              "for name,method in ((\"stored.zip\",zipfile.ZIP_STORED),(\"deflated.zip\",zipfile.ZIP_DEFLATED)):\n"
              "  zipfile.ZipFile(name,\"w\",method).writestr(\"occurrences.csv\",src)\n"
              "b=bytearray(open(\"stored.zip\",\"rb\").read()); i=b.find(b\"QM-0500\"); b[i+5]^=1; open(\"crc.zip\",\"wb\").write(b)\n"
              "b=bytearray(open(\"deflated.zip\",\"rb\").read()); b[len(b)//3]^=0x55; open(\"inflate.zip\",\"wb\").write(b)\n"
              "b=open(\"deflated.zip\",\"rb\").read(); open(\"cut.zip\",\"wb\").write(b[:len(b)-30])\n");
  for (const char* good : {"stored", "deflated"}) {
    EXPECT_EQ(run("unzip -tq " + dir + "/" + good + ".zip").exit_code, 0);
    EXPECT_EQ(sample(dir + "/" + good + ".zip", dir + "/" + good + ".csv").exit_code, 0);
  }
  for (const char* bad : {"crc", "inflate", "cut"}) EXPECT_NE(run("unzip -tq " + dir + "/" + bad + ".zip").exit_code, 0) << bad;
  expect_refused(dir + "/crc.zip", dir, "do not match the CRC-32 its archive records");
  expect_refused(dir + "/inflate.zip", dir, "the archive is damaged");
  expect_refused(dir + "/cut.zip", dir, "zip");
}

TEST(DamagedInput, ZipMemberThatIsASymbolicLinkIsNotFollowed) {
  const auto dir = temp_dir("zip-link");
  write_file(dir + "/meta.xml", kMinimalMeta);
  // a Unix zip whose occurrences.csv is a link to /etc/passwd (zip --symlinks writes the same)
  python(dir, "import zipfile, stat\n"
              "z=zipfile.ZipFile(\"link.zip\",\"w\")\n"
              "i=zipfile.ZipInfo(\"occurrences.csv\"); i.create_system=3; i.external_attr=(stat.S_IFLNK|0o777)<<16\n"
              "z.writestr(i,\"/etc/passwd\"); z.close()\n"
              "z=zipfile.ZipFile(\"dwca.zip\",\"w\")\n"
              "z.writestr(\"meta.xml\",open(\"meta.xml\").read())\n"
              "i=zipfile.ZipInfo(\"occurrence.txt\"); i.create_system=3; i.external_attr=(stat.S_IFLNK|0o777)<<16\n"
              "z.writestr(i,\"/etc/passwd\"); z.close()\n");
  EXPECT_EQ(run("zipinfo " + dir + "/link.zip | grep -c '^l'").output, "1\n");  // zipinfo: a link
  expect_refused(dir + "/link.zip", dir, "is a symbolic link inside the zip archive");
  expect_refused(dir + "/dwca.zip", dir, "is a symbolic link inside the zip archive");
}

}  // namespace
}  // namespace envsift
