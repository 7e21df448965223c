// eigenzeit: distances in units in the last place, for tests and accuracy reports.
// Distributed under the Boost Software License, Version 1.0 (see LICENSE).
#ifndef EIGENZEIT_NUMERIC_ULP_HPP
#define EIGENZEIT_NUMERIC_ULP_HPP

#include <cmath>
#include <cstdint>
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
/// NaN against anything, or inf against a finite value, gives the largest int64.
template <class T>
inline std::int64_t ulp_distance(T a, T b) {
  using std::isnan;
  constexpr std::int64_t far = std::numeric_limits<std::int64_t>::max();
  if (isnan(a) || isnan(b)) return (isnan(a) && isnan(b)) ? 0 : far;
  if (a == b) return 0;
  using std::isinf;
  if (isinf(a) || isinf(b)) return far;
  if constexpr (std::is_same<T, float>::value) {
    std::int64_t d = detail::ordered_bits<float, std::uint32_t>(a) -
                     detail::ordered_bits<float, std::uint32_t>(b);
    return d < 0 ? -d : d;
  } else if constexpr (std::is_same<T, double>::value) {
    std::int64_t d = detail::ordered_bits<double, std::uint64_t>(a) -
                     detail::ordered_bits<double, std::uint64_t>(b);
    return d < 0 ? -d : d;
  } else {
    using std::abs;
    T d = abs(boost::math::float_distance(a, b));
    if (d > T(far / 2)) return far;
    return static_cast<std::int64_t>(d);
  }
}

}  // namespace numeric
}  // namespace eigenzeit

#endif
