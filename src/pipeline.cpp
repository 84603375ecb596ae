#include "envsift/pipeline.hpp"

#include <algorithm>
#include <cstdio>
#include <cmath>
#include <memory>
#include <chrono>
#include <fstream>
#include <mutex>
#include <sstream>
#include <numeric>

#include "envsift/detect/circular_layers.hpp"
#include "envsift/detect/reverse_jackknife.hpp"
#include "envsift/detect/robust_mahalanobis.hpp"
#include "envsift/detect/robust_z.hpp"
#include "envsift/errors.hpp"
#include "envsift/reason_codes.hpp"
#include "envsift/score/scoring.hpp"
#include "envsift/score/screen_taxa.hpp"
#include "envsift/read/csv_reader.hpp"
#include "envsift/write/csv_writer.hpp"
#include "envsift/write/gis_writer.hpp"
#include "envsift/write/taxon_summary.hpp"
#include "envsift/write/value_format.hpp"
#include "gather_values.hpp"
#include "report_builder.hpp"

namespace envsift {
namespace {

using detail::Gathered;

const std::string kElevationCheck = "elevation_mismatch";

std::string join(const std::vector<std::string>& parts, const char* separator) {
  std::string s;
  for (const auto& p : parts) s += (s.empty() ? "" : separator) + p;
  return s;
}

bool has_any_value(const Eigen::MatrixXd& values, std::size_t record) {
  return values.row(static_cast<Eigen::Index>(record)).array().isFinite().any();
}

std::vector<std::string> output_header(const Gathered& g, const std::vector<std::string>& added) {
  std::vector<std::string> h = g.table.columns;
  if (!g.layers_are_columns)
    for (const auto& name : g.layer_names) {
      h.push_back(name);
      if (g.has_discs)
        for (const char* s : {"_min", "_mean", "_max"}) h.push_back(name + s);
    }
  h.insert(h.end(), added.begin(), added.end());
  return h;
}

// Original fields, then (when sampled) each layer's value and disc, then the status.
std::vector<std::string> output_row(const Gathered& g, std::size_t i) {
  std::vector<std::string> row = g.table.fields.read(i);
  const auto r = static_cast<Eigen::Index>(i);
  if (!g.layers_are_columns)
    for (std::size_t l = 0; l < g.layer_names.size(); ++l) {
      const auto c = static_cast<Eigen::Index>(l);
      row.push_back(format_value(g.values(r, c), g.float32[l]));
      if (g.has_discs) {
        row.push_back(format_value(g.discs.min(r, c), g.float32[l]));
        row.push_back(format_statistic(g.discs.mean(r, c)));
        row.push_back(format_value(g.discs.max(r, c), g.float32[l]));
      }
    }
  row.push_back(g.status.of(i).empty() ? reason::ok : join(g.status.of(i), ";"));
  return row;
}

std::vector<std::unique_ptr<Detector>> make_detectors(const ScreenOptions& o) {
  std::vector<std::unique_ptr<Detector>> detectors;
  for (const auto& name : o.tests)
    if (std::find(all_test_names().begin(), all_test_names().end(), name) == all_test_names().end())
      throw UsageError("unknown test '" + name + "'; choose from " + join(all_test_names(), ", "));
  for (const auto& name : all_test_names()) {
    if (std::find(o.tests.begin(), o.tests.end(), name) == o.tests.end()) continue;
    if (name == "robust_z") detectors.push_back(std::make_unique<RobustZ>(o.robust_z));
    if (name == "reverse_jackknife") detectors.push_back(std::make_unique<ReverseJackknife>(o.jackknife));
    if (name == "mahalanobis") detectors.push_back(std::make_unique<Mahalanobis>(o.mahalanobis));
    if (name == "mahalanobis_robust") detectors.push_back(std::make_unique<RobustMahalanobis>(o.mahalanobis, o.mcd));
  }
  if (detectors.empty()) throw UsageError("no test chosen; choose from " + join(all_test_names(), ", "));
  return detectors;
}

// The DEM's range around each record: its disc, or its point value.
std::vector<DemRange> dem_ranges(const Gathered& g, std::size_t dem) {
  std::vector<DemRange> out(g.table.records.size());
  for (std::size_t i = 0; i < out.size(); ++i) {
    const auto r = static_cast<Eigen::Index>(i), c = static_cast<Eigen::Index>(dem);
    const double point = g.values(r, c);
    out[i] = {point, point, 0.0};
    if (g.has_discs && g.radius_m[i] > 0 && std::isfinite(g.discs.min(r, c)))
      out[i] = {std::min(point, g.discs.min(r, c)), std::max(point, g.discs.max(r, c)), g.radius_m[i]};
  }
  return out;
}

}  // namespace

const std::vector<std::string>& all_test_names() {
  static const std::vector<std::string> names{"robust_z", "reverse_jackknife", "mahalanobis", "mahalanobis_robust"};
  return names;
}

const std::vector<std::string>& default_test_names() {
  static const std::vector<std::string> names{"robust_z", "reverse_jackknife", "mahalanobis"};
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

std::size_t shard_of(const std::string& taxon, std::size_t shard_count) {
  return static_cast<std::size_t>(stable_hash(taxon) % shard_count);
}

std::string RunSummary::codes_line() const {
  std::vector<std::string> parts;
  for (const auto& [code, count] : codes) parts.push_back(code + " " + std::to_string(count));
  return "envsift: reason codes: " + (parts.empty() ? std::string("none") : join(parts, ", "));
}

RunSummary run_sample(const SampleOptions& o) {
  const std::vector<std::string> added{"status"};
  const auto start = std::chrono::steady_clock::now();
  const Gathered g = detail::sample_rasters(o, added);
  const auto sampled = std::chrono::steady_clock::now();
  CsvWriter out(o.out);
  out.row(output_header(g, added));
  RunSummary summary;
  summary.warnings = g.warnings;
  summary.seconds = g.seconds;
  for (std::size_t i = 0; i < g.table.records.size(); ++i) {
    out.row(output_row(g, i));
    for (const auto& c : g.status.of(i)) ++summary.codes[c];
    ++summary.read;
    if (has_any_value(g.values, i)) ++summary.scored;  // for `sample`, a record is done once it has values
    else ++summary.not_scored[g.status.of(i).empty() ? reason::no_values : g.status.of(i).front()];
  }
  out.commit();
  summary.seconds.emplace_back("write", std::chrono::duration<double>(std::chrono::steady_clock::now() - sampled).count());
  summary.seconds.emplace_back("total", std::chrono::duration<double>(std::chrono::steady_clock::now() - start).count());
  return summary;
}

// The columns envsift appends after `status` for one record: rank is filled in at the end, the
// rest comes from its verdict and findings.
std::vector<std::string> verdict_columns(const Verdict& v, const std::vector<const Finding*>& findings,
                                         const std::vector<std::size_t>& extra_counts) {
  std::vector<std::string> out{v.score ? format_score(*v.score) : "", join(v.flags, ";"), join(v.reasons, "; ")};
  for (std::size_t t = 0; t < findings.size(); ++t) {
    const Finding& f = *findings[t];
    out.push_back(f.tested ? format_statistic(f.statistic) : "");
    out.push_back(f.tested ? format_statistic(f.threshold) : "");
    for (std::size_t e = 0; e < extra_counts[t]; ++e)
      out.push_back(f.tested && e < f.extras.size() ? format_statistic(f.extras[e]) : "");
  }
  return out;
}

RunSummary run_screen(const ScreenOptions& o) {
  const auto detectors = make_detectors(o);
  std::vector<std::string> names;
  std::vector<std::size_t> extra_counts;
  for (const auto& d : detectors) names.push_back(d->name()), extra_counts.push_back(d->extra_columns().size());
  const bool check_elevation = !o.elevation.dem_layer.empty();
  if (check_elevation) names.push_back(kElevationCheck), extra_counts.push_back(0);
  std::vector<std::string> added{"status", "rank", "score", "flags", "reasons"};
  for (const auto& d : detectors) {
    added.push_back(d->name() + "_stat");
    added.push_back(d->name() + "_cutoff");
    for (const auto& extra : d->extra_columns()) added.push_back(d->name() + "_" + extra);
  }
  if (check_elevation)
    for (const char* c : {"_stat", "_cutoff"}) added.push_back(kElevationCheck + c);
  if (check_elevation && !o.value_columns.empty())
    throw UsageError("--dem needs --layers: the elevation check compares with a sampled DEM");
  if (o.shard_count > 1 && o.order == RowOrder::rank)
    throw UsageError("--shard writes rows in input order (envsift merge ranks them); drop --order rank");
  const std::string single_name = "*";
  auto owned = [&](const PointTable& t, std::size_t i) {
    return o.shard_count <= 1 || shard_of(o.single_taxon ? single_name : t.taxon(i), o.shard_count) == o.shard_index;
  };
  auto clock = std::chrono::steady_clock::now();
  RunSummary summary;
  auto lap = [&](const std::string& stage) {
    const auto now = std::chrono::steady_clock::now();
    summary.seconds.emplace_back(stage, std::chrono::duration<double>(now - clock).count());
    clock = now;
  };
  if (o.value_columns.empty()) {
    std::vector<std::string> layer_names;
    for (const auto& spec : expand_layer_arguments(o.layers)) layer_names.push_back(spec.name);
    refuse_circular_layers(layer_names);
  } else {
    refuse_circular_layers(o.value_columns);
  }
  Gathered g = o.value_columns.empty() ? detail::sample_rasters(o, added, owned) : detail::read_value_columns(o, added);
  summary.seconds = g.seconds;
  lap("sampling, total");
  const std::size_t n = g.table.records.size();
  std::vector<bool> mine(n);
  for (std::size_t i = 0; i < n; ++i) {
    mine[i] = owned(g.table, i);
    if (!mine[i]) g.status.set(i, {reason::other_shard});
  }

  // Taxa: the reader's interned names, or one group for --single-taxon.
  std::vector<std::uint32_t> taxon_of(n);
  const std::vector<std::string> single{"", "*"};
  const std::vector<std::string>& taxon_names = o.single_taxon ? single : g.table.taxa;
  std::vector<bool> eligible(n);
  for (std::size_t i = 0; i < n; ++i) {
    taxon_of[i] = o.single_taxon ? 1u : g.table.records[i].taxon;
    if (taxon_of[i] == 0 && g.table.records[i].has_coordinates() && mine[i]) g.status.add(i, reason::taxon_missing);
    eligible[i] = mine[i] && taxon_of[i] != 0 && has_any_value(g.values, i);
  }

  // The reported elevation is checked for every record with coordinates, taxon or not.
  std::vector<DemRange> dem;
  std::vector<ReportedElevation> reported;
  std::vector<double> dem_low, dem_high, dem_point;
  if (check_elevation) {
    const auto it = std::find(g.layer_names.begin(), g.layer_names.end(), o.elevation.dem_layer);
    if (it == g.layer_names.end())
      throw UsageError("--dem " + o.elevation.dem_layer + " is not one of the layers (" + join(g.layer_names, ", ") + ")");
    const auto column = static_cast<std::size_t>(it - g.layer_names.begin());
    dem = dem_ranges(g, column);
    reported = detail::reported_elevations(g, o.reader.columns);
    for (std::size_t i = 0; i < n; ++i) {
      dem_low.push_back(dem[i].low);
      dem_high.push_back(dem[i].high);
      dem_point.push_back(g.values(static_cast<Eigen::Index>(i), static_cast<Eigen::Index>(column)));
    }
  }
  auto elevation_of = [&](std::size_t i) {
    return check_elevation && mine[i] ? check_reported_elevation(reported[i], dem[i], o.elevation.tolerance_m, o.elevation.dem_layer)
                           : Finding{};
  };
  const ElevationBand band{&dem_low, &dem_high, &dem_point, o.robust_z.cutoff};

  // Each taxon's verdicts go straight to disk as the envsift columns of its records; kept in
  // memory per record are only the score (for the ranking) and where its columns are.
  FieldStore results;
  std::mutex results_lock;
  constexpr std::uint64_t kNone = ~std::uint64_t(0);
  std::vector<std::uint64_t> result_of(n, kNone);
  std::vector<std::optional<double>> scores(n);
  std::vector<std::vector<std::string>> summary_rows;
  auto judge_record = [&](std::size_t i, std::vector<const Finding*> per_test, std::vector<std::string>& columns) {
    const Finding elevation = elevation_of(i);
    if (check_elevation) per_test.push_back(&elevation);
    Verdict v = combine(per_test, names);
    if (const auto note = g.notes.find(i); note != g.notes.end())
      v.reasons.insert(v.reasons.end(), note->second.begin(), note->second.end());
    // rank by the score as written, so that merged shards rank exactly as a single run
    if (v.score) scores[i] = std::stod(format_score(*v.score));
    // first the codes of tests that could not judge the record (they join its status), then
    // the columns as written
    std::vector<std::string> codes;
    for (const auto& u : v.untested)
      if (!u.empty()) codes.push_back(u);
    columns = verdict_columns(v, per_test, extra_counts);
    columns.insert(columns.begin(), join(codes, ";"));
    return v;
  };
  std::unique_ptr<detail::ReportBuilder> report;
  if (!o.report.empty()) report = std::make_unique<detail::ReportBuilder>(o, g, detectors);
  std::vector<double> test_seconds;
  std::vector<std::pair<std::size_t, std::string>> population_warnings;  // (taxon index, words)
  std::size_t eligible_taxa = 0;
  {
    std::vector<bool> seen(taxon_names.size());
    for (std::size_t i = 0; i < n; ++i)
      if (eligible[i] && !seen[taxon_of[i]]) seen[taxon_of[i]] = true, ++eligible_taxa;
  }
  if (o.progress) o.progress->stage("screening", eligible_taxa, "taxa");
  const auto taxa = screen_taxa(
      {g.values, g.cells, taxon_of, taxon_names, eligible, g.layer_names, g.has_discs ? &g.discs.min : nullptr,
       g.has_discs ? &g.discs.max : nullptr},
      detectors, o.distinct_cells, o.seed, [&](const ScreenedTaxon& taxon, std::vector<std::vector<Finding>>& findings) {
        for (std::size_t t = 0; t < detectors.size(); ++t) {
          const double share = withhold_population_flags(findings[t], names[t], o.population);
          if (share < 0) continue;
          char words[320];
          std::snprintf(words, sizeof words,
                        "taxon '%s': %s flagged %.0f%% of its records, so it may have several populations; "
                        "those flags are withheld (looks_multimodal:%s) - review the taxon as a whole",
                        taxon.taxon.c_str(), names[t].c_str(), 100 * share, names[t].c_str());
          std::lock_guard<std::mutex> lock(results_lock);
          population_warnings.emplace_back(taxon.index, words);
        }
        std::vector<Verdict> verdicts;
        std::vector<std::string> columns;
        for (std::size_t r = 0; r < taxon.records.size(); ++r) {
          const std::size_t i = taxon.records[r];
          std::vector<const Finding*> per_test;
          for (const auto& f : findings) per_test.push_back(&f[r]);
          verdicts.push_back(judge_record(i, per_test, columns));
          std::lock_guard<std::mutex> lock(results_lock);
          results.append(columns);
          result_of[i] = results.size() - 1;
        }
        if (report) report->taxon(taxon, verdicts);
        if (!o.summary.empty()) {
          auto row = taxon_summary_row(taxon, verdicts, names, check_elevation ? &band : nullptr);
          std::lock_guard<std::mutex> lock(results_lock);
          if (summary_rows.size() <= taxon.index) summary_rows.resize(taxon.index + 1);
          summary_rows[taxon.index] = std::move(row);
        }
        if (o.progress) o.progress->advance(1);
      },
      &test_seconds, o.populations);
  lap("screen");
  for (std::size_t t = 0; t < detectors.size(); ++t) summary.seconds.emplace_back("test " + names[t] + " (CPU)", test_seconds[t]);
  // Records outside every taxon: only the elevation check can judge them.
  const std::vector<Finding> none(detectors.size());
  std::vector<const Finding*> no_findings;
  for (const auto& f : none) no_findings.push_back(&f);
  std::vector<std::string> columns;
  for (std::size_t i = 0; i < n; ++i)
    if (result_of[i] == kNone) {
      judge_record(i, no_findings, columns);
      results.append(columns);
      result_of[i] = results.size() - 1;
    }

  const auto rank = rank_by_score(scores);
  std::vector<std::size_t> rows(n);
  std::iota(rows.begin(), rows.end(), 0);
  if (o.order == RowOrder::rank)
    std::stable_sort(rows.begin(), rows.end(), [&](std::size_t a, std::size_t b) {
      return (rank[a] ? rank[a] : n + 1) < (rank[b] ? rank[b] : n + 1);
    });

  summary.warnings = g.warnings;
  std::sort(population_warnings.begin(), population_warnings.end());  // by taxon, whatever the threads
  for (auto& w : population_warnings) summary.warnings.push_back(std::move(w.second));
  CsvWriter out(o.out);
  const auto header = output_header(g, added);
  out.row(header);
  std::unique_ptr<GisWriter> gis;
  if (!o.gis.empty()) {
    // originals and words are text; sampled values and statistics are numbers; rank an integer
    std::vector<FieldKind> kinds(header.size(), FieldKind::real);
    for (std::size_t c = 0; c < g.table.columns.size(); ++c) kinds[c] = FieldKind::text;
    for (std::size_t c = 0; c < header.size(); ++c) {
      if (header[c] == "status" || header[c] == "flags" || header[c] == "reasons") kinds[c] = FieldKind::text;
      if (header[c] == "rank") kinds[c] = FieldKind::integer;
    }
    gis = std::make_unique<GisWriter>(o.gis, header, kinds);
  }
  std::vector<std::string> verdict;
  if (o.progress) o.progress->stage("writing", n, "records");
  for (std::size_t i : rows) {
    if (o.progress && summary.read % 4096 == 4095) o.progress->advance(4096);
    ++summary.read;
    results.read(result_of[i], verdict);
    if (eligible[i] && !verdict[0].empty()) {
      std::stringstream codes(verdict[0]);
      for (std::string code; std::getline(codes, code, ';');) g.status.add(i, code);
    }
    if (scores[i]) {
      ++summary.scored;
      if (!verdict[2].empty()) ++summary.flagged;
    } else {
      if (g.status.of(i).empty()) g.status.add(i, reason::no_values);
      ++summary.not_scored[g.status.of(i).front()];
    }
    for (const auto& c : g.status.of(i)) ++summary.codes[c];
    auto row = output_row(g, i);
    row.push_back(rank[i] ? std::to_string(rank[i]) : "");
    row.insert(row.end(), verdict.begin() + 1, verdict.end());
    out.row(row);
    if (gis) gis->add(row, g.table.records[i].longitude, g.table.records[i].latitude, g.radius_m[i]);
    if (report) report->written(i, rank[i], verdict[1], verdict[2], verdict[3]);
  }

  if (!o.summary.empty()) {
    CsvWriter table(o.summary);
    table.row(taxon_summary_header(names, check_elevation));
    for (const auto& t : taxa) table.row(summary_rows.at(t.index));
    table.commit();
  }
  if (gis) gis->commit();
  lap("write");
  if (report) {
    report->finish(summary);
    lap("report");
  }
  out.commit();
  if (o.progress) o.progress->finish();
  return summary;
}

RunSummary merge_shards(const std::vector<std::string>& paths, const std::string& out_path) {
  if (paths.empty()) throw UsageError("merge needs the shard outputs");
  struct Shard {
    std::ifstream in;
    std::unique_ptr<CsvReader> reader;
  };
  std::vector<Shard> shards(paths.size());
  std::vector<std::string> header;
  auto open_all = [&]() {
    for (std::size_t s = 0; s < paths.size(); ++s) {
      shards[s].in = std::ifstream(paths[s], std::ios::binary);
      if (!shards[s].in) throw InputError(paths[s], "cannot open the shard output", "check the path");
      shards[s].reader = std::make_unique<CsvReader>(shards[s].in, ',', paths[s]);
      std::vector<std::string> h;
      std::size_t line;
      if (!shards[s].reader->next(h, line)) throw InputError(paths[s], 1, "the file is empty", "give the outputs of envsift screen --shard");
      if (s == 0) header = h;
      else if (h != header)
        throw InputError(paths[s], 1, "its columns differ from " + paths[0] + "'s", "merge the shards of one run only");
    }
  };
  auto column = [&](const std::string& name) {
    auto it = std::find(header.begin(), header.end(), name);
    if (it == header.end())
      throw InputError(paths[0], 1, "no '" + name + "' column: not an envsift screen output", "merge screen outputs");
    return static_cast<std::size_t>(it - header.begin());
  };
  // Each row comes from the one shard that owns it; the others mark it other_shard.
  auto next_rows = [&](std::vector<std::string>& picked, std::size_t row_number, std::size_t status) {
    std::vector<std::string> fields;
    std::size_t line = 0, owners = 0, ended = 0;
    for (std::size_t s = 0; s < shards.size(); ++s) {
      if (!shards[s].reader->next(fields, line)) {
        ++ended;
        continue;
      }
      if (fields.size() != header.size())
        throw InputError(paths[s], line, "row has " + std::to_string(fields.size()) + " fields, the header " +
                                             std::to_string(header.size()), "merge unmodified shard outputs");
      if (fields[status] != reason::other_shard) {
        ++owners;
        picked = fields;
      }
    }
    if (ended == shards.size()) return false;
    if (ended || owners != 1)
      throw InputError(paths[0], row_number + 1,
                       ended ? "the shard outputs have different numbers of rows"
                             : std::to_string(owners) + " shards claim this row",
                       "merge all shards 0..N-1 of one run, each once");
    return true;
  };

  open_all();
  const std::size_t status = column("status"), rank = column("rank"), score = column("score"), flags = column("flags");
  // Pass 1: every row's score, to rank them as one run would.
  std::vector<std::optional<double>> scores;
  std::vector<std::string> row;
  while (next_rows(row, scores.size() + 1, status))
    scores.push_back(row[score].empty() ? std::nullopt : std::optional<double>(std::stod(row[score])));
  const auto ranks = rank_by_score(scores);
  // Pass 2: the rows again, with their rank.
  open_all();
  RunSummary summary;
  CsvWriter out(out_path);
  out.row(header);
  for (std::size_t i = 0; next_rows(row, i + 1, status); ++i) {
    row[rank] = ranks[i] ? std::to_string(ranks[i]) : "";
    ++summary.read;
    std::vector<std::string> codes;
    std::stringstream status_text(row[status]);
    for (std::string code; std::getline(status_text, code, ';');)
      if (code != reason::ok) codes.push_back(code), ++summary.codes[code];
    if (scores[i]) ++summary.scored;
    else ++summary.not_scored[codes.empty() ? reason::no_values : codes.front()];
    if (!row[flags].empty()) ++summary.flagged;
    out.row(row);
  }
  out.commit();
  return summary;
}

}  // namespace envsift
