#include "envsift/score/population_guard.hpp"

#include <unordered_set>

#include "envsift/reason_codes.hpp"

namespace envsift {

GuardOutcome withhold_population_flags(std::vector<Finding>& findings, const std::vector<std::uint64_t>& locality,
                                       const std::string& test, const PopulationGuard& guard) {
  GuardOutcome o;
  std::unordered_set<std::uint64_t> judged, flagged;
  for (std::size_t r = 0; r < findings.size(); ++r) {
    if (!findings[r].tested) continue;
    judged.insert(locality[r]);
    if (findings[r].flagged) flagged.insert(locality[r]), ++o.flagged_records;
  }
  o.judged_places = judged.size(), o.flagged_places = flagged.size();
  if (o.flagged_places < guard.min_places || !(o.share() > guard.max_share)) return o;
  o.withheld = true;
  for (auto& f : findings) {
    f.withheld = true;  // its evidence leaves the combined probability for this taxon
    if (f.flagged) {
      f.flagged = false;  // severity kept: the record still ranks by how far out it is
      f.reasons.clear();
      f.codes.push_back(reason::on_layer(reason::looks_multimodal, test));
    }
  }
  return o;
}

}  // namespace envsift
