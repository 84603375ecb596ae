#include "envsift/write/taxon_summary.hpp"

#include <algorithm>
#include <cmath>
#include <iterator>

#include "envsift/detect/robust_z.hpp"
#include "envsift/write/value_format.hpp"

namespace envsift {

namespace {
constexpr Decision kDecisions[] = {Decision::error, Decision::valid, Decision::unsure};
}

std::vector<std::string> taxon_summary_header(const std::vector<std::string>& test_names, bool with_band,
                                              bool with_decisions) {
  std::vector<std::string> header{"taxon", "records", "reference_cells", "scored", "flagged"};
  for (const auto& t : test_names) header.push_back("flagged_" + t);
  if (with_decisions)
    for (Decision d : kDecisions) header.push_back(std::string("decided_") + decision_name(d));
  if (with_band)
    for (const char* c : {"elevation_median", "elevation_band_low", "elevation_band_high", "outside_elevation_band"})
      header.push_back(c);
  header.push_back("similar_names");
  return header;
}

std::vector<std::string> taxon_summary_row(const JudgedTaxon& t, const std::vector<Verdict>& verdicts,
                                           const std::vector<std::string>& test_names, const ElevationBand* band,
                                           const std::string& similar_names, bool with_decisions) {
  std::size_t scored = 0, flagged = 0;
  std::vector<std::size_t> per_test(test_names.size(), 0), decided(std::size(kDecisions), 0);
  for (const Verdict& v : verdicts) {
    scored += v.score.has_value();
    for (std::size_t d = 0; d < decided.size(); ++d) decided[d] += v.decision == kDecisions[d];
    if (!v.open()) continue;  // a decided error keeps its flags, but is not a suspect any more
    flagged += !v.flags.empty();
    for (std::size_t k = 0; k < test_names.size(); ++k)
      per_test[k] += std::find(v.flags.begin(), v.flags.end(), test_names[k]) != v.flags.end();
  }
  std::vector<std::string> row{t.taxon, std::to_string(t.records.size()), std::to_string(t.reference.size()),
                               std::to_string(scored), std::to_string(flagged)};
  for (std::size_t c : per_test) row.push_back(std::to_string(c));
  if (with_decisions)
    for (std::size_t c : decided) row.push_back(std::to_string(c));
  if (band) {
    std::vector<double> reference;
    for (std::size_t i : t.reference)
      if (std::isfinite((*band->dem_point)[i])) reference.push_back((*band->dem_point)[i]);
    const RobustSpread s = robust_spread(reference);
    const double low = s.median - band->z_cutoff * s.spread, high = s.median + band->z_cutoff * s.spread;
    std::size_t outside = 0;
    for (std::size_t i : t.records)  // outside when even the record's disc does not reach the band
      outside += std::isfinite(low) && ((*band->dem_high)[i] < low || (*band->dem_low)[i] > high);
    row.push_back(format_statistic(s.median));
    row.push_back(format_statistic(low));
    row.push_back(format_statistic(high));
    row.push_back(std::isfinite(low) ? std::to_string(outside) : "");
  }
  row.push_back(similar_names);
  return row;
}

}  // namespace envsift
