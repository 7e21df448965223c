// eigenzeit: power series summed from a term functor with an explicit iteration cap.
// Distributed under the Boost Software License, Version 1.0 (see LICENSE).
#ifndef EIGENZEIT_NUMERIC_SERIES_HPP
#define EIGENZEIT_NUMERIC_SERIES_HPP

#include <cmath>
#include <limits>

#include <eigenzeit/config.hpp>
#include <eigenzeit/numeric/traits.hpp>

namespace eigenzeit {
namespace numeric {

template <class T>
struct series_result {
  T sum;
  int terms;       // terms added
  bool converged;  // false if the cap was reached before the tolerance
};

/// Sums the terms produced by successive calls of `next()` until a term falls below
/// `tolerance` times the running sum (in magnitude) or `max_terms` terms were added.
/// The caller decides what to do with a series that did not converge; nothing is hidden.
template <class T, class Terms>
EIGENZEIT_HOST_DEVICE inline series_result<T> sum_series(Terms& next, T tolerance, int max_terms) {
  using std::abs;
  T sum = T(0);
  for (int k = 0; k < max_terms; ++k) {
    T term = next();
    sum += term;
    if (abs(term) <= tolerance * abs(sum)) return {sum, k + 1, true};
  }
  return {sum, max_terms, false};
}

/// Iteration cap for a series in x with |x| <= 2^-series_exponent_v<T>: each term shrinks
/// by that factor at least, so digits / series_exponent + 2 terms always suffice; the cap
/// doubles it so that a wrong threshold shows up as non-convergence in tests, not as a hang.
template <class T>
inline constexpr int series_cap_v = 2 * (digits_v<T> / series_exponent_v<T> + 2);

}  // namespace numeric
}  // namespace eigenzeit

#endif
