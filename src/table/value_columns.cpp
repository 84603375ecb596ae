#include "envsift/table/value_columns.hpp"

#include <algorithm>
#include <cmath>
#include <cstring>

#include "envsift/errors.hpp"
#include "envsift/read/coordinates.hpp"
#include "envsift/reason_codes.hpp"
#include "envsift/stable_hash.hpp"

namespace envsift {

RecordTable read_value_columns(PointTable points, const InputSettings& input, const std::vector<std::string>& added_columns) {
  RecordTable t;
  t.points = std::move(points);
  t.warnings = t.points.warnings;
  t.layers_are_columns = true;
  std::vector<std::string> columns = t.points.columns;
  columns.insert(columns.end(), added_columns.begin(), added_columns.end());
  check_unique_columns(columns);
  std::vector<std::size_t> index;
  for (const auto& name : input.value_columns) {
    auto it = std::find(t.points.columns.begin(), t.points.columns.end(), name);
    if (it == t.points.columns.end())
      throw InputError(input.points, 1, "no value column '" + name + "'", "check the names given to --value-columns");
    index.push_back(static_cast<std::size_t>(it - t.points.columns.begin()));
    LayerInfo column;
    column.spec.name = name;
    t.layers.push_back(column);
  }
  const std::size_t n = t.size();
  t.values = ValueTable(n, std::vector<bool>(index.size(), false));  // parsed text: doubles
  t.cells.assign(n, 0);
  t.codes.resize(n);
  std::vector<std::string> fields;
  for (std::size_t i = 0; i < n; ++i) {
    t.points.fields.read(i, fields);
    for (const auto& p : t.points.problems(i))
      if (p == reason::ragged_row || p == reason::uncertainty_not_numeric || p == reason::latin1_converted ||
          p == reason::duplicate_id || p == reason::spans_lines)
        t.codes.add(i, p);
    std::uint64_t key = kFnvBasis;  // over the values' bits: equal values, equal key
    for (std::size_t l = 0; l < index.size(); ++l) {
      const ParsedNumber v = parse_number(fields[index[l]]);
      if (v.problem.empty()) {
        t.values.set(static_cast<Eigen::Index>(i), static_cast<Eigen::Index>(l), v.value);
        std::uint64_t bits;
        std::memcpy(&bits, &v.value, sizeof bits);
        key = fnv_mix(key, bits);
      } else {
        t.codes.add(i, reason::on_layer(v.problem == "empty" ? reason::value_missing : reason::value_not_numeric,
                                        input.value_columns[l]));
        key = fnv_mix(key, 0x9E3779B97F4A7C15ull);
      }
    }
    t.cells[i] = key;
  }
  return t;
}

}  // namespace envsift
