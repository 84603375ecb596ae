#include "envsift/value_table.hpp"

#include <cmath>
#include <limits>

namespace envsift {

ValueTable::ValueTable(std::size_t rows, const std::vector<bool>& as_float) : rows_(rows) {
  for (bool f : as_float) add_column(f);
}

void ValueTable::add_column(bool as_float) {
  if (as_float) {
    column_.push_back({true, floats_.size()});
    floats_.emplace_back(rows_, std::numeric_limits<float>::quiet_NaN());
  } else {
    column_.push_back({false, doubles_.size()});
    doubles_.emplace_back(rows_, std::numeric_limits<double>::quiet_NaN());
  }
}

Eigen::RowVectorXd ValueTable::row(Eigen::Index r) const {
  Eigen::RowVectorXd out(cols());
  for (Eigen::Index c = 0; c < cols(); ++c) out[c] = (*this)(r, c);
  return out;
}

bool ValueTable::any_finite(Eigen::Index r) const {
  for (Eigen::Index c = 0; c < cols(); ++c)
    if (std::isfinite((*this)(r, c))) return true;
  return false;
}

Eigen::MatrixXd ValueTable::block(Eigen::Index first, Eigen::Index count, const std::vector<Eigen::Index>& columns) const {
  const auto width = columns.empty() ? cols() : static_cast<Eigen::Index>(columns.size());
  Eigen::MatrixXd out(count, width);
  for (Eigen::Index k = 0; k < width; ++k) {
    const Eigen::Index c = columns.empty() ? k : columns[static_cast<std::size_t>(k)];
    for (Eigen::Index r = 0; r < count; ++r) out(r, k) = (*this)(first + r, c);
  }
  return out;
}

std::size_t ValueTable::bytes() const { return rows_ * (floats_.size() * sizeof(float) + doubles_.size() * sizeof(double)); }

}  // namespace envsift
