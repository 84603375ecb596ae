#include "envsift/table/circular_layers.hpp"
#include "envsift/reason_codes.hpp"
#include "envsift/table/value_columns.hpp"
#include "envsift/settings/memory_estimate.hpp"
#include "envsift/run_summary.hpp"
#include <algorithm>

#include <omp.h>
#include "envsift/run/run.hpp"
#include "envsift/table/sample_records.hpp"
#include "envsift/stable_hash.hpp"
#include "envsift/write/record_columns.hpp"
#include "steps.hpp"

namespace envsift {


std::size_t shard_of(const std::string& taxon, std::size_t shard_count) {
  return static_cast<std::size_t>(stable_hash(taxon) % shard_count);
}

namespace run {

const std::string kSingleTaxon = "*";

bool owned_by_this_shard(const ScreenSettings& s, const PointTable& points, std::size_t i) {
  const auto& o = s.outputs;
  return o.shard_count <= 1 || shard_of(s.input.single_taxon ? kSingleTaxon : points.taxon(i), o.shard_count) == o.shard_index;
}

RecordTable read_and_sample(const ScreenSettings& s, const ActiveTests* tests) {
  const auto added = added_columns(tests, s.outputs.column_prefix, !s.review.decisions.empty());
  std::vector<std::string> layer_names = s.input.value_columns;
  if (layer_names.empty())
    for (const auto& spec : expand_layer_arguments(s.input.layers)) layer_names.push_back(spec.name);
  const auto circular = circular_layers(layer_names, s.input.circular);  // before the long part: a typo stops here
  const bool sampling = s.input.value_columns.empty();
  ReaderOptions reading = s.input.reader;
  if (sampling) reading.progress = s.progress;
  else reading.coordinates_optional = true;  // the values are in the file: coordinates are not needed
  const Stopwatch clock;
  PointTable points = read_points(s.input.points, reading);  // 1. read the points
  const double read_seconds = clock.seconds();
  RecordTable t = sampling  // 2. sample the layers
                      ? sample_records(std::move(points), s.input, s.sampling, s.progress, added,
                                       [&s](const PointTable& p, std::size_t i) { return owned_by_this_shard(s, p, i); })
                      : read_value_columns(std::move(points), s.input, added);
  if (sampling) t.seconds.insert(t.seconds.begin(), {"read points", read_seconds});
  add_circular_components(t, circular);
  {
    RunShape shape{t.size(), t.points.taxa.size() - 1, static_cast<std::size_t>(t.values.cols()), 0, t.has_discs, 0};
    for (Eigen::Index c = 0; c < t.values.cols(); ++c) shape.float_layers += t.values.as_float(c);
    for (const auto& l : t.layers)  // blocks are kept as floats where a float holds the cells (block_cache.hpp)
      if (l.derived_from.empty() && !t.layers_are_columns)
        shape.raster_bytes += static_cast<std::size_t>(l.width) * static_cast<std::size_t>(l.height) * (l.float_cells ? 4 : 8);
    shape.threads = static_cast<std::size_t>(omp_get_max_threads());
    shape.report = !s.outputs.report.empty(), shape.gis = !s.outputs.gis.empty();
    if (tests && t.stack && std::any_of(tests->detectors.begin(), tests->detectors.end(), [](const auto& d) { return d->uses_landscape(); }))
      if (const auto landscape = tests->landscape(s.tests)) shape.landscape_cells = landscape->cells;
    const MemoryEstimate e = estimate_memory(shape, s.sampling);
    t.memory = e.words() + "; --memory-limit " + with_thousands(s.sampling.memory_limit_mb) + " MB";
    if (e.peak() > (s.sampling.memory_limit_mb << 20))
      t.warnings.push_back("these " + with_thousands(t.size()) + " records and " + std::to_string(t.values.cols()) +
                           " layers need " + e.words() + ", more than --memory-limit " +
                           with_thousands(s.sampling.memory_limit_mb) + " MB; split the run with --shard I/N");
  }
  if (!circular.empty()) check_unique_columns(record_header(t, tests, s.outputs.column_prefix, !s.review.decisions.empty()));
  for (std::size_t l : circular)
    t.warnings.push_back("layer " + t.layers[l].spec.name + " is circular (a direction in degrees): the tests judge its "
                         "sine and cosine (columns " + t.layers[l].spec.name + "_sin, " + t.layers[l].spec.name + "_cos)");
  return t;
}

}  // namespace run
}  // namespace envsift
