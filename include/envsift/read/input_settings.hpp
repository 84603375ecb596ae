// What a run reads: the points and how (columns, delimiter, quoting, CRS), the layers or value
// columns, and their declared options (--points, --layers, column names, ...).
#pragma once
#include <string>
#include <vector>

#include "envsift/option_spec.hpp"
#include "envsift/read/point_reader.hpp"

namespace envsift {

struct InputSettings {
  std::string points;                      // CSV/TSV or an OGR vector source
  ReaderOptions reader;                    // column names, delimiter, vector layer
  std::vector<std::string> layers;         // raster paths or NAME=PATH
  std::vector<std::string> value_columns;  // screen these input columns instead of sampling layers
  bool single_taxon = false;               // one group for the whole file
  std::string assume_crs;                  // CRS for layers that have none (else they are refused)
  std::vector<std::string> circular;       // layers holding directions in degrees (besides those named so)
};

// --points, --layers, the column names, --delimiter, --quoting, --points-crs, --points-layer,
// --circular, --assume-crs (--value-columns and --single-taxon belong to `screen` alone).
const std::vector<Option<InputSettings>>& input_options();

}  // namespace envsift
