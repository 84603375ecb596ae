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
// Its probability: the share of the taxon's fitted distribution f lying in environments at most
// as suited as the record's (η at most the record's). f ∝ a · exp(η), so the landscape cells,
// drawn from a, weighted by exp(η) are a sample of f (importance weights), and with the record
// itself counted once, as a conformal p-value counts its test point (Vovk, Gammerman & Shafer
// 2005, Algorithmic Learning in a Random World, Springer, from memory),
//   p(x) = (Σ_{c: η_c ≤ η_x} e^{η_c} + e^{η_x}) / (Σ_c e^{η_c} + e^{η_x}),
// which never reaches 0 and for a normal taxon in a normal landscape is the closed form the
// tests check. Unlike a share of the taxon's own places, it is not raised by the errors
// themselves: relocated records are many among a taxon's unsuited places, few among its
// weighted landscape.
// With its own cutoff (--flag-rule cutoffs) a record is flagged when, besides the ratio, at most
// 2 % of the taxon's places lie in environments at least as unsuited to it (a taxon sampled
// unevenly under-uses a common environment without any of its records there being wrong). The
// severity, and so the rank, is the ratio's either way.
// The reason gives the evidence in counts: the share of the landscape at least as unsuited to the
// taxon (η at most the record's) and how many of the taxon's places lie there.
#include "envsift/detect/landscape.hpp"

#include <algorithm>
#include <cmath>
#include <cstdio>

#include <Eigen/Eigenvalues>

#include "envsift/detect/numerics.hpp"
#include "landscape_model.hpp"

namespace envsift {
namespace {

using namespace landscape_model;

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

// What the model is fitted on: the layers with enough of the taxon's values and a spread over
// the landscape, and the landscape cells and the taxon's places complete on them.
struct Sample {
  std::vector<Eigen::Index> layers, cells, places;
  bool complete(const Eigen::MatrixXd& m, Eigen::Index r) const {
    for (Eigen::Index l : layers)
      if (!std::isfinite(m(r, l))) return false;
    return !layers.empty();
  }
};

// The sample, or the code that says why the taxon cannot be judged.
std::string choose_sample(const TaxonValues& taxon, const LandscapeTestOptions& o, const std::string& me, Sample& s) {
  const Eigen::MatrixXd& land = taxon.landscape->values;
  bool enough_values = false;
  for (Eigen::Index l = 0; l < taxon.records.cols(); ++l) {
    if (static_cast<std::size_t>(taxon.reference.col(l).array().isFinite().count()) < o.min_records) continue;
    enough_values = true;
    const Eigen::ArrayXd c = land.col(l).array();
    const auto finite = c.isFinite();
    if (static_cast<std::size_t>(finite.count()) < o.min_cells) continue;
    const double lo = finite.select(c, INFINITY).minCoeff(), hi = finite.select(c, -INFINITY).maxCoeff();
    if (hi > lo) s.layers.push_back(l);
  }
  if (!enough_values) return "too_few_records:" + me;
  for (Eigen::Index r = 0; r < land.rows(); ++r)
    if (s.complete(land, r)) s.cells.push_back(r);
  for (Eigen::Index r = 0; r < taxon.reference.rows(); ++r)
    if (s.complete(taxon.reference, r)) s.places.push_back(r);
  if (s.cells.size() < o.min_cells) return "no_landscape:" + me;
  if (s.places.size() < o.min_records) return "too_few_records:" + me;
  return "";
}

// The landscape's scale: each layer mapped onto it, then the landscape's whitened principal
// components, as many as the places can afford (one coefficient per 5), products if affordable.
struct Basis {
  std::vector<Eigen::Index> layers;
  std::vector<LayerScale> maps;
  Eigen::RowVectorXd centre;
  Eigen::MatrixXd whiten;
  std::size_t d = 0;
  bool products = false;

  template <class ValueOf>
  Eigen::VectorXd mapped(ValueOf&& value_of) const {
    const auto q = static_cast<Eigen::Index>(layers.size());
    Eigen::VectorXd z(q);
    for (Eigen::Index j = 0; j < q; ++j) z[j] = maps[static_cast<std::size_t>(j)](value_of(layers[static_cast<std::size_t>(j)]));
    return z;
  }
  Eigen::VectorXd features_of(const Eigen::VectorXd& z) const {
    return features(whiten.transpose() * (z - centre.transpose()), products);
  }
};

// The basis, or d = 0 when the places afford no dimension; `zl`: the landscape cells mapped.
Basis choose_basis(const TaxonValues& taxon, const Sample& s, const LandscapeTestOptions& o, Eigen::MatrixXd& zl) {
  const Eigen::MatrixXd& land = taxon.landscape->values;
  Basis b;
  b.layers = s.layers;
  const auto q = static_cast<Eigen::Index>(s.layers.size());
  for (Eigen::Index l : s.layers) {
    std::vector<double> v;
    for (Eigen::Index r : s.cells) v.push_back(land(r, l));
    b.maps.push_back(o.normal_scores ? normal_scores(std::move(v)) : linear_scale(v));
  }
  const auto m = static_cast<Eigen::Index>(s.cells.size());
  zl.resize(m, q);
  for (Eigen::Index i = 0; i < m; ++i) zl.row(i) = b.mapped([&](Eigen::Index l) { return land(s.cells[static_cast<std::size_t>(i)], l); });
  b.centre = zl.colwise().mean();
  const Eigen::MatrixXd centred = zl.rowwise() - b.centre;
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
  available = std::min(available, o.max_dimensions);
  const std::size_t budget = s.places.size() / 5;
  for (std::size_t k = available; k >= 1 && b.d == 0; --k) {
    if (feature_count(k, true) <= budget) b.d = k, b.products = true;
    else if (feature_count(k, false) <= budget) b.d = k;
  }
  b.whiten.resize(q, static_cast<Eigen::Index>(b.d));
  for (std::size_t c = 0; c < b.d; ++c) {
    const Eigen::Index at = q - 1 - static_cast<Eigen::Index>(c);
    b.whiten.col(static_cast<Eigen::Index>(c)) = fixed_sign(eig.eigenvectors().col(at)) / std::sqrt(lambda[at]);
  }
  return b;
}

// The fitted logit: a first fit, then a refit without the places it flags; η of every landscape
// cell and place, sorted, to count those at least as unsuited as a record.
struct Fit {
  Eigen::VectorXd beta;
  double log_n_over_m = 0;
  std::vector<double> eta_land, eta_places;
  std::vector<double> weight_below;  // Σ exp(η_c − max η) over the cells up to each, sorted by η

  // The share of the taxon's fitted distribution at most as suited as η (see the top).
  double probability(double eta, std::size_t cells_at_most) const {
    const double top = eta_land.back(), ref = std::max(top, eta);
    const double scale = std::exp(top - ref), own = std::exp(eta - ref);
    const double below = cells_at_most ? weight_below[cells_at_most - 1] : 0.0;
    return (below * scale + own) / (weight_below.back() * scale + own);
  }
};

Fit fit_model(const TaxonValues& taxon, const Sample& s, const Basis& b, const Eigen::MatrixXd& zl,
              const LandscapeTestOptions& o) {
  const auto m = static_cast<Eigen::Index>(s.cells.size()), n = static_cast<Eigen::Index>(s.places.size());
  const Eigen::Index p = static_cast<Eigen::Index>(feature_count(b.d, b.products));
  Eigen::MatrixXd design(n + m, p);
  Eigen::VectorXd y(n + m), w = Eigen::VectorXd::Ones(n + m);
  for (Eigen::Index i = 0; i < n; ++i) {
    const Eigen::VectorXd zp = b.mapped([&](Eigen::Index l) { return taxon.reference(s.places[static_cast<std::size_t>(i)], l); });
    design.row(i) = b.features_of(zp), y[i] = 1;
  }
  for (Eigen::Index i = 0; i < m; ++i) design.row(n + i) = b.features_of(zl.row(i).transpose()), y[n + i] = 0;
  const double log_cutoff = std::log(o.ratio_cutoff);
  const Eigen::VectorXd no_offset = Eigen::VectorXd::Zero(n + m);
  auto fit = [&](double intercept) {
    const Eigen::VectorXd beta = fit_logistic(design, y, w, o.ridge, intercept, no_offset);
    return unimodal(design, y, w, beta, static_cast<Eigen::Index>(b.d), b.products, o.ridge, o.curvature);
  };
  Fit f;
  f.beta = fit(std::log(static_cast<double>(n) / static_cast<double>(m)));
  double used = static_cast<double>(n);
  const Eigen::VectorXd eta = design.topRows(n) * f.beta;
  for (Eigen::Index i = 0; i < n; ++i)
    if (std::log(used / static_cast<double>(m)) - eta[i] > log_cutoff) w[i] = 0;
  const double kept = w.head(n).sum();
  if (kept < static_cast<double>(n) && kept >= static_cast<double>(o.min_records)) {
    used = kept;
    f.beta = fit(std::log(used / static_cast<double>(m)));
  }
  f.log_n_over_m = std::log(used / static_cast<double>(m));
  for (Eigen::Index i = 0; i < m; ++i) f.eta_land.push_back(design.row(n + i).dot(f.beta));
  for (Eigen::Index i = 0; i < n; ++i) f.eta_places.push_back(design.row(i).dot(f.beta));
  std::sort(f.eta_land.begin(), f.eta_land.end());
  std::sort(f.eta_places.begin(), f.eta_places.end());
  double sum = 0;
  for (double e : f.eta_land) f.weight_below.push_back(sum += std::exp(e - f.eta_land.back()));
  return f;
}

// Within a disc, the largest η over the box [lo, hi] of mapped values, by coordinate ascent from
// z (η is quadratic along each coordinate, so each step is exact: the vertex if concave and
// inside, else an end).
double best_in_box(const Basis& b, const Eigen::VectorXd& beta, Eigen::VectorXd z, const Eigen::VectorXd& lo,
                   const Eigen::VectorXd& hi, double eta) {
  auto eta_of = [&](const Eigen::VectorXd& t) { return b.features_of(t).dot(beta); };
  for (int sweep = 0; sweep < 20; ++sweep) {
    double gained = 0;
    for (Eigen::Index j = 0; j < z.size(); ++j) {
      if (!(hi[j] > lo[j])) continue;
      auto at = [&](double v) {
        Eigen::VectorXd t = z;
        t[j] = v;
        return eta_of(t);
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
  return eta;
}

// One record: its η (the best within its disc), the ratio a/f, and the evidence in counts.
Finding judge_record(const TaxonValues& taxon, Eigen::Index r, const Basis& b, const Fit& fit, std::size_t places,
                     const LandscapeTestOptions& o) {
  Finding f;
  const Eigen::VectorXd z = b.mapped([&](Eigen::Index l) { return taxon.records(r, l); });
  double eta = b.features_of(z).dot(fit.beta);
  Eigen::VectorXd lo = z, hi = z;
  for (Eigen::Index j = 0; j < z.size(); ++j) {
    const auto [a, c] = taxon.range(r, b.layers[static_cast<std::size_t>(j)]);
    lo[j] = b.maps[static_cast<std::size_t>(j)](a), hi[j] = b.maps[static_cast<std::size_t>(j)](c);
  }
  const bool disc = (hi - lo).maxCoeff() > 0;
  if (disc) eta = best_in_box(b, fit.beta, z, lo, hi, eta);
  const double log_cutoff = std::log(o.ratio_cutoff);
  const double log_ratio = std::min(fit.log_n_over_m - eta, 700.0);
  // "At most the record's η", ties included: a cell or place in the record's own environment
  // (often its own cell) gets η by another sum of the same terms, equal up to rounding, and the
  // rounding was seen to differ between machines; a tolerance far above rounding and far below
  // any real difference makes the count the same everywhere.
  const double at_most = eta + 1e-9 * std::max(1.0, std::fabs(eta));
  const auto& land = fit.eta_land;
  const auto cells_there = static_cast<std::size_t>(std::upper_bound(land.begin(), land.end(), at_most) - land.begin());
  const double area_share = static_cast<double>(cells_there) / static_cast<double>(land.size());
  const auto places_there =
      static_cast<std::size_t>(std::upper_bound(fit.eta_places.begin(), fit.eta_places.end(), at_most) - fit.eta_places.begin());
  f.tested = true;
  f.statistic = std::exp(log_ratio);
  f.threshold = o.ratio_cutoff;
  f.severity = log_ratio > 0 ? std::sqrt(log_ratio / log_cutoff) : 0.0;  // on the D² scale, like Mahalanobis
  const double place_share = static_cast<double>(places_there) / static_cast<double>(places);
  f.flagged = log_ratio > log_cutoff && place_share <= o.max_place_share;
  f.probability = fit.probability(eta, cells_there);
  f.extras = {area_share};
  if (f.flagged || f.probability <= kWorthWords) {
    char buf[400];
    std::snprintf(buf, sizeof buf,
                  "landscape: this environment is %s times more common %s than among the taxon's records: "
                  "environments as unsuited to it cover %s of that landscape and hold %zu of its %zu places (%s)%s",
                  times(f.statistic).c_str(), taxon.landscape->area.c_str(), percent(area_share).c_str(), places_there,
                  places, percent(place_share).c_str(),
                  disc ? ", for the value within its uncertainty disc that fits the taxon best" : "");
    f.reasons.push_back(buf);
  }
  return f;
}

}  // namespace

std::vector<Finding> LandscapeTest::judge(const TaxonValues& taxon) const {
  const auto rows = static_cast<std::size_t>(taxon.records.rows());
  const std::string me = name();
  if (!taxon.landscape || taxon.landscape->values.rows() == 0) return untested(rows, "no_landscape:" + me);
  Sample sample;
  if (const std::string why = choose_sample(taxon, options_, me, sample); !why.empty()) return untested(rows, why);
  Eigen::MatrixXd zl;
  const Basis basis = choose_basis(taxon, sample, options_, zl);
  if (basis.d == 0) return untested(rows, "too_few_records:" + me);
  const Fit fit = fit_model(taxon, sample, basis, zl, options_);
  std::vector<Finding> findings(rows);
  for (std::size_t i = 0; i < rows; ++i) {
    const auto r = static_cast<Eigen::Index>(i);
    if (!sample.complete(taxon.records, r)) findings[i].untested_code = "missing_value:" + me;
    else findings[i] = judge_record(taxon, r, basis, fit, sample.places.size(), options_);
  }
  return findings;
}

}  // namespace envsift
