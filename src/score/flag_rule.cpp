#include "envsift/score/flag_rule.hpp"

#include "envsift/detect/tail_probability.hpp"

namespace envsift {

void flag_tests_at_knob(std::vector<std::vector<Finding>>& findings, const FlagSettings& settings) {
  if (settings.rule == FlagRule::cutoffs) return;
  for (auto& test : findings)
    for (Finding& f : test) f.flagged = f.tested && f.probability <= settings.share;  // NaN: false
}

double combined_probability(const std::vector<const Finding*>& findings) {
  std::vector<double> p;
  for (const Finding* f : findings)
    if (f->tested && !f->withheld && std::isfinite(f->probability)) p.push_back(f->probability);
  return p.empty() ? std::nan("") : cauchy_combination(p);
}

std::vector<RecordFlag> decide_flags(const std::vector<std::vector<Finding>>& findings, const FlagSettings& settings) {
  const std::size_t rows = findings.empty() ? 0 : findings.front().size();
  std::vector<RecordFlag> out(rows);
  std::vector<double> family;  // the combined probabilities of the taxon's records that have one
  std::vector<std::size_t> at;
  for (std::size_t r = 0; r < rows; ++r) {
    std::vector<const Finding*> per_test;
    for (const auto& test : findings) per_test.push_back(&test[r]);
    out[r].probability = combined_probability(per_test);
    if (std::isfinite(out[r].probability)) family.push_back(out[r].probability), at.push_back(r);
  }
  if (settings.rule == FlagRule::share)
    for (std::size_t k = 0; k < family.size(); ++k) out[at[k]].flagged = family[k] <= settings.share;
  if (settings.rule == FlagRule::fdr) {
    const std::vector<bool> found = benjamini_hochberg(family, settings.share);
    for (std::size_t k = 0; k < family.size(); ++k) out[at[k]].flagged = found[k];
  }
  return out;
}

}  // namespace envsift
