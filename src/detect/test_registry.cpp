#include "envsift/detect/test_registry.hpp"

#include <algorithm>

#include "envsift/errors.hpp"

namespace envsift {

// Each entry is defined in its own file beside its test (src/detect/NAME_entry.cpp).
TestEntry robust_z_entry();
TestEntry reverse_jackknife_entry();
TestEntry mahalanobis_entry();
TestEntry robust_mahalanobis_entry();
TestEntry landscape_entry();
TestEntry reported_elevation_entry();
TestEntry range_check_entry();

// The registry: one line per test, in the order their columns are written.
const std::vector<TestEntry>& test_registry() {
  static const std::vector<TestEntry> entries{
      robust_z_entry(),
      reverse_jackknife_entry(),
      mahalanobis_entry(),
      robust_mahalanobis_entry(),
      landscape_entry(),
      reported_elevation_entry(),
      range_check_entry(),
  };
  return entries;
}

const TestEntry* find_test(const std::string& name) {
  for (const auto& e : test_registry())
    if (e.name == name) return &e;
  return nullptr;
}

std::vector<std::string> default_test_names() {
  std::vector<std::string> names;
  for (const auto& e : test_registry())
    if (e.is_default) names.push_back(e.name);
  return names;
}

TestSettings::TestSettings() : tests(default_test_names()) {
  for (const auto& e : test_registry())
    if (e.own_defaults.has_value()) own.add(e.own_defaults);
}

namespace {

std::string taxon_test_names() {
  std::string names;
  for (const auto& e : test_registry())
    if (e.make_detector) names += (names.empty() ? "" : ", ") + e.name;
  return names;
}

TestOption tests_option() {
  std::string help = "tests to run, comma-separated.";
  for (const auto& e : test_registry())
    if (e.make_detector) help += " " + e.name + ": " + e.help;
  help += " The defaults are what the evaluation supports (docs/evaluation.md, envsift evaluate).";
  TestOption o{"tests", "LIST", help};
  o.set = [](TestSettings& s, const std::string& text) { s.tests = split_list(text); };
  o.get = [](const TestSettings& s) { return join_list(s.tests, ","); };
  o.check = [](const TestSettings& s) {
    if (s.tests.empty()) return "names no test; choose from " + taxon_test_names();
    for (const auto& t : s.tests) {
      const TestEntry* e = find_test(t);
      if (!e || !e->make_detector) return "names an unknown test '" + t + "'; choose from " + taxon_test_names();
    }
    return std::string();
  };
  return o;
}

}  // namespace

const std::vector<TestOption>& test_options() {
  using T = TestSettings;
  static const std::vector<TestOption> options = [] {
    std::vector<TestOption> v{tests_option()};
    v.push_back(choice_option(
        "scale",
        "how robust z and the Mahalanobis distances measure distance on a layer. mad: one spread, 1.4826 × MAD, for both "
        "sides of the taxon's median; skew: each side its own spread, from the adjusted boxplot's fence on that side "
        "(Hubert & Vandervieren 2008), so a long tail (rainfall, slope, distances) is not flagged. mad is the default "
        "because it measured better with envsift evaluate (docs/evaluation.md); try both on your rasters",
        &T::scale, Choices<Scale>{{"mad", Scale::mad}, {"skew", Scale::skew}}));
    v.push_back(real_option("common-share", "S",
                            "the one-layer tests never flag a value that at least this share of the taxon's values hold "
                            "exactly (a layer of few classes has common classes, not outliers); 0 turns this off",
                            &T::common_share, between(0, 1)));
    v.push_back(count_option("min-records", "N",
                             "a taxon needs N values (distinct cells) on a layer for the one-layer tests, and N complete "
                             "rows for the Mahalanobis tests, which also use at most one dimension per 3 rows; smaller "
                             "taxa get too_few_records:TEST",
                             &T::min_records, at_least(3)));
    v.push_back(switch_option("all-records",
                              "estimate each taxon's statistics from every record, not from one record per distinct "
                              "cell (the default, so that fifty records in one cell neither zero the spread nor hide an "
                              "outlier)",
                              &T::all_records));
    v.push_back(count_option("seed", "N", "seed of the randomised tests; the same seed gives the same output", &T::seed));
    v.push_back(choice_option(
        "combine",
        "how the tests' severities (1 at each test's cutoff) make a record's score, which ranks it. max: the most "
        "severe test, so a score above 1 means a test flagged it; mean: the mean over the tests that judged it, so a "
        "record several tests find far from its taxon ranks above one that a single test finds far. Flags are the "
        "same either way",
        &T::combine, Choices<Combine>{{"max", Combine::max}, {"mean", Combine::mean}}));
    v.push_back(choice_option(
        "populations",
        "split: a taxon whose records form two separate groups in the layers' space (k-means with a density valley "
        "between the groups; each at least 20 % of the taxon) is judged as two populations, each on its own; one: "
        "every taxon is judged as one",
        &T::populations, Choices<PopulationMode>{{"split", PopulationMode::split}, {"one", PopulationMode::one}}));
    v.push_back(real_option(
        "max-flagged-share", "S",
        "when one test flags more than this share of the distinct places (cells) of a taxon it judged, and at least 5 "
        "places, the taxon probably has several populations, not that many errors: that test's flags are withheld for "
        "the taxon (its records keep their score and rank), they get looks_multimodal:TEST and a warning names the "
        "taxon. Places, not records, are counted, so a batch of records at a few wrong places stays flagged. 1 turns "
        "this off",
        &T::max_flagged_share, Bounds{0.0, 1.0, true, false}));
    v.push_back(real_option(
        "flag-share", "P",
        "with --flag-rule share: the share of a taxon's clean records you accept to see flagged: a record is flagged when the tests' combined "
        "probability (how often a clean record of its taxon would look at least this unusual) is at most P. 0.01 "
        "flags about 1 in 100 clean records; with --flag-rule fdr, P is the false discovery rate among each taxon's flags",
        &T::flag_share, Bounds{0.0, 0.5, true, false}));
    v.push_back(choice_option(
        "flag-rule",
        "how flags are decided. share: the combined probability at most --flag-share; fdr: Benjamini-Hochberg at "
        "--flag-share over each taxon's records (fewer flags where a taxon has many unusual records); cutoffs: each "
        "test by its own cutoff (--z-cutoff, --chi2-quantile, --landscape-ratio; the reverse jackknife's is fixed). cutoffs "
        "stays the default until the probabilities keep their share on every terrain measured (docs/methods.md)",
        &T::flag_rule, Choices<FlagRule>{{"share", FlagRule::share}, {"fdr", FlagRule::fdr}, {"cutoffs", FlagRule::cutoffs}}));
    for (const auto& e : test_registry()) v.insert(v.end(), e.options.begin(), e.options.end());
    return v;
  }();
  return options;
}

std::vector<std::string> ActiveTests::names() const {
  std::vector<std::string> n;
  for (const auto* e : entries) n.push_back(e->name);
  return n;
}

std::vector<std::vector<std::string>> ActiveTests::extra_columns() const {
  std::vector<std::vector<std::string>> extras;
  for (const auto& d : detectors) extras.push_back(d->extra_columns());
  extras.resize(entries.size());
  return extras;
}

std::optional<LandscapeOptions> ActiveTests::landscape(const TestSettings& settings) const {
  for (const auto* e : entries)
    if (e->landscape) return e->landscape(settings);
  return std::nullopt;
}

std::string elevation_layer(const TestSettings& settings) {
  for (const auto& e : test_registry())
    if (e.elevation_layer && !e.elevation_layer(settings).empty()) return e.elevation_layer(settings);
  return "";
}

namespace {

bool named(const TestSettings& s, const TestEntry& e) {
  return std::find(s.tests.begin(), s.tests.end(), e.name) != s.tests.end();
}

// A test that needs layers, with --value-columns: left out when the defaults are in use, refused
// when asked for by name.
bool inapplicable(const TestContext& c, const TestEntry& e) { return e.needs_layers && c.values_from_columns; }

}  // namespace

ActiveTests activate_tests(const TestSettings& s, const TestContext& c) {
  validate_tests(s, c);
  ActiveTests active;
  for (const auto& e : test_registry())
    if (e.make_detector && named(s, e) && !inapplicable(c, e)) {
      active.detectors.push_back(e.make_detector(s));
      active.entries.push_back(&e);
    }
  for (const auto& e : test_registry())
    if (e.make_check && e.wanted_check(s)) {
      active.checks.push_back(e.make_check(s));
      active.entries.push_back(&e);
    }
  return active;
}

void validate_tests(const TestSettings& s, const TestContext& c) {
  check_options(test_options(), s);
  if (s.tests != default_test_names())
    for (const auto& e : test_registry())
      if (named(s, e) && inapplicable(c, e))
        throw UsageError("--tests " + e.name + " needs layers (--layers), not --value-columns; leave it out of --tests");
  for (const auto& e : test_registry())
    if (e.validate) e.validate(s, c);
}

}  // namespace envsift
