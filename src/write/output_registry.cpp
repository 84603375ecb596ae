#include "envsift/write/output_registry.hpp"

#include "envsift/write/gis_writer.hpp"

namespace envsift {

// Each output is defined in its own file (src/write/outputs/, src/write/report/).
std::unique_ptr<RecordSink> make_csv_output(const std::string& path, const ScreenSettings&);
std::unique_ptr<RecordSink> make_gis_output(const std::string& path, const ScreenSettings&);
std::unique_ptr<RecordSink> make_summary_output(const std::string& path, const ScreenSettings&);
std::unique_ptr<RecordSink> make_report_output(const std::string& path, const ScreenSettings&);
std::unique_ptr<RecordSink> make_manifest_output(const std::string& path, const ScreenSettings&);
std::unique_ptr<RecordSink> make_decisions_template_output(const std::string& path, const ScreenSettings&);

namespace {

std::function<std::string&(ScreenSettings&)> path_of(std::string OutputSettings::*member) {
  return [member](ScreenSettings& s) -> std::string& { return s.outputs.*member; };
}

OptionSpec gis_option() {
  OptionSpec o = text_option("gis", "FILE.gpkg|FILE.geojson",
                             "also write every record as a point with all its attributes, for a desktop GIS; a "
                             "GeoPackage also gets a layer of the uncertainty discs (polygons)",
                             path_of(&OutputSettings::gis));
  o.check = [](const ScreenSettings& s) { return s.outputs.gis.empty() ? std::string() : gis_path_complaint(s.outputs.gis); };
  return o;
}

}  // namespace

// The registry: one line per output, in the order they finish and commit.
const std::vector<OutputEntry>& output_registry() {
  static const std::vector<OutputEntry> entries{
      {"csv", text_option("out", "FILE.csv", "where to write the result (CSV)", path_of(&OutputSettings::out)), true,
       make_csv_output},
      {"gis", gis_option(), false, make_gis_output},
      {"summary",
       text_option("summary", "FILE.csv",
                   "also write one row per taxon: records, judged, flagged per test and, with --dem, the taxon's robust "
                   "elevation band (median ± z-cutoff robust SD over distinct cells) and the records outside it",
                   path_of(&OutputSettings::summary)),
       false, make_summary_output},
      {"report",
       text_option("report", "FILE.html",
                   "also write an HTML report for reviewers: one self-contained file (no network, no scripts) with the "
                   "run overview, the top suspects, and per taxon its suspects, a map (shaded relief from --dem) and "
                   "plots of its values with the cutoffs",
                   path_of(&OutputSettings::report)),
       false, make_report_output},
      {"decisions-template",
       text_option("decisions-template", "FILE.csv",
                   "also write the next round's decisions file: the top --decisions-template-top open suspects with "
                   "their rank, score, flags and reasons and an empty decision column (error, valid or unsure) to fill "
                   "in, then the records decided in earlier rounds; give it back as --decisions",
                   [](ScreenSettings& s) -> std::string& { return s.review.template_path; }),
       false, make_decisions_template_output},
      {"manifest",
       text_option("manifest", "FILE.json",
                   "also write a run manifest: envsift's version, the command line, every option value, each input's "
                   "size and SHA-256, each layer's CRS, size and nodata, the seed, threads and timings",
                   path_of(&OutputSettings::manifest)),
       true, make_manifest_output},
  };
  return entries;
}

const std::vector<OptionSpec>& output_options() {
  static const std::vector<OptionSpec> options = [] {
    std::vector<OptionSpec> v;
    for (const auto& e : output_registry()) v.push_back(e.option);
    v.push_back(count_option("decisions-template-top", "N", "open suspects listed in --decisions-template (default 200)",
                             [](ScreenSettings& s) -> std::size_t& { return s.review.template_top; }, at_least(1)));
    v.push_back(count_option("report-taxa", "N",
                             "draw sections for at most N taxa in the report: all when there are no more, else the N "
                             "whose worst suspect scores highest (the index lists every taxon); keeps the report quick "
                             "to open",
                             [](ScreenSettings& s) -> std::size_t& { return s.outputs.report_taxa; }));
    return v;
  }();
  return options;
}

std::vector<std::unique_ptr<RecordSink>> open_outputs(const ScreenSettings& s, bool sample) {
  std::vector<std::unique_ptr<RecordSink>> sinks;
  for (const auto& e : output_registry()) {
    const std::string path = e.option.get(s);
    if (!path.empty() && (e.in_sample || !sample)) sinks.push_back(e.make(path, s));
  }
  return sinks;
}

}  // namespace envsift
