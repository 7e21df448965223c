// eigenzeit: precision traits and thresholds derived from std::numeric_limits.
// Distributed under the Boost Software License, Version 1.0 (see LICENSE).
#ifndef EIGENZEIT_NUMERIC_TRAITS_HPP
#define EIGENZEIT_NUMERIC_TRAITS_HPP

#include <cmath>
#include <limits>
#include <type_traits>

#include <eigenzeit/config.hpp>

namespace eigenzeit {
namespace numeric {

/// Integer arguments promote to double, as in <cmath>; real types stay as they are.
template <class T>
using promote_t = std::conditional_t<std::is_integral<T>::value, double, T>;

/// True for the built-in binary floating types, whose std::fma is exact (one rounding).
template <class T>
inline constexpr bool is_builtin_float_v = std::is_floating_point<T>::value;

/// 2^e in T, exact.  std::ldexp for built-in types, ADL ldexp (Boost.Multiprecision) otherwise.
template <class T>
EIGENZEIT_HOST_DEVICE inline T pow2(int e) {
  using std::ldexp;
  return ldexp(T(1), e);
}

/// The next wider real type, where one exists and is known here; otherwise T itself.  Used
/// only for the exp/log calls of Boost.Multiprecision types, whose own exp and log lose
/// accuracy in proportion to the argument (measured: ~0.7 eps per unit of argument for
/// cpp_bin_float_50).  Built-in types keep their own std:: functions.  Users may specialise
/// eigenzeit::numeric::wider for their own types.
template <class T, class Enable = void>
struct wider {
  using type = T;
};
template <class T>
using wider_t = typename wider<T>::type;

/// 2^k in T, computed once: a compile-time constant for the built-in types (where pow2 would
/// be a call to ldexp on every use), a function-local static for the others.  For the
/// thresholds and splitting constants that sit on hot paths.
template <class T, int k>
inline T pow2_const() {
  if constexpr (std::is_floating_point<T>::value) {
    constexpr T value = [] {
      T r = T(1);
      for (int i = 0; i < (k < 0 ? -k : k); ++i) r = k < 0 ? r / 2 : r * 2;
      return r;
    }();
    return value;
  } else {
    static const T value = pow2<T>(k);
    return value;
  }
}

/// Binary digits of the significand of T (53 for double).
template <class T>
inline constexpr int digits_v = std::numeric_limits<T>::digits;

/// Exponent k of the series threshold 2^-k: below it, a quantity x = beta^2 is small enough
/// that 4 terms of a power series in x reach full precision (x^4 <= 2^-4k < eps / 16), and
/// above it the closed forms have no harmful cancellation (their absolute error ~eps^2 is
/// below eps^(1/3) * eps, i.e. far below one ulp of results that are >= x / 2).
template <class T>
inline constexpr int series_exponent_v = (digits_v<T> - 1) / 3 + 1;

/// The threshold itself: x < small_square_threshold<T>() selects the series.
template <class T>
inline T small_square_threshold() {
  return pow2_const<T, -series_exponent_v<T>>();
}

/// Below this value q = 1 - beta^2 is rescaled before its square root is refined: the
/// residual q - sqrt(q)^2, of size eps * q, must stay a normal number.
template <class T>
inline T rescale_threshold() {
  return std::numeric_limits<T>::min() / (std::numeric_limits<T>::epsilon() *
                                           std::numeric_limits<T>::epsilon());
}

}  // namespace numeric
}  // namespace eigenzeit

#endif
