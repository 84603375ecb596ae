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

std::size_t mb(std::size_t bytes) { return (bytes + (1u << 19)) >> 20; }

}  // namespace

std::size_t MemoryEstimate::peak() const { return base + per_record + values + std::max(sampling, budgets); }

std::string MemoryEstimate::words() const {
  return "about " + with_thousands(mb(peak())) + " MB at its peak (records " + with_thousands(mb(per_record)) +
         ", values " + with_thousands(mb(values)) + ", the larger of sampling " + with_thousands(mb(sampling)) +
         " and cache, landscapes and verdicts " + with_thousands(mb(budgets)) + ", program " + with_thousands(mb(base)) + ")";
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
  return e;
}

}  // namespace envsift
