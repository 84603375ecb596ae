// Taxon names compared as Unicode text. Reference: Unicode Standard Annex #15 (Normalization
// Forms): the NFC of "e" + U+0301 COMBINING ACUTE ACCENT is U+00E9, and NFC leaves composed text
// as it is; U+00A0 is NO-BREAK SPACE (Unicode character database). Authorship after a binomial is
// the botanical and zoological codes' convention (common practice).
#include <gtest/gtest.h>

#include "../support.hpp"
#include "envsift/read/taxon_names.hpp"

namespace envsift {
namespace {

using namespace envsift::testing;

TEST(TaxonNames, NfcAndWhitespaceFolding) {
  EXPECT_EQ(normalise_taxon_name("Vossica fre\xCC\x81" "de\xCC\x81rici"), "Vossica fr\xC3\xA9" "d\xC3\xA9rici");
  EXPECT_EQ(normalise_taxon_name("Vossica fr\xC3\xA9" "d\xC3\xA9rici"), "Vossica fr\xC3\xA9" "d\xC3\xA9rici");
  EXPECT_EQ(normalise_taxon_name("  Thraxula  alba "), "Thraxula alba");
  EXPECT_EQ(normalise_taxon_name("Thraxula\xC2\xA0" "alba"), "Thraxula alba");
  EXPECT_EQ(normalise_taxon_name("Thraxula\talba"), "Thraxula alba");
  EXPECT_EQ(normalise_taxon_name("\xFF\xFE bad"), "\xFF\xFE bad");  // not UTF-8: left alone
}

TEST(TaxonNames, CaseAndAuthorshipLookAlikeButSubspeciesDoNot) {
  EXPECT_EQ(taxon_likeness_key("Thraxula alba Vend."), "thraxula alba");
  EXPECT_EQ(taxon_likeness_key("thraxula alba"), "thraxula alba");
  EXPECT_EQ(taxon_likeness_key("Thraxula alba (Orm.) Tal."), "thraxula alba");
  EXPECT_EQ(taxon_likeness_key("Thraxula alba subsp. apennina"), "thraxula alba subsp. apennina");
  const auto groups = names_that_look_alike({"Thraxula alba", "Thraxula alba Vend.", "thraxula alba", "Thraxula borvensis",
                                             "Thraxula alba subsp. apennina"});
  ASSERT_EQ(groups.size(), 1u);
  EXPECT_EQ(groups[0], (std::vector<std::string>{"Thraxula alba", "Thraxula alba Vend.", "thraxula alba"}));
}

TEST(TaxonNames, OneTaxonWhateverTheSpacesAndLookAlikesListed) {
  const auto dir = temp_dir("taxon-names");
  write_file(dir + "/p.csv",
             "occurrenceID,scientificName,decimalLongitude,decimalLatitude\n"
             "N1,Oxmontia nivicola,0.47831,0.6708\n"
             "N2,Oxmontia  nivicola,0.42082,0.41779\n"
             "N3,Oxmontia\xC2\xA0nivicola,0.5125,0.26933\n"
             "N4,oxmontia nivicola,0.48159,0.61887\n"
             "N5,Oxmontia nivicola Quill.,0.5496,0.5767\n");
  auto r = run(envsift_binary() + " screen -q --points " + dir + "/p.csv" + demo_layers() + " --summary " + dir +
               "/taxa.csv --out " + dir + "/out.csv");
  ASSERT_EQ(r.exit_code, 0) << r.output;
  EXPECT_NE(r.output.find("look like one taxon"), std::string::npos) << r.output;
  const Table taxa = read_csv(dir + "/taxa.csv");
  ASSERT_EQ(taxa.rows.size(), 3u);  // the three spellings of one name are one taxon
  const std::size_t similar = taxa.column("similar_names");
  for (const auto& row : taxa.rows) {
    if (row[0] == "Oxmontia nivicola") {
      EXPECT_EQ(row[1], "3");
      EXPECT_EQ(row[similar], "oxmontia nivicola; Oxmontia nivicola Quill.");  // in the order first seen
    }
    EXPECT_FALSE(row[similar].empty()) << row[0];
  }
  const Table out = read_csv(dir + "/out.csv");
  EXPECT_EQ(out.rows[1][1], "Oxmontia  nivicola");  // the original text is written back as it was
}

}  // namespace
}  // namespace envsift
