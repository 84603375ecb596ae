// Chi-square quantiles and probabilities (Boost.Math), for Mahalanobis cutoffs and the MCD
// consistency factor.
#pragma once

namespace envsift {

// The q-quantile of χ² with `dof` degrees of freedom, e.g. chi_square_quantile(2, 0.975) = 7.378.
double chi_square_quantile(double dof, double q);
// P(χ²_dof ≤ x).
double chi_square_cdf(double dof, double x);

}  // namespace envsift
