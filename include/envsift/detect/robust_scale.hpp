// Robust scales of one variable, as the deterministic MCD uses them (deterministic_mcd.hpp).
#pragma once
#include <vector>

namespace envsift {

// Qn of Rousseeuw & Croux (1993): 2.21914 · the k-th smallest |x_i − x_j| (i < j),
// k = C(⌊n/2⌋ + 1, 2), with the finite-sample factors of R's robustbase::Qn.
double qn_scale(std::vector<double> x);

// The τ-scale of Yohai & Zamar (1988) in the form of Maronna & Zamar (2002), one step from the
// median and MAD, c1 = 4.5, c2 = 3, consistent at the normal (R's robustbase::scaleTau2).
double tau_scale(const std::vector<double>& x);

// The scale the deterministic MCD standardises with ("hrv2012" in robustbase): Qn below 1000
// values, τ-scale from 1000 on. A zero scale (over half the values tied) is replaced as R's
// robustbase::doScale does: the first non-zero of the 50 %…98.75 % quantiles of |x − median|
// over its normal quantile, else 1.
double mcd_scale(const std::vector<double>& x);

}  // namespace envsift
