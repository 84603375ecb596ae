// Darwin Core Archives as the TDWG Darwin Core Text Guide describes them: meta.xml names the core
// file, its terminators, quote character, header lines and each field's term URI; a field may
// have only a default value. The archive (zip written through GDAL's /vsizip/, and the same as a
// folder) must screen like the demo CSV, byte for byte in the columns envsift computes.
#include <cpl_vsi.h>
#include <gtest/gtest.h>
#include <unistd.h>

#include <cstdio>
#include <filesystem>

#include "../support.hpp"

namespace envsift {
namespace {

using namespace envsift::testing;

const char* kMeta =
    "<?xml version=\"1.0\" encoding=\"UTF-8\"?>\n"
    "<archive xmlns=\"http://rs.tdwg.org/dwc/text/\" metadata=\"eml.xml\">\n"
    "  <core encoding=\"UTF-8\" fieldsTerminatedBy=\"\\t\" linesTerminatedBy=\"\\n\" fieldsEnclosedBy=\"\"\n"
    "        ignoreHeaderLines=\"1\" rowType=\"http://rs.tdwg.org/dwc/terms/Occurrence\">\n"
    "    <files><location>occurrence.txt</location></files>\n"
    "    <id index=\"0\"/>\n"
    "    <field index=\"0\" term=\"http://rs.tdwg.org/dwc/terms/occurrenceID\"/>\n"
    "    <field index=\"1\" term=\"http://rs.tdwg.org/dwc/terms/scientificName\"/>\n"
    "    <field index=\"2\" term=\"http://rs.tdwg.org/dwc/terms/decimalLongitude\"/>\n"
    "    <field index=\"3\" term=\"http://rs.tdwg.org/dwc/terms/decimalLatitude\"/>\n"
    "    <field index=\"4\" term=\"http://rs.tdwg.org/dwc/terms/coordinateUncertaintyInMeters\"/>\n"
    "    <field index=\"5\" term=\"http://rs.tdwg.org/dwc/terms/minimumElevationInMeters\"/>\n"
    "    <field index=\"6\" term=\"http://rs.tdwg.org/dwc/terms/locality\"/>\n"
    "    <field term=\"http://rs.tdwg.org/dwc/terms/countryCode\" default=\"QM\"/>\n"
    "  </core>\n"
    "  <extension encoding=\"UTF-8\" fieldsTerminatedBy=\"\\t\" linesTerminatedBy=\"\\n\" fieldsEnclosedBy=\"\"\n"
    "             ignoreHeaderLines=\"1\" rowType=\"http://rs.tdwg.org/ac/terms/Multimedia\">\n"
    "    <files><location>multimedia.txt</location></files>\n"
    "    <coreid index=\"0\"/>\n"
    "  </extension>\n"
    "</archive>\n";

void write_member(const std::string& path, const std::string& content) {
  VSILFILE* f = VSIFOpenL(path.c_str(), "wb");
  ASSERT_NE(f, nullptr) << path;
  VSIFWriteL(content.data(), 1, content.size(), f);
  VSIFCloseL(f);
}

// The computed columns of a screen output: every column after the input's `n` columns.
std::vector<std::vector<std::string>> computed(const Table& t, std::size_t n) {
  std::vector<std::vector<std::string>> rows{{t.header.begin() + static_cast<long>(n), t.header.end()}};
  for (const auto& r : t.rows) rows.emplace_back(r.begin() + static_cast<long>(n), r.end());
  return rows;
}

TEST(DarwinCoreArchive, ZipAndFolderScreenLikeTheCsv) {
  const auto dir = temp_dir("dwca");
  const Table demo = read_csv(source_path("demo-points/occurrences.csv"));
  std::string core = "id\tname\tlon\tlat\tunc\telev\tloc\n";  // a header line the archive says to skip
  for (const auto& r : demo.rows) {
    for (std::size_t i = 0; i < r.size(); ++i) core += (i ? "\t" : "") + r[i];
    core += "\n";
  }
  for (const std::string& root : {"/vsizip/" + dir + "/archive.zip", dir + "/folder"}) {
    if (root.rfind("/vsizip/", 0) != 0) VSIMkdir(root.c_str(), 0755);
    write_member(root + "/meta.xml", kMeta);
    write_member(root + "/occurrence.txt", core);
    write_member(root + "/multimedia.txt", "id\tidentifier\nQM-0001\timage.jpg\n");
  }
  const std::string screen = envsift_binary() + " screen -q" + demo_layers() + " --dem dem";
  ASSERT_EQ(run(screen + " --points " + source_path("demo-points/occurrences.csv") + " --out " + dir + "/csv.csv").exit_code, 0);
  const auto expected = computed(read_csv(dir + "/csv.csv"), demo.header.size());
  for (const std::string& points : {dir + "/archive.zip", dir + "/folder"}) {
    SCOPED_TRACE(points);
    auto r = run(screen + " --points " + points + " --out " + dir + "/dwca.csv");
    ASSERT_EQ(r.exit_code, 0) << r.output;
    EXPECT_NE(r.output.find("1 extension file(s) of the archive are not read"), std::string::npos) << r.output;
    const Table out = read_csv(dir + "/dwca.csv");
    ASSERT_EQ(out.header.size(), demo.header.size() + 1 + expected[0].size());
    EXPECT_EQ(out.header[demo.header.size()], "countryCode");  // the default-valued field
    for (const auto& row : out.rows) EXPECT_EQ(row[demo.header.size()], "QM");
    EXPECT_TRUE(computed(out, demo.header.size() + 1) == expected);
    EXPECT_EQ(std::vector<std::string>(out.rows[2].begin(), out.rows[2].begin() + 7), demo.rows[2]);  // fields as written
  }
}

TEST(DarwinCoreArchive, ABrokenMetaXmlIsNamed) {
  const auto dir = temp_dir("dwca-broken");
  write_member("/vsizip/" + dir + "/broken.zip/meta.xml", "<archive><extension/></archive>");
  auto r = run(envsift_binary() + " screen -q" + demo_layers() + " --points " + dir + "/broken.zip --out " + dir + "/o.csv");
  EXPECT_EQ(r.exit_code, 3) << r.output;
  EXPECT_NE(r.output.find("broken.zip/meta.xml: has no <archive><core> element"), std::string::npos) << r.output;
}

// An archive names only its own files: a core location that climbs out (..), is absolute or a URL,
// or passes through a symbolic link is refused before anything is read — the case seen read
// /etc/passwd into the output. A location in a subfolder of the archive is its own file and is read.
TEST(DarwinCoreArchive, ACoreOutsideTheArchiveIsRefused) {
  const auto dir = temp_dir("dwca-escape");
  const std::string folder = dir + "/folder", out = dir + "/o.csv";
  VSIMkdir(folder.c_str(), 0755);
  VSIMkdir((folder + "/data").c_str(), 0755);
  const std::string core = "id\tname\tlon\tlat\tunc\telev\tloc\nQM-0001\tOxmontia nivicola\t0.47831\t0.6708\t\t\t\n";
  write_member(folder + "/data/occurrence.txt", core);
  write_member(dir + "/outside.txt", core);
  ASSERT_EQ(::symlink((dir + "/outside.txt").c_str(), (folder + "/linked.txt").c_str()), 0);
  ASSERT_EQ(::symlink(dir.c_str(), (folder + "/up").c_str()), 0);
  const std::string meta = kMeta;
  auto with_location = [&](const std::string& location) {
    std::string m = meta;
    m.replace(m.find("occurrence.txt"), std::string("occurrence.txt").size(), location);
    return m;
  };
  const std::string screen = envsift_binary() + " sample -q" + demo_layers() + " --points " + folder + " --out " + out;
  write_member(folder + "/meta.xml", with_location("data/occurrence.txt"));
  auto r = run(screen);
  ASSERT_EQ(r.exit_code, 0) << r.output;
  EXPECT_EQ(read_csv(out).rows.size(), 1u);
  const std::vector<std::pair<std::string, std::string>> refused = {
      {"../../../../../../etc/passwd", "climbs out of the archive"},
      {"data/../../outside.txt", "climbs out of the archive"},
      {"..\\outside.txt", "climbs out of the archive"},
      {"/etc/passwd", "is an absolute path or a URL"},
      {"file:///etc/passwd", "is an absolute path or a URL"},
      {"linked.txt", "passes through a symbolic link"},
      {"up/outside.txt", "passes through a symbolic link"},
  };
  for (const auto& [location, words] : refused) {
    SCOPED_TRACE(location);
    std::remove(out.c_str());
    write_member(folder + "/meta.xml", with_location(location));
    r = run(screen);
    EXPECT_EQ(r.exit_code, 3) << r.output;
    EXPECT_NE(r.output.find("folder/meta.xml: the core's location"), std::string::npos) << r.output;
    EXPECT_NE(r.output.find(words), std::string::npos) << r.output;
    EXPECT_EQ(r.output.find("root:"), std::string::npos) << r.output;
    EXPECT_FALSE(std::filesystem::exists(out));
  }
  // the zipped form: the same locations, refused the same way
  write_member("/vsizip/" + dir + "/a.zip/meta.xml", with_location("../outside.txt"));
  write_member("/vsizip/" + dir + "/a.zip/occurrence.txt", core);
  r = run(envsift_binary() + " sample -q" + demo_layers() + " --points " + dir + "/a.zip --out " + out);
  EXPECT_EQ(r.exit_code, 3) << r.output;
  EXPECT_NE(r.output.find("climbs out of the archive"), std::string::npos) << r.output;
}

}  // namespace
}  // namespace envsift
