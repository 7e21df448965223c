// eigenzeit: the widening ladder (the real types a fallback climbs) and correctly rounded
// conversion back down it.
// Distributed under the Boost Software License, Version 1.0 (see LICENSE).
//
// float -> double -> long double -> cpp_bin_float_50 -> cpp_bin_float_100 -> ... -> the last
// cpp_bin_float rung with at most ladder_max_digits10 decimal digits, then no rung (void).
// A rung is skipped where it adds no precision (long double with double's 53 bits, as on
// some ABIs).  The one-rung cost measured here for the careful gamma - 1: double 3.5 ns,
// long double 3.9 ns, cpp_bin_float_50 4.9 us, so the first rung decides what a fallback
// costs; float128 (419 ns) is not a default rung because it needs libquadmath at link time:
// specialise next_rung<long double> to add it.
//
// Users extend the ladder by specialising eigenzeit::numeric::next_rung for their type
// (type = the next wider type, or void for none).
#ifndef EIGENZEIT_NUMERIC_LADDER_HPP
#define EIGENZEIT_NUMERIC_LADDER_HPP

#include <cmath>
#include <limits>
#include <type_traits>

#include <boost/multiprecision/cpp_bin_float.hpp>

#include <eigenzeit/numeric/traits.hpp>

namespace eigenzeit {
namespace numeric {

/// Decimal digits of the widest default rung; the ladder ends above it.
inline constexpr unsigned ladder_max_digits10 = 400;

/// The first multiprecision rung.
using ladder_mp_rung = boost::multiprecision::cpp_bin_float_50;

/// next_rung<T>::type: the next wider type of the ladder, or void at the top (and for types
/// the ladder does not know).
template <class T, class Enable = void>
struct next_rung {
  using type = void;
};

template <>
struct next_rung<float> {
  using type = double;
};

template <>
struct next_rung<double> {
  using type = std::conditional_t<(std::numeric_limits<long double>::digits >
                                   std::numeric_limits<double>::digits),
                                  long double, ladder_mp_rung>;
};

template <>
struct next_rung<long double> {
  using type = std::conditional_t<(std::numeric_limits<long double>::digits <
                                   std::numeric_limits<ladder_mp_rung>::digits),
                                  ladder_mp_rung, boost::multiprecision::cpp_bin_float_100>;
};

/// cpp_bin_float<D> -> cpp_bin_float<2D> (same base, allocator and exponent range) while
/// 2D stays within ladder_max_digits10 decimal digits (or the binary equivalent).
template <unsigned D, boost::multiprecision::backends::digit_base_type B, class A, class E,
          E MinE, E MaxE, boost::multiprecision::expression_template_option ET>
struct next_rung<boost::multiprecision::number<
    boost::multiprecision::backends::cpp_bin_float<D, B, A, E, MinE, MaxE>, ET>> {
 private:
  static constexpr unsigned limit =
      B == boost::multiprecision::backends::digit_base_10 ? ladder_max_digits10
                                                          : ladder_max_digits10 * 10 / 3;

 public:
  using type = std::conditional_t<
      (2 * D <= limit),
      boost::multiprecision::number<
          boost::multiprecision::backends::cpp_bin_float<2 * D, B, A, E, MinE, MaxE>, ET>,
      void>;
};

template <class T>
using next_rung_t = typename next_rung<T>::type;

template <class T>
inline constexpr bool has_next_rung_v = !std::is_void<next_rung_t<T>>::value;

/// Number of rungs above T (0 at the top).
template <class T>
constexpr int rungs_above() {
  if constexpr (has_next_rung_v<T>) {
    return 1 + rungs_above<next_rung_t<T>>();
  } else {
    return 0;
  }
}

/// Tag that carries a type through generic callables: f(type_tag<W>{}) evaluates in W.
template <class T>
struct type_tag {
  using type = T;
};

/// The value of w rounded to nearest (ties to even) in T, for w of a wider type W.
/// Conversions between the built-in types already round correctly (IEEE 754); for the
/// others (Boost.Multiprecision 1.74 converts some values by truncation) the candidate is
/// moved to whichever neighbour is nearer, the differences being exact in W.  Overflow
/// gives +-inf, as the conversion of a built-in type would.
template <class T, class W>
inline T round_to(const W& w) {
  if constexpr (std::is_same<T, W>::value) {
    return w;
  } else if constexpr (std::is_floating_point<T>::value && std::is_floating_point<W>::value) {
    return static_cast<T>(w);
  } else {
    using std::abs;
    using std::isfinite;
    using std::nextafter;
    T h = static_cast<T>(w);
    if (!isfinite(h) || w != w) return h;
    for (int step = 0; step < 4; ++step) {
      const W d = W(w) - W(h);
      if (d == 0) return h;
      const T n = nextafter(h, d > 0 ? std::numeric_limits<T>::infinity()
                                     : -std::numeric_limits<T>::infinity());
      if (!isfinite(n)) {
        // Beyond the largest finite value: round to infinity from half an ulp above it.
        const W half_ulp = (W(h) - W(nextafter(h, T(0)))) / 2;
        return abs(d) >= half_ulp ? n : h;
      }
      const W dn = W(n) - W(w);
      const W ad = abs(d), adn = abs(dn);
      if (adn > ad) return h;
      if (adn == ad) {
        // Tie: the neighbour whose significand, as an integer at h's exponent (the
        // subnormal exponent for subnormal h), is even.
        using std::fmod;
        using std::ilogb;
        using std::ldexp;
        const int lowest = std::numeric_limits<T>::min_exponent - 1;
        const int eh = h == 0 ? lowest : static_cast<int>(ilogb(h));
        const int e = eh > lowest ? eh : lowest;
        const T significand = ldexp(h, std::numeric_limits<T>::digits - 1 - e);
        return fmod(significand, T(2)) == 0 ? h : n;
      }
      h = n;
    }
    return h;
  }
}

}  // namespace numeric
}  // namespace eigenzeit

#endif
