// envsift's own contract (no outside reference): settings are validated by the library with the
// command line's messages, so a program embedding envsift gets the same checks as the binary.
#include <gtest/gtest.h>

#include "../support.hpp"
#include "envsift/errors.hpp"
#include "envsift/run/run.hpp"
#include "envsift/detect/mahalanobis.hpp"
#include "envsift/detect/reported_elevation.hpp"
#include "envsift/detect/robust_z.hpp"
#include "envsift/run/validate.hpp"

namespace envsift {
namespace {

using namespace envsift::testing;

ScreenSettings demo_settings(const std::string& out) {
  ScreenSettings s;
  s.input.points = source_path("demo-points/occurrences.csv");
  s.input.layers = demo_layer_paths();
  s.input.reader.require_taxon = true;
  s.outputs.out = out;
  return s;
}

std::string library_message(const ScreenSettings& s) {
  try {
    run_screen(s);
  } catch (const UsageError& e) {
    return e.what();
  }
  return "(no error)";
}

// The CLI's one-line error, without its "envsift: error: " prefix.
std::string cli_message(const std::string& out, const std::string& options) {
  const auto r = run(envsift_binary() + " screen -q --points " + source_path("demo-points/occurrences.csv") + demo_layers() +
                     " --out " + out + " " + options);
  EXPECT_EQ(r.exit_code, 2) << r.output;
  const std::string prefix = "envsift: error: ";
  const auto at = r.output.find(prefix);
  if (at == std::string::npos) return r.output;
  const auto end = r.output.find('\n', at);
  return r.output.substr(at + prefix.size(), end - at - prefix.size());
}

TEST(Validation, EmbeddingAndCommandLineGetTheSameMessage) {
  const auto dir = temp_dir("validation");
  struct Case {
    std::string options;
    void (*change)(ScreenSettings&);
  };
  const Case cases[] = {
      {"--z-cutoff 0", [](ScreenSettings& s) { s.tests.own.get<RobustZSettings>().z_cutoff = 0; }},
      {"--chi2-quantile 1", [](ScreenSettings& s) { s.tests.own.get<MahalanobisSettings>().chi2_quantile = 1; }},
      {"--min-records 2", [](ScreenSettings& s) { s.tests.min_records = 2; }},
      {"--tests robust_z,gap", [](ScreenSettings& s) { s.tests.tests = {"robust_z", "gap"}; }},
      {"--elevation-tolerance 0 --dem dem",
       [](ScreenSettings& s) {
         auto& e = s.tests.own.get<ElevationSettings>();
         e.tolerance_m = 0, e.dem_layer = "dem";
       }},
      {"--threads 100000", [](ScreenSettings& s) { s.sampling.threads = 100000; }},  // crashed the OpenMP runtime
      {"--order rank --shard 0/2",
       [](ScreenSettings& s) { s.outputs.order = RowOrder::rank, s.outputs.shard_index = 0, s.outputs.shard_count = 2; }},
  };
  for (const auto& c : cases) {
    SCOPED_TRACE(c.options);
    ScreenSettings s = demo_settings(dir + "/library.csv");
    c.change(s);
    const std::string library = library_message(s);
    EXPECT_NE(library, "(no error)");
    EXPECT_EQ(library, cli_message(dir + "/cli.csv", c.options));
  }
  EXPECT_EQ(library_message([&] {
              ScreenSettings s = demo_settings(dir + "/library.csv");
              s.tests.own.get<RobustZSettings>().z_cutoff = 0;
              return s;
            }()),
            "--z-cutoff must be above 0, not 0");
  EXPECT_FALSE(std::ifstream(dir + "/library.csv")) << "nothing is written by a refused run";
}

// A choice is typed (an enum in the settings), so a program cannot hold a word outside it; the
// word is refused as it is read, with the command line's message, through the same declaration.
TEST(Validation, AChoiceOutsideItsWordsIsRefusedAsItIsRead) {
  const auto dir = temp_dir("validation-choices");
  for (const auto& [option, word, expected] :
       {std::tuple{"method", "cubic", "--method must be one of nearest|bilinear, not 'cubic'"},
        std::tuple{"scale", "log", "--scale must be one of mad|skew, not 'log'"},
        std::tuple{"order", "random", "--order must be one of input|rank, not 'random'"},
        std::tuple{"mcd-start", "fast", "--mcd-start must be one of deterministic|random, not 'fast'"}}) {
    SCOPED_TRACE(option);
    ScreenSettings s;
    const auto options = all_screen_options();
    const std::string name = option;  // a structured binding cannot be captured in C++17
    const auto o = std::find_if(options.begin(), options.end(), [&name](const OptionSpec& d) { return d.name == name; });
    ASSERT_NE(o, options.end());
    std::string library = "(no error)";
    try {
      o->set(s, word);
    } catch (const UsageError& e) {
      library = e.what();
    }
    EXPECT_EQ(library, expected);
    EXPECT_EQ(cli_message(dir + "/cli.csv", std::string("--") + option + " " + word), expected);
    o->set(s, o->get(ScreenSettings{}));  // the default as written reads back
    EXPECT_EQ(o->get(s), o->get(ScreenSettings{}));
  }
}

TEST(Validation, DefaultsAreValidAndShownAsWritten) {
  ScreenSettings s = demo_settings("x.csv");
  EXPECT_NO_THROW(validate(s));
  EXPECT_EQ(number_text(0.05), "0.05");
  EXPECT_EQ(number_text(0.975), "0.975");
  EXPECT_EQ(number_text(0.15), "0.15");
  EXPECT_EQ(number_text(25000), "25000");
  EXPECT_EQ(number_text(1.0 / 3), "0.3333333333333333");  // 16 digits read back exactly
  const auto r = run(envsift_binary() + " screen --help");
  EXPECT_NE(r.output.find("(=0.05)"), std::string::npos);
  EXPECT_NE(r.output.find("(=0.995)"), std::string::npos);
  EXPECT_NE(r.output.find("(=0.15)"), std::string::npos);
  EXPECT_EQ(r.output.find("0000000"), std::string::npos) << "a default printed as a long expansion";
}

TEST(Validation, AMistypedOptionGetsTheNearestDeclaredOne) {
  const auto r = run(envsift_binary() + " screen --points x.csv --layers y.tif --out z.csv --z-cuttoff 3");
  EXPECT_EQ(r.exit_code, 2);
  EXPECT_NE(r.output.find("unrecognised option '--z-cuttoff' (did you mean --z-cutoff?)"), std::string::npos) << r.output;
  const auto far = run(envsift_binary() + " screen --points x.csv --layers y.tif --out z.csv --colour red");
  EXPECT_EQ(far.output.find("did you mean"), std::string::npos) << far.output;
}

TEST(Validation, SampleDoesNotSayFlaggedAndMergeAsksForTheShards) {
  const auto dir = temp_dir("small-messages");
  auto r = run(envsift_binary() + " sample -q --points " + source_path("demo-points/occurrences.csv") + demo_layers() +
               " --out " + dir + "/s.csv");
  ASSERT_EQ(r.exit_code, 0) << r.output;
  EXPECT_EQ(r.output.find("flagged"), std::string::npos) << r.output;
  EXPECT_NE(r.output.find("910 with values, 5 without"), std::string::npos) << r.output;
  r = run(envsift_binary() + " merge --out " + dir + "/m.csv");
  EXPECT_EQ(r.exit_code, 2);
  EXPECT_NE(r.output.find("give the shard outputs"), std::string::npos) << r.output;
  EXPECT_EQ(r.output.find("--shards"), std::string::npos) << r.output;
}

}  // namespace
}  // namespace envsift
