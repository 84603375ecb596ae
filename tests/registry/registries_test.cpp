// envsift's own contract for its extension points (no outside reference): every registered test
// declares its options, reads back its defaults as written, describes itself and builds; every
// registered output opens, finishes and commits on a run without records.
#include <filesystem>
#include <set>

#include <gtest/gtest.h>

#include "../support.hpp"
#include "envsift/detect/reported_elevation.hpp"
#include "envsift/detect/test_registry.hpp"
#include "envsift/run/validate.hpp"
#include "envsift/write/output_registry.hpp"

namespace envsift {
namespace {

TEST(TestRegistry, EveryEntryIsNamedOnceDescribesItselfAndBuilds) {
  const TestSettings defaults;
  std::set<std::string> names;
  for (const auto& e : test_registry()) {
    SCOPED_TRACE(e.name);
    EXPECT_TRUE(names.insert(e.name).second) << "two entries named " << e.name;
    EXPECT_FALSE(e.name.empty());
    ASSERT_TRUE(e.describe);
    EXPECT_NE(e.describe(defaults).find(e.name), std::string::npos);
    ASSERT_NE(static_cast<bool>(e.make_detector), static_cast<bool>(e.make_check)) << "a taxon test or a record check";
    if (e.make_detector) {
      const auto detector = e.make_detector(defaults);
      ASSERT_TRUE(detector);
      EXPECT_EQ(detector->name(), e.name);  // the word written to `flags`
      EXPECT_FALSE(e.help.empty());
    } else {
      ASSERT_TRUE(e.wanted_check);
      EXPECT_FALSE(e.is_default) << "a record check is asked for by its own options";
      const auto check = e.make_check(defaults);
      ASSERT_TRUE(check);
      EXPECT_EQ(check->name(), e.name);
    }
  }
  EXPECT_EQ(default_test_names(), (std::vector<std::string>{"robust_z", "mahalanobis", "landscape"}));
}

TEST(TestRegistry, EveryOptionRoundTripsItsDefaultAsWritten) {
  const ScreenSettings defaults;
  std::set<std::string> seen;
  for (const auto& o : all_screen_options()) {
    SCOPED_TRACE(o.name);
    EXPECT_TRUE(seen.insert(o.name).second) << "declared twice";
    ASSERT_TRUE(o.set && o.get);
    EXPECT_FALSE(o.help.empty());
    const std::string text = o.get(defaults);
    if (o.check) {
      EXPECT_EQ(o.check(defaults), "") << "the default is out of its own bounds";
    }
    if (text.empty() || o.multitoken) continue;
    ScreenSettings read = defaults;
    o.set(read, text);
    EXPECT_EQ(o.get(read), text);
    // as written: never a 17-digit expansion such as 0.050000000000000003
    EXPECT_LE(text.size(), 40u);
    EXPECT_EQ(text.find("00000000"), std::string::npos) << text;
  }
  // the options each test entry declares are among the command's
  for (const auto& e : test_registry())
    for (const auto& o : e.options) EXPECT_TRUE(seen.count(o.name)) << o.name;
}

TEST(TestRegistry, ActivatingTheDefaultsGivesTheirDetectorsInRegistryOrder) {
  TestSettings s;
  s.tests = {"mahalanobis", "robust_z"};
  s.own.get<ElevationSettings>().dem_layer = "dem";
  const ActiveTests active = activate_tests(s, {});
  ASSERT_EQ(active.detectors.size(), 2u);
  ASSERT_EQ(active.checks.size(), 1u);
  EXPECT_EQ(active.names(), (std::vector<std::string>{"robust_z", "mahalanobis", "elevation_mismatch"}));
  EXPECT_EQ(active.extra_columns(), (std::vector<std::vector<std::string>>{{}, {"dims"}, {}}));
}

TEST(OutputRegistry, EveryOutputOpensFinishesAndCommitsOnAnEmptyRun) {
  const auto dir = testing::temp_dir("empty-run-outputs");
  ScreenSettings s;
  s.input.points = testing::source_path("demo-points/occurrences.csv");  // the manifest hashes it
  const ActiveTests tests = activate_tests(s.tests, {});
  RecordTable table;
  table.codes.resize(0);
  table.points.columns = {s.input.reader.columns.id};  // a file's header, no records (the template lists by ID)
  std::set<std::string> names;
  for (const auto& e : output_registry()) {
    SCOPED_TRACE(e.name);
    EXPECT_TRUE(names.insert(e.name).second);
    const std::string extension = e.name == "gis" ? ".gpkg" : e.name == "report" ? ".html" : e.name == "manifest" ? ".json" : ".csv";
    const std::string path = dir + "/" + e.name + extension;
    auto sink = e.make(path);
    ASSERT_TRUE(sink);
    const RunContext run{s.outputs, table, &tests, &s.tests, {s.input.points, {}, s.input.reader.columns.id, false, "", ""}, nullptr,
                         {"status", "rank", "score", "flags", "reasons"}, {}};
    sink->begin(run);
    RunSummary summary;
    sink->finish(summary);
    EXPECT_FALSE(std::filesystem::exists(path)) << "in place before commit";
    sink->commit();
    EXPECT_TRUE(std::filesystem::exists(path));
    EXPECT_GT(std::filesystem::file_size(path), 0u);
  }
  // nothing is left under a temporary name
  for (const auto& f : std::filesystem::directory_iterator(dir))
    EXPECT_EQ(f.path().string().find(".partial-"), std::string::npos) << f.path();
}

TEST(OutputRegistry, AnOutputNotCommittedLeavesNothing) {
  const auto dir = testing::temp_dir("uncommitted-outputs");
  ScreenSettings s;
  for (const auto& e : output_registry()) {
    if (e.name == "gis") continue;  // GDAL creates its file at begin(), covered by the CLI's interrupt test
    { auto sink = e.make(dir + "/" + e.name + ".out"); }
  }
  EXPECT_TRUE(std::filesystem::is_empty(dir));
}

}  // namespace
}  // namespace envsift
