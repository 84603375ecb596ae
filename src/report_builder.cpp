#include "report_builder.hpp"

#include <algorithm>
#include <cmath>

#include <gdal_priv.h>

#include "envsift/detect/per_layer_test.hpp"
#include "envsift/sample/raster_stack.hpp"
#include "gdal_init.hpp"

namespace envsift::detail {
namespace {

// Each layer's unit as its raster declares it (GDAL unit type), "" when it does not.
std::vector<std::string> layer_units(const ScreenOptions& o, std::size_t layers) {
  std::vector<std::string> units(layers);
  if (!o.value_columns.empty()) return units;
  const auto specs = expand_layer_arguments(o.layers);
  for (std::size_t l = 0; l < specs.size() && l < layers; ++l) {
    QuietGdalErrors quiet;
    std::unique_ptr<GDALDataset> d(GDALDataset::Open(specs[l].path.c_str(), GDAL_OF_RASTER | GDAL_OF_READONLY));
    if (d && specs[l].band <= d->GetRasterCount()) units[l] = d->GetRasterBand(specs[l].band)->GetUnitType();
  }
  return units;
}

ReliefSource relief_of(const ScreenOptions& o) {
  if (o.elevation.dem_layer.empty() || !o.value_columns.empty()) return {};
  for (const auto& spec : expand_layer_arguments(o.layers))
    if (spec.name == o.elevation.dem_layer) return {spec.path, spec.band};
  return {};
}

std::string fixed(double v, int decimals) {
  char buf[64];
  std::snprintf(buf, sizeof buf, "%.*f", decimals, v);
  return buf;
}

}  // namespace

ReportBuilder::ReportBuilder(const ScreenOptions& o, const Gathered& g, const std::vector<std::unique_ptr<Detector>>& detectors)
    : o_(o), g_(g), detectors_(detectors), units_(layer_units(o, g.layer_names.size())),
      report_(o.report, relief_of(o), o.seed, o.mahalanobis.min_records, o.report_taxa) {
  const auto& columns = g.table.columns;
  if (const auto it = std::find(columns.begin(), columns.end(), o.reader.columns.id); it != columns.end())
    id_column_ = static_cast<std::size_t>(it - columns.begin());
}

std::string ReportBuilder::label(std::size_t i) const {
  if (id_column_) {
    std::lock_guard<std::mutex> guard(fields_lock_);
    std::string id = g_.table.fields.read(i).at(*id_column_);
    if (!id.empty()) return id;
  }
  return "line " + std::to_string(g_.table.records[i].line);
}

void ReportBuilder::taxon(const ScreenedTaxon& taxon, const std::vector<Verdict>& verdicts) {
  const std::size_t layers = g_.layer_names.size();
  TaxonPicture p;
  p.taxon = taxon.taxon;
  p.reference_label = o_.distinct_cells ? "distinct cells" : "records";
  p.two_populations = taxon.two_populations;
  p.reference.resize(static_cast<Eigen::Index>(taxon.reference.size()), static_cast<Eigen::Index>(layers));
  for (std::size_t r = 0; r < taxon.reference.size(); ++r)
    p.reference.row(static_cast<Eigen::Index>(r)) = g_.values.row(static_cast<Eigen::Index>(taxon.reference[r]));
  for (std::size_t l = 0; l < layers; ++l) {
    PlotLayer layer{g_.layer_names[l], units_[l], std::nullopt, std::nullopt};
    std::vector<double> column(p.reference.col(static_cast<Eigen::Index>(l)).data(),
                               p.reference.col(static_cast<Eigen::Index>(l)).data() + p.reference.rows());
    for (const auto& d : detectors_)
      if (const auto* test = dynamic_cast<const PerLayerTest*>(d.get())) {
        const auto range = test->accepted_range(column, layer.name);
        (d->name() == "robust_z" ? layer.robust_z : layer.jackknife) = range;
      }
    p.layers.push_back(std::move(layer));
  }
  std::size_t judged = 0;
  for (std::size_t k = 0; k < taxon.records.size(); ++k) {
    const std::size_t i = taxon.records[k];
    const auto row = static_cast<Eigen::Index>(i);
    const Verdict& v = verdicts[k];
    judged += v.score.has_value();
    PlotRecord r;
    r.suspect = !v.flags.empty();
    r.label = r.suspect ? label(i) : std::string();
    r.longitude = g_.table.records[i].longitude;
    r.latitude = g_.table.records[i].latitude;
    r.score = v.score.value_or(0);
    for (const auto& words : v.reasons) r.reasons += (r.reasons.empty() ? "" : "; ") + words;
    for (std::size_t l = 0; l < layers; ++l) {
      const auto c = static_cast<Eigen::Index>(l);
      r.value.push_back(g_.values(row, c));
      r.low.push_back(g_.has_discs && std::isfinite(g_.discs.min(row, c)) ? std::min(g_.values(row, c), g_.discs.min(row, c)) : g_.values(row, c));
      r.high.push_back(g_.has_discs && std::isfinite(g_.discs.max(row, c)) ? std::max(g_.values(row, c), g_.discs.max(row, c)) : g_.values(row, c));
    }
    p.records.push_back(std::move(r));
  }
  // suspects first, worst first, so that the labelled ones are the worst
  std::stable_sort(p.records.begin(), p.records.end(), [](const PlotRecord& a, const PlotRecord& b) {
    return a.suspect != b.suspect ? a.suspect : a.suspect && a.score > b.score;
  });
  report_.add_taxon(taxon.index, p, judged);
  std::lock_guard<std::mutex> guard(taxa_lock_);
  taxon_index_[taxon.taxon] = taxon.index;
}

void ReportBuilder::written(std::size_t i, std::size_t rank, const std::string& score, const std::string& flags,
                            const std::string& reasons) {
  if (rank == 0 || rank > kTopSuspects || flags.empty()) return;
  ReportSuspect s{rank, label(i), o_.single_taxon ? "*" : g_.table.taxon(i), score, flags, reasons};
  if (const auto it = taxon_index_.find(s.taxon); it != taxon_index_.end()) s.taxon_index = it->second;
  top_.push_back(std::move(s));
}

void ReportBuilder::finish(const RunSummary& summary) {
  ReportOverview v;
  v.title = "envsift screening report: " + o_.points;
  v.inputs.emplace_back("points", o_.points);
  if (o_.value_columns.empty())
    for (const auto& spec : expand_layer_arguments(o_.layers))
      v.inputs.emplace_back("layer " + spec.name, spec.path + (spec.band > 1 ? " (band " + std::to_string(spec.band) + ")" : ""));
  else
    for (const auto& c : o_.value_columns) v.inputs.emplace_back("value column", c);
  v.inputs.emplace_back("output", o_.out);
  v.inputs.emplace_back("statistics from", o_.distinct_cells ? "one row per distinct raster cell of each taxon"
                                                              : "every record of each taxon");
  v.inputs.emplace_back("minimum records per test", std::to_string(o_.robust_z.min_records));
  for (const auto& d : detectors_) {
    const std::string n = d->name();
    if (n == "robust_z") v.tests.push_back("robust_z: flags a value more than " + fixed(o_.robust_z.cutoff, 2) +
                                            " robust SD (1.4826 × MAD) from the taxon's median on any layer");
    if (n == "reverse_jackknife") v.tests.push_back("reverse_jackknife: flags a value beyond a gap that cuts a tail off the "
                                                     "taxon's values on any layer (gap statistic > 0.95 √n + 0.2)");
    if (n == "mahalanobis") v.tests.push_back("mahalanobis: flags D² above the " + fixed(o_.mahalanobis.quantile, 3) +
                                               " quantile of χ² (classical mean and covariance, all layers together)");
    if (n == "mahalanobis_robust") v.tests.push_back("mahalanobis_robust: the same with reweighted FAST-MCD centre and scatter "
                                                      "(seed " + std::to_string(o_.seed) + ")");
  }
  if (!o_.elevation.dem_layer.empty())
    v.tests.push_back("elevation_mismatch: the reported elevation is more than " + fixed(o_.elevation.tolerance_m, 0) +
                      " m outside the range of " + o_.elevation.dem_layer + " within the record's uncertainty disc");
  v.read = summary.read;
  v.scored = summary.scored;
  v.flagged = summary.flagged;
  v.not_scored = summary.not_scored;
  v.codes = summary.codes;
  v.warnings = summary.warnings;
  std::sort(top_.begin(), top_.end(), [](const ReportSuspect& a, const ReportSuspect& b) { return a.rank < b.rank; });
  v.top = top_;
  if (o_.manifest_json) v.manifest_json = o_.manifest_json(summary);
  report_.finish(v);
}

}  // namespace envsift::detail
