#include "envsift/sample/sampling_settings.hpp"

#include <algorithm>
#include <omp.h>
#include <sys/resource.h>
#include <cpl_conv.h>

namespace envsift {

const std::vector<Option<SamplingSettings>>& sampling_options() {
  using S = SamplingSettings;
  static const std::vector<Option<S>> options = [] {
    std::vector<Option<S>> v;
    v.push_back(choice_option("method",
                              "nearest: the value of the cell the point falls in (what gdallocationinfo reports); "
                              "bilinear: weighted from the four nearest cell centres, falling back to nearest at edges "
                              "and beside nodata",
                              &S::method, Choices<Interpolation>{{"nearest", Interpolation::nearest},
                                                                 {"bilinear", Interpolation::bilinear}}));
    v.push_back(real_option("default-uncertainty", "M",
                            "uncertainty radius in metres for records that give none (0: sample only their point)",
                            &S::default_radius_m, at_least(0)));
    v.push_back(real_option("max-uncertainty", "M",
                            "larger uncertainty discs are cut to M metres (cost grows with the disc's area); such "
                            "records say so (uncertainty_capped)",
                            &S::max_radius_m, above(0)));
    Option<S> no_discs = switch_option("no-discs", "ignore coordinate uncertainty: sample and judge each record at its point only",
                                       &S::discs);
    no_discs.set = [](S& s, const std::string& text) { s.discs = text == "false"; };
    no_discs.get = [](const S& s) { return std::string(s.discs ? "false" : "true"); };
    v.push_back(no_discs);
    // 0 (unset) is every core; each thread keeps its own handle on every layer, so the count is
    // bounded to keep open files and thread stacks within what a machine gives a process
    v.push_back(count_option("threads", "N",
                             "threads to use, at most " + std::to_string(kMaxThreads) +
                                 " (0, the default: all cores); results do not depend on it",
                             &S::threads, between(0, kMaxThreads)));
    v.back().get = [](const S& s) { return s.threads ? std::to_string(s.threads) : std::string(); };
    v.push_back(count_option("block-cache-mb", "MB", "memory for decoded raster blocks (at most a quarter of --memory-limit)",
                             &S::block_cache_mb, at_least(1)));
    v.push_back(count_option("memory-limit", "MB",
                             "memory envsift aims to stay within: it bounds the block cache and samples records in "
                             "chunks small enough to fit; results do not depend on it. A run whose records alone need "
                             "more is warned about",
                             &S::memory_limit_mb, at_least(16)));
    v.push_back(list_option("gdal-config", "KEY=VALUE...",
                            "GDAL configuration options, e.g. GDAL_HTTP_MAX_RETRY=3 for rasters read over HTTP "
                            "(/vsicurl/https://...) or GDAL_NUM_THREADS=2 for decompression",
                            &S::gdal_config));
    v.back().check = [](const S& s) {
      for (const auto& kv : s.gdal_config)
        if (kv.find('=') == std::string::npos || kv[0] == '=') return "takes KEY=VALUE, not '" + kv + "'";
      return std::string();
    };
    return v;
  }();
  return options;
}

SamplingPlan sampling_plan(const SamplingSettings& s) {
  SamplingPlan plan;
  plan.method = s.method;
  plan.cache_bytes = std::max<std::size_t>(1, std::min(s.block_cache_mb, s.memory_limit_mb / 4)) << 20;
  // sampling works on ~100 bytes per record and layer pass; a quarter of the limit for that
  plan.chunk_records = std::max<std::size_t>(1024, (s.memory_limit_mb << 20) / 4 / 100);
  plan.landscape_bytes = (s.memory_limit_mb << 20) / 8;
  plan.verdict_bytes = (s.memory_limit_mb << 20) / 16;
  return plan;
}

void apply_process_settings(const SamplingSettings& s) {
  for (const auto& kv : s.gdal_config) {
    const auto eq = kv.find('=');
    CPLSetConfigOption(kv.substr(0, eq).c_str(), kv.substr(eq + 1).c_str());
  }
  if (s.threads > 0) omp_set_num_threads(static_cast<int>(s.threads));
  // every thread opens every layer once: let the process use the open files its hard limit
  // allows (the soft limit is often 1,024), as most runtimes do at start
  rlimit files{};
  if (getrlimit(RLIMIT_NOFILE, &files) == 0 && files.rlim_cur < files.rlim_max) {
    files.rlim_cur = files.rlim_max;
    setrlimit(RLIMIT_NOFILE, &files);
  }
}

}  // namespace envsift
