// One occurrence record as read from the input, and the table of them.
#pragma once
#include <cmath>
#include <cstddef>
#include <optional>
#include <string>
#include <vector>

namespace envsift {

// A record keeps its original fields verbatim; the parsed values are what envsift works with.
struct Occurrence {
  std::size_t line = 0;             // line (CSV) or feature number (vector) where the record starts
  std::vector<std::string> fields;  // original columns, in input order, untouched
  std::string id;
  std::string taxon;
  double longitude = std::nan("");
  double latitude = std::nan("");
  std::optional<double> uncertainty_m;
  std::vector<std::string> problems;  // reason codes found while reading (see reason_codes.hpp)

  bool has_coordinates() const { return std::isfinite(longitude) && std::isfinite(latitude); }
};

struct PointTable {
  std::string source;                // path it was read from
  std::vector<std::string> columns;  // original column names, in order
  std::vector<Occurrence> records;   // in input order
  std::optional<std::size_t> uncertainty_column;  // index in `columns`, when the file has one
};

}  // namespace envsift
