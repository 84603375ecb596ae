#include "envsift/score/scoring.hpp"

#include <algorithm>
#include <cmath>
#include <cstdio>
#include <numeric>
#include <utility>

#include "envsift/reason_codes.hpp"

namespace envsift {

std::vector<std::string> Verdict::withheld() const {
  const std::string prefix = reason::looks_multimodal + ":";
  std::vector<std::string> tests;
  for (const auto& c : codes)
    if (c.compare(0, prefix.size(), prefix) == 0) tests.push_back(c.substr(prefix.size()));
  return tests;
}

std::string one_in(double p) {
  if (!(p > 0)) return "none";
  if (p < 1e-6) return "fewer than 1 in a million";
  if (p > 0.5) return "more than 1 in 2";
  // 1/p to two significant figures, thousands grouped: 1 in 4,000; 1 in 37; 1 in 120,000
  std::string digits = std::to_string(std::llround(1 / p));
  if (digits.size() > 2) {
    const std::size_t drop = digits.size() - 2;
    // (996 → 100 · 10 = 1,000: rounding up adds a digit, and the zeros keep the magnitude)
    digits = std::to_string(std::llround(1 / p / std::pow(10.0, static_cast<double>(drop)))) + std::string(drop, '0');
  }
  std::string grouped;
  for (std::size_t k = 0; k < digits.size(); ++k) {
    if (k > 0 && (digits.size() - k) % 3 == 0) grouped += ',';
    grouped += digits[k];
  }
  return "about 1 in " + grouped;
}

namespace {

// The sentence that opens a record's reasons when the tests' evidence together flagged it.
std::string combined_words(const std::vector<const Finding*>& findings, const std::vector<std::string>& names, double p) {
  std::string tests;
  std::size_t listed = 0;
  for (std::size_t t = 0; t < findings.size(); ++t)
    if (findings[t]->tested && !findings[t]->withheld && std::isfinite(findings[t]->probability)) {
      char each[96];
      std::snprintf(each, sizeof each, "%s%s %.2g", listed++ ? ", " : "", names[t].c_str(), findings[t]->probability);
      tests += each;
    }
  char p_text[32];
  std::snprintf(p_text, sizeof p_text, "%.2g", p);
  const std::string how_many = p > 0 ? one_in(p) : "almost none";
  return how_many + " of this taxon's clean records would look this unusual to the tests together (probability " +
         p_text + ": " + tests + ")";
}

}  // namespace

Verdict combine(const std::vector<const Finding*>& findings, const std::vector<std::string>& names, CombineRule rule,
                const RecordFlag& flag, FlagRule flag_rule) {
  Verdict v;
  const bool by_probability = flag_rule != FlagRule::cutoffs;
  v.probability = flag.probability;
  std::vector<std::size_t> order;  // tests whose reasons are written, in the order written
  double sum = 0;
  std::size_t judged = 0;
  bool named = false;  // a test that gives a probability is listed in `flags`
  for (std::size_t t = 0; t < findings.size(); ++t) {
    const Finding& f = *findings[t];
    v.tests.push_back({f.tested, f.statistic, f.threshold, f.probability, f.extras});
    if (!f.tested) {
      v.codes.push_back(f.untested_code);
      continue;
    }
    v.codes.insert(v.codes.end(), f.codes.begin(), f.codes.end());
    v.score = std::max(v.score.value_or(0.0), f.severity);
    sum += f.severity, ++judged;
    const bool gives_probability = std::isfinite(f.probability);
    // under a probability rule a test's own flag counts only on a record the evidence flagged;
    // a check (no probability) flags by its own tolerance under every rule
    const bool flags = f.flagged && (!by_probability || !gives_probability || flag.flagged);
    if (flags) v.flags.push_back(names[t]), named = named || gives_probability;
    const bool worded = flags || (by_probability && flag.flagged && gives_probability && !f.withheld &&
                                  f.probability <= kWorthWords);
    if (worded) order.push_back(t);
  }
  if (by_probability && flag.flagged && !named) v.flags.push_back("combined");
  if (rule == CombineRule::mean && judged > 0) v.score = sum / static_cast<double>(judged);
  // most severe first; under a probability rule the tests by their evidence (smallest probability
  // first), then the checks by severity — one key, so the order is a strict weak ordering
  auto key = [&](std::size_t t) {
    const Finding& f = *findings[t];
    const bool ranked_by_p = by_probability && std::isfinite(f.probability);
    return std::make_pair(ranked_by_p ? 0 : 1, ranked_by_p ? f.probability : -f.severity);
  };
  auto stronger = [&](std::size_t a, std::size_t b) { return key(a) < key(b); };
  std::stable_sort(order.begin(), order.end(), stronger);
  if (by_probability && flag.flagged) v.reasons.push_back(combined_words(findings, names, flag.probability));
  for (std::size_t t : order)
    for (const auto& r : findings[t]->reasons) v.reasons.push_back(r);
  return v;
}

std::vector<std::size_t> rank_by_score(const std::vector<std::optional<double>>& scores,
                                       const std::vector<std::uint8_t>& tiers) {
  std::vector<std::size_t> order;
  for (std::size_t i = 0; i < scores.size(); ++i)
    if (scores[i]) order.push_back(i);
  auto tier = [&](std::size_t i) { return tiers.empty() ? 0 : tiers[i]; };
  std::stable_sort(order.begin(), order.end(), [&](std::size_t a, std::size_t b) {
    return tier(a) != tier(b) ? tier(a) < tier(b) : *scores[a] > *scores[b];
  });
  std::vector<std::size_t> rank(scores.size(), 0);
  for (std::size_t k = 0; k < order.size(); ++k) rank[order[k]] = k + 1;
  return rank;
}

std::uint8_t review_tier(Decision decision) {
  return decision == Decision::valid ? 1 : decision == Decision::error ? 2 : 0;
}

void apply_decision(Verdict& v, Decision decision, const std::string& note) {
  v.decision = decision;
  v.decision_note = note;
  if (decision == Decision::valid && !v.flags.empty()) {
    std::string flags, reasons;
    for (const auto& f : v.flags) flags += (flags.empty() ? "" : ";") + f;
    for (const auto& r : v.reasons) reasons += (reasons.empty() ? "" : "; ") + r;
    v.set_aside = flags + (reasons.empty() ? "" : ": " + reasons);
    v.flags.clear();
    v.reasons.clear();
  }
  if (decision == Decision::error) v.codes.push_back(reason::reviewed_error);
}

}  // namespace envsift
