// Known errors put into virtual taxa's records: the georeferencing slips screening is for.
//   relocated       the record moved to a random cell of the study area
//   swapped         latitude and longitude exchanged
//   longitude_sign  longitude sign flipped;   latitude_sign: latitude sign flipped
//   decimal_shift   longitude or latitude divided by ten (12.34 → 1.234)
// and batches: many records of one taxon moved to one to a few wrong places (the lot labelled with
// the town it was shipped from, a dataset georeferenced to a district centroid):
//   batch           the record moved, with others of its batch, to one of the batch's random cells
#pragma once
#include <string>
#include <vector>

#include "envsift/seeded_random.hpp"
#include "envsift/evaluate/virtual_taxa.hpp"

namespace envsift {

struct VirtualRecord {
  std::string id, taxon;
  double longitude = 0, latitude = 0;
  std::string error;  // the kind of error, empty for a clean record
};

// Puts an error into round(share · n) of the records (at least one, at most n − 1), chosen at
// random, each of a random kind.
void inject_errors(std::vector<VirtualRecord>& taxon_records, const StudyArea& area, double share, SeededRandom& random);

// Moves round(share · n) of the records still clean (at least one, at most half the taxon)
// to `places` random cells of the study area, in turn; identical coordinates, as a batch has.
void inject_batch(std::vector<VirtualRecord>& taxon_records, const StudyArea& area, double share, std::size_t places,
                  SeededRandom& random);

}  // namespace envsift
