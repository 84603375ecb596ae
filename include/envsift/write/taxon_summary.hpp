// The per-taxon summary (`--summary FILE`): how many records each taxon has, how many were judged
// and flagged (in all and per test), and — with a DEM — the taxon's robust elevation band and the
// records outside it, so a reviewer sees at a glance which mountain taxa have lowland records.
// `flagged` counts open records only; with --decisions, the records decided in earlier rounds are
// counted per decision (decided_error, decided_valid, decided_unsure).
#pragma once
#include <string>
#include <vector>

#include "envsift/detect/judged_taxon.hpp"
#include "envsift/score/scoring.hpp"

namespace envsift {

struct ElevationBand {
  const std::vector<double>* dem_low;    // per record: the DEM's range (disc, or point)
  const std::vector<double>* dem_high;
  const std::vector<double>* dem_point;  // per record: the DEM at the point
  double z_cutoff = 3;                   // band = median ± z_cutoff · robust spread
};

std::vector<std::string> taxon_summary_header(const std::vector<std::string>& test_names, bool with_band,
                                              bool with_decisions = false);

// `verdicts[r]`: the verdict on the taxon's r-th record; `similar_names`: other names in the file
// that look like this one (read/taxon_names.hpp), "; "-separated.
std::vector<std::string> taxon_summary_row(const JudgedTaxon& taxon, const std::vector<Verdict>& verdicts,
                                           const std::vector<std::string>& test_names, const ElevationBand* band,
                                           const std::string& similar_names = "", bool with_decisions = false);

}  // namespace envsift
