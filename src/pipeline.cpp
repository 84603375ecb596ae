#include "envsift/pipeline.hpp"

#include <algorithm>
#include <cstring>
#include <memory>
#include <numeric>

#include "envsift/detect/reverse_jackknife.hpp"
#include "envsift/detect/robust_mahalanobis.hpp"
#include "envsift/detect/robust_z.hpp"
#include "envsift/errors.hpp"
#include "envsift/read/coordinates.hpp"
#include "envsift/reason_codes.hpp"
#include "envsift/score/screen_taxa.hpp"
#include "envsift/write/csv_writer.hpp"
#include "envsift/write/value_format.hpp"

namespace envsift {
namespace {

std::string join(const std::vector<std::string>& parts, const char* separator) {
  std::string s;
  for (const auto& p : parts) s += (s.empty() ? "" : separator) + p;
  return s;
}

void add_code(std::vector<std::string>& codes, const std::string& code) {
  if (std::find(codes.begin(), codes.end(), code) == codes.end()) codes.push_back(code);
}

// Records and the values to judge them on, from rasters or from the input's own columns.
struct Valued {
  PointTable table;
  std::vector<std::string> layer_names;
  std::vector<bool> float32;       // per layer: print as 32-bit float
  bool layers_are_columns = false; // values came from input columns: no layer columns are added
  Eigen::MatrixXd values;
  std::vector<std::uint64_t> cells;
  std::vector<std::vector<std::string>> status;  // reason codes per record
};

void check_unique_columns(const std::vector<std::string>& columns) {
  for (std::size_t i = 0; i < columns.size(); ++i)
    for (std::size_t j = 0; j < i; ++j)
      if (columns[i] == columns[j])
        throw UsageError("the output would have two columns named '" + columns[i] +
                         "' (an input column, a layer or an envsift column); rename the input column, or "
                         "name the layer with NAME=PATH");
}

Valued sample_rasters(const SampleOptions& o, const std::vector<std::string>& added_columns) {
  Valued s;
  auto specs = expand_layer_arguments(o.layers);
  s.table = read_points(o.points, o.reader);
  std::vector<std::string> columns = s.table.columns;
  for (const auto& spec : specs) columns.push_back(spec.name);
  columns.insert(columns.end(), added_columns.begin(), added_columns.end());
  check_unique_columns(columns);

  RasterStack stack(specs, o.cache_megabytes << 20);
  const std::size_t n = s.table.records.size();
  std::vector<double> lon(n), lat(n);
  for (std::size_t i = 0; i < n; ++i) {
    lon[i] = s.table.records[i].longitude;
    lat[i] = s.table.records[i].latitude;
  }
  Samples samples = stack.sample(lon, lat, o.method);
  s.values = std::move(samples.values);
  s.cells = std::move(samples.cell);
  for (const auto& l : stack.layers()) {
    s.layer_names.push_back(l.spec.name);
    s.float32.push_back(o.method == Interpolation::nearest && l.float32_values);
  }
  s.status.resize(n);
  for (std::size_t i = 0; i < n; ++i) {
    s.status[i] = s.table.records[i].problems;
    for (std::size_t l = 0; l < s.layer_names.size(); ++l) {
      const CellStatus c = samples.status_at(i, l);
      if (c == CellStatus::outside) s.status[i].push_back(reason::on_layer(reason::outside_layer, s.layer_names[l]));
      if (c == CellStatus::nodata) s.status[i].push_back(reason::on_layer(reason::nodata, s.layer_names[l]));
    }
  }
  return s;
}

// Pre-sampled values: the named input columns are the layers.
Valued read_value_columns(const ScreenOptions& o, const std::vector<std::string>& added_columns) {
  Valued s;
  ReaderOptions reader = o.reader;
  reader.coordinates_optional = true;
  s.table = read_points(o.points, reader);
  s.layers_are_columns = true;
  std::vector<std::string> columns = s.table.columns;
  columns.insert(columns.end(), added_columns.begin(), added_columns.end());
  check_unique_columns(columns);
  std::vector<std::size_t> index;
  for (const auto& name : o.value_columns) {
    auto it = std::find(s.table.columns.begin(), s.table.columns.end(), name);
    if (it == s.table.columns.end())
      throw InputError(o.points, 1, "no value column '" + name + "'", "check the names given to --value-columns");
    index.push_back(static_cast<std::size_t>(it - s.table.columns.begin()));
    s.layer_names.push_back(name);
    s.float32.push_back(false);
  }
  const std::size_t n = s.table.records.size();
  s.values = Eigen::MatrixXd::Constant(static_cast<Eigen::Index>(n), static_cast<Eigen::Index>(index.size()), std::nan(""));
  s.cells.assign(n, 0);
  s.status.resize(n);
  for (std::size_t i = 0; i < n; ++i) {
    const Occurrence& r = s.table.records[i];
    for (const auto& p : r.problems)
      if (p == reason::ragged_row || p == reason::uncertainty_not_numeric) s.status[i].push_back(p);
    std::uint64_t key = 0xcbf29ce484222325ull;
    for (std::size_t l = 0; l < index.size(); ++l) {
      const ParsedNumber v = parse_number(r.fields[index[l]]);
      if (v.problem.empty()) {
        s.values(static_cast<Eigen::Index>(i), static_cast<Eigen::Index>(l)) = v.value;
        std::uint64_t bits;
        std::memcpy(&bits, &v.value, sizeof bits);
        key = (key ^ bits) * 0x100000001b3ull;
      } else {
        s.status[i].push_back(reason::on_layer(v.problem == "empty" ? reason::value_missing : reason::value_not_numeric,
                                               s.layer_names[l]));
        key = (key ^ 0x9E3779B97F4A7C15ull) * 0x100000001b3ull;
      }
    }
    s.cells[i] = key;
  }
  return s;
}

bool has_any_value(const Eigen::MatrixXd& values, std::size_t record) {
  return values.row(static_cast<Eigen::Index>(record)).array().isFinite().any();
}

std::vector<std::string> output_header(const Valued& s, const std::vector<std::string>& added) {
  std::vector<std::string> h = s.table.columns;
  if (!s.layers_are_columns) h.insert(h.end(), s.layer_names.begin(), s.layer_names.end());
  h.insert(h.end(), added.begin(), added.end());
  return h;
}

// Original fields, then (when sampled) one value per layer, then the status.
std::vector<std::string> output_row(const Valued& s, std::size_t i) {
  std::vector<std::string> row = s.table.records[i].fields;
  if (!s.layers_are_columns)
    for (std::size_t l = 0; l < s.layer_names.size(); ++l)
      row.push_back(format_value(s.values(static_cast<Eigen::Index>(i), static_cast<Eigen::Index>(l)), s.float32[l]));
  row.push_back(s.status[i].empty() ? reason::ok : join(s.status[i], ";"));
  return row;
}

std::vector<std::unique_ptr<Detector>> make_detectors(const ScreenOptions& o) {
  std::vector<std::unique_ptr<Detector>> detectors;
  for (const auto& name : all_test_names()) {
    if (std::find(o.tests.begin(), o.tests.end(), name) == o.tests.end()) continue;
    if (name == "robust_z") detectors.push_back(std::make_unique<RobustZ>(o.robust_z));
    if (name == "reverse_jackknife") detectors.push_back(std::make_unique<ReverseJackknife>(o.jackknife));
    if (name == "mahalanobis") detectors.push_back(std::make_unique<Mahalanobis>(o.mahalanobis));
    if (name == "mahalanobis_robust") detectors.push_back(std::make_unique<RobustMahalanobis>(o.mahalanobis, o.mcd));
  }
  for (const auto& name : o.tests)
    if (std::find(all_test_names().begin(), all_test_names().end(), name) == all_test_names().end())
      throw UsageError("unknown test '" + name + "'; choose from " + join(all_test_names(), ", "));
  if (detectors.empty()) throw UsageError("no test chosen; choose from " + join(all_test_names(), ", "));
  return detectors;
}

}  // namespace

const std::vector<std::string>& all_test_names() {
  static const std::vector<std::string> names{"robust_z", "reverse_jackknife", "mahalanobis", "mahalanobis_robust"};
  return names;
}

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
  const Valued s = sample_rasters(o, added);
  CsvWriter out(o.out);
  out.row(output_header(s, added));
  RunSummary summary;
  for (std::size_t i = 0; i < s.table.records.size(); ++i) {
    out.row(output_row(s, i));
    ++summary.read;
    if (has_any_value(s.values, i)) ++summary.scored;  // for `sample`, a record is done once it has values
    else ++summary.not_scored[s.status[i].empty() ? reason::no_values : s.status[i].front()];
  }
  out.commit();
  return summary;
}

RunSummary run_screen(const ScreenOptions& o) {
  const auto detectors = make_detectors(o);
  std::vector<std::string> added{"status", "rank", "score", "flags", "reasons"};
  for (const auto& d : detectors) {
    added.push_back(d->name() + "_stat");
    added.push_back(d->name() + "_cutoff");
    for (const auto& extra : d->extra_columns()) added.push_back(d->name() + "_" + extra);
  }
  Valued s = o.value_columns.empty() ? sample_rasters(o, added) : read_value_columns(o, added);
  const std::size_t n = s.table.records.size();

  std::vector<std::string> taxa(n);
  std::vector<bool> eligible(n);
  for (std::size_t i = 0; i < n; ++i) {
    taxa[i] = o.single_taxon ? std::string("*") : s.table.records[i].taxon;
    if (taxa[i].empty() && s.table.records[i].has_coordinates()) s.status[i].push_back(reason::taxon_missing);
    eligible[i] = !taxa[i].empty() && has_any_value(s.values, i);
  }
  const ScreeningResult screened =
      screen_taxa({s.values, s.cells, taxa, eligible, s.layer_names}, detectors, o.distinct_cells, o.seed);

  std::vector<std::optional<double>> scores(n);
  for (std::size_t i = 0; i < n; ++i) scores[i] = screened.verdicts[i].score;
  const auto rank = rank_by_score(scores);
  std::vector<std::size_t> rows(n);
  std::iota(rows.begin(), rows.end(), 0);
  if (o.order == RowOrder::rank)
    std::stable_sort(rows.begin(), rows.end(), [&](std::size_t a, std::size_t b) {
      return (rank[a] ? rank[a] : n + 1) < (rank[b] ? rank[b] : n + 1);
    });

  RunSummary summary;
  CsvWriter out(o.out);
  out.row(output_header(s, added));
  for (std::size_t i : rows) {
    const Verdict& v = screened.verdicts[i];
    if (eligible[i])
      for (const auto& u : v.untested) add_code(s.status[i], u);
    ++summary.read;
    if (v.score) {
      ++summary.scored;
      if (!v.flags.empty()) ++summary.flagged;
    } else {
      if (s.status[i].empty()) s.status[i].push_back(reason::no_values);
      ++summary.not_scored[s.status[i].front()];
    }
    auto row = output_row(s, i);
    row.push_back(rank[i] ? std::to_string(rank[i]) : "");
    row.push_back(v.score ? format_score(*v.score) : "");
    row.push_back(join(v.flags, ";"));
    row.push_back(join(v.reasons, "; "));
    for (std::size_t t = 0; t < detectors.size(); ++t) {
      const Finding& f = screened.findings[t][i];
      row.push_back(f.tested ? format_statistic(f.statistic) : "");
      row.push_back(f.tested ? format_statistic(f.threshold) : "");
      for (std::size_t e = 0; e < detectors[t]->extra_columns().size(); ++e)
        row.push_back(f.tested && e < f.extras.size() ? format_statistic(f.extras[e]) : "");
    }
    out.row(row);
  }
  out.commit();
  return summary;
}

}  // namespace envsift
