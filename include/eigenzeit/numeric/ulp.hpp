// eigenzeit: distances in units in the last place, for tests and accuracy reports.
// Distributed under the Boost Software License, Version 1.0 (see LICENSE).
#ifndef EIGENZEIT_NUMERIC_ULP_HPP
#define EIGENZEIT_NUMERIC_ULP_HPP

#include <algorithm>
#include <cmath>
#include <cstdint>
#include <cstdlib>
#include <cstring>
#include <limits>
#include <type_traits>

#include <boost/math/special_functions/next.hpp>

namespace eigenzeit {
namespace numeric {

namespace detail {
// Maps a float or double to an integer that increases with the value, with +0 and -0 equal.
template <class T, class U>
inline std::int64_t ordered_bits(T x) {
  U u;
  std::memcpy(&u, &x, sizeof u);
  constexpr U sign = U(1) << (8 * sizeof(U) - 1);
  if (u & sign) return -static_cast<std::int64_t>(u & ~sign);
  return static_cast<std::int64_t>(u);
}
}  // namespace detail

/// Number of representable values of T between a and b (0 if equal, 1 if neighbours).
/// NaN against a number, or inf against a finite value, gives the largest int64; NaN against
/// NaN gives 0.  Distances that do not fit in int64 saturate to the largest int64.
template <class T>
inline std::int64_t ulp_distance(T a, T b) {
  using std::isnan;
  constexpr std::int64_t far = std::numeric_limits<std::int64_t>::max();
  if (isnan(a) || isnan(b)) return (isnan(a) && isnan(b)) ? 0 : far;
  if (a == b) return 0;
  using std::isinf;
  if (isinf(a) || isinf(b)) return far;
  if constexpr (std::is_same<T, float>::value || std::is_same<T, double>::value) {
    using U = std::conditional_t<std::is_same<T, float>::value, std::uint32_t, std::uint64_t>;
    const std::int64_t ia = detail::ordered_bits<T, U>(a);
    const std::int64_t ib = detail::ordered_bits<T, U>(b);
    // The difference of two such integers can exceed int64 (2.0 against -2.0 is 2^63 steps):
    // take it in unsigned arithmetic, where it is exact, and saturate.
    const std::uint64_t d = ia > ib ? static_cast<std::uint64_t>(ia) - static_cast<std::uint64_t>(ib)
                                    : static_cast<std::uint64_t>(ib) - static_cast<std::uint64_t>(ia);
    return d > static_cast<std::uint64_t>(far) ? far : static_cast<std::int64_t>(d);
  } else {
    // Boost.Math's float_distance counts exactly, but overflows an int inside when the binary
    // exponents are far apart (types with exponent ranges near 2^31).  A gap of more than 64
    // binades is always beyond int64, so it saturates here before Boost is called.
    using std::abs;
    using std::frexp;
    int ea = 0, eb = 0;
    frexp(a, &ea);
    frexp(b, &eb);
    constexpr int lowest = std::numeric_limits<T>::has_denorm == std::denorm_present
                               ? std::numeric_limits<T>::min_exponent - std::numeric_limits<T>::digits
                               : std::numeric_limits<T>::min_exponent;
    const bool through_zero = a == T(0) || b == T(0) || ((a < T(0)) != (b < T(0)));
    const long gap = through_zero ? static_cast<long>(std::max(a == T(0) ? lowest : ea, b == T(0) ? lowest : eb)) - lowest
                                  : std::labs(static_cast<long>(ea) - static_cast<long>(eb));
    if (gap > 64) return far;
    const T d = abs(boost::math::float_distance(a, b));
    if (!(d < T(far))) return far;
    return static_cast<std::int64_t>(d);
  }
}

}  // namespace numeric
}  // namespace eigenzeit

#endif
