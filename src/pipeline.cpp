#include "envsift/pipeline.hpp"

#include <algorithm>
#include <memory>
#include <numeric>

#include "envsift/detect/robust_z.hpp"
#include "envsift/errors.hpp"
#include "envsift/group/taxon_groups.hpp"
#include "envsift/reason_codes.hpp"
#include "envsift/score/scoring.hpp"
#include "envsift/write/csv_writer.hpp"
#include "envsift/write/value_format.hpp"

namespace envsift {
namespace {

std::string join(const std::vector<std::string>& parts, const char* separator) {
  std::string s;
  for (const auto& p : parts) s += (s.empty() ? "" : separator) + p;
  return s;
}

// Points and their samples, shared by `sample` and `screen`.
struct Sampled {
  PointTable table;
  std::vector<LayerInfo> layers;
  Samples samples;
  std::vector<std::vector<std::string>> status;  // reason codes per record
};

Sampled read_and_sample(const SampleOptions& o, const std::vector<std::string>& added_columns) {
  Sampled s;
  auto specs = expand_layer_arguments(o.layers);
  s.table = read_points(o.points, o.reader);
  std::vector<std::string> taken = s.table.columns;
  for (const auto& spec : specs) taken.push_back(spec.name);
  for (const auto& c : added_columns) taken.push_back(c);
  for (std::size_t i = 0; i < taken.size(); ++i)
    for (std::size_t j = 0; j < i; ++j)
      if (taken[i] == taken[j])
        throw UsageError("the output would have two columns named '" + taken[i] +
                         "' (an input column, a layer or an envsift column); rename the input column, or "
                         "name the layer with NAME=PATH");

  RasterStack stack(specs, o.cache_megabytes << 20);
  s.layers = stack.layers();
  const std::size_t n = s.table.records.size();
  std::vector<double> lon(n), lat(n);
  for (std::size_t i = 0; i < n; ++i) {
    lon[i] = s.table.records[i].longitude;
    lat[i] = s.table.records[i].latitude;
  }
  s.samples = stack.sample(lon, lat, o.method);
  s.status.resize(n);
  for (std::size_t i = 0; i < n; ++i) {
    auto& codes = s.status[i];
    codes = s.table.records[i].problems;
    for (std::size_t l = 0; l < s.layers.size(); ++l) {
      const CellStatus c = s.samples.status_at(i, l);
      if (c == CellStatus::outside) codes.push_back(reason::on_layer(reason::outside_layer, s.layers[l].spec.name));
      if (c == CellStatus::nodata) codes.push_back(reason::on_layer(reason::nodata, s.layers[l].spec.name));
    }
  }
  return s;
}

bool has_any_value(const Samples& samples, std::size_t record) {
  return samples.values.row(static_cast<Eigen::Index>(record)).array().isFinite().any();
}

std::vector<std::string> base_row(const Sampled& s, std::size_t i, bool nearest) {
  std::vector<std::string> row = s.table.records[i].fields;
  for (std::size_t l = 0; l < s.layers.size(); ++l)
    row.push_back(format_value(s.samples.values(static_cast<Eigen::Index>(i), static_cast<Eigen::Index>(l)),
                               nearest && s.layers[l].float32_values));
  row.push_back(s.status[i].empty() ? reason::ok : join(s.status[i], ";"));
  return row;
}

std::vector<std::string> header(const Sampled& s, const std::vector<std::string>& added) {
  std::vector<std::string> h = s.table.columns;
  for (const auto& l : s.layers) h.push_back(l.spec.name);
  h.insert(h.end(), added.begin(), added.end());
  return h;
}

}  // namespace

std::string RunSummary::line() const {
  std::string s = "envsift: " + std::to_string(read) + " records read, " + std::to_string(scored) + " scored, " +
                  std::to_string(flagged) + " flagged, " + std::to_string(read - scored) + " not scored";
  if (!not_scored.empty()) {
    std::vector<std::string> parts;
    for (const auto& [code, count] : not_scored) parts.push_back(code + " " + std::to_string(count));
    s += " (" + join(parts, ", ") + ")";
  }
  return s;
}

RunSummary run_sample(const SampleOptions& o) {
  const std::vector<std::string> added{"status"};
  Sampled s = read_and_sample(o, added);
  CsvWriter out(o.out);
  out.row(header(s, added));
  RunSummary summary;
  const bool nearest = o.method == Interpolation::nearest;
  for (std::size_t i = 0; i < s.table.records.size(); ++i) {
    out.row(base_row(s, i, nearest));
    ++summary.read;
    if (has_any_value(s.samples, i)) {
      ++summary.sampled;
      ++summary.scored;  // for `sample`, a record is complete once it has values
    } else {
      ++summary.not_scored[s.status[i].empty() ? reason::no_values : s.status[i].front()];
    }
  }
  out.commit();
  return summary;
}

RunSummary run_screen(const ScreenOptions& o) {
  const std::vector<std::string> added{"status", "rank", "score", "flags", "reasons"};
  Sampled s = read_and_sample(o, added);
  const std::size_t n = s.table.records.size(), L = s.layers.size();

  std::vector<std::string> taxa(n), layer_names;
  std::vector<bool> eligible(n);
  for (const auto& l : s.layers) layer_names.push_back(l.spec.name);
  for (std::size_t i = 0; i < n; ++i) {
    taxa[i] = s.table.records[i].taxon;
    const bool has_taxon = !taxa[i].empty();
    if (!has_taxon && s.table.records[i].has_coordinates()) s.status[i].push_back(reason::taxon_missing);
    eligible[i] = has_taxon && has_any_value(s.samples, i);
  }
  const auto groups = group_by_taxon(taxa, eligible);

  std::vector<std::unique_ptr<Detector>> detectors;
  detectors.push_back(std::make_unique<RobustZ>(o.robust_z));
  std::vector<std::string> names;
  for (const auto& d : detectors) names.push_back(d->name());

  std::vector<Verdict> verdicts(n);
  // Largest taxa first keeps both threads busy to the end.
  std::vector<std::size_t> order(groups.size());
  std::iota(order.begin(), order.end(), 0);
  std::stable_sort(order.begin(), order.end(),
                   [&](std::size_t a, std::size_t b) { return groups[a].records.size() > groups[b].records.size(); });
#pragma omp parallel for schedule(dynamic, 1)
  for (std::ptrdiff_t k = 0; k < static_cast<std::ptrdiff_t>(order.size()); ++k) {
    const TaxonGroup& g = groups[order[static_cast<std::size_t>(k)]];
    Eigen::MatrixXd values(static_cast<Eigen::Index>(g.records.size()), static_cast<Eigen::Index>(L));
    for (std::size_t r = 0; r < g.records.size(); ++r)
      values.row(static_cast<Eigen::Index>(r)) = s.samples.values.row(static_cast<Eigen::Index>(g.records[r]));
    const TaxonValues taxon{values, values, layer_names};
    std::vector<std::vector<Finding>> findings;
    for (const auto& d : detectors) findings.push_back(d->judge(taxon));
    for (std::size_t r = 0; r < g.records.size(); ++r) {
      std::vector<const Finding*> per_test;
      for (const auto& f : findings) per_test.push_back(&f[r]);
      verdicts[g.records[r]] = combine(per_test, names);
    }
  }

  std::vector<std::optional<double>> scores(n);
  for (std::size_t i = 0; i < n; ++i) scores[i] = verdicts[i].score;
  const auto rank = rank_by_score(scores);

  RunSummary summary;
  std::vector<std::size_t> rows(n);
  std::iota(rows.begin(), rows.end(), 0);
  if (o.order == RowOrder::rank)
    std::stable_sort(rows.begin(), rows.end(), [&](std::size_t a, std::size_t b) {
      return (rank[a] ? rank[a] : n + 1) < (rank[b] ? rank[b] : n + 1);
    });
  CsvWriter out(o.out);
  out.row(header(s, added));
  const bool nearest = o.method == Interpolation::nearest;
  for (std::size_t i : rows) {
    const Verdict& v = verdicts[i];
    if (!v.score) {
      for (const auto& u : v.untested)
        if (std::find(s.status[i].begin(), s.status[i].end(), u) == s.status[i].end()) s.status[i].push_back(u);
      if (s.status[i].empty()) s.status[i].push_back(reason::no_values);
      ++summary.not_scored[s.status[i].front()];
    } else {
      ++summary.scored;
      if (!v.flags.empty()) ++summary.flagged;
    }
    ++summary.read;
    if (has_any_value(s.samples, i)) ++summary.sampled;
    auto row = base_row(s, i, nearest);
    row.push_back(rank[i] ? std::to_string(rank[i]) : "");
    row.push_back(v.score ? format_score(*v.score) : "");
    row.push_back(join(v.flags, ";"));
    row.push_back(join(v.reasons, "; "));
    out.row(row);
  }
  out.commit();
  return summary;
}

}  // namespace envsift
