// A taxon with two populations in different environments (two mountain ranges, an island and the
// mainland) is not a taxon with many errors, but every test sees the smaller population as
// outliers. The population split (group/populations.hpp) handles most; this guard is the last
// resort. What tells a population from a batch of errors is how many *places* it covers: a
// population is many distinct localities spread over an environment, a batch (a season's
// specimens labelled with the town they were shipped from, a dataset georeferenced to a district
// centroid) is many records at one to a few localities. So the guard counts distinct localities
// (raster cells), never records: when one test flags more than `max_share` of the localities of
// a taxon it could judge, and at least `min_places` of them, its flags are withheld for the taxon
// and the records get the code looks_multimodal:TEST, so the taxon is reviewed as a whole. A batch
// at three places never reaches five flagged places, however many records it holds: it stays
// flagged. Withheld records keep their own severity, so they still rank by how far out they are
// (the worst of them first), only their flag is withheld. The other tests still judge the taxon.
#pragma once
#include <cstddef>
#include <cstdint>
#include <string>
#include <vector>

#include "envsift/detect/detector.hpp"

namespace envsift {

struct PopulationGuard {
  double max_share = 0.15;
  std::size_t min_places = 5;
};

struct GuardOutcome {
  bool withheld = false;
  std::size_t flagged_places = 0, judged_places = 0, flagged_records = 0;
  double share() const { return judged_places ? static_cast<double>(flagged_places) / static_cast<double>(judged_places) : 0; }
};

// Applies the rule to one test's findings for one taxon; `locality[r]` identifies the place
// (raster cell) of record r, in the findings' order.
GuardOutcome withhold_population_flags(std::vector<Finding>& findings, const std::vector<std::uint64_t>& locality,
                                       const std::string& test, const PopulationGuard& guard);

}  // namespace envsift
