#include "envsift/score/scoring.hpp"

#include <algorithm>
#include <numeric>

#include "envsift/reason_codes.hpp"

namespace envsift {

std::vector<std::string> Verdict::withheld() const {
  const std::string prefix = reason::looks_multimodal + ":";
  std::vector<std::string> tests;
  for (const auto& c : codes)
    if (c.compare(0, prefix.size(), prefix) == 0) tests.push_back(c.substr(prefix.size()));
  return tests;
}

Verdict combine(const std::vector<const Finding*>& findings, const std::vector<std::string>& names, CombineRule rule) {
  Verdict v;
  std::vector<std::size_t> order;
  double sum = 0;
  std::size_t judged = 0;
  for (std::size_t t = 0; t < findings.size(); ++t) {
    const Finding& f = *findings[t];
    v.tests.push_back({f.tested, f.statistic, f.threshold, f.extras});
    if (!f.tested) {
      v.codes.push_back(f.untested_code);
      continue;
    }
    v.codes.insert(v.codes.end(), f.codes.begin(), f.codes.end());
    v.score = std::max(v.score.value_or(0.0), f.severity);
    sum += f.severity, ++judged;
    if (f.flagged) {
      v.flags.push_back(names[t]);
      order.push_back(t);
    }
  }
  if (rule == CombineRule::mean && judged > 0) v.score = sum / static_cast<double>(judged);
  std::stable_sort(order.begin(), order.end(),
                   [&](std::size_t a, std::size_t b) { return findings[a]->severity > findings[b]->severity; });
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
