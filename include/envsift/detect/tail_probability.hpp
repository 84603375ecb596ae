// How often a clean record would look at least this unusual: tail probabilities of the
// distributions the tests fit, and rules that combine several tests' probabilities for one
// record, or decide flags for a taxon's records at a stated error rate. The kernels a calibrated
// flag is built from; the Boost.Math distributions are checked against R's pnorm and pchisq.
//   Cauchy combination: Liu, Y. & Xie, J. (2020) Cauchy combination test: a powerful test with
//   analytic p-value calculation under arbitrary dependency structures. J. Am. Stat. Assoc.
//   115:393-402 — valid when the tests are dependent (they all see the same values), which
//   Fisher's product is not.
//   False discovery rate: Benjamini, Y. & Hochberg, Y. (1995) Controlling the false discovery
//   rate. J. R. Stat. Soc. B 57:289-300.
#pragma once
#include <cstddef>
#include <vector>

namespace envsift {

// P(Z > z) for a standard normal Z; P(|Z| > |z|) two-sided.
double normal_upper_tail(double z);
double normal_two_sided_tail(double z);
// P(χ²_dof > x).
double chi_square_upper_tail(double dof, double x);
// P(B > x) for B ~ Beta(a, b): 1 at x ≤ 0, 0 at x ≥ 1.
double beta_upper_tail(double a, double b, double x);

// The Cauchy combination of probabilities p_i with weights w_i (summing to 1; equal when empty):
//   T = Σ w_i tan((1/2 − p_i) π),   p = 1/2 − arctan(T) / π.
// A probability of 0 gives 0; the combination of k equal probabilities is that probability.
double cauchy_combination(const std::vector<double>& p, const std::vector<double>& weights = {});

// The smallest of k probabilities made a probability for all k (Šidák): 1 − (1 − min p)^k.
double sidak_minimum(const std::vector<double>& p);
double sidak_minimum(double smallest, std::size_t k);

// Which of a family's probabilities are discoveries at false discovery rate q (Benjamini &
// Hochberg's step-up rule): p_(i) ≤ i q / m for the largest such i, and every smaller one.
std::vector<bool> benjamini_hochberg(const std::vector<double>& p, double q);

}  // namespace envsift
