#include "envsift/evaluate/evaluation.hpp"

#include <cmath>
#include <cstdio>
#include <cstdlib>
#include <filesystem>
#include <fstream>
#include <map>

#include "envsift/detect/circular_layers.hpp"
#include "envsift/errors.hpp"
#include "envsift/evaluate/injected_errors.hpp"
#include "envsift/read/csv_reader.hpp"
#include "envsift/sample/raster_stack.hpp"
#include "envsift/write/csv_writer.hpp"
#include "envsift/write/value_format.hpp"

namespace envsift {
namespace {

// A private directory for the evaluation's points and screen output, removed afterwards.
struct ScratchDirectory {
  std::string path;
  ScratchDirectory() {
    std::string pattern = (std::filesystem::temp_directory_path() / "envsift-evaluate-XXXXXX").string();
    if (!mkdtemp(pattern.data())) throw OutputError(pattern, "cannot create a temporary directory; check $TMPDIR");
    path = pattern;
  }
  ~ScratchDirectory() {
    std::error_code ignored;
    std::filesystem::remove_all(path, ignored);
  }
};

std::string ratio_text(double v) {
  char buf[32];
  std::snprintf(buf, sizeof buf, "%.4f", v);
  return buf;
}

}  // namespace

Evaluation run_evaluation(const EvaluateOptions& o) {
  std::vector<std::string> layer_names;
  for (const auto& spec : expand_layer_arguments(o.screen.layers)) layer_names.push_back(spec.name);
  refuse_circular_layers(layer_names);
  const StudyArea area = study_area(o.screen.layers, o.study_cells, o.taxa.seed, o.screen.assume_crs);
  const auto taxa = make_virtual_taxa(area, o.taxa);
  std::vector<VirtualRecord> records;
  std::vector<const VirtualTaxon*> taxon_of;
  for (std::size_t t = 0; t < taxa.size(); ++t) {
    std::vector<VirtualRecord> mine;
    for (std::size_t cell : taxa[t].cells) {
      char id[32];
      std::snprintf(id, sizeof id, "V%07zu", records.size() + mine.size() + 1);
      mine.push_back({id, taxa[t].name, area.longitude[cell], area.latitude[cell], ""});
    }
    SeededRandom random(o.taxa.seed * 0xd1b54a32d192ed03ull + t + 7);
    inject_errors(mine, area, o.error_share, random);
    for (auto& r : mine) records.push_back(std::move(r)), taxon_of.push_back(&taxa[t]);
  }

  // The suitability where each record now lies (the layers sampled as the screen will sample them).
  std::vector<double> suitability(records.size());
  {
    RasterStack stack(expand_layer_arguments(o.screen.layers), std::size_t(256) << 20, o.screen.assume_crs);
    std::vector<double> lon, lat;
    for (const auto& r : records) {
      const bool valid = std::fabs(r.latitude) <= 90 && std::fabs(r.longitude) <= 180;
      lon.push_back(valid ? r.longitude : std::nan("")), lat.push_back(valid ? r.latitude : std::nan(""));
    }
    const Samples s = stack.sample(lon, lat, o.screen.method);
    for (std::size_t i = 0; i < records.size(); ++i)
      suitability[i] = taxon_of[i]->suitability(s.values.row(static_cast<Eigen::Index>(i)).transpose());
  }
  ScratchDirectory scratch;
  ScreenOptions screen = o.screen;
  screen.points = scratch.path + "/virtual.csv";
  screen.out = o.keep_screened.empty() ? scratch.path + "/screened.csv" : o.keep_screened;
  screen.order = RowOrder::input;
  {
    std::ofstream points(screen.points, std::ios::binary);
    points << "occurrenceID,scientificName,decimalLongitude,decimalLatitude,virtual_error,virtual_suitability\n";
    for (std::size_t i = 0; i < records.size(); ++i) {
      const VirtualRecord& r = records[i];
      points << r.id << "," << r.taxon << "," << format_value(r.longitude) << "," << format_value(r.latitude) << "," << r.error << ","
             << format_value(suitability[i]) << "\n";
    }
    if (!points) throw OutputError(screen.points, "cannot write the virtual records; check free space in $TMPDIR");
  }
  Evaluation e;
  e.taxa = taxa.size();
  e.records = records.size();
  e.screen = run_screen(screen);

  std::ifstream in(screen.out, std::ios::binary);
  CsvReader reader(in, ',', screen.out);
  std::vector<std::string> header, row;
  std::size_t line;
  reader.next(header, line);
  std::map<std::string, std::size_t> column;
  for (std::size_t c = 0; c < header.size(); ++c) column[header[c]] = c;
  std::vector<std::string> names = screen.tests;
  const auto n_tests = names.size();
  std::vector<std::vector<JudgedRecord>> judged(n_tests + 1);
  for (std::size_t i = 0; reader.next(row, line); ++i) {
    const VirtualRecord& r = records.at(i);
    JudgedRecord base;
    base.error = !r.error.empty();
    base.unsuitable = base.error && suitability[i] < o.unsuitable_below;
    if (base.error) ++e.errors, e.errors_off_layers += std::isnan(suitability[i]);
    const std::string& flags = row[column.at("flags")];
    const std::string separated = ";" + flags + ";";
    for (std::size_t t = 0; t < n_tests; ++t) {
      JudgedRecord j = base;
      const std::string& stat = row[column.at(names[t] + "_stat")];
      j.scored = !stat.empty();
      j.flagged = separated.find(";" + names[t] + ";") != std::string::npos;
      if (j.scored) {
        const double severity = std::stod(stat) / std::stod(row[column.at(names[t] + "_cutoff")]);
        j.score = j.flagged ? severity : std::min(severity, 1.0);  // withheld flags rank at the cutoff
      }
      judged[t].push_back(j);
    }
    JudgedRecord all = base;
    all.scored = !row[column.at("score")].empty();
    all.flagged = !flags.empty();
    all.score = all.scored ? std::stod(row[column.at("score")]) : 0;
    judged[n_tests].push_back(all);
  }
  names.push_back("combined");
  for (std::size_t t = 0; t <= n_tests; ++t) e.rows.push_back({names[t], measure_detection(judged[t])});
  return e;
}

void write_evaluation(const std::string& path, const Evaluation& e) {
  CsvWriter out(path);
  out.row({"test", "errors", "errors_unsuitable", "clean", "flagged_errors", "flagged_unsuitable", "flagged_clean",
           "recall_unsuitable", "recall_all", "false_flag_rate", "precision", "average_precision"});
  for (const auto& r : e.rows) {
    const DetectionMetrics& m = r.metrics;
    out.row({r.test, std::to_string(m.errors), std::to_string(m.errors_unsuitable), std::to_string(m.clean),
             std::to_string(m.flagged_errors), std::to_string(m.flagged_unsuitable), std::to_string(m.flagged_clean),
             ratio_text(m.recall_unsuitable), ratio_text(m.recall_all), ratio_text(m.false_flag_rate),
             ratio_text(m.precision), ratio_text(m.average_precision)});
  }
  out.commit();
}

}  // namespace envsift
