// Mahalanobis distance with a chi-square cutoff.
// Sources: Mahalanobis, P.C. (1936) On the generalised distance in statistics. Proceedings of
// the National Institute of Sciences of India 2:49-55; cutoff as in Rousseeuw, P.J. & van
// Zomeren, B.C. (1990) Unmasking multivariate outliers and leverage points. Journal of the
// American Statistical Association 85:633-639.
//
//   D²_i = (x_i − μ)ᵀ Σ⁻¹ (x_i − μ),   flagged when D²_i > χ²_{k, q}   (default q = 0.975)
//
// Climate layers are strongly collinear and many taxa have few records, so Σ is often singular
// or nearly so. envsift measures D² in a reduced space (envsift's choice, documented in
// docs/methods.md): layers without spread are left out, the others standardised, and projected on the
// leading principal components of their correlation matrix, keeping a component only when its
// eigenvalue exceeds `eigen_floor` (1e-6) times the largest and keeping at most one component
// per `rows_per_dimension` (3) reference rows. The dimension k actually used is reported per
// record (`<test>_dims`) and is the χ² degrees of freedom. When every component is kept, D² is
// exactly the classical D² of the raw values (D² is invariant under invertible linear maps).
//
// Which layers drive D²: with e the record's standardised deviation from the centre and
// A = B Σ⁺ Bᵀ (B the component basis), D² = eᵀ A e = Σ_j e_j (A e)_j.
//
// Uncertainty discs: a record may lie anywhere in its disc's [min, max] on each layer; the test
// judges the combination in that box with the smallest D² (a convex quadratic minimised over a
// box). This is lenient — the combination need not occur in any single cell of the disc — by
// design: like the one-layer tests, a record is called an outlier only when nothing within its
// uncertainty fits. A term can be negative
// when correlation pulls the other way, so the reported share of layer j is its positive part
// over the sum of the positive parts: max(0, e_j (A e)_j) / Σ_i max(0, e_i (A e)_i).
//
// Its probability. With the sample mean and covariance of n rows that include the record, D²
// is bounded by (n − 1)²/n and exactly
//   n D² / (n − 1)²  ~  Beta(k/2, (n − k − 1)/2)
// for multivariate normal rows (Gnanadesikan, R. & Kettenring, J.R. (1972) Robust estimates,
// residuals, and outlier detection with multiresponse data. Biometrics 28:81-124, after Wilks
// 1962), which the χ² limit overstates at small n: a taxon of 20 places has D² < 18.05 in 2
// dimensions whatever its values. A record beyond the bound (one left out of the estimate, a
// record decided `error`) gets probability 0. The principal-component reduction uses the
// same rows, so the form is approximate when it keeps fewer components than layers.
//
// The scatter is inverted over its directions of non-negligible variance only (pseudo-inverse,
// same floor). A robust scatter is flat along a direction when more than half the reference rows
// share one value there (an exact fit, e.g. a layer of a few classes); that direction is left
// out and the reported dimension, which is also the χ² degrees of freedom, drops by one.
#include "envsift/detect/mahalanobis.hpp"

#include <algorithm>
#include <cmath>
#include <cstdio>

#include <Eigen/Eigenvalues>

#include "envsift/detect/chi_square.hpp"
#include "envsift/detect/robust_z.hpp"
#include "envsift/detect/numerics.hpp"
#include "envsift/detect/skew_scale.hpp"
#include "envsift/detect/tail_probability.hpp"

namespace envsift {

ReducedSpace reduce(const Eigen::MatrixXd& complete, const MahalanobisOptions& o) {
  ReducedSpace space;
  const Eigen::Index m = complete.rows();
  if (m < 2) return space;
  const Eigen::VectorXd mean = complete.colwise().mean().transpose();
  const Eigen::VectorXd sd =
      ((complete.rowwise() - mean.transpose()).array().square().colwise().sum() / static_cast<double>(m - 1))
          .sqrt()
          .transpose();
  for (Eigen::Index j = 0; j < complete.cols(); ++j)
    if (sd[j] > 1e-12 * std::max(1.0, std::fabs(mean[j]))) space.layers.push_back(static_cast<std::size_t>(j));
  const auto p = static_cast<Eigen::Index>(space.layers.size());
  if (p == 0) return space;
  space.mean.resize(p);
  space.scale.resize(p);
  Eigen::MatrixXd z(m, p);
  for (Eigen::Index j = 0; j < p; ++j) {
    const auto layer = static_cast<Eigen::Index>(space.layers[static_cast<std::size_t>(j)]);
    space.mean[j] = mean[layer];
    space.scale[j] = sd[layer];
    z.col(j) = (complete.col(layer).array() - mean[layer]) / sd[layer];
  }
  const Eigen::MatrixXd correlation = (z.transpose() * z) / static_cast<double>(m - 1);
  Eigen::SelfAdjointEigenSolver<Eigen::MatrixXd> eig(correlation);
  const Eigen::VectorXd& lambda = eig.eigenvalues();  // ascending
  const double largest = lambda[p - 1];
  Eigen::Index keep = 0;
  while (keep < p && lambda[p - 1 - keep] > o.eigen_floor * largest) ++keep;
  keep = std::min<Eigen::Index>(keep, m / static_cast<Eigen::Index>(o.rows_per_dimension));
  space.basis.resize(p, keep);
  for (Eigen::Index c = 0; c < keep; ++c) {
    space.basis.col(c) = fixed_sign(eig.eigenvectors().col(p - 1 - c));
  }
  return space;
}

double Mahalanobis::tail(double d2, std::size_t dims, std::size_t rows) const {
  const double n = static_cast<double>(rows), k = static_cast<double>(dims);
  if (n - k - 1 <= 0) return chi_square_upper_tail(k, d2);
  return beta_upper_tail(k / 2, (n - k - 1) / 2, n * d2 / ((n - 1) * (n - 1)));
}

Estimate Mahalanobis::estimate(const Eigen::MatrixXd& scores, const Eigen::MatrixXd&, const Eigen::MatrixXd&,
                               std::uint64_t) const {
  Estimate e;
  e.center = scores.colwise().mean().transpose();
  const Eigen::MatrixXd centred = scores.rowwise() - e.center.transpose();
  e.scatter = (centred.transpose() * centred) / static_cast<double>(scores.rows() - 1);
  return e;
}

namespace {

// A robust scatter is flat along a direction when more than half the reference rows share one
// value there (an "exact fit", e.g. a layer of few classes): its pseudo-inverse (numerics.hpp)
// leaves that direction out, like a layer without spread.

// The e in the box [lo, hi] with the smallest eᵀ A e (A positive semi-definite), by cyclic
// coordinate descent from `start`: each step minimises exactly along one coordinate and clamps to
// its bounds, which converges for a convex quadratic on a box.
Eigen::VectorXd closest_in_box(const Eigen::MatrixXd& a, const Eigen::VectorXd& lo, const Eigen::VectorXd& hi,
                               Eigen::VectorXd e) {
  for (int sweep = 0; sweep < 200; ++sweep) {
    double moved = 0;
    for (Eigen::Index j = 0; j < e.size(); ++j) {
      if (!(a(j, j) > 1e-12)) continue;
      const double rest = a.row(j).dot(e) - a(j, j) * e[j];
      const double best = std::clamp(-rest / a(j, j), lo[j], hi[j]);
      moved = std::max(moved, std::fabs(best - e[j]));
      e[j] = best;
    }
    if (moved < 1e-12) break;
  }
  return e;
}

std::string describe(const std::string& test, double d2, double cutoff, std::size_t k,
                     std::vector<std::pair<double, std::string>> shares) {
  std::stable_sort(shares.begin(), shares.end(), [](const auto& a, const auto& b) { return a.first > b.first; });
  char buf[160];
  std::snprintf(buf, sizeof buf, "%s D² %.1f %s %.1f (%zu dim%s):", test == "mahalanobis" ? "Mahalanobis" : "robust Mahalanobis",
                d2, d2 > cutoff ? ">" : "≤", cutoff, k, k == 1 ? "" : "s");
  std::string s = buf;
  std::size_t listed = 0;
  for (const auto& [share, layer] : shares) {
    if (listed == 4 || (listed > 0 && share < 0.05)) break;
    std::snprintf(buf, sizeof buf, "%s %s %.0f%%", listed ? "," : "", layer.c_str(), 100 * share);
    s += buf;
    ++listed;
  }
  return s + " of D²";
}

}  // namespace

// The skew-adjusted scale (see MahalanobisOptions): every value v of layer l becomes
// (v − median_l) / scale_l(side of v), from the layer's reference values. Monotone per layer, so
// a disc's [min, max] maps onto the transformed disc.
std::vector<Finding> Mahalanobis::judge(const TaxonValues& taxon) const {
  if (!options_.skew_adjusted) return judge_values(taxon);
  Eigen::MatrixXd reference = taxon.reference, records = taxon.records, lower, upper;
  if (taxon.lower) lower = *taxon.lower, upper = *taxon.upper;
  for (Eigen::Index l = 0; l < reference.cols(); ++l) {
    std::vector<double> column(reference.col(l).data(), reference.col(l).data() + reference.rows());
    const RobustSpread spread = robust_spread(column);
    if (!(spread.spread > 0)) continue;  // no spread: reduce() leaves the layer out anyway
    const double floor = resolution(column);
    SideScales scale = side_scales(std::move(column), spread.spread);
    scale.below = std::max(scale.below, floor), scale.above = std::max(scale.above, floor);
    auto transform = [&](Eigen::MatrixXd& m) {
      for (Eigen::Index r = 0; r < m.rows(); ++r) m(r, l) = scale.z(m(r, l));
    };
    transform(reference);
    transform(records);
    if (taxon.lower) transform(lower), transform(upper);
  }
  const TaxonValues adjusted{reference, records, taxon.layer_names, taxon.seed, taxon.lower ? &lower : nullptr,
                             taxon.upper ? &upper : nullptr};
  return judge_values(adjusted);
}

// A row in standardised units of the space's layers; `row(l)` gives the value on layer l.
template <class Row>
Eigen::VectorXd standardise(const ReducedSpace& space, Row&& row) {
  const auto used = static_cast<Eigen::Index>(space.layers.size());
  Eigen::VectorXd z(used);
  for (Eigen::Index j = 0; j < used; ++j) {
    const Eigen::Index layer = static_cast<Eigen::Index>(space.layers[static_cast<std::size_t>(j)]);
    z[j] = (row(layer) - space.mean[j]) / space.scale[j];
  }
  return z;
}

// The taxon's fitted space as every record is judged in it.
struct Mahalanobis::FittedSpace {
  const ReducedSpace& space;
  const std::vector<Eigen::Index>& layers;  // the taxon's layers (space.layers index into them)
  const Eigen::MatrixXd& precision;         // A, in standardised layer units
  const Eigen::VectorXd& centre;            // Bc, in standardised layer units
  std::size_t dims;
  double cutoff;
  std::size_t rows;  // reference rows the estimate came from
};

Finding Mahalanobis::judge_record(const TaxonValues& taxon, Eigen::Index row, const FittedSpace& m) const {
  Finding f;
  bool complete_record = true;
  for (std::size_t j : m.space.layers)
    complete_record = complete_record && std::isfinite(taxon.records(row, m.layers[j]));
  if (!complete_record) {
    f.untested_code = "missing_value:" + name();
    return f;
  }
  // Deviation from the centre in standardised layer units; D² = eᵀ A e.
  const Eigen::VectorXd z = standardise(m.space, [&](Eigen::Index l) { return taxon.records(row, m.layers[static_cast<std::size_t>(l)]); });
  const auto used = static_cast<Eigen::Index>(m.space.layers.size());
  Eigen::VectorXd e = z - m.centre;
  Eigen::VectorXd lo = e, hi = e;
  for (Eigen::Index j = 0; j < used; ++j) {
    const Eigen::Index l = m.layers[m.space.layers[static_cast<std::size_t>(j)]];
    const auto [a, b] = taxon.range(row, l);
    lo[j] = (a - m.space.mean[j]) / m.space.scale[j] - m.centre[j];
    hi[j] = (b - m.space.mean[j]) / m.space.scale[j] - m.centre[j];
  }
  const bool disc = (hi - lo).maxCoeff() > 0;
  if (disc) e = closest_in_box(m.precision, lo, hi, e);
  const Eigen::VectorXd ae = m.precision * e;
  const double d2 = std::max(0.0, e.dot(ae));
  f.tested = true;
  f.statistic = d2;
  f.threshold = m.cutoff;
  f.severity = std::sqrt(d2 / m.cutoff);  // a distance ratio, comparable with |z| / cutoff
  f.flagged = d2 > m.cutoff;
  f.probability = tail(d2, m.dims, m.rows);
  f.extras = {static_cast<double>(m.dims)};
  if (f.flagged || f.probability <= kWorthWords) {
    std::vector<std::pair<double, std::string>> shares;
    double positive = 0;
    for (Eigen::Index j = 0; j < used; ++j) positive += std::max(0.0, e[j] * ae[j]);
    for (Eigen::Index j = 0; j < used; ++j)
      shares.emplace_back(positive > 0 ? std::max(0.0, e[j] * ae[j]) / positive : 0.0,
                          taxon.layer_names[static_cast<std::size_t>(m.layers[m.space.layers[static_cast<std::size_t>(j)]])]);
    f.reasons.push_back(describe(name(), d2, m.cutoff, m.dims, std::move(shares)) +
                        (disc ? ", for the combination within its uncertainty disc closest to the taxon" : ""));
  }
  return f;
}

std::vector<Finding> Mahalanobis::judge_values(const TaxonValues& taxon) const {
  const auto rows = static_cast<std::size_t>(taxon.records.rows());
  const Eigen::Index p = taxon.records.cols();
  // Layers with enough reference values, then the reference rows complete on those layers.
  std::vector<Eigen::Index> layers;
  for (Eigen::Index j = 0; j < p; ++j)
    if (static_cast<std::size_t>(taxon.reference.col(j).array().isFinite().count()) >= options_.min_records)
      layers.push_back(j);
  std::vector<Eigen::Index> complete_rows;
  for (Eigen::Index r = 0; r < taxon.reference.rows(); ++r) {
    bool ok = !layers.empty();
    for (Eigen::Index j : layers) ok = ok && std::isfinite(taxon.reference(r, j));
    if (ok) complete_rows.push_back(r);
  }
  const std::string too_few = "too_few_records:" + name();
  if (complete_rows.size() < options_.min_records) return untested(rows, too_few);
  Eigen::MatrixXd complete(static_cast<Eigen::Index>(complete_rows.size()), static_cast<Eigen::Index>(layers.size()));
  for (std::size_t r = 0; r < complete_rows.size(); ++r)
    for (std::size_t j = 0; j < layers.size(); ++j)
      complete(static_cast<Eigen::Index>(r), static_cast<Eigen::Index>(j)) = taxon.reference(complete_rows[r], layers[j]);

  const ReducedSpace space = reduce(complete, options_);
  const std::size_t k = space.dimensions();
  if (k == 0) return untested(rows, space.layers.empty() ? "no_spread:" + name() : too_few);
  const auto used = static_cast<Eigen::Index>(space.layers.size());
  Eigen::MatrixXd standardised(complete.rows(), used);
  for (Eigen::Index r = 0; r < complete.rows(); ++r)
    standardised.row(r) = standardise(space, [&](Eigen::Index l) { return complete(r, l); }).transpose();
  const Eigen::MatrixXd scores = standardised * space.basis;

  const Estimate est = estimate(scores, standardised, space.basis, taxon.seed);
  const Precision precision = pseudo_inverse(est.scatter, options_.eigen_floor);
  if (precision.rank == 0) return untested(rows, "no_spread:" + name());
  const Eigen::MatrixXd layer_precision = space.basis * precision.matrix * space.basis.transpose();
  const Eigen::VectorXd centre = space.basis * est.center;  // in standardised layer units
  // D²(z) = (Bᵀz − c)ᵀ Σ⁺ (Bᵀz − c) = (z − Bc)ᵀ A (z − Bc), since Bᵀ B = I.
  const std::size_t dims = precision.rank;
  const double cutoff = chi_square_quantile(static_cast<double>(dims), options_.quantile);

  const FittedSpace fitted{space, layers, layer_precision, centre, dims, cutoff, complete_rows.size()};
  std::vector<Finding> findings(rows);
  for (std::size_t i = 0; i < rows; ++i) findings[i] = judge_record(taxon, static_cast<Eigen::Index>(i), fitted);
  return findings;
}

}  // namespace envsift
