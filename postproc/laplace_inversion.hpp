#pragma once
// Numerical inversion of Laplace transforms, for the well-test solutions known only in the
// Laplace domain. Two independent methods so that each checks the other. Pure numerics.

#include <complex>
#include <functional>

namespace aquiledger {

/// Stehfest (1970) (with the 1970 corrigendum): f(t) ~ ln2 / t sum_k V_k F(k ln2 / t) over
/// `n_terms` (even; about 10..16 in double precision) real samples of F. Suited to smooth,
/// non-oscillating f such as drawdown curves.
double stehfest_inverse(const std::function<double(double)>& transform, double t, int n_terms = 12);

/// de Hoog, Knight and Stokes (1982): the Fourier series of the inversion integral summed as a
/// continued fraction (quotient-difference algorithm) with their remainder estimate, over
/// 2 m + 1 complex samples of F on the line Re p = gamma, period 2 T with T = scale * t.
/// `tolerance` sets gamma = -ln(tolerance) / (2 T).
double de_hoog_inverse(const std::function<std::complex<double>(std::complex<double>)>& transform,
                       double t, int m = 20, double tolerance = 1e-12, double scale = 2.0);

}  // namespace aquiledger
