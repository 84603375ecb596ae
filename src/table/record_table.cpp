#include "envsift/table/record_table.hpp"

#include <algorithm>
#include <cmath>

#include "envsift/errors.hpp"

namespace envsift {

void ReasonCodeStore::set(std::size_t record, const std::vector<std::string>& codes) {
  auto [it, added] = lookup_.emplace(codes, static_cast<std::uint32_t>(lists_.size()));
  if (added) lists_.push_back(codes);
  index_[record] = it->second;
}

void ReasonCodeStore::add(std::size_t record, const std::string& code) {
  const auto& now = of(record);
  if (std::find(now.begin(), now.end(), code) != now.end()) return;
  std::vector<std::string> codes = now;
  codes.push_back(code);
  set(record, codes);
}

std::vector<std::string> RecordTable::layer_names() const {
  std::vector<std::string> names;
  for (const auto& l : layers) names.push_back(l.spec.name);
  return names;
}

std::optional<std::size_t> RecordTable::layer_index(const std::string& name) const {
  for (std::size_t l = 0; l < layers.size(); ++l)
    if (layers[l].spec.name == name) return l;
  return std::nullopt;
}

bool RecordTable::has_any_value(std::size_t record) const {
  return values.any_finite(static_cast<Eigen::Index>(record));
}

std::pair<double, double> RecordTable::range(std::size_t record, std::size_t layer) const {
  const auto r = static_cast<Eigen::Index>(record), c = static_cast<Eigen::Index>(layer);
  const double x = values(r, c);
  if (!has_discs || !std::isfinite(discs.min(r, c))) return {x, x};
  return {std::min(x, discs.min(r, c)), std::max(x, discs.max(r, c))};
}

void check_unique_columns(const std::vector<std::string>& columns) {
  for (std::size_t i = 0; i < columns.size(); ++i)
    for (std::size_t j = 0; j < i; ++j)
      if (columns[i] == columns[j])
        throw UsageError("the output would have two columns named '" + columns[i] +
                         "' (an input column, a layer or an envsift column); give envsift's columns a prefix with "
                         "--column-prefix, name the layer with NAME=PATH, or rename the input column");
}

}  // namespace envsift
