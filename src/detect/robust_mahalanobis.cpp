#include "envsift/detect/robust_mahalanobis.hpp"

namespace envsift {

Estimate RobustMahalanobis::estimate(const Eigen::MatrixXd& scores, std::uint64_t seed) const {
  McdOptions o = mcd_;
  o.seed = seed;
  McdResult r = fast_mcd(scores, o);
  return {std::move(r.center), std::move(r.scatter)};
}

}  // namespace envsift
