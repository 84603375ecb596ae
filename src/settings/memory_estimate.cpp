#include "envsift/settings/memory_estimate.hpp"

#include <algorithm>

#include "envsift/run_summary.hpp"
#include "envsift/settings/run_options.hpp"

namespace envsift {
namespace {

// Per record, for the whole run (occurrence.hpp, record_table.hpp, run/, score/): the parsed
// record (56), its offset in the field store (8), cell key (8), reason-code index (4), taxon and
// eligibility (5), its place in its taxon's group (8), score (16), verdict slot and offset (16),
// and the writer's rank and order (16).
constexpr std::size_t kPerRecord = 56 + 8 + 8 + 4 + 5 + 8 + 16 + 16 + 16;
// While sampling: per record its longitude and latitude (16), the cell key being built (8) and
// one status byte per layer; per record of the chunk being sampled, its place in the plan (40:
// location, cell, outside flag).
constexpr std::size_t kSamplingPerRecord = 16 + 8;
constexpr std::size_t kPlanPerRecord = 40;
constexpr std::size_t kBase = std::size_t(100) << 20;  // GDAL, PROJ, the program (measured at ~90 MB)
// A verdict serialised (score, flags, codes, each test's numbers; reasons of flagged records).
constexpr std::size_t kVerdictBytes = 120;
// Per thread: its stack, its malloc arena's slack, and its own GDAL handle on every layer.
// Measured (scripts/bench workload, 1 M records, 19 layers): 8 threads peaked 105 MB above 2.
constexpr std::size_t kPerThread = std::size_t(8) << 20, kPerThreadLayer = std::size_t(512) << 10;
// The outputs that hold more than a row at a time, measured on the same workload: the report
// (pictures of the taxa it draws, the top suspects) +44 MB, the GeoPackage (SQLite's page cache) +11 MB.
constexpr std::size_t kReport = std::size_t(64) << 20, kGis = std::size_t(24) << 20;

std::size_t mb(std::size_t bytes) { return (bytes + (1u << 19)) >> 20; }

}  // namespace

std::size_t MemoryEstimate::peak() const {
  return base + per_record + values + threads + outputs + std::max(sampling, budgets);
}

std::string MemoryEstimate::words() const {
  return "about " + with_thousands(mb(peak())) + " MB at its peak (records " + with_thousands(mb(per_record)) +
         ", values " + with_thousands(mb(values)) + ", the larger of sampling " + with_thousands(mb(sampling)) +
         " and cache, landscapes and verdicts " + with_thousands(mb(budgets)) + ", threads " + with_thousands(mb(threads)) +
         (outputs ? ", outputs " + with_thousands(mb(outputs)) : std::string()) + ", program " + with_thousands(mb(base)) + ")";
}

MemoryEstimate estimate_memory(const RunShape& run, const SamplingSettings& s) {
  const SamplingPlan plan = sampling_plan(s);
  const std::size_t n = run.records, layers = run.layers, float_layers = run.float_layers;
  const bool discs = run.discs;
  const std::size_t cache = run.raster_bytes ? std::min(plan.cache_bytes, run.raster_bytes) : plan.cache_bytes;
  // a batch of landscapes: points, samples (value and status) and the taxa's copies (landscape_sample.hpp)
  const std::size_t landscapes =
      std::min(plan.landscape_bytes, run.taxa * run.landscape_cells * (3 * sizeof(double) + layers * (2 * sizeof(double) + 1)));
  MemoryEstimate e;
  e.base = kBase;
  e.per_record = n * (kPerRecord + (discs ? sizeof(double) : 0));  // disc radius
  e.values = n * (float_layers * sizeof(float) + (layers - std::min(layers, float_layers)) * sizeof(double) +
                  (discs ? 3 * layers * sizeof(double) : 0));
  e.sampling = n * (kSamplingPerRecord + layers) + std::min(n, plan.chunk_records) * kPlanPerRecord + cache;
  e.budgets = cache + landscapes + std::min(plan.verdict_bytes, n * kVerdictBytes);
  e.threads = std::max<std::size_t>(1, run.threads) * (kPerThread + layers * kPerThreadLayer);
  e.outputs = (run.report ? kReport : 0) + (run.gis ? kGis : 0);
  return e;
}

}  // namespace envsift
