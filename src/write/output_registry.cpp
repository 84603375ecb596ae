#include "envsift/write/output_registry.hpp"

#include "envsift/write/gis_writer.hpp"

namespace envsift {

// Each output is defined in its own file (src/write/outputs/, src/write/report/).
std::unique_ptr<RecordSink> make_csv_output(const std::string& path);
std::unique_ptr<RecordSink> make_gis_output(const std::string& path);
std::unique_ptr<RecordSink> make_summary_output(const std::string& path);
std::unique_ptr<RecordSink> make_report_output(const std::string& path);
std::unique_ptr<RecordSink> make_manifest_output(const std::string& path);
std::unique_ptr<RecordSink> make_decisions_template_output(const std::string& path);

namespace {

using O = OutputSettings;

OutputOption gis_option() {
  OutputOption o = text_option("gis", "FILE.gpkg|FILE.geojson",
                             "also write every record as a point with all its attributes, for a desktop GIS; a "
                             "GeoPackage also gets a layer of the uncertainty discs (polygons)",
                             &O::gis);
  o.check = [](const O& s) { return s.gis.empty() ? std::string() : gis_path_complaint(s.gis); };
  return o;
}

}  // namespace

// The registry: one line per output, in the order they finish and commit.
const std::vector<OutputEntry>& output_registry() {
  static const std::vector<OutputEntry> entries{
      {"csv", text_option("out", "FILE.csv", "where to write the result (CSV)", &O::out), true,
       make_csv_output},
      {"gis", gis_option(), false, make_gis_output},
      {"summary",
       text_option("summary", "FILE.csv",
                   "also write one row per taxon: records, judged, flagged per test and, with --dem, the taxon's robust "
                   "elevation band (median ± z-cutoff robust SD over distinct cells) and the records outside it",
                   &O::summary),
       false, make_summary_output},
      {"report",
       text_option("report", "FILE.html",
                   "also write an HTML report for reviewers: one self-contained file (no network, no scripts) with the "
                   "run overview, the top suspects, and per taxon its suspects, a map (shaded relief from --dem) and "
                   "plots of its values with the cutoffs",
                   &O::report),
       false, make_report_output},
      {"decisions-template",
       text_option("decisions-template", "FILE.csv",
                   "also write the next round's decisions file: the top --decisions-template-top open suspects with "
                   "their rank, score, flags and reasons and an empty decision column (error, valid or unsure) to fill "
                   "in, then the records decided in earlier rounds; give it back as --decisions",
                   &O::decisions_template),
       false, make_decisions_template_output},
      {"manifest",
       text_option("manifest", "FILE.json",
                   "also write a run manifest: envsift's version, the command line, every option value, each input's "
                   "size and SHA-256, each layer's CRS, size and nodata, the seed, threads and timings",
                   &O::manifest),
       true, make_manifest_output},
  };
  return entries;
}

const std::vector<OutputOption>& output_options() {
  static const std::vector<OutputOption> options = [] {
    std::vector<OutputOption> v;
    for (const auto& e : output_registry()) v.push_back(e.option);
    v.push_back(count_option("decisions-template-top", "N", "open suspects listed in --decisions-template (default 200)",
                             &O::decisions_template_top, at_least(1)));
    v.push_back(count_option("report-taxa", "N",
                             "draw sections for at most N taxa in the report: all when there are no more, else the N "
                             "whose worst suspect scores highest (the index lists every taxon); keeps the report quick "
                             "to open",
                             &O::report_taxa));
    return v;
  }();
  return options;
}

std::vector<std::unique_ptr<RecordSink>> open_outputs(const OutputSettings& s, bool sample) {
  std::vector<std::unique_ptr<RecordSink>> sinks;
  for (const auto& e : output_registry()) {
    const std::string path = e.option.get(s);
    if (!path.empty() && (e.in_sample || !sample)) sinks.push_back(e.make(path));
  }
  return sinks;
}

}  // namespace envsift
