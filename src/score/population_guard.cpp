#include "envsift/score/population_guard.hpp"

#include <algorithm>

#include "envsift/reason_codes.hpp"

namespace envsift {

double withhold_population_flags(std::vector<Finding>& findings, const std::string& test, const PopulationGuard& guard) {
  std::size_t judged = 0, flagged = 0;
  for (const auto& f : findings) judged += f.tested, flagged += f.flagged;
  if (judged == 0 || flagged < guard.min_count) return -1;
  const double share = static_cast<double>(flagged) / static_cast<double>(judged);
  if (share <= guard.max_share) return -1;
  for (auto& f : findings)
    if (f.flagged) {
      f.flagged = false;
      f.severity = std::min(f.severity, 1.0);  // at the cutoff: ranked with the closest calls
      f.reasons.clear();
      f.codes.push_back(reason::on_layer(reason::looks_multimodal, test));
    }
  return share;
}

}  // namespace envsift
