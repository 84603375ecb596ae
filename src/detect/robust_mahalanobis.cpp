#include "envsift/detect/robust_mahalanobis.hpp"

#include "envsift/detect/deterministic_mcd.hpp"

namespace envsift {

// DetMCD standardises each column and starts from coordinatewise medians and rank correlations:
// it is not rotation-equivariant, and its starts are meant for the variables themselves. When
// every component is kept (the basis is square) it therefore runs on the standardised layers and
// its estimate is rotated into the scores (exact, the basis being orthonormal); the result is
// then the MCD of the layers as given. With fewer components it runs on the scores.
Estimate RobustMahalanobis::estimate(const Eigen::MatrixXd& scores, const Eigen::MatrixXd& standardised,
                                     const Eigen::MatrixXd& basis, std::uint64_t seed) const {
  McdOptions o = mcd_;
  o.seed = seed;
  if (o.engine == McdEngine::deterministic && basis.rows() == basis.cols()) {
    const McdResult r = minimum_covariance_determinant(standardised, o);
    return {basis.transpose() * r.center, basis.transpose() * r.scatter * basis};
  }
  McdResult r = minimum_covariance_determinant(scores, o);
  return {std::move(r.center), std::move(r.scatter)};
}

}  // namespace envsift
