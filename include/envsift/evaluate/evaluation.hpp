// `envsift evaluate`: screen virtual taxa with injected errors on the user's rasters, with exactly
// the settings `screen` would use, and measure what each test and the combined verdict find.
//   virtual taxa (virtual_taxa.hpp) → records → errors and batches (injected_errors.hpp) → points file →
//   run_screen, whose verdicts an output of its own tallies → metrics per test and combined
//   (detection_metrics.hpp), over each slice of the records (evaluation_slices.hpp)
#pragma once
#include <string>
#include <vector>

#include "envsift/evaluate/detection_metrics.hpp"
#include "envsift/evaluate/virtual_taxa.hpp"
#include "envsift/run_summary.hpp"
#include "envsift/settings/settings.hpp"

namespace envsift {

struct EvaluateOptions {
  ScreenSettings screen;             // layers, tests and their settings (points/out are set here)
  VirtualTaxaOptions taxa;
  std::size_t study_cells = 200000;  // candidate cells sampled from the first layer
  double error_share = 0.05;         // of each taxon's records, single errors
  double batch_taxa_share = 0.33;    // this share of the taxa also get a batch of errors…
  double batch_share_low = 0.12, batch_share_high = 0.25;  // …of this share of their records (uniform)…
  std::size_t batch_places_low = 1, batch_places_high = 3;  // …at this many wrong places
  double unsuitable_below = 0.05;    // an error is "into unsuitable environment" below this suitability
  std::string keep_screened;         // also keep the screen output (with the truth columns); "" = no
};

struct EvaluationRow {
  std::string test;   // a test's name, or "combined"
  std::string slice;  // evaluation_slices.hpp
  DetectionMetrics metrics;
};

struct Evaluation {
  std::size_t taxa = 0, records = 0, errors = 0, batch_errors = 0, errors_off_layers = 0;
  std::vector<EvaluationRow> rows;
  RunSummary screen;  // what the screen said (warnings, counts)
};

// Throws UsageError for settings out of their bounds (the screen's are checked by run_screen).
void validate(const EvaluateOptions& options);
Evaluation run_evaluation(const EvaluateOptions& options);

// The table as CSV (atomically): for each test and the combined verdict, one row per slice.
void write_evaluation(const std::string& path, const Evaluation& evaluation);

}  // namespace envsift
