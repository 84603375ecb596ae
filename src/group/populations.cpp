// Two populations in one taxon.
//   1. Layers with spread are standardised by median and 1.4826 · MAD (the robust z scale); rows
//      complete on them are split in two by k-means (Lloyd's algorithm, k = 2, started from the
//      row farthest from the median and the row farthest from that one: deterministic).
//   2. The split stands only when each part holds at least `min_rows` rows and `min_share` of
//      them, and the rows projected on the line through the two centres are bimodal: a Gaussian
//      kernel density (Silverman's rule-of-thumb bandwidth, 0.9 · s · n^(−1/5), with s the pooled
//      within-part SD; Silverman 1986, Density Estimation for Statistics and Data Analysis,
//      eq. 3.31 — from memory) falls between the two parts to at most `max_valley` of the lower
//      of its two peaks. k-means cuts any cloud in two; only a real valley makes two populations
//      (a normal or a flat cloud has none, and is left whole).
//   3. A record belongs to the population whose projected mean is nearer in units of that
//      population's SD along the line; a record missing a layer of the split, to the larger one.
#include "envsift/group/populations.hpp"
#include "envsift/median.hpp"

#include <algorithm>
#include <cmath>

namespace envsift {

std::uint8_t Populations::population_of(const Eigen::RowVectorXd& values) const {
  if (!split) return 0;
  double p = 0;
  for (std::size_t j = 0; j < layers.size(); ++j) {
    const double v = values[layers[j]];
    if (!std::isfinite(v)) return larger;
    p += direction[static_cast<Eigen::Index>(j)] * (v - centre[static_cast<Eigen::Index>(j)]) / scale[static_cast<Eigen::Index>(j)];
  }
  return std::fabs(p - mean[1]) / sd[1] < std::fabs(p - mean[0]) / sd[0] ? 1 : 0;
}

namespace {

// Lloyd's algorithm for k = 2 from the row farthest from the origin (the median) and the row
// farthest from that one; false when a cluster empties.
bool two_means(const Eigen::MatrixXd& z, std::vector<std::uint8_t>& label, Eigen::RowVectorXd (&c)[2]) {
  const Eigen::Index n = z.rows(), p = z.cols();
  Eigen::Index a = 0, b = 0;
  z.rowwise().squaredNorm().maxCoeff(&a);  // farthest from the median (the origin)
  (z.rowwise() - z.row(a)).rowwise().squaredNorm().maxCoeff(&b);
  c[0] = z.row(a), c[1] = z.row(b);
  label.assign(static_cast<std::size_t>(n), 0);
  for (int iteration = 0; iteration < 100; ++iteration) {
    bool changed = false;
    for (Eigen::Index i = 0; i < n; ++i) {
      const std::uint8_t k = (z.row(i) - c[1]).squaredNorm() < (z.row(i) - c[0]).squaredNorm() ? 1 : 0;
      changed = changed || k != label[static_cast<std::size_t>(i)];
      label[static_cast<std::size_t>(i)] = k;
    }
    Eigen::RowVectorXd sum[2] = {Eigen::RowVectorXd::Zero(p), Eigen::RowVectorXd::Zero(p)};
    Eigen::Index count[2] = {0, 0};
    for (Eigen::Index i = 0; i < n; ++i) sum[label[static_cast<std::size_t>(i)]] += z.row(i), ++count[label[static_cast<std::size_t>(i)]];
    if (count[0] == 0 || count[1] == 0) return false;
    c[0] = sum[0] / static_cast<double>(count[0]), c[1] = sum[1] / static_cast<double>(count[1]);
    if (!changed && iteration > 0) break;
  }
  return true;
}

// Whether the kernel density of the projected rows (Silverman's bandwidth from the pooled SD)
// falls between the two means to at most `max_valley` of the lower of its two peaks.
bool has_valley(const Eigen::VectorXd& along, const double (&mean)[2], double pooled, double max_valley) {
  const Eigen::Index n = along.size();
  const double h = std::max(0.9 * pooled * std::pow(static_cast<double>(n), -0.2), 1e-9);
  auto density = [&](double x) {
    double d = 0;
    for (Eigen::Index i = 0; i < n; ++i) d += std::exp(-0.5 * (x - along[i]) * (x - along[i]) / (h * h));
    return d;
  };
  const double lo = std::min(mean[0], mean[1]), hi = std::max(mean[0], mean[1]);
  constexpr int kSteps = 48;
  std::vector<double> grid(kSteps + 1);
  for (int g = 0; g <= kSteps; ++g) grid[static_cast<std::size_t>(g)] = density(lo + (hi - lo) * g / kSteps);
  // peaks: the highest density on each half of the segment; valley: the lowest between them
  const auto middle = grid.begin() + kSteps / 2;
  const auto left_peak = std::max_element(grid.begin(), middle + 1), right_peak = std::max_element(middle, grid.end());
  const double valley = *std::min_element(left_peak, right_peak + 1);
  return !(valley > max_valley * std::min(*left_peak, *right_peak));
}

}  // namespace

Populations find_populations(const Eigen::MatrixXd& reference, const PopulationOptions& o) {
  Populations none;
  if (!o.enabled || reference.rows() < static_cast<Eigen::Index>(2 * o.min_rows)) return none;
  // 1. robust standardisation, complete rows
  Populations s;
  std::vector<double> centres, scales;
  for (Eigen::Index l = 0; l < reference.cols(); ++l) {
    std::vector<double> v;
    for (Eigen::Index r = 0; r < reference.rows(); ++r)
      if (std::isfinite(reference(r, l))) v.push_back(reference(r, l));
    if (v.size() < 2 * o.min_rows) continue;
    const double m = median_in_place(v);
    for (double& x : v) x = std::fabs(x - m);
    const double mad = 1.4826 * median_in_place(v);
    if (!(mad > 0)) continue;
    s.layers.push_back(l), centres.push_back(m), scales.push_back(mad);
  }
  if (s.layers.empty()) return none;
  const auto p = static_cast<Eigen::Index>(s.layers.size());
  s.centre = Eigen::Map<Eigen::VectorXd>(centres.data(), p);
  s.scale = Eigen::Map<Eigen::VectorXd>(scales.data(), p);
  std::vector<Eigen::Index> rows;
  for (Eigen::Index r = 0; r < reference.rows(); ++r) {
    bool complete = true;
    for (Eigen::Index l : s.layers) complete = complete && std::isfinite(reference(r, l));
    if (complete) rows.push_back(r);
  }
  const auto n = static_cast<Eigen::Index>(rows.size());
  if (n < static_cast<Eigen::Index>(2 * o.min_rows)) return none;
  Eigen::MatrixXd z(n, p);
  for (Eigen::Index i = 0; i < n; ++i)
    for (Eigen::Index j = 0; j < p; ++j) z(i, j) = (reference(rows[static_cast<std::size_t>(i)], s.layers[static_cast<std::size_t>(j)]) - s.centre[j]) / s.scale[j];

  // k-means, k = 2
  std::vector<std::uint8_t> label;
  Eigen::RowVectorXd c[2];
  if (!two_means(z, label, c)) return none;

  // 2. sizes, then a valley along the line through the centres
  Eigen::Index count[2] = {0, 0};
  for (auto k : label) ++count[k];
  const double smaller = static_cast<double>(std::min(count[0], count[1]));
  if (smaller < static_cast<double>(o.min_rows) || smaller < o.min_share * static_cast<double>(n)) return none;
  const Eigen::RowVectorXd gap = c[1] - c[0];
  if (!(gap.norm() > 0)) return none;
  s.direction = (gap / gap.norm()).transpose();
  const Eigen::VectorXd along = z * s.direction;
  double sum[2] = {0, 0}, squares[2] = {0, 0};
  for (Eigen::Index i = 0; i < n; ++i) sum[label[static_cast<std::size_t>(i)]] += along[i];
  for (int k = 0; k < 2; ++k) s.mean[k] = sum[k] / static_cast<double>(count[k]);
  for (Eigen::Index i = 0; i < n; ++i) {
    const auto k = label[static_cast<std::size_t>(i)];
    squares[k] += (along[i] - s.mean[k]) * (along[i] - s.mean[k]);
  }
  for (int k = 0; k < 2; ++k) s.sd[k] = std::max(std::sqrt(squares[k] / static_cast<double>(count[k] - 1)), 1e-9);
  const double pooled = std::sqrt((squares[0] + squares[1]) / static_cast<double>(n - 2));
  if (!has_valley(along, s.mean, pooled, o.max_valley)) return none;

  // every row, reference or not, is placed by the same rule (step 3)
  s.split = true;
  s.larger = count[1] > count[0] ? 1 : 0;
  std::size_t placed[2] = {0, 0};
  for (Eigen::Index r = 0; r < reference.rows(); ++r) {
    s.of_reference.push_back(s.population_of(reference.row(r)));
    ++placed[s.of_reference.back()];
  }
  if (std::min(placed[0], placed[1]) < o.min_rows) return none;
  return s;
}

}  // namespace envsift
