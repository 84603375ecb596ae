#include "test_options.hpp"

#include <sstream>

#include "envsift/errors.hpp"

namespace envsift::cli {

std::vector<std::string> split_list(const std::string& text) {
  std::vector<std::string> items;
  std::stringstream in(text);
  std::string item;
  while (std::getline(in, item, ','))
    if (!item.empty()) items.push_back(item);
  return items;
}

void add_test_options(po::options_description& d, ScreenOptions& o, TestChoices& c) {
  d.add_options()
    ("tests", po::value(&c.tests)->default_value(c.tests)->value_name("LIST"),
     "tests to run, comma-separated. robust_z: one layer at a time, distance from the taxon's median; "
     "reverse_jackknife: one layer at a time, a gap cutting off a tail; mahalanobis: all layers together, "
     "classical mean/covariance; mahalanobis_robust: all layers together, FAST-MCD estimates that outliers "
     "cannot distort (add it when errors come in batches that could mask each other; it costs most of the "
     "time). The default three are what the evaluation supports (README, envsift evaluate).")
    ("z-cutoff", po::value(&o.robust_z.cutoff)->default_value(o.robust_z.cutoff)->value_name("Z"),
     "robust_z flags |z| > Z. 3 is 'very conservative' in Leys et al. (2013); lower values flag more good "
     "records, and a record is judged on every layer")
    ("scale", po::value<std::string>()->default_value("mad")->value_name("mad|skew"),
     "how robust_z and the Mahalanobis tests measure distance on a layer. mad: one spread, 1.4826 × MAD, "
     "for both sides of the taxon's median; skew: each side its own spread, from the adjusted boxplot's "
     "fence on that side (Hubert & Vandervieren 2008), so a long tail (rainfall, slope, distances) is not "
     "flagged. mad is the default because it measured better with envsift evaluate (README); try both on "
     "your rasters")
    ("common-share", po::value(&o.robust_z.common_share)->default_value(o.robust_z.common_share)->value_name("S"),
     "the one-layer tests never flag a value that at least this share of the taxon's values hold exactly "
     "(a layer of few classes has common classes, not outliers); 0 turns this off")
    ("chi2-quantile", po::value(&o.mahalanobis.quantile)->default_value(o.mahalanobis.quantile)->value_name("Q"),
     "the Mahalanobis tests flag D² above the Q quantile of chi-square (Rousseeuw & van Zomeren 1990 use 0.975)")
    ("min-records", po::value(&c.min_records)->default_value(c.min_records)->value_name("N"),
     "a taxon needs N values (distinct cells) on a layer for the one-layer tests, and N complete rows for "
     "the Mahalanobis tests, which also use at most one dimension per 3 rows; smaller taxa get "
     "too_few_records:TEST")
    ("all-records", po::bool_switch(),
     "estimate each taxon's statistics from every record, not from one record per distinct cell (the "
     "default, so that fifty records in one cell neither zero the spread nor hide an outlier)")
    ("seed", po::value(&o.seed)->default_value(o.seed)->value_name("N"),
     "seed of the random subsets of mahalanobis_robust; the same seed gives the same output")
    ("populations", po::value<std::string>()->default_value("split")->value_name("split|one"),
     "split: a taxon whose records form two separate groups in the layers' space (k-means with a density "
     "valley between the groups; each at least 20 % of the taxon) is judged as two populations, each on its "
     "own; one: every taxon is judged as one")
    ("max-flagged-share", po::value(&o.population.max_share)->default_value(o.population.max_share)->value_name("S"),
     "when one test flags more than this share of a taxon's judged records (and at least "
     "5), the taxon probably has several populations, not that many errors: that test's flags are withheld "
     "for the taxon, its records get looks_multimodal:TEST and a warning names the taxon. 1 turns this off");
}

void finish_test_options(const po::variables_map& vm, ScreenOptions& o, const TestChoices& c) {
  o.tests = split_list(c.tests);
  o.distinct_cells = !vm["all-records"].as<bool>();
  const std::string scale = vm["scale"].as<std::string>();
  if (scale != "skew" && scale != "mad") throw UsageError("--scale must be skew or mad, not '" + scale + "'");
  o.robust_z.skew_adjusted = o.mahalanobis.skew_adjusted = scale == "skew";
  if (!(o.robust_z.common_share >= 0 && o.robust_z.common_share <= 1))
    throw UsageError("--common-share must be between 0 and 1");
  o.jackknife.common_share = o.robust_z.common_share;
  if (!(o.robust_z.cutoff > 0)) throw UsageError("--z-cutoff must be a positive number");
  if (!(o.mahalanobis.quantile > 0 && o.mahalanobis.quantile < 1)) throw UsageError("--chi2-quantile must be between 0 and 1");
  if (c.min_records < 3) throw UsageError("--min-records must be at least 3");
  o.robust_z.min_records = o.jackknife.min_records = o.mahalanobis.min_records = c.min_records;
  const std::string populations = vm["populations"].as<std::string>();
  if (populations != "split" && populations != "one")
    throw UsageError("--populations must be split or one, not '" + populations + "'");
  o.populations.enabled = populations == "split";
  o.populations.min_rows = c.min_records;
  if (!(o.population.max_share > 0 && o.population.max_share <= 1))
    throw UsageError("--max-flagged-share must be above 0 and at most 1");
}

}  // namespace envsift::cli
