#include "envsift/detect/chi_square.hpp"

#include <boost/math/distributions/chi_squared.hpp>

namespace envsift {

double chi_square_quantile(double dof, double q) { return boost::math::quantile(boost::math::chi_squared(dof), q); }

double chi_square_cdf(double dof, double x) { return boost::math::cdf(boost::math::chi_squared(dof), x); }

}  // namespace envsift
