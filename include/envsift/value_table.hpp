// Records × layers values (NaN = missing), column by column. A layer whose every value a 32-bit
// float holds exactly — a Float32 or 8/16-bit integer layer sampled at the nearest cell, without
// scale or offset — is kept as floats: half the memory, and the value read back is the cell's own,
// so every output is the same byte for byte. Other layers (bilinear, scaled, Float64, derived
// sine and cosine) are kept as doubles.
#pragma once
#include <cstddef>
#include <cstdint>
#include <vector>

#include <Eigen/Core>

namespace envsift {

class ValueTable {
 public:
  ValueTable() = default;
  // `rows` records; one column per entry of `as_float`, all NaN.
  ValueTable(std::size_t rows, const std::vector<bool>& as_float);

  Eigen::Index rows() const { return static_cast<Eigen::Index>(rows_); }
  Eigen::Index cols() const { return static_cast<Eigen::Index>(column_.size()); }
  double operator()(Eigen::Index r, Eigen::Index c) const {
    const Column& k = column_[static_cast<std::size_t>(c)];
    return k.as_float ? floats_[k.at][static_cast<std::size_t>(r)] : doubles_[k.at][static_cast<std::size_t>(r)];
  }
  // A float column is written only with values a float holds exactly (see above).
  void set(Eigen::Index r, Eigen::Index c, double v) {
    const Column& k = column_[static_cast<std::size_t>(c)];
    if (k.as_float) floats_[k.at][static_cast<std::size_t>(r)] = static_cast<float>(v);
    else doubles_[k.at][static_cast<std::size_t>(r)] = v;
  }
  bool as_float(Eigen::Index c) const { return column_[static_cast<std::size_t>(c)].as_float; }
  void add_column(bool as_float);  // appended, all NaN

  Eigen::RowVectorXd row(Eigen::Index r) const;
  bool any_finite(Eigen::Index r) const;
  // Rows [first, first + count) of the listed columns (all when `columns` is empty), as doubles.
  Eigen::MatrixXd block(Eigen::Index first, Eigen::Index count, const std::vector<Eigen::Index>& columns = {}) const;
  Eigen::MatrixXd to_matrix() const { return block(0, rows()); }
  std::size_t bytes() const;  // memory the values take

 private:
  struct Column {
    bool as_float = false;
    std::size_t at = 0;  // index into floats_ or doubles_
  };
  std::size_t rows_ = 0;
  std::vector<Column> column_;
  std::vector<std::vector<float>> floats_;
  std::vector<std::vector<double>> doubles_;
};

}  // namespace envsift
