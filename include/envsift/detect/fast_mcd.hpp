// Minimum Covariance Determinant location and scatter by the FAST-MCD algorithm, with a
// consistency factor and one reweighting step.
#pragma once
#include <cstddef>
#include <cstdint>
#include <vector>

#include <Eigen/Core>

namespace envsift {

// Where the C-steps start: the six deterministic estimates of DetMCD (deterministic_mcd.hpp,
// the default: fast, the same result every time) or FAST-MCD's random (p+1)-subsets (which also
// handles exact fits, and is kept for comparison).
enum class McdEngine { deterministic, fast };

struct McdOptions {
  McdEngine engine = McdEngine::deterministic;
  std::size_t starts = 500;        // random (p+1)-subsets tried
  std::size_t finalists = 10;      // best starts iterated to convergence on all rows
  std::size_t subsample = 1500;    // larger data: starts are screened on this many random rows…
  std::size_t group = 300;         // …in groups of about this many (nested subsets, n > 2 · group)
  double reweight_quantile = 0.975;
  std::uint64_t seed = 1;
};

struct McdResult {
  std::size_t h = 0;                 // size of the best subset, ⌊(n + p + 1)/2⌋
  std::vector<std::size_t> subset;   // its rows, ascending
  Eigen::VectorXd raw_center;
  Eigen::MatrixXd raw_scatter;       // consistency-corrected
  std::vector<bool> weights;         // rows kept by the reweighting step
  Eigen::VectorXd center;            // reweighted
  Eigen::MatrixXd scatter;           // reweighted, consistency-corrected
  bool exact_fit = false;            // h rows lie on a hyperplane: the scatter is singular
};

// `x`: n rows × p columns, all finite, n > p.
McdResult fast_mcd(const Eigen::MatrixXd& x, const McdOptions& options);

}  // namespace envsift
