// One occurrence record as read from the input, and the table of them. A table of millions of
// records stays small: each record holds only its parsed values and small indices; taxon names
// and sets of reason codes are stored once, and the original text lives in a FieldStore on disk.
#pragma once
#include <cmath>
#include <cstddef>
#include <cstdint>
#include <optional>
#include <string>
#include <vector>

#include "envsift/read/field_store.hpp"

namespace envsift {

struct Occurrence {
  std::size_t line = 0;             // line (CSV) or feature number (vector) where the record starts
  std::uint32_t taxon = 0;          // index into PointTable::taxa (0: no taxon)
  std::uint32_t problems = 0;       // index into PointTable::problem_sets (0: none)
  double longitude = std::nan("");
  double latitude = std::nan("");
  std::optional<double> uncertainty_m;
  std::uint64_t id_hash = 0;        // of the record's ID (0: none), to find duplicates

  bool has_coordinates() const { return std::isfinite(longitude) && std::isfinite(latitude); }
};

struct PointTable {
  std::string source;                // path it was read from
  std::vector<std::string> columns;  // original column names, in order
  std::vector<Occurrence> records;   // in input order
  FieldStore fields;                 // original fields of each record, untouched (padded if ragged)
  std::vector<std::string> taxa{""};                   // taxon names (NFC, whitespace folded), each once
  std::vector<std::string> similar_names;              // per taxon: names that look like it ("a; b"), or ""
  std::vector<std::vector<std::string>> problem_sets{{}};  // reason codes found while reading
  std::optional<std::size_t> uncertainty_column;       // index in `columns`, when the file has one
  std::vector<std::string> warnings;                   // e.g. records that span several lines

  const std::string& taxon(std::size_t i) const { return taxa[records[i].taxon]; }
  const std::vector<std::string>& problems(std::size_t i) const { return problem_sets[records[i].problems]; }
};

}  // namespace envsift
