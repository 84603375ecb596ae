// Screening in rounds (--decisions). A taxon of 20 records with two planted errors close together
// (x ≈ 17, y ≈ 61 against x ≈ 10 ± 1, y ≈ 50 ± 2): together they widen the classical mean and
// covariance so much that neither is flagged (masking, the classic failure of the classical
// Mahalanobis distance — Rousseeuw & Leroy 1987, Robust Regression and Outlier Detection, ch. 6,
// from memory). Once a reviewer confirms one as `error`, it leaves the statistics and the other
// is flagged. The check is against the statistics computed without the confirmed record: the
// same run on the points with that record deleted, and D² = (x − m)ᵀ S⁻¹ (x − m) from the mean
// and sample covariance of the remaining reference (Eigen, computed here).
#include <gtest/gtest.h>

#include <algorithm>

#include <Eigen/Dense>
#include <random>
#include <sstream>

#include <nlohmann/json.hpp>

#include "../support.hpp"
#include "envsift/write/run_manifest.hpp"

namespace envsift {
namespace {

using namespace envsift::testing;

struct Planted {
  std::string dir, points, without_e1;
  std::vector<Eigen::Vector2d> normal;
};

Planted planted(const std::string& name) {
  Planted p;
  p.dir = temp_dir(name);
  std::mt19937 rng(5);
  std::normal_distribution<double> x(10, 1), y(50, 2);
  std::ostringstream all, without;
  for (auto* o : {&all, &without}) *o << "occurrenceID,scientificName,x,y\n";
  for (int i = 0; i < 20; ++i) {
    char row[96];
    const double a = std::round(x(rng) * 1000) / 1000, b = std::round(y(rng) * 1000) / 1000;
    std::snprintf(row, sizeof row, "N%02d,Demo taxon,%.3f,%.3f\n", i, a, b);
    all << row, without << row;
    p.normal.emplace_back(a, b);
  }
  all << "E1,Demo taxon,16.8,61.0\n";
  all << "E2,Demo taxon,17.0,60.6\n", without << "E2,Demo taxon,17.0,60.6\n";
  p.points = p.dir + "/points.csv", p.without_e1 = p.dir + "/without-e1.csv";
  write_file(p.points, all.str());
  write_file(p.without_e1, without.str());
  return p;
}

std::string screen(const std::string& points, const std::string& out, const std::string& more = "") {
  // the masking scenario is the classical test's at its own χ² cutoff (--flag-rule cutoffs); its
  // small-sample probability (Beta form) already finds both planted errors in round 1
  return envsift_binary() + " screen -q --tests mahalanobis --flag-rule cutoffs --value-columns x,y --points " + points +
         " --out " + out + more;
}

TEST(ReviewRounds, AConfirmedErrorNoLongerMasksItsNeighbour) {
  const Planted p = planted("review-masking");
  ASSERT_EQ(run(screen(p.points, p.dir + "/round1.csv")).exit_code, 0);
  const Table one = read_csv(p.dir + "/round1.csv");
  auto r1 = by_id(one);
  EXPECT_EQ(r1["E1"][one.column("flags")], "");  // masked: neither is flagged
  EXPECT_EQ(r1["E2"][one.column("flags")], "");

  write_file(p.dir + "/decisions.csv", "occurrenceID,decision,note\nE1,error,the shipping town's coordinates\n");
  const auto round2 = run(screen(p.points, p.dir + "/round2.csv", " --decisions " + p.dir + "/decisions.csv"));
  ASSERT_EQ(round2.exit_code, 0) << round2.output;
  const Table two = read_csv(p.dir + "/round2.csv");
  auto r2 = by_id(two);
  EXPECT_EQ(r2["E2"][two.column("flags")], "mahalanobis");  // unmasked
  EXPECT_EQ(r2["E2"][two.column("rank")], "1");
  // the confirmed error: written with its decision, the results it would have had, ranked last
  EXPECT_EQ(r2["E1"][two.column("decision")], "error");
  EXPECT_EQ(r2["E1"][two.column("decision_note")], "the shipping town's coordinates");
  EXPECT_NE(r2["E1"][two.column("status")].find("reviewed_error"), std::string::npos);
  EXPECT_EQ(r2["E1"][two.column("rank")], "22");
  EXPECT_NE(r2["E1"][two.column("mahalanobis_stat")], "");
  EXPECT_NE(round2.output.find("1 decided in earlier rounds (error 1)"), std::string::npos) << round2.output;
  // the manifest records which decisions file (SHA-256 by OpenSSL, sha256_of_file) and what it did
  ASSERT_EQ(run(screen(p.points, p.dir + "/m.csv", " --decisions " + p.dir + "/decisions.csv --manifest " + p.dir + "/m.json")).exit_code, 0);
  const auto manifest = nlohmann::json::parse(read_file(p.dir + "/m.json"));
  EXPECT_EQ(manifest["decisions"]["sha256"], sha256_of_file(p.dir + "/decisions.csv"));
  EXPECT_EQ(manifest["decisions"]["records_decided"]["error"], 1);

  // the statistics computed without the confirmed record: the same as deleting it from the points
  ASSERT_EQ(run(screen(p.without_e1, p.dir + "/deleted.csv")).exit_code, 0);
  const Table deleted = read_csv(p.dir + "/deleted.csv");
  auto rd = by_id(deleted);
  for (const auto& [id, row] : rd)
    EXPECT_EQ(row[deleted.column("mahalanobis_stat")], r2[id][two.column("mahalanobis_stat")]) << id;
  // and D² by hand from the 21 reference rows (the 20 and E2)
  Eigen::MatrixXd ref(21, 2);
  for (int i = 0; i < 20; ++i) ref.row(i) = p.normal[static_cast<std::size_t>(i)].transpose();
  ref.row(20) << 17.0, 60.6;
  const Eigen::RowVector2d mean = ref.colwise().mean();
  const Eigen::MatrixXd centred = ref.rowwise() - mean;
  const Eigen::Matrix2d cov = centred.transpose() * centred / 20.0;
  const Eigen::Vector2d d = Eigen::Vector2d(17.0, 60.6) - mean.transpose();
  EXPECT_NEAR(std::stod(r2["E2"][two.column("mahalanobis_stat")]), d.dot(cov.inverse() * d), 1e-4);
}

TEST(ReviewRounds, AValidRecordIsNeverFlaggedAgainButShowsWhatWouldHaveFired) {
  const Planted p = planted("review-valid");
  write_file(p.dir + "/decisions.csv", "occurrenceID,decision\nE1,error\nE2,valid\nN03,unsure\nGONE-1,error\n");
  const auto r = run(screen(p.points, p.dir + "/out.csv", " --decisions " + p.dir + "/decisions.csv"));
  ASSERT_EQ(r.exit_code, 0) << r.output;
  const Table t = read_csv(p.dir + "/out.csv");
  auto rows = by_id(t);
  EXPECT_EQ(rows["E2"][t.column("flags")], "");
  EXPECT_EQ(rows["E2"][t.column("decision")], "valid");
  EXPECT_EQ(rows["E2"][t.column("set_aside")].rfind("mahalanobis: Mahalanobis D²", 0), 0u) << rows["E2"][t.column("set_aside")];
  EXPECT_EQ(rows["E2"][t.column("rank")], "21");  // after the 20 open records, before the error
  EXPECT_EQ(rows["E1"][t.column("rank")], "22");
  EXPECT_EQ(rows["N03"][t.column("decision")], "unsure");
  // an ID the points do not have: one warning, naming it
  EXPECT_NE(r.output.find("1 decided record(s) are not in the points (renamed or deleted?): GONE-1"), std::string::npos) << r.output;
  // the same output for any thread count
  ASSERT_EQ(run(screen(p.points, p.dir + "/one-thread.csv", " --threads 1 --decisions " + p.dir + "/decisions.csv")).exit_code, 0);
  EXPECT_EQ(read_file(p.dir + "/out.csv"), read_file(p.dir + "/one-thread.csv"));
  // and shards merged rank decided records as one run does
  for (const char* shard : {"0/2", "1/2"})
    ASSERT_EQ(run(screen(p.points, p.dir + "/shard" + std::string(1, shard[0]) + ".csv",
                         std::string(" --shard ") + shard + " --decisions " + p.dir + "/decisions.csv"))
                  .exit_code,
              0);
  ASSERT_EQ(run(envsift_binary() + " merge " + p.dir + "/shard0.csv " + p.dir + "/shard1.csv --out " + p.dir + "/merged.csv").exit_code, 0);
  EXPECT_EQ(read_file(p.dir + "/out.csv"), read_file(p.dir + "/merged.csv"));
}

TEST(ReviewRounds, DuplicateIdsAndBadDecisionsAreSaidSo) {
  const Planted p = planted("review-bad");
  std::string points = read_file(p.points) + "E2,Demo taxon,10.1,50.2\n";  // E2 twice: duplicate_id
  write_file(p.dir + "/dup.csv", points);
  write_file(p.dir + "/decisions.csv", "occurrenceID,decision\nE2,error\n");
  const auto dup = run(screen(p.dir + "/dup.csv", p.dir + "/dup-out.csv", " --decisions " + p.dir + "/decisions.csv"));
  ASSERT_EQ(dup.exit_code, 0) << dup.output;
  EXPECT_NE(dup.output.find("belong to several records (duplicate_id), so the decision is applied to none of them"),
            std::string::npos) << dup.output;
  const Table t = read_csv(p.dir + "/dup-out.csv");
  for (const auto& row : t.rows) EXPECT_EQ(row[t.column("decision")], "");

  write_file(p.dir + "/typo.csv", "occurrenceID,decision\nE1,eror\n");
  const auto typo = run(screen(p.points, p.dir + "/typo-out.csv", " --decisions " + p.dir + "/typo.csv"));
  EXPECT_EQ(typo.exit_code, 3) << typo.output;
  EXPECT_NE(typo.output.find("typo.csv:2: decision 'eror' is not error, valid or unsure"), std::string::npos) << typo.output;
  EXPECT_FALSE(std::ifstream(p.dir + "/typo-out.csv").good());  // nothing written

  // the decisions file is an input: never written to, even when named as the output
  const std::string before = read_file(p.dir + "/decisions.csv");
  const auto clash = run(screen(p.points, p.dir + "/decisions.csv", " --decisions " + p.dir + "/decisions.csv"));
  EXPECT_NE(clash.exit_code, 0);
  EXPECT_EQ(read_file(p.dir + "/decisions.csv"), before);
}

// The loop as a reviewer runs it: screen with --decisions-template, fill the decision column in
// (as a spreadsheet saves it: RFC 4180), screen again with it as --decisions.
TEST(ReviewRounds, TheTemplateRoundTrips) {
  const Planted p = planted("review-template");
  ASSERT_EQ(run(screen(p.points, p.dir + "/r1.csv", " --decisions-template " + p.dir + "/t1.csv --decisions-template-top 3")).exit_code, 0);
  Table t1 = read_csv(p.dir + "/t1.csv");
  ASSERT_EQ(t1.rows.size(), 0u);  // round 1: masked, no open suspect (nothing is flagged)
  write_file(p.dir + "/decisions.csv", "occurrenceID,decision,note\nE1,error,from a locality gazetteer\nN05,unsure,look again\n");
  ASSERT_EQ(run(screen(p.points, p.dir + "/r2.csv",
                       " --decisions " + p.dir + "/decisions.csv --decisions-template " + p.dir + "/t2.csv"))
                .exit_code,
            0);
  Table t2 = read_csv(p.dir + "/t2.csv");
  ASSERT_EQ(t2.rows.size(), 3u);  // E2, now an open suspect, then the earlier decisions by rank
  EXPECT_EQ(t2.rows[0][t2.column("occurrenceID")], "E2");
  EXPECT_EQ(t2.rows[0][t2.column("rank")], "1");
  EXPECT_EQ(t2.rows[0][t2.column("decision")], "");
  EXPECT_EQ(t2.rows[1][t2.column("occurrenceID")], "N05");  // unsure and not flagged: carried over all the same
  EXPECT_EQ(t2.rows[1][t2.column("note")], "look again");
  EXPECT_EQ(t2.rows[2][t2.column("occurrenceID")], "E1");
  EXPECT_EQ(t2.rows[2][t2.column("decision")], "error");
  EXPECT_EQ(t2.rows[2][t2.column("note")], "from a locality gazetteer");
  // filled in and read back as it is
  std::string filled = read_file(p.dir + "/t2.csv");
  const auto at = filled.find("\nE2,");
  ASSERT_NE(at, std::string::npos);
  const auto line_end = filled.find('\n', at + 1);
  std::string line = filled.substr(at + 1, line_end - at - 1);
  ASSERT_EQ(line.substr(line.size() - 4), ",,,,");  // decision, note, reviewer, date empty
  line = line.substr(0, line.size() - 4) + ",valid,\"checked, a real range edge\",A. Reviewer,2026-12-03";
  filled.replace(at + 1, line_end - at - 1, line);
  write_file(p.dir + "/t2-filled.csv", filled);
  const auto r3 = run(screen(p.points, p.dir + "/r3.csv", " --decisions " + p.dir + "/t2-filled.csv --decisions-template " + p.dir + "/t3.csv"));
  ASSERT_EQ(r3.exit_code, 0) << r3.output;
  auto rows = by_id(read_csv(p.dir + "/r3.csv"));
  const Table r3t = read_csv(p.dir + "/r3.csv");
  EXPECT_EQ(rows["E2"][r3t.column("decision")], "valid");
  EXPECT_EQ(rows["E2"][r3t.column("decision_note")], "checked, a real range edge");
  EXPECT_EQ(rows["E2"][r3t.column("flags")], "");
  const Table t3 = read_csv(p.dir + "/t3.csv");
  ASSERT_EQ(t3.rows.size(), 3u);  // all decided now, who and when carried over
  const auto e2 = std::find_if(t3.rows.begin(), t3.rows.end(), [&](const auto& r) { return r[t3.column("occurrenceID")] == "E2"; });
  ASSERT_NE(e2, t3.rows.end());
  EXPECT_EQ((*e2)[t3.column("reviewer")], "A. Reviewer");
  EXPECT_EQ((*e2)[t3.column("date")], "2026-12-03");
}

// The decisions file is read once, before sampling, so it may come through a pipe (bash's
// process substitution, common practice for a file filtered on the way): the same output as
// from the file itself (envsift's own contract; a file read twice, or sought back, loses a pipe).
TEST(ReviewRounds, DecisionsThroughAPipeAreReadOnceAndAsFromTheFile) {
  const Planted p = planted("review-pipe");
  write_file(p.dir + "/decisions.csv", "occurrenceID,decision,note\nE1,error,confirmed\n");
  ASSERT_EQ(run(screen(p.points, p.dir + "/file.csv", " --decisions " + p.dir + "/decisions.csv")).exit_code, 0);
  const auto piped = run("bash -c '" + screen(p.points, p.dir + "/pipe.csv", " --decisions <(cat " + p.dir + "/decisions.csv)") + "'");
  ASSERT_EQ(piped.exit_code, 0) << piped.output;
  EXPECT_TRUE(read_file(p.dir + "/pipe.csv") == read_file(p.dir + "/file.csv"));
  EXPECT_EQ(by_id(read_csv(p.dir + "/pipe.csv"))["E1"][read_csv(p.dir + "/pipe.csv").column("decision")], "error");
}

}  // namespace
}  // namespace envsift
