// The per-taxon summary (`--summary FILE`): how many records each taxon has, how many were judged
// and flagged (in all and per test), and — with a DEM — the taxon's robust elevation band and the
// records outside it, so a reviewer sees at a glance which mountain taxa have lowland records.
#pragma once
#include <string>
#include <vector>

#include "envsift/detect/detector.hpp"
#include "envsift/score/screen_taxa.hpp"
#include "envsift/score/scoring.hpp"

namespace envsift {

struct ElevationBand {
  std::vector<double> dem_low, dem_high;  // per record: the DEM's range (disc, or point)
  std::vector<double> dem_point;          // per record: the DEM at the point
  double z_cutoff = 3;                    // band = median ± z_cutoff · robust spread
};

void write_taxon_summary(const std::string& path, const ScreeningResult& screened, const std::vector<Verdict>& verdicts,
                         const std::vector<std::string>& test_names, const ElevationBand* band);

}  // namespace envsift
