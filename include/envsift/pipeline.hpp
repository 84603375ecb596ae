// The whole pipeline, as the CLI runs it:
//   read points → sample raster stack → group by taxon → tests → score and rank → write.
#pragma once
#include <cstddef>
#include <map>
#include <string>
#include <vector>

#include "envsift/detect/robust_z.hpp"
#include "envsift/read/point_reader.hpp"
#include "envsift/sample/raster_stack.hpp"

namespace envsift {

struct SampleOptions {
  std::string points;
  ReaderOptions reader;
  std::vector<std::string> layers;  // paths or NAME=PATH
  Interpolation method = Interpolation::nearest;
  std::string out;
  std::size_t cache_megabytes = 256;
};

enum class RowOrder { input, rank };

struct ScreenOptions : SampleOptions {
  RobustZOptions robust_z;
  RowOrder order = RowOrder::input;
};

// Where the records went: every record read is counted once as scored or as not scorable.
struct RunSummary {
  std::size_t read = 0;
  std::size_t sampled = 0;   // at least one layer value
  std::size_t scored = 0;
  std::size_t flagged = 0;
  std::map<std::string, std::size_t> not_scored;  // by first reason code
  std::string line() const;  // one line for stderr
};

RunSummary run_sample(const SampleOptions& options);
RunSummary run_screen(const ScreenOptions& options);

}  // namespace envsift
