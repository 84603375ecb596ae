#include "envsift/detect/range_check.hpp"

#include <cmath>
#include <cstdio>
#include <exception>
#include <map>
#include <memory>

#include "envsift/detect/test_registry.hpp"
#include "envsift/errors.hpp"
#include "envsift/read/range_layer.hpp"
#include "envsift/read/taxon_names.hpp"
#include "envsift/reason_codes.hpp"
#include "envsift/table/record_table.hpp"

namespace envsift {

Finding judge_range_distance(double outside_m, double radius_m, double tolerance_km, const std::string& taxon) {
  Finding f;
  f.tested = true;
  const double beyond_km = std::max(0.0, outside_m - radius_m) / 1000;
  f.statistic = beyond_km;
  f.threshold = tolerance_km;
  f.severity = beyond_km / tolerance_km;
  f.flagged = beyond_km > tolerance_km;
  if (f.flagged) {
    char words[512];
    if (radius_m >= 500)  // a disc of a few metres is not worth the words
      std::snprintf(words, sizeof words, "%.0f km outside the range of %s, beyond its %.0f km uncertainty", beyond_km,
                    taxon.c_str(), radius_m / 1000);
    else
      std::snprintf(words, sizeof words, "%.0f km outside the range of %s", beyond_km, taxon.c_str());
    f.reasons.push_back(words);
  }
  return f;
}

void RangeCheck::prepare(RecordTable& t) {
  table_ = &t;
  const std::size_t n = t.size();
  outside_m_.assign(n, NAN);
  radius_m_.assign(n, 0);
  has_range_.assign(n, 0);
  RangeLayer index(settings_.source());
  t.warnings.insert(t.warnings.end(), index.notes().begin(), index.notes().end());
  const auto& taxa = t.points.taxa;
  std::vector<std::vector<std::size_t>> records_of(taxa.size());
  for (std::size_t i = 0; i < n; ++i) {
    const auto& codes = t.codes.of(i);  // --shard: another shard judges it, so its range is not read here
    if (codes.size() == 1 && codes[0] == reason::other_shard) continue;
    records_of[t.points.records[i].taxon].push_back(i);
  }
  // names that look like a range's but are not the same: said, never matched silently
  std::map<std::string, std::string> range_by_likeness;
  for (const auto& name : index.taxa()) range_by_likeness.emplace(taxon_likeness_key(name), name);
  std::vector<std::uint32_t> with_range;
  for (std::uint32_t k = 1; k < taxa.size(); ++k) {
    if (records_of[k].empty()) continue;
    if (index.has(taxa[k])) {
      with_range.push_back(k);
      continue;
    }
    const auto alike = range_by_likeness.find(taxon_likeness_key(taxa[k]));
    if (alike != range_by_likeness.end())
      t.warnings.push_back("--ranges " + settings_.path + ": no range for taxon '" + taxa[k] + "', but the range layer has '" +
                           alike->second + "', which looks like it; make the names match to check its records");
  }
  // each taxon's range read once, its records measured, the range freed: one range per thread in memory
  std::vector<std::size_t> skipped(with_range.size(), 0), invalid(with_range.size(), 0);
  std::vector<std::exception_ptr> errors(with_range.size());
#pragma omp parallel
  {
    std::unique_ptr<RangeLayer> mine;
#pragma omp for schedule(dynamic, 1)
    for (std::ptrdiff_t w = 0; w < static_cast<std::ptrdiff_t>(with_range.size()); ++w) {
      const auto k = static_cast<std::size_t>(w);
      try {
        if (!mine) mine = std::make_unique<RangeLayer>(settings_.source());  // GDAL handles are per thread
        const auto range = mine->load(taxa[with_range[k]]);
        skipped[k] = range->skipped, invalid[k] = range->invalid;
        if (range->vertices() == 0) continue;  // only features without polygons: no range
        for (std::size_t i : records_of[with_range[k]]) {
          has_range_[i] = 1;
          const Occurrence& r = t.points.records[i];
          if (!r.has_coordinates()) continue;
          outside_m_[i] = static_cast<float>(range->distance_m(r.longitude, r.latitude));
          if (t.has_discs) radius_m_[i] = static_cast<float>(t.radius_m[i]);
        }
      } catch (...) {
        errors[k] = std::current_exception();
      }
    }
  }
  for (std::size_t k = 0; k < with_range.size(); ++k)
    if (errors[k]) std::rethrow_exception(errors[k]);  // the first taxon's, whatever the threads
  // one warning per kind, however many taxa: the count, and the first taxa in the points' order
  auto warn = [&](const std::vector<std::size_t>& count, const std::string& what, const std::string& then) {
    std::string list;
    std::size_t features = 0, named = 0;
    for (std::size_t k = 0; k < with_range.size(); ++k) {
      if (!count[k]) continue;
      features += count[k];
      if (named++ < 5) list += (list.empty() ? "'" : ", '") + taxa[with_range[k]] + "'";
    }
    if (named > 5) list += " and " + std::to_string(named - 5) + " more";
    if (features)
      t.warnings.push_back("--ranges " + settings_.path + ": " + std::to_string(features) + " feature(s) of " +
                           std::to_string(named) + " taxa " + what + " (" + list + ")" + then);
  };
  warn(skipped, "hold no polygon (a point, a line or no geometry) and are not used",
       "; a taxon with no polygon left has no range (no_range)");
  warn(invalid, "are not valid polygons (a ring crosses itself or another, as GEOS finds)",
       ": distances near their edges may be wrong; repair the file, e.g. ogr2ogr -makevalid fixed.gpkg " + settings_.path);
}

Finding RangeCheck::judge(std::size_t i) const {
  Finding f;
  if (!has_range_[i]) {
    if (table_->points.records[i].taxon != 0) f.untested_code = reason::no_range;
    return f;
  }
  if (std::isnan(outside_m_[i])) return f;  // no coordinates: their own codes say so
  return judge_range_distance(outside_m_[i], radius_m_[i], settings_.tolerance_km, table_->points.taxon(i));
}

}  // namespace envsift
