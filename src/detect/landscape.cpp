// The landscape test: presence against availability.
// Sources: Warton, D.I. & Shepherd, L.C. (2010) Poisson point process models solve the
// "pseudo-absence problem" for presence-only data in ecology. Annals of Applied Statistics
// 4:1383-1402; Sugiyama, M., Suzuki, T. & Kanamori, T. (2012) Density Ratio Estimation in Machine
// Learning. Cambridge University Press (density ratios by probabilistic classification, ch. 4).
// Both from memory.
//
// A taxon's records are drawn from f(x) ∝ s(x)·a(x): its suitability s times the availability a
// of environment x in the area it can reach. A relocated record is drawn from a(x) alone, so the
// ratio a(x)/f(x) ∝ 1/s(x) is the natural suspicion: with a share π of errors, a record is more
// likely an error than not when a/f > (1 − π)/π. The cutoff (default 5, chosen by envsift
// evaluate) is that ratio.
//
// Estimator: logistic regression of the taxon's places (y = 1, n rows) against cells of its
// landscape (y = 0, m rows; landscape_sample.hpp), with linear and quadratic terms. Its logit
// η(x) estimates log(n f(x) / (m a(x))) (case-control sampling; Warton & Shepherd show it is the
// point-process model as m grows), so
//     a(x)/f(x) = (n/m) · exp(−η(x)).
// A quadratic logit is the Gaussian niche of the classic response-curve view, and unlike a kernel
// density ratio it does not break down in a dozen collinear dimensions. The design, so it holds
// on real layers:
//   - scale: each layer is standardised by its landscape mean and SD (--scale mad), or, for
//     skewed layers (--scale skew), mapped to the normal scores of its landscape values (Φ⁻¹ of
//     the mid-rank ECDF, linear between the landscape's values and beyond them with the average
//     slope), so that it is roughly normal over the landscape and the quadratic sees a long tail
//     as a long tail. The linear scale is the default because it measured better (docs/evaluation.md,
//     envsift evaluate): a response quadratic in the layer's own units is then exact;
//   - collinear layers: the mapped layers are projected on the principal components of the
//     landscape (99 % of its variance, at most 6 components), whitened;
//   - small taxa: at most one coefficient per 5 places — the full quadratic (with products) when
//     affordable, else squares only, else fewer components; a ridge penalty (1 on the whitened
//     scale) keeps separated data finite; fewer than 20 places are not judged;
//   - a unimodal response: the quadratic part is made negative definite (the Gaussian response
//     of ter Braak & Looman 1986, Vegetatio 65:3-11, from memory), so that environments beyond
//     the landscape, where no cell says how available they are, are not called ever more suitable;
//   - the records themselves: a first fit, then a refit without the places it flags (as the
//     MCD's reweighting), so that errors do not widen the niche they are judged against;
//   - uncertainty discs: the value inside the disc that fits the taxon best (coordinate ascent of
//     η over the disc's box), as the other tests do.
// A record is flagged only when, besides the ratio, at most 2 % of the taxon's places lie in
// environments at least as unsuited to it: a taxon sampled unevenly (collectors favouring the
// uplands) under-uses a common environment without any of its records there being wrong, and
// flagging a tenth of its places would say nothing a reviewer can act on. The severity, and so
// the rank, is the ratio's either way.
// The reason gives the evidence in counts: the share of the landscape at least as unsuited to the
// taxon (η at most the record's) and how many of the taxon's places lie there.
#include "envsift/detect/landscape.hpp"

#include <algorithm>
#include <cmath>
#include <cstdio>
#include <numeric>

#include <Eigen/Cholesky>
#include <Eigen/Eigenvalues>
#include <boost/math/distributions/normal.hpp>

#include "envsift/detect/test_registry.hpp"
#include "envsift/errors.hpp"

namespace envsift {
namespace {

// One layer's map onto a common scale: piecewise linear through (value, score) points, beyond
// them with `slope`.
struct LayerScale {
  std::vector<double> value, score;  // distinct landscape values, ascending, and their scores
  double slope = 0;                  // beyond the ends
  double operator()(double x) const {
    if (x <= value.front()) return score.front() + (x - value.front()) * slope;
    if (x >= value.back()) return score.back() + (x - value.back()) * slope;
    const auto k = static_cast<std::size_t>(std::upper_bound(value.begin(), value.end(), x) - value.begin());
    const double t = (x - value[k - 1]) / (value[k] - value[k - 1]);
    return score[k - 1] + t * (score[k] - score[k - 1]);
  }
};

// Standardised by the landscape's mean and standard deviation.
LayerScale linear_scale(const std::vector<double>& v) {
  double mean = 0, sq = 0;
  for (double x : v) mean += x;
  mean /= static_cast<double>(v.size());
  for (double x : v) sq += (x - mean) * (x - mean);
  const double sd = std::sqrt(sq / static_cast<double>(v.size() - 1));
  const auto [lo, hi] = std::minmax_element(v.begin(), v.end());
  LayerScale s;
  s.value = {*lo, *hi};
  s.score = {(*lo - mean) / sd, (*hi - mean) / sd};
  s.slope = 1 / sd;
  return s;
}

// The normal scores of the landscape's values: Φ⁻¹ of the mid-rank ECDF.
LayerScale normal_scores(std::vector<double> v) {
  std::sort(v.begin(), v.end());
  const boost::math::normal normal;
  LayerScale s;
  const double m = static_cast<double>(v.size());
  for (std::size_t i = 0; i < v.size();) {
    std::size_t j = i;
    while (j < v.size() && v[j] == v[i]) ++j;
    const double mid_rank = (static_cast<double>(i) + static_cast<double>(j) + 1) / 2;  // 1-based
    s.value.push_back(v[i]);
    s.score.push_back(boost::math::quantile(normal, (mid_rank - 0.5) / m));
    i = j;
  }
  if (s.value.size() > 1) s.slope = (s.score.back() - s.score.front()) / (s.value.back() - s.value.front());
  return s;
}

// The quadratic features of whitened scores: 1, s_j, s_j², and s_j s_k (j < k) when `products`.
Eigen::VectorXd features(const Eigen::VectorXd& s, bool products) {
  const Eigen::Index d = s.size();
  Eigen::VectorXd f(1 + 2 * d + (products ? d * (d - 1) / 2 : 0));
  Eigen::Index k = 0;
  f[k++] = 1;
  for (Eigen::Index j = 0; j < d; ++j) f[k++] = s[j];
  for (Eigen::Index j = 0; j < d; ++j) f[k++] = s[j] * s[j];
  if (products)
    for (Eigen::Index j = 0; j < d; ++j)
      for (Eigen::Index l = j + 1; l < d; ++l) f[k++] = s[j] * s[l];
  return f;
}

std::size_t feature_count(std::size_t d, bool products) { return 1 + 2 * d + (products ? d * (d - 1) / 2 : 0); }

double log1p_exp(double x) { return x > 0 ? x + std::log1p(std::exp(-x)) : std::log1p(std::exp(x)); }

// Ridge logistic regression by Newton's method with step halving: maximises
// Σ w_i [y_i η_i − log(1 + e^η_i)] − ridge/2 · Σ_{j≥1} β_j².
Eigen::VectorXd fit_logistic(const Eigen::MatrixXd& x, const Eigen::VectorXd& y, const Eigen::VectorXd& w, double ridge,
                             double intercept, const Eigen::VectorXd& offset) {
  const Eigen::Index p = x.cols();
  Eigen::VectorXd beta = Eigen::VectorXd::Zero(p);
  beta[0] = intercept;
  Eigen::VectorXd penalty = Eigen::VectorXd::Constant(p, ridge);
  penalty[0] = 0;
  auto objective = [&](const Eigen::VectorXd& b) {
    const Eigen::VectorXd eta = x * b + offset;
    double sum = 0;
    for (Eigen::Index i = 0; i < eta.size(); ++i) sum += w[i] * (y[i] * eta[i] - log1p_exp(eta[i]));
    return sum - 0.5 * (penalty.array() * b.array().square()).sum();
  };
  double current = objective(beta);
  for (int iteration = 0; iteration < 100; ++iteration) {
    const Eigen::VectorXd eta = x * beta + offset;
    Eigen::VectorXd prob(eta.size()), weight(eta.size());
    for (Eigen::Index i = 0; i < eta.size(); ++i) {
      prob[i] = 1 / (1 + std::exp(-eta[i]));
      weight[i] = w[i] * prob[i] * (1 - prob[i]);
    }
    const Eigen::VectorXd gradient = x.transpose() * (w.array() * (y - prob).array()).matrix() - penalty.cwiseProduct(beta);
    Eigen::MatrixXd hessian = x.transpose() * weight.asDiagonal() * x;
    hessian.diagonal() += penalty;
    hessian.diagonal().array() += 1e-10;
    const Eigen::VectorXd step = hessian.ldlt().solve(gradient);
    double scale = 1, next = current;
    Eigen::VectorXd candidate = beta;
    for (int halving = 0; halving < 30; ++halving, scale /= 2) {
      candidate = beta + scale * step;
      next = objective(candidate);
      if (next >= current) break;
    }
    if (!(next >= current)) break;
    const double moved = (candidate - beta).cwiseAbs().maxCoeff();
    beta = candidate;
    current = next;
    if (moved < 1e-9) break;
  }
  return beta;
}

// A unimodal response: the quadratic part's matrix Q (η = β₀ + bᵀs + sᵀQs) made negative
// definite, every eigenvalue at most −curvature, and the intercept and linear terms refitted with
// the quadratic part fixed. Without it, a taxon at the edge of its landscape (the highest
// ground) gets a convex η that calls environments beyond the landscape ever more suitable.
Eigen::VectorXd unimodal(const Eigen::MatrixXd& design, const Eigen::VectorXd& y, const Eigen::VectorXd& w,
                         Eigen::VectorXd beta, Eigen::Index d, bool products, double ridge, double curvature) {
  Eigen::MatrixXd q(d, d);
  Eigen::Index k = 1 + 2 * d;
  for (Eigen::Index j = 0; j < d; ++j) {
    q(j, j) = beta[1 + d + j];
    for (Eigen::Index l = j + 1; l < d; ++l) q(j, l) = q(l, j) = products ? beta[k++] / 2 : 0;
  }
  Eigen::SelfAdjointEigenSolver<Eigen::MatrixXd> eig(q);
  if (eig.eigenvalues().maxCoeff() <= -curvature) return beta;
  const Eigen::VectorXd clamped = eig.eigenvalues().cwiseMin(-curvature);
  q = eig.eigenvectors() * clamped.asDiagonal() * eig.eigenvectors().transpose();
  k = 1 + 2 * d;
  for (Eigen::Index j = 0; j < d; ++j) {
    beta[1 + d + j] = q(j, j);
    for (Eigen::Index l = j + 1; l < d && products; ++l) beta[k++] = 2 * q(j, l);
  }
  const Eigen::Index fixed = design.cols() - 1 - d;
  const Eigen::VectorXd offset = design.rightCols(fixed) * beta.tail(fixed);
  const Eigen::VectorXd head = fit_logistic(design.leftCols(1 + d), y, w, ridge, beta[0], offset);
  beta.head(1 + d) = head;
  return beta;
}

std::string percent(double share) {
  char buf[32];
  if (share >= 0.1) std::snprintf(buf, sizeof buf, "%.0f%%", 100 * share);
  else if (share >= 0.001) std::snprintf(buf, sizeof buf, "%.1f%%", 100 * share);
  else std::snprintf(buf, sizeof buf, "%.2f%%", 100 * share);
  return buf;
}

std::string times(double ratio) {
  char buf[48];
  if (ratio < 1000) std::snprintf(buf, sizeof buf, "%.0f", ratio);
  else if (ratio < 1e6) std::snprintf(buf, sizeof buf, "%.0f thousand", ratio / 1000);
  else std::snprintf(buf, sizeof buf, "more than a million");
  return buf;
}

}  // namespace

std::vector<Finding> LandscapeTest::judge(const TaxonValues& taxon) const {
  const auto rows = static_cast<std::size_t>(taxon.records.rows());
  const std::string me = name();
  if (!taxon.landscape || taxon.landscape->values.rows() == 0) return untested(rows, "no_landscape:" + me);
  const Eigen::MatrixXd& land = taxon.landscape->values;
  const Eigen::Index L = taxon.records.cols();

  // Layers: enough of the taxon's values, and a spread over the landscape.
  std::vector<Eigen::Index> layers;
  bool enough_values = false;
  for (Eigen::Index l = 0; l < L; ++l) {
    if (static_cast<std::size_t>(taxon.reference.col(l).array().isFinite().count()) < options_.min_records) continue;
    enough_values = true;
    const Eigen::ArrayXd c = land.col(l).array();
    const auto finite = c.isFinite();
    if (static_cast<std::size_t>(finite.count()) < options_.min_cells) continue;
    const double lo = finite.select(c, INFINITY).minCoeff(), hi = finite.select(c, -INFINITY).maxCoeff();
    if (hi > lo) layers.push_back(l);
  }
  auto complete = [&](const Eigen::MatrixXd& m, Eigen::Index r) {
    for (Eigen::Index l : layers)
      if (!std::isfinite(m(r, l))) return false;
    return !layers.empty();
  };
  if (!enough_values) return untested(rows, "too_few_records:" + me);
  std::vector<Eigen::Index> cells, places;
  for (Eigen::Index r = 0; r < land.rows(); ++r)
    if (complete(land, r)) cells.push_back(r);
  for (Eigen::Index r = 0; r < taxon.reference.rows(); ++r)
    if (complete(taxon.reference, r)) places.push_back(r);
  if (cells.size() < options_.min_cells) return untested(rows, "no_landscape:" + me);
  if (places.size() < options_.min_records) return untested(rows, "too_few_records:" + me);
  const auto q = static_cast<Eigen::Index>(layers.size());

  // Each layer on the landscape's scale, then the landscape's whitened principal components.
  std::vector<LayerScale> maps;
  for (Eigen::Index l : layers) {
    std::vector<double> v;
    for (Eigen::Index r : cells) v.push_back(land(r, l));
    maps.push_back(options_.normal_scores ? normal_scores(std::move(v)) : linear_scale(v));
  }
  auto mapped = [&](auto&& value_of) {
    Eigen::VectorXd z(q);
    for (Eigen::Index j = 0; j < q; ++j) z[j] = maps[static_cast<std::size_t>(j)](value_of(layers[static_cast<std::size_t>(j)]));
    return z;
  };
  const auto m = static_cast<Eigen::Index>(cells.size()), n = static_cast<Eigen::Index>(places.size());
  Eigen::MatrixXd zl(m, q), zp(n, q);
  for (Eigen::Index i = 0; i < m; ++i) zl.row(i) = mapped([&](Eigen::Index l) { return land(cells[static_cast<std::size_t>(i)], l); });
  for (Eigen::Index i = 0; i < n; ++i)
    zp.row(i) = mapped([&](Eigen::Index l) { return taxon.reference(places[static_cast<std::size_t>(i)], l); });
  const Eigen::RowVectorXd centre = zl.colwise().mean();
  const Eigen::MatrixXd centred = zl.rowwise() - centre;
  Eigen::SelfAdjointEigenSolver<Eigen::MatrixXd> eig((centred.transpose() * centred) / static_cast<double>(m - 1));
  const Eigen::VectorXd& lambda = eig.eigenvalues();  // ascending
  const double total = lambda.sum(), largest = lambda[q - 1];
  std::size_t available = 0;
  for (double covered = 0; available < static_cast<std::size_t>(q) && covered < 0.99 * total;) {
    const double next = lambda[q - 1 - static_cast<Eigen::Index>(available)];
    if (!(next > 1e-9 * largest)) break;
    covered += next;
    ++available;
  }
  available = std::min(available, options_.max_dimensions);
  // The largest dimension the places can afford (one coefficient per 5), products if affordable.
  const std::size_t budget = places.size() / 5;
  std::size_t d = 0;
  bool products = false;
  for (std::size_t k = available; k >= 1 && d == 0; --k) {
    if (feature_count(k, true) <= budget) d = k, products = true;
    else if (feature_count(k, false) <= budget) d = k;
  }
  if (d == 0) return untested(rows, "too_few_records:" + me);
  Eigen::MatrixXd whiten(q, static_cast<Eigen::Index>(d));
  for (std::size_t c = 0; c < d; ++c) {
    const Eigen::Index at = q - 1 - static_cast<Eigen::Index>(c);
    Eigen::VectorXd v = eig.eigenvectors().col(at);
    Eigen::Index big;
    v.cwiseAbs().maxCoeff(&big);
    if (v[big] < 0) v = -v;  // a fixed sign, whatever the solver returns
    whiten.col(static_cast<Eigen::Index>(c)) = v / std::sqrt(lambda[at]);
  }
  auto eta_of = [&](const Eigen::VectorXd& beta, const Eigen::VectorXd& z) {
    return features(whiten.transpose() * (z - centre.transpose()), products).dot(beta);
  };

  // Fit, then refit without the places the first fit flags.
  const Eigen::Index p = static_cast<Eigen::Index>(feature_count(d, products));
  Eigen::MatrixXd design(n + m, p);
  Eigen::VectorXd y(n + m), w = Eigen::VectorXd::Ones(n + m);
  for (Eigen::Index i = 0; i < n; ++i) design.row(i) = features(whiten.transpose() * (zp.row(i) - centre).transpose(), products), y[i] = 1;
  for (Eigen::Index i = 0; i < m; ++i) design.row(n + i) = features(whiten.transpose() * (zl.row(i) - centre).transpose(), products), y[n + i] = 0;
  const double log_cutoff = std::log(options_.ratio_cutoff);
  const Eigen::VectorXd no_offset = Eigen::VectorXd::Zero(n + m);
  auto fit = [&](double intercept) {
    const Eigen::VectorXd b = fit_logistic(design, y, w, options_.ridge, intercept, no_offset);
    return unimodal(design, y, w, b, static_cast<Eigen::Index>(d), products, options_.ridge, options_.curvature);
  };
  Eigen::VectorXd beta = fit(std::log(static_cast<double>(n) / static_cast<double>(m)));
  double used = static_cast<double>(n);
  {
    const Eigen::VectorXd eta = design.topRows(n) * beta;
    for (Eigen::Index i = 0; i < n; ++i)
      if (std::log(used / static_cast<double>(m)) - eta[i] > log_cutoff) w[i] = 0;
    const double kept = w.head(n).sum();
    if (kept < static_cast<double>(n) && kept >= static_cast<double>(options_.min_records)) {
      used = kept;
      beta = fit(std::log(used / static_cast<double>(m)));
    }
  }
  const double log_n_over_m = std::log(used / static_cast<double>(m));
  std::vector<double> eta_land(static_cast<std::size_t>(m)), eta_places(static_cast<std::size_t>(n));
  for (Eigen::Index i = 0; i < m; ++i) eta_land[static_cast<std::size_t>(i)] = design.row(n + i).dot(beta);
  for (Eigen::Index i = 0; i < n; ++i) eta_places[static_cast<std::size_t>(i)] = design.row(i).dot(beta);
  std::sort(eta_land.begin(), eta_land.end());
  std::sort(eta_places.begin(), eta_places.end());

  std::vector<Finding> findings(rows);
  for (std::size_t i = 0; i < rows; ++i) {
    Finding& f = findings[i];
    const auto r = static_cast<Eigen::Index>(i);
    if (!complete(taxon.records, r)) {
      f.untested_code = "missing_value:" + me;
      continue;
    }
    Eigen::VectorXd z = mapped([&](Eigen::Index l) { return taxon.records(r, l); });
    double eta = eta_of(beta, z);
    // Within the disc: coordinate ascent of η over the box of mapped values (η is quadratic along
    // each coordinate, so each step is exact: the vertex if concave and inside, else an end).
    Eigen::VectorXd lo = z, hi = z;
    for (Eigen::Index j = 0; j < q; ++j) {
      const auto [a, b] = taxon.range(r, layers[static_cast<std::size_t>(j)]);
      lo[j] = maps[static_cast<std::size_t>(j)](a), hi[j] = maps[static_cast<std::size_t>(j)](b);
    }
    const bool disc = (hi - lo).maxCoeff() > 0;
    for (int sweep = 0; disc && sweep < 20; ++sweep) {
      double gained = 0;
      for (Eigen::Index j = 0; j < q; ++j) {
        if (!(hi[j] > lo[j])) continue;
        auto at = [&](double v) {
          Eigen::VectorXd t = z;
          t[j] = v;
          return eta_of(beta, t);
        };
        const double e0 = at(z[j]), ep = at(z[j] + 1), em = at(z[j] - 1);
        const double curvature = (ep + em) / 2 - e0, slope = (ep - em) / 2;
        std::vector<double> tries{lo[j], hi[j]};
        if (curvature < 0) tries.push_back(std::clamp(z[j] - slope / (2 * curvature), lo[j], hi[j]));
        double best = z[j], best_eta = e0;
        for (double v : tries)
          if (const double e = at(v); e > best_eta) best = v, best_eta = e;
        gained += best_eta - e0;
        z[j] = best;
        eta = best_eta;
      }
      if (gained < 1e-10) break;
    }
    const double log_ratio = std::min(log_n_over_m - eta, 700.0);
    // "At most the record's η", ties included: a cell or place in the record's own environment
    // (often its own cell) gets η by another sum of the same terms, equal up to rounding, and the
    // rounding was seen to differ between machines; a tolerance far above rounding and far below
    // any real difference makes the count the same everywhere.
    const double at_most = eta + 1e-9 * std::max(1.0, std::fabs(eta));
    const double area_share =
        static_cast<double>(std::upper_bound(eta_land.begin(), eta_land.end(), at_most) - eta_land.begin()) / static_cast<double>(m);
    const auto places_there =
        static_cast<std::size_t>(std::upper_bound(eta_places.begin(), eta_places.end(), at_most) - eta_places.begin());
    f.tested = true;
    f.statistic = std::exp(log_ratio);
    f.threshold = options_.ratio_cutoff;
    f.severity = log_ratio > 0 ? std::sqrt(log_ratio / log_cutoff) : 0.0;  // on the D² scale, like Mahalanobis
    const double place_share = static_cast<double>(places_there) / static_cast<double>(places.size());
    f.flagged = log_ratio > log_cutoff && place_share <= options_.max_place_share;
    f.extras = {area_share};
    if (f.flagged) {
      char buf[400];
      std::snprintf(buf, sizeof buf,
                    "landscape: this environment is %s times more common %s than among the taxon's records: "
                    "environments as unsuited to it cover %s of that landscape and hold %zu of its %zu places (%s)%s",
                    times(f.statistic).c_str(), taxon.landscape->area.c_str(), percent(area_share).c_str(), places_there,
                    places.size(), percent(static_cast<double>(places_there) / static_cast<double>(places.size())).c_str(),
                    disc ? ", for the value within its uncertainty disc that fits the taxon best" : "");
      f.reasons.push_back(buf);
    }
  }
  return findings;
}

}  // namespace envsift
