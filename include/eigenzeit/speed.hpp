// eigenzeit: functions of a speed and the speed<T> value type.
// Distributed under the Boost Software License, Version 1.0 (see LICENSE).
//
// Conventions: beta = v / c.  The free functions take a signed beta in (-1, 1); speed<T>
// holds a magnitude in [0, 1).  "u" below is the unit roundoff of T (2^-53 for double).
//
// How the accuracy is reached.  The textbook forms lose digits in two places: 1 - beta^2
// when beta is near 1, and gamma - 1 or 1 - 1/gamma when beta is small.  Here
//   * q = 1 - beta^2 is formed as (1 - beta)(1 + beta) in double-word arithmetic: 1 - beta
//     and 1 + beta are split exactly into two words (fast_two_sum), their product is split
//     exactly by one fused multiply-add, so q carries about 2x the precision of T;
//   * 1 / sqrt(q) is refined to double-word accuracy with one division: y = RN(1/RN(sqrt(q))),
//     then gamma = y + y (t - r y^2 / 2), with t = 1 - y sqrt(q) and r = q - sqrt(q)^2 both
//     exact residuals.  Neglected terms are O(u^2) relative, so gamma is the correctly
//     rounded value except within O(u) of a rounding boundary;
//   * gamma - 1 = (y - 1) + correction, again exact up to the final rounding, and for
//     beta^2 below 2^-k (k = digits/3 + 1, see numeric/traits.hpp) a 4-term series in beta^2.
// speed<T> stores beta and gamma each as a double-word number, so every view is one or two
// exact residual steps away from a correctly rounded result, whatever constructor was used.
#ifndef EIGENZEIT_SPEED_HPP
#define EIGENZEIT_SPEED_HPP

#include <cmath>
#include <limits>
#include <type_traits>

#include <eigenzeit/config.hpp>
#include <eigenzeit/numeric/eft.hpp>
#include <eigenzeit/numeric/ladder.hpp>
#include <eigenzeit/numeric/policy.hpp>
#include <eigenzeit/numeric/rounding.hpp>
#include <eigenzeit/numeric/traits.hpp>
#include <eigenzeit/numeric/wider.hpp>

namespace eigenzeit {

namespace detail {

using numeric::dd;
using numeric::fast_two_sum;
using numeric::fms;
using numeric::two_prod;
using numeric::two_sum;

/// gamma - 1 = sum_{k>=1} C(2k,k)/4^k x^k for x = beta^2 given as a double-word number, used
/// for x < 2^-k (k = series_exponent_v<T>).  Terms up to x^4 are kept: the first one dropped
/// is below 0.5 x^4 < 2^-(4k+1) relative, and 4k >= digits + 3 for every T, so truncation
/// stays below u/8.  The leading term x/2 is exact; the tail (< x/2 * 0.76 x) carries
/// relative error ~3u, i.e. < 3u x: the result is within 0.5 ulp + 3u 2^-k of the truth.
template <class T>
EIGENZEIT_HOST_DEVICE inline T gamma_m1_series_low(dd<T> x) {
  const T tail = x.hi * x.hi * (T(3) / 8 + x.hi * (T(5) / 16 + x.hi * (T(35) / 128)));
  return x.lo / 2 + tail;
}
template <class T>
EIGENZEIT_HOST_DEVICE inline T gamma_m1_series(dd<T> x) {
  return x.hi / 2 + gamma_m1_series_low(x);
}

/// 1 - sqrt(1 - x) = x/2 + x^2/8 + x^3/16 + 5x^4/128 + ..., same range and error argument.
template <class T>
EIGENZEIT_HOST_DEVICE inline T dilation_series_low(dd<T> x) {
  const T tail = x.hi * x.hi * (T(1) / 8 + x.hi * (T(1) / 16 + x.hi * (T(5) / 128)));
  return x.lo / 2 + tail;
}
template <class T>
EIGENZEIT_HOST_DEVICE inline T dilation_series(dd<T> x) {
  return x.hi / 2 + dilation_series_low(x);
}

/// q = 1 - a^2 = (1 - a)(1 + a) for 0 <= a < 1, as a double-word number with relative error
/// below 3u^2: both factors are split exactly, the product's rounding error is recovered by
/// one fms, and the dropped product of the two low words is below u^2 q.
template <class T>
EIGENZEIT_HOST_DEVICE inline dd<T> one_minus_square(T a) {
  dd<T> d = fast_two_sum(T(1), -a);
  dd<T> s = fast_two_sum(T(1), a);
  T qh = d.hi * s.hi;
  T ql = fms(d.hi, s.hi, qh) + (d.hi * s.lo + d.lo * s.hi);
  return {qh, ql};
}

/// 1 / sqrt(q) as an unevaluated sum y + c, relative error O(u^2).  One sqrt, one division.
/// With s = RN(sqrt(qh)), y = RN(1/s): t = 1 - y s and r = q - s^2 are exact residuals and
/// 1/sqrt(q) = y (1 + t)(1 - r / (2 s^2)) + O(u^2) = y + y (t - (r y) y / 2) + O(u^2).
/// (r y) y instead of r y^2 keeps y^2 from overflowing when q is tiny.
template <class T>
EIGENZEIT_HOST_DEVICE inline dd<T> rsqrt_parts(dd<T> q) {
  using std::sqrt;
  T s = sqrt(q.hi);
  T y = T(1) / s;
  T t = -fms(y, s, T(1));
  T r = -fms(s, s, q.hi) + q.lo;
  return {y, y * (t - T(0.5) * (r * y) * y)};
}

/// gamma - 1 from gamma = y + c with y >= 1: y - 1 is split exactly, so the only rounding
/// of consequence is the last one.  Used where gamma - 1 >= 2^-k-1, far above |c| u.
template <class T>
EIGENZEIT_HOST_DEVICE inline T minus_one(dd<T> g) {
  dd<T> h = fast_two_sum(g.hi, T(-1));
  return h.hi + (h.lo + g.lo);
}

template <class T>
EIGENZEIT_HOST_DEVICE inline T copysign_(numeric::identity_t<T> magnitude, numeric::identity_t<T> sign_source) {
  using std::signbit;
  return signbit(sign_source) ? T(-magnitude) : magnitude;
}

/// log1p(x) for 0 <= x <= 1/4 and log(x) for x >= 1.  For built-in types these are the std::
/// functions, whose error on those ranges was measured below 1 ulp (glibc 2.36: log1pl
/// reaches 2.2 ulp on [1/4, 1], hence the split at 1/4 below).  For Boost.Multiprecision
/// types the call is made one rung wider (numeric::wider_t) and rounded back, because their
/// own exp/log lose accuracy roughly in proportion to the argument.
template <class T>
EIGENZEIT_HOST_DEVICE inline T log1p_small(T x) {
  using std::log1p;
  using W = numeric::wider_t<T>;
  return T(log1p(W(x)));
}

template <class T>
EIGENZEIT_HOST_DEVICE inline T log_(T x) {
  using std::log;
  using W = numeric::wider_t<T>;
  return T(log(W(x)));
}

template <class T>
EIGENZEIT_HOST_DEVICE inline T exp_(T x) {
  using std::exp;
  using W = numeric::wider_t<T>;
  return T(exp(W(x)));
}

/// ln 2 as a double-word number: the high word from T's own log (correctly rounded for the
/// built-in types), the low word from the next rung of the ladder (none for a type without one).
template <class T>
inline dd<T> ln2_words() {
  using std::log;
  const T hi = log(T(2));
  using W = numeric::next_rung_t<T>;
  if constexpr (std::is_void<W>::value) {
    return {hi, T(0)};
  } else {
    return {hi, T(log(W(2)) - W(hi))};
  }
}

/// atanh(a + al) for 0 <= a < 1 given as a double-word number (HasLow = false: al is 0).
/// d = 1 - a is split exactly.  For a <= 1/9: eta = log1p(z) / 2 with z = 2a / d; the
/// quotient's remainder rho is exact and log1p(z + rho/d) = log1p(z) + rho / (1 + a).
/// Otherwise eta = log(w) / 2 with w = (1 + a) / d, 1 + a split exactly, and again
/// log(w + rho/d) = log(w) + rho / (1 + a).  The correction is at most ~u, so 1/(1 + a) is
/// taken from its best linear fit on [1, 2], 8 (2 - a) / 17 (error <= 1/17), refined by one
/// Newton step (error <= 1/289): it then costs < 0.01 ulp.  Error: the library log or log1p
/// (< 1 ulp, see log1p_small) plus 0.5 ulp for the final addition.
template <bool HasLow, class T>
EIGENZEIT_HOST_DEVICE inline T atanh_words(T a, T al) {
  dd<T> d = fast_two_sum(T(1), -a);
  if (HasLow) d = fast_two_sum(d.hi, d.lo - al);  // d.hi may be 0 when a rounds to 1
  T recip = (T(2) - a) * (T(8) / T(17));
  recip = recip * (T(2) - (T(1) + a) * recip);
  if (a <= T(1) / T(9)) {
    const T two_a = a + a;
    const T z = two_a / d.hi;
    const T rho = -fms(z, d.hi, two_a) + ((HasLow ? 2 * al : T(0)) - z * d.lo);
    return (log1p_small(z) + rho * recip) / T(2);
  }
  dd<T> s = fast_two_sum(T(1), a);
  if (HasLow) s.lo += al;
  const T w = s.hi / d.hi;
  const T rho = -fms(w, d.hi, s.hi) + (s.lo - w * d.lo);
  return (log_(w) + rho * recip) / T(2);
}

// ---- the correctly rounded mode (numeric/rounding.hpp) ------------------------------------
// Each careful form below ends in one rounding of an unevaluated sum hi + lo.  In the
// correctly rounded mode that sum is kept, with a bound on its error; where the bound leaves
// the rounding open the routine is evaluated again up the widening ladder.  The bounds are
// c u^2 times the result's scale, with c a power of two at least 4x the error analysis beside
// each form, twice it for the series (tests/test_speed_rounded.cpp measures the sums against
// MPFR and checks that the error stays below a quarter of the bound).

/// Relative error of the 4-term series of gamma - 1 and of 1 - sqrt(1 - x), before the final
/// rounding, for x = beta^2 < 2^-k: truncation <= x^4 / 2, the tail's roundings and its
/// neglect of x.lo <= 3.2 u x, the last addition u^2.  Bound: twice that, 2 x^4 + 8 u x + 4 u^2.
template <class T>
EIGENZEIT_HOST_DEVICE inline T series_error(T x) {
  const T u = numeric::pow2_const<T, -std::numeric_limits<T>::digits>();
  const T x2 = x * x;
  return 2 * x2 * x2 + 8 * u * x + 4 * u * u;
}

/// gamma of |beta| = a as hi + lo (= rsqrt_parts) with its error bound (absolute): q's 3 u^2
/// halved, the dropped t^2, t r and r^2 terms (<= 4 u^2) and the correction's four roundings
/// (<= 8 u^2) make <= 16 u^2 gamma; bound 64 u^2 gamma.
template <class T>
EIGENZEIT_HOST_DEVICE inline T gamma_parts(T a, dd<T>& parts) {
  parts = rsqrt_parts(one_minus_square(a));
  return numeric::relative_u2<T, 6>() * parts.hi;
}

/// beta gamma of |beta| = a as hi + lo with its error bound (absolute): gamma's 16 u^2 times a,
/// plus the roundings of a c and of the low sum (4 u^2 a gamma); bound 128 u^2 a gamma.
template <class T>
EIGENZEIT_HOST_DEVICE inline T proper_speed_parts(T a, dd<T>& parts) {
  const dd<T> g = rsqrt_parts(one_minus_square(a));
  const dd<T> p = two_prod(a, g.hi);
  parts = {p.hi, p.lo + a * g.lo};
  return numeric::relative_u2<T, 7>() * p.hi;
}

/// gamma - 1 of |beta| = a as hi + lo with its error bound (absolute), see lorentz_factor_m1.
template <class T>
EIGENZEIT_HOST_DEVICE inline T gamma_m1_parts(T a, dd<T>& parts) {
  const dd<T> x = two_prod(a, a);
  if (x.hi < numeric::small_square_threshold<T>()) {
    parts = {x.hi / 2, gamma_m1_series_low(x)};
    return x.hi * series_error(x.hi);
  }
  const dd<T> g = rsqrt_parts(one_minus_square(a));
  const dd<T> h = fast_two_sum(g.hi, T(-1));
  parts = {h.hi, h.lo + g.lo};
  return numeric::relative_u2<T, 7>() * g.hi;
}

/// 1 - sqrt(1 - a^2) as hi + lo with its error bound (absolute), see dilation_fraction.  The
/// closed form here divides by s instead of taking dilation_fraction's division-free
/// reciprocal (whose error reaches 0.27 u), so that the correction keeps O(u^2).
template <class T>
EIGENZEIT_HOST_DEVICE inline T dilation_parts(T a, dd<T>& parts) {
  using std::sqrt;
  const dd<T> x = two_prod(a, a);
  if (x.hi < numeric::small_square_threshold<T>()) {
    parts = {x.hi / 2, dilation_series_low(x)};
    return x.hi * series_error(x.hi);
  }
  const dd<T> q = one_minus_square(a);
  const T s = sqrt(q.hi);
  const T r = -fms(s, s, q.hi) + q.lo;
  const dd<T> h = fast_two_sum(T(1), -s);
  parts = {h.hi, h.lo - T(0.5) * r / s};
  return numeric::relative_u2<T, 4>();  // absolute: the error is <= 6 u^2 and 1 - s < 1
}

/// sqrt(1 - a^2) = 1/gamma as hi + lo: s + r / (2 s), error <= 2.5 u^2 s (q's 3 u^2 halved, the
/// dropped r^2 / (8 s^3), the correction's roundings).
template <class T>
EIGENZEIT_HOST_DEVICE inline T inv_gamma_parts(T a, dd<T>& parts) {
  using std::sqrt;
  const dd<T> q = one_minus_square(a);
  const T s = sqrt(q.hi);
  const T r = -fms(s, s, q.hi) + q.lo;
  parts = {s, T(0.5) * r / s};
  return numeric::relative_u2<T, 4>() * s;
}

/// The correctly rounded mode's last step: `parts` within `err` of the exact result; if that
/// does not decide the rounding, climb the ladder with fallback(type_tag<W>) -> result in W.
template <class T, class Fallback, class Policy>
inline T decide(dd<T> parts, T err, const Fallback& fallback, const char* function, T input,
                const Policy& pol) {
  T out;
  if (numeric::try_decide(parts, err, out)) return out;
  return numeric::climb_ladder<T>(fallback, function, input, numeric::error_policy_of(pol));
}

/// The domain error of every free function of beta: |beta| < 1 failed (or beta is NaN).
template <class R, class Policy>
inline R beta_domain_error(const char* function, R beta, const Policy& pol) {
  return numeric::domain_error<R>(function,
                                  "beta = %1%, but it must lie in the open interval (-1, 1)",
                                  beta, pol);
}

}  // namespace detail

// ============================================================================================
// Free functions of a signed beta in (-1, 1)
// ============================================================================================

// Every free function takes an optional policy argument: a Boost.Math error policy
// (throw_policy, nan_policy, errno_policy), or eigenzeit::correctly_rounded (of type
// correctly_rounded_policy<ErrorPolicy>) for the correctly rounded result: the fast path when
// its error bound decides the rounding, the widening ladder otherwise (numeric/rounding.hpp).

/// Lorentz factor gamma = 1 / sqrt(1 - beta^2).
/// Domain: -1 < beta < 1; otherwise (and for NaN) a domain error through the policy.
/// Accuracy: <= 1 ulp (measured max 0.5x ulp, double; see README for the table).
template <class T, class Policy = throw_policy>
inline numeric::promote_t<T> lorentz_factor(T beta_in, const Policy& pol = Policy()) {
  using R = numeric::promote_t<T>;
  using std::abs;
  const R beta = R(beta_in);
  const R a = abs(beta);
  if (!(a < R(1)))
    return detail::beta_domain_error("eigenzeit::lorentz_factor<%1%>(%1%)", beta,
                                     numeric::error_policy_of(pol));
  numeric::dd<R> g;
  const R err = detail::gamma_parts(a, g);
  if constexpr (numeric::is_correctly_rounded_v<Policy>) {
    return detail::decide(g, err,
                          [a](auto tag) {
                            using W = typename decltype(tag)::type;
                            return lorentz_factor(W(a));
                          },
                          "eigenzeit::lorentz_factor<%1%>(%1%)", beta, pol);
  }
  (void)err;
  return g.hi + g.lo;
}

/// gamma - 1 = beta^2 / (sqrt(1 - beta^2) (1 + sqrt(1 - beta^2))), without cancellation.
/// Domain: -1 < beta < 1.  Accuracy: <= 1 ulp (double).
template <class T, class Policy = throw_policy>
inline numeric::promote_t<T> lorentz_factor_m1(T beta_in, const Policy& pol = Policy()) {
  using R = numeric::promote_t<T>;
  using std::abs;
  const R beta = R(beta_in);
  const R a = abs(beta);
  if (!(a < R(1)))
    return detail::beta_domain_error("eigenzeit::lorentz_factor_m1<%1%>(%1%)", beta,
                                     numeric::error_policy_of(pol));
  if constexpr (numeric::is_correctly_rounded_v<Policy>) {
    numeric::dd<R> parts;
    const R err = detail::gamma_m1_parts(a, parts);
    return detail::decide(parts, err,
                          [a](auto tag) {
                            using W = typename decltype(tag)::type;
                            return lorentz_factor_m1(W(a));
                          },
                          "eigenzeit::lorentz_factor_m1<%1%>(%1%)", beta, pol);
  }
  numeric::dd<R> x = detail::two_prod(a, a);
  if (x.hi < numeric::small_square_threshold<R>()) return detail::gamma_m1_series(x);
  return detail::minus_one(detail::rsqrt_parts(detail::one_minus_square(a)));
}

/// Proper speed (celerity) u = beta * gamma, in units of c; keeps the sign of beta.
/// Domain: -1 < beta < 1.  Accuracy: <= 1 ulp (double).
template <class T, class Policy = throw_policy>
inline numeric::promote_t<T> proper_speed(T beta_in, const Policy& pol = Policy()) {
  using R = numeric::promote_t<T>;
  using std::abs;
  const R beta = R(beta_in);
  const R a = abs(beta);
  if (!(a < R(1)))
    return detail::beta_domain_error("eigenzeit::proper_speed<%1%>(%1%)", beta,
                                     numeric::error_policy_of(pol));
  // a (y + c) with the product split exactly: error 0.5 ulp + O(u^2).
  numeric::dd<R> p;
  const R err = detail::proper_speed_parts(a, p);
  if constexpr (numeric::is_correctly_rounded_v<Policy>) {
    return detail::copysign_<R>(
        detail::decide(p, err,
                       [a](auto tag) {
                         using W = typename decltype(tag)::type;
                         return proper_speed(W(a));
                       },
                       "eigenzeit::proper_speed<%1%>(%1%)", beta, pol),
        beta);
  }
  (void)err;
  return detail::copysign_<R>(p.hi + p.lo, beta);
}

/// Fraction of coordinate time a moving clock loses: 1 - 1/gamma = 1 - sqrt(1 - beta^2).
/// Domain: -1 < beta < 1.  Accuracy: <= 1 ulp (double).
template <class T, class Policy = throw_policy>
inline numeric::promote_t<T> dilation_fraction(T beta_in, const Policy& pol = Policy()) {
  using R = numeric::promote_t<T>;
  using std::abs;
  using std::sqrt;
  const R beta = R(beta_in);
  const R a = abs(beta);
  if (!(a < R(1)))
    return detail::beta_domain_error("eigenzeit::dilation_fraction<%1%>(%1%)", beta,
                                     numeric::error_policy_of(pol));
  if constexpr (numeric::is_correctly_rounded_v<Policy>) {
    numeric::dd<R> parts;
    const R err = detail::dilation_parts(a, parts);
    return detail::decide(parts, err,
                          [a](auto tag) {
                            using W = typename decltype(tag)::type;
                            return dilation_fraction(W(a));
                          },
                          "eigenzeit::dilation_fraction<%1%>(%1%)", beta, pol);
  }
  numeric::dd<R> x = detail::two_prod(a, a);
  if (x.hi < numeric::small_square_threshold<R>()) return detail::dilation_series(x);
  // 1 - sqrt(q) with sqrt(q) = s + r / (2 s).  No division: 1/s is approximated by one Newton
  // step from 2 - s, relative error (1 - s)^4; with |r| <= 5u q the correction's error is
  // below 2.5u s (1 - s)^3 relative to the result (< 0.27u).  1 - s is split exactly.
  const numeric::dd<R> q = detail::one_minus_square(a);
  const R s = sqrt(q.hi);
  const R r = -numeric::fms(s, s, q.hi) + q.lo;
  R w = R(2) - s;
  w = w * (R(2) - s * w);
  numeric::dd<R> h = numeric::fast_two_sum(R(1), -s);
  return h.hi + (h.lo - R(0.5) * r * w);
}

/// Rapidity eta = atanh(beta) = log1p(2 beta / (1 - beta)) / 2; keeps the sign of beta.
/// Domain: -1 < beta < 1.  Accuracy: <= 2 ulp (double; measured max 1.1 ulp).  In the
/// correctly rounded mode it is evaluated on the ladder from the first wider rung on, since
/// the library log of T is itself only good to about an ulp.
template <class T, class Policy = throw_policy>
inline numeric::promote_t<T> rapidity(T beta_in, const Policy& pol = Policy()) {
  using R = numeric::promote_t<T>;
  using std::abs;
  const R beta = R(beta_in);
  const R a = abs(beta);
  if (!(a < R(1)))
    return detail::beta_domain_error("eigenzeit::rapidity<%1%>(%1%)", beta,
                                     numeric::error_policy_of(pol));
  if constexpr (numeric::is_correctly_rounded_v<Policy>) {
    if (a == 0) return beta;
    return detail::copysign_<R>(
        numeric::climb_ladder<R>(
            [a](auto tag) {
              using W = typename decltype(tag)::type;
              return rapidity(W(a));
            },
            "eigenzeit::rapidity<%1%>(%1%)", beta, numeric::error_policy_of(pol)),
        beta);
  }
  return detail::copysign_<R>(detail::atanh_words<false>(a, R(0)), beta);
}

// ============================================================================================
// speed<T>
// ============================================================================================

/// Which named constructor a speed came from (rounded_speed keeps it with the input).
enum class speed_origin { beta, beta_deficit, gamma, gamma_m1, rapidity, proper_speed, kinetic_energy, momentum };

template <class T, class ErrorPolicy = throw_policy>
class rounded_speed;

/// One speed magnitude 0 <= beta < 1 of a massive body, stored as beta and gamma, each as a
/// double-word number (hi + lo), so that every view is accurate whichever quantity it was
/// built from.  Trivially copyable; 4 * sizeof(T) bytes.
///
/// Named constructors validate their input through the policy (default: throw
/// std::domain_error naming the function and the value); with a NaN-returning policy an
/// invalid input gives a speed whose views are all NaN.  The speed of light itself is not a
/// speed<T>: beta = 1, deficit 0, and infinite gamma, rapidity or proper speed are errors.
template <class T>
class speed {
  static_assert(!std::is_integral<T>::value, "speed<T> needs a real type");

 public:
  using value_type = T;

  /// Speed at rest (beta = 0).
  speed() : b_{T(0), T(0)}, g_{T(1), T(0)} {}

  // ---- named constructors ----------------------------------------------------------------

  /// From beta in [0, 1).
  template <class Policy = throw_policy>
  static speed from_beta(T beta, const Policy& pol = Policy()) {
    if (!(beta >= T(0) && beta < T(1)))
      return invalid("eigenzeit::speed<%1%>::from_beta(%1%)",
                     "beta = %1%, but it must lie in [0, 1)", beta, pol);
    // The exact input takes the short form of q = 1 - beta^2 (one_minus_square), the same as
    // the free functions; from_beta_dd forms q from two double-word numbers.
    const numeric::dd<T> b{beta + T(0), T(0)};  // + 0 turns -0 into +0
    const numeric::dd<T> x = numeric::two_prod(b.hi, b.hi);
    if (x.hi < numeric::small_square_threshold<T>()) return speed(b, gamma_from_series(x));
    return speed(b, gamma_from_q(detail::one_minus_square(b.hi)));
  }

  /// From the deficit d = 1 - beta in (0, 1].
  template <class Policy = throw_policy>
  static speed from_beta_deficit(T deficit, const Policy& pol = Policy()) {
    if (!(deficit > T(0) && deficit <= T(1)))
      return invalid("eigenzeit::speed<%1%>::from_beta_deficit(%1%)",
                     "1 - beta = %1%, but it must lie in (0, 1]", deficit, pol);
    return from_beta_dd(numeric::fast_two_sum(T(1), -deficit), {deficit, T(0)});
  }

  /// From the Lorentz factor gamma in [1, inf).
  template <class Policy = throw_policy>
  static speed from_gamma(T gamma, const Policy& pol = Policy()) {
    using std::isfinite;
    if (!(gamma >= T(1)) || !isfinite(gamma))
      return invalid("eigenzeit::speed<%1%>::from_gamma(%1%)",
                     "gamma = %1%, but it must be finite and >= 1", gamma, pol);
    return from_gamma_m1_dd(numeric::fast_two_sum(gamma, T(-1)), {gamma, T(0)});
  }

  /// From gamma - 1 in [0, inf).
  template <class Policy = throw_policy>
  static speed from_gamma_m1(T gamma_m1, const Policy& pol = Policy()) {
    using std::isfinite;
    if (!(gamma_m1 >= T(0)) || !isfinite(gamma_m1))
      return invalid("eigenzeit::speed<%1%>::from_gamma_m1(%1%)",
                     "gamma - 1 = %1%, but it must be finite and >= 0", gamma_m1, pol);
    return from_gamma_m1_dd({gamma_m1, T(0)}, numeric::two_sum(T(1), gamma_m1));
  }

  /// From the rapidity eta = atanh(beta) in [0, inf); gamma = cosh(eta) must be finite.
  /// Accuracy of the views: <= 2 ulp (double), since exp's rounding enters once.
  template <class Policy = throw_policy>
  static speed from_rapidity(T eta, const Policy& pol = Policy()) {
    using std::isfinite;
    if (!(eta >= T(0)) || !isfinite(eta))
      return invalid("eigenzeit::speed<%1%>::from_rapidity(%1%)",
                     "rapidity = %1%, but it must be finite and >= 0", eta, pol);
    if (eta <= T(4)) {
      // proper speed sinh(eta) = eta sum_k eta^2k / (2k+1)!: positive terms, Horner in
      // double-word arithmetic from eta^2 (exact), error O(u^2); no exp call at all.
      return from_proper_speed_dd(sinh_series(eta));
    }
    // sinh(eta) = (E - 1/E) / 2 with E = e^eta: E's rounding (~1 ulp) passes to the proper
    // speed and gamma nearly unchanged (the 1/E term is below 4e-4 of E for eta > 4).
    const T big = detail::exp_(eta);
    if (!isfinite(big)) {
      // e^eta overflows while gamma = e^eta / 2 (1 + e^(-2 eta)) may not: E/2 = 2 exp(eta - 2 ln 2),
      // with ln 2 as a double-word constant, so that r = eta - 2 ln 2 is exact to ~u^2 (the
      // two_sum) and exp(r.hi + r.lo) = exp(r.hi) (1 + r.lo): exp's one rounding, as above;
      // exp(r.hi) itself cannot overflow, so only a true overflow of gamma is refused.
      // 1/E is below 2^-1000 of E here: gamma = proper speed = E/2, and 1 - beta underflows.
      const numeric::dd<T> ln2 = detail::ln2_words<T>();
      numeric::dd<T> r = numeric::two_sum(eta, -2 * ln2.hi);
      r = numeric::fast_two_sum(r.hi, r.lo - 2 * ln2.lo);
      const T quarter = detail::exp_(r.hi);
      const numeric::dd<T> q = numeric::fast_two_sum(quarter, quarter * r.lo);
      const numeric::dd<T> half{2 * q.hi, 2 * q.lo};  // exact doubling, after the low word
      if (!isfinite(half.hi))
        return invalid("eigenzeit::speed<%1%>::from_rapidity(%1%)",
                       "rapidity = %1% gives a Lorentz factor beyond the largest finite value",
                       eta, pol);
      return from_proper_speed_dd(half);
    }
    numeric::dd<T> e{big, T(0)};
    numeric::dd<T> u = numeric::dd_add(e, numeric::dd_div(numeric::dd<T>{T(-1), T(0)}, e));
    speed s = from_proper_speed_dd({u.hi / 2, u.lo / 2});
    // 1 - beta = 2 e^(-2 eta) / (1 + e^(-2 eta)) from its own exp call (-2 eta is exact), so
    // that the deficit carries one exp rounding, not the doubled one of 1 / (2 E^2).
    const T e2 = detail::exp_(T(-2 * eta));
    numeric::dd<T> d = numeric::dd_div(numeric::dd<T>{2 * e2, T(0)}, numeric::two_sum(T(1), e2));
    numeric::dd<T> b = numeric::fast_two_sum(T(1), -d.hi);
    s.b_ = numeric::fast_two_sum(b.hi, b.lo - d.lo);
    return s;
  }

  /// From the proper speed u = beta * gamma in [0, inf), in units of c.
  template <class Policy = throw_policy>
  static speed from_proper_speed(T u, const Policy& pol = Policy()) {
    using std::isfinite;
    if (!(u >= T(0)) || !isfinite(u))
      return invalid("eigenzeit::speed<%1%>::from_proper_speed(%1%)",
                     "proper speed = %1%, but it must be finite and >= 0", u, pol);
    return from_proper_speed_dd({u, T(0)});
  }

  /// From kinetic energy and rest energy in one unit (T_kin and m c^2): gamma - 1 = T_kin / m.
  template <class Policy = throw_policy>
  static speed from_kinetic_energy(T kinetic, T mass, const Policy& pol = Policy()) {
    using std::isfinite;
    if (!(mass > T(0)) || !isfinite(mass))
      return invalid("eigenzeit::speed<%1%>::from_kinetic_energy(%1%, mass)",
                     "mass = %1%, but it must be finite and > 0", mass, pol);
    if (!(kinetic >= T(0)) || !isfinite(kinetic))
      return invalid("eigenzeit::speed<%1%>::from_kinetic_energy(%1%, mass)",
                     "kinetic energy = %1%, but it must be finite and >= 0", kinetic, pol);
    if (kinetic == 0) return speed();
    // m = K / mass as r 2^e with r from the significands (see ratio): no overflow, no
    // underflow, an exact remainder, whatever the two exponents.
    int e = 0;
    const numeric::dd<T> r = ratio(kinetic, mass, e);
    const numeric::dd<T> m = numeric::dd_ldexp(r, e);
    if (!isfinite(m.hi) || !isfinite(m.hi + m.lo))
      return invalid("eigenzeit::speed<%1%>::from_kinetic_energy(%1%, mass)",
                     "kinetic energy = %1% over the mass gives a Lorentz factor beyond the "
                     "largest finite value", kinetic, pol);
    if (m.hi < numeric::rescale_threshold<T>()) {
      // K/m so small that it may leave the normal range while beta = sqrt(2 K/m) does not:
      // beta = sqrt(2 r 2^e) with the exponent halved exactly (2 r or 4 r under the root so
      // that e becomes even).  Dropping m^2 from m (m + 2) costs a relative m / 2, far below u.
      const int odd = (e % 2 != 0) ? 1 : 0;
      const numeric::dd<T> b = numeric::dd_sqrt(numeric::dd_ldexp(r, 1 + odd));
      return speed(numeric::dd_ldexp(b, (e - odd) / 2), add_one(m));
    }
    return from_gamma_m1_dd(m, add_one(m));
  }

  /// From momentum and rest energy in one unit (p c and m c^2): proper speed = p / m.
  template <class Policy = throw_policy>
  static speed from_momentum(T momentum, T mass, const Policy& pol = Policy()) {
    using std::isfinite;
    if (!(mass > T(0)) || !isfinite(mass))
      return invalid("eigenzeit::speed<%1%>::from_momentum(%1%, mass)",
                     "mass = %1%, but it must be finite and > 0", mass, pol);
    if (!(momentum >= T(0)) || !isfinite(momentum))
      return invalid("eigenzeit::speed<%1%>::from_momentum(%1%, mass)",
                     "momentum = %1%, but it must be finite and >= 0", momentum, pol);
    if (momentum == 0) return speed();
    int e = 0;
    const numeric::dd<T> r = ratio(momentum, mass, e);
    const numeric::dd<T> u = numeric::dd_ldexp(r, e);
    if (!isfinite(u.hi) || !isfinite(u.hi + u.lo))
      return invalid("eigenzeit::speed<%1%>::from_momentum(%1%, mass)",
                     "momentum = %1% over the mass gives a proper speed beyond the largest "
                     "finite value", momentum, pol);
    return from_proper_speed_dd(u);
  }

  // ---- from double-word values --------------------------------------------------------------
  // For code that carries extra precision (the frames layer builds boosts from them): the
  // value is hi + lo, |lo| <= ulp(hi) / 2, and the speed is built as accurately as from an
  // exact input of twice the precision.

  /// From beta = hi + lo in [0, 1).
  template <class Policy = throw_policy>
  static speed from_beta_words(numeric::dd<T> beta, const Policy& pol = Policy()) {
    const T sum = beta.hi + beta.lo;
    // Below 1 decided on the words: hi = 1 with a negative lo is below 1 although hi + lo
    // rounds to 1.
    const bool below_one = beta.hi < T(1) || (beta.hi == T(1) && beta.lo < T(0));
    if (!(beta.hi >= T(0) && sum >= T(0) && below_one))
      return invalid("eigenzeit::speed<%1%>::from_beta_words(%1%)",
                     "beta = %1% (high + low word), but it must lie in [0, 1)", sum, pol);
    if (beta.hi == 0) return speed();
    // 1 - beta from the words: 1 - hi is exact (hi in [1/2, 1)) or the sum is normalised.
    numeric::dd<T> d = numeric::two_sum(T(1), -beta.hi);
    d = numeric::fast_two_sum(d.hi, d.lo - beta.lo);
    return from_beta_dd(beta, d);
  }

  /// From gamma - 1 = hi + lo in [0, inf).
  template <class Policy = throw_policy>
  static speed from_gamma_m1_words(numeric::dd<T> gamma_m1, const Policy& pol = Policy()) {
    using std::isfinite;
    const T sum = gamma_m1.hi + gamma_m1.lo;
    if (!(gamma_m1.hi >= T(0) && sum >= T(0)) || !isfinite(sum))
      return invalid("eigenzeit::speed<%1%>::from_gamma_m1_words(%1%)",
                     "gamma - 1 = %1% (high + low word), but it must be finite and >= 0", sum,
                     pol);
    if (gamma_m1.hi == 0) return speed();
    return from_gamma_m1_dd(gamma_m1, add_one(gamma_m1));
  }

  /// From the proper speed beta gamma = hi + lo in [0, inf).
  template <class Policy = throw_policy>
  static speed from_proper_speed_words(numeric::dd<T> u, const Policy& pol = Policy()) {
    using std::isfinite;
    const T sum = u.hi + u.lo;
    if (!(u.hi >= T(0) && sum >= T(0)) || !isfinite(sum))
      return invalid("eigenzeit::speed<%1%>::from_proper_speed_words(%1%)",
                     "proper speed = %1% (high + low word), but it must be finite and >= 0", sum,
                     pol);
    if (u.hi == 0) return speed();
    return from_proper_speed_dd(u);
  }

  // ---- the same constructors in the correctly rounded mode --------------------------------
  // Given eigenzeit::correctly_rounded as the policy, each named constructor returns a
  // rounded_speed<T>: the same speed, and the input it came from, so that every view can be
  // returned correctly rounded (see rounded_speed below).

  template <class E>
  static rounded_speed<T, E> from_beta(T beta, const correctly_rounded_policy<E>&) {
    return {from_beta(beta, E()), speed_origin::beta, beta, T(0)};
  }
  template <class E>
  static rounded_speed<T, E> from_beta_deficit(T deficit, const correctly_rounded_policy<E>&) {
    return {from_beta_deficit(deficit, E()), speed_origin::beta_deficit, deficit, T(0)};
  }
  template <class E>
  static rounded_speed<T, E> from_gamma(T gamma, const correctly_rounded_policy<E>&) {
    return {from_gamma(gamma, E()), speed_origin::gamma, gamma, T(0)};
  }
  template <class E>
  static rounded_speed<T, E> from_gamma_m1(T gamma_m1, const correctly_rounded_policy<E>&) {
    return {from_gamma_m1(gamma_m1, E()), speed_origin::gamma_m1, gamma_m1, T(0)};
  }
  template <class E>
  static rounded_speed<T, E> from_rapidity(T eta, const correctly_rounded_policy<E>&) {
    return {from_rapidity(eta, E()), speed_origin::rapidity, eta, T(0)};
  }
  template <class E>
  static rounded_speed<T, E> from_proper_speed(T u, const correctly_rounded_policy<E>&) {
    return {from_proper_speed(u, E()), speed_origin::proper_speed, u, T(0)};
  }
  template <class E>
  static rounded_speed<T, E> from_kinetic_energy(T kinetic, T mass, const correctly_rounded_policy<E>&) {
    return {from_kinetic_energy(kinetic, mass, E()), speed_origin::kinetic_energy, kinetic, mass};
  }
  template <class E>
  static rounded_speed<T, E> from_momentum(T momentum, T mass, const correctly_rounded_policy<E>&) {
    return {from_momentum(momentum, mass, E()), speed_origin::momentum, momentum, mass};
  }

  // ---- views ---------------------------------------------------------------------------

  /// beta = v / c.  Correctly rounded (it is the high word).
  T beta() const { return b_.hi; }

  /// 1 - beta, accurate down to the smallest normal deficit.  Accuracy: <= 1 ulp.
  T beta_deficit() const {
    numeric::dd<T> h = numeric::fast_two_sum(T(1), -b_.hi);
    return h.hi + (h.lo - b_.lo);
  }

  /// gamma.  Correctly rounded (it is the high word).
  T gamma() const { return g_.hi; }

  /// gamma - 1.  Accuracy: <= 1 ulp.
  T gamma_m1() const { return detail::minus_one(g_); }

  /// 1 / gamma = sqrt(1 - beta^2).  One division and a residual step: <= 1 ulp.
  T inv_gamma() const {
    numeric::dd<T> s = reciprocal_gamma();
    return s.hi + s.lo;
  }

  /// 1 - 1/gamma.  Accuracy: <= 1 ulp.
  T dilation_fraction() const {
    if (b_.hi * b_.hi < numeric::small_square_threshold<T>())
      return detail::dilation_series(beta_squared());
    numeric::dd<T> s = reciprocal_gamma();  // s.hi <= 1, so 1 - s.hi splits exactly
    numeric::dd<T> h = numeric::fast_two_sum(T(1), -s.hi);
    return h.hi + (h.lo - s.lo);
  }

  /// Rapidity atanh(beta), from the stored beta words (see detail::atanh_words).
  /// Accuracy: <= 2 ulp.
  T rapidity() const {
    // 1 - beta ~ 1/(2 gamma^2) comes exactly from the stored words and stays normal while
    // gamma <= 2^(max_exponent/2 - 4); above, log(1 + beta) = log 2 - (1 - beta)/2 to far
    // below an ulp, so eta = log(gamma) + log 2.
    if (g_.hi > numeric::pow2_const<T, std::numeric_limits<T>::max_exponent / 2 - 4>())
      return detail::log_(g_.hi) + (detail::log_(T(2)) + g_.lo / g_.hi);  // log(1 + beta) = log 2 - d/2, d < 2^-max_exponent
    return detail::atanh_words<true>(b_.hi, b_.lo);
  }

  /// Proper speed beta * gamma, in units of c.  Accuracy: <= 1 ulp.
  T proper_speed() const {
    numeric::dd<T> u = proper_speed_dd();
    return u.hi + u.lo;
  }

  /// The stored words, for code that wants to carry the extra precision further.
  numeric::dd<T> beta_words() const { return b_; }
  numeric::dd<T> gamma_words() const { return g_; }

 private:
  numeric::dd<T> b_;  // beta
  numeric::dd<T> g_;  // gamma

  speed(numeric::dd<T> b, numeric::dd<T> g) : b_(b), g_(g) {}

  template <class Policy>
  static speed invalid(const char* function, const char* message, T value, const Policy& pol) {
    T nan = numeric::domain_error<T>(function, message, value, pol);
    return speed({nan, nan}, {nan, nan});
  }

  // sinh(eta) for 0 <= eta <= 4 as a double-word number (see from_rapidity).
  static numeric::dd<T> sinh_series(T eta) {
    const numeric::dd<T> x = numeric::two_prod(eta, eta);
    // Terms x^k / (2k+1)! relative to 1; stop below eps^2 (the count is found in T first).
    const T tol = std::numeric_limits<T>::epsilon() * std::numeric_limits<T>::epsilon();
    T term = T(1);
    int n = 0;
    while (n < 8 * numeric::digits_v<T> && term > tol) {
      ++n;
      term = term * x.hi / T((2 * n) * (2 * n + 1));
    }
    // Horner: p = 1 + x / ((2k)(2k+1)) p from the innermost level, then sinh = eta p.
    numeric::dd<T> p{T(1), T(0)};
    for (int k = n; k >= 1; --k) {
      numeric::dd<T> q = numeric::dd_div(numeric::dd_mul(x, p),
                                         numeric::dd<T>{T((2 * k) * (2 * k + 1)), T(0)});
      p = numeric::dd_add(numeric::dd<T>{T(1), T(0)}, q);
    }
    return numeric::dd_mul(numeric::dd<T>{eta, T(0)}, p);
  }

  // gamma = 1 + m for beta^2 = x below the series threshold: m from the series has relative
  // error ~u, and 1 + m splits exactly, so gamma - 1 keeps it.
  static numeric::dd<T> gamma_from_series(numeric::dd<T> x) {
    return numeric::fast_two_sum(T(1), detail::gamma_m1_series(x));
  }

  // gamma = 1 / sqrt(q) as a normalised double-word number.
  static numeric::dd<T> gamma_from_q(numeric::dd<T> q) {
    const numeric::dd<T> g = detail::rsqrt_parts(q);
    return numeric::fast_two_sum(g.hi, g.lo);
  }

  // a / b = r 2^e with r in (1/2, 2) as a double-word number: the significands of a and b
  // (both positive and finite) divided with an exact remainder.  Error <= 4 u^2 relative.
  static numeric::dd<T> ratio(T a, T b, int& e) {
    using std::ilogb;
    using std::ldexp;
    const int ea = static_cast<int>(ilogb(a)), eb = static_cast<int>(ilogb(b));
    e = ea - eb;
    return numeric::dd_div(numeric::dd<T>{ldexp(a, -ea), T(0)}, numeric::dd<T>{ldexp(b, -eb), T(0)});
  }

  static numeric::dd<T> add_one(numeric::dd<T> m) {
    return numeric::dd_add(numeric::two_sum(T(1), m.hi), numeric::dd<T>{m.lo, T(0)});
  }

  numeric::dd<T> beta_squared() const {
    numeric::dd<T> x = numeric::two_prod(b_.hi, b_.hi);
    return {x.hi, x.lo + 2 * b_.hi * b_.lo};
  }

  numeric::dd<T> proper_speed_dd() const {
    numeric::dd<T> p = numeric::two_prod(b_.hi, g_.hi);
    return numeric::fast_two_sum(p.hi, p.lo + (b_.hi * g_.lo + b_.lo * g_.hi));
  }

  // 1 / (g.hi + g.lo) = y (1 + t)(1 - y g.lo) + O(u^2) with y = RN(1/g.hi), t = 1 - y g.hi exact.
  numeric::dd<T> reciprocal_gamma() const {
    const T y = T(1) / g_.hi;
    const T t = -numeric::fms(y, g_.hi, T(1));
    return {y, y * (t - y * g_.lo)};
  }

  // Builds from beta and d = 1 - beta, both exact double-word numbers.
  static speed from_beta_dd(numeric::dd<T> b, numeric::dd<T> d) {
    numeric::dd<T> x = numeric::two_prod(b.hi, b.hi);
    x.lo += 2 * b.hi * b.lo;
    if (x.hi < numeric::small_square_threshold<T>()) return speed(b, gamma_from_series(x));
    // q = 1 - beta^2 = d (1 + beta) = d (2 - d) in double-word arithmetic.
    numeric::dd<T> two_minus_d = numeric::fast_two_sum(T(2), -d.hi);
    two_minus_d.lo -= d.lo;
    int scale = 0;
    if (d.hi < numeric::rescale_threshold<T>()) {
      // Tiny deficit: scale d by 2^(2k), k = 2 digits, so that even the smallest subnormal
      // becomes >= min / eps^2 and the residuals of the square root stay normal; 1/sqrt
      // then scales back by 2^k exactly.
      scale = 2 * numeric::digits_v<T>;
      d = numeric::dd_ldexp(d, 2 * scale);
    }
    numeric::dd<T> g = gamma_from_q(numeric::dd_mul(d, two_minus_d));
    if (scale != 0) g = numeric::dd_ldexp(g, scale);
    return speed(b, g);
  }

  // Builds from m = gamma - 1 and gamma, both accurate double-word numbers.
  static speed from_gamma_m1_dd(numeric::dd<T> m, numeric::dd<T> g) {
    if (m.hi < numeric::rescale_threshold<T>()) {
      // Tiny m (subnormal included): beta = sqrt(2 m) to far below an ulp, taken from
      // 2^(4p) m (exact scaling, well inside the normal range, so the square root's residual
      // is exact) and scaled back by 2^(-2p).
      const int k = 2 * numeric::digits_v<T>;
      const numeric::dd<T> b = numeric::dd_sqrt(numeric::dd_ldexp(m, 2 * k + 1));
      return speed(numeric::dd_ldexp(b, -k), g);
    }
    if (m.hi <= T(1)) {
      // beta = sqrt(m (m + 2)) / gamma: products and sums of positive terms only.
      numeric::dd<T> m2 = numeric::dd_add(m, numeric::dd<T>{T(2), T(0)});
      numeric::dd<T> u = numeric::dd_sqrt(numeric::dd_mul(m, m2));
      return speed(numeric::dd_div(u, g), g);
    }
    // Fast: s = 1/gamma <= 1/2; beta = sqrt(1 - s^2) and d = 1 - beta = s^2 / (1 + beta),
    // then beta = 1 - d from the accurate small d (holds 1 - 1e-300 exactly in two words).
    numeric::dd<T> s = numeric::dd_div(numeric::dd<T>{T(1), T(0)}, g);
    numeric::dd<T> s2 = numeric::dd_mul(s, s);
    numeric::dd<T> b0 = numeric::dd_sqrt(numeric::dd_add(numeric::dd<T>{T(1), T(0)},
                                                         numeric::dd<T>{-s2.hi, -s2.lo}));
    numeric::dd<T> d = numeric::dd_div(s2, numeric::dd_add(numeric::dd<T>{T(1), T(0)}, b0));
    numeric::dd<T> b = numeric::fast_two_sum(T(1), -d.hi);
    b = numeric::fast_two_sum(b.hi, b.lo - d.lo);
    return speed(b, g);
  }

  static speed from_proper_speed_dd(numeric::dd<T> u) {
    numeric::dd<T> one{T(1), T(0)};
    if (u.hi <= T(1)) {
      // gamma - 1 = u^2 / (1 + sqrt(1 + u^2)), no cancellation.
      numeric::dd<T> x = numeric::dd_mul(u, u);
      numeric::dd<T> root = numeric::dd_sqrt(numeric::dd_add(one, x));
      numeric::dd<T> m = numeric::dd_div(x, numeric::dd_add(one, root));
      // beta = u / sqrt(1 + u^2) directly: for tiny u, u^2 underflows but beta must not.
      return speed(numeric::dd_div(u, root), add_one(m));
    }
    // gamma = u sqrt(1 + 1/u^2): no overflow for any finite u.
    numeric::dd<T> w = numeric::dd_div(one, u);
    numeric::dd<T> g = numeric::dd_mul(u, numeric::dd_sqrt(numeric::dd_add(one, numeric::dd_mul(w, w))));
    numeric::dd<T> m = numeric::dd_add(g, numeric::dd<T>{T(-1), T(0)});
    return from_gamma_m1_dd(m, g);
  }
};

// ============================================================================================
// rounded_speed<T>: the correctly rounded mode of speed<T>
// ============================================================================================

/// The views of one speed, correctly rounded.  Made by the named constructors of speed<T>
/// given eigenzeit::correctly_rounded (or correctly_rounded_policy<ErrorPolicy>) as the
/// policy; ErrorPolicy reports the (not expected) case of a rounding that the widest rung
/// cannot decide.  It keeps the speed<T> and the input it
/// came from (so 4 sizeof(T) + 2 sizeof(T) + the origin tag; 56 bytes for double).
///
/// Each view first tries a fast path from the input: the free functions' forms for from_beta,
/// and for the other algebraic constructors gamma - 1, gamma and the proper speed as
/// double-word numbers from the input (sums and products of positive terms, O(u^2)), from
/// which every algebraic view follows without cancellation (see from_mgu).  Where that path's
/// bound leaves the rounding open, for the rapidity views, for everything built from a
/// rapidity, and for inputs near the ends of the exponent range, the speed is built again from
/// the same input on the next wider type of the ladder (long double for double, double for
/// float) and the view rounded back, climbing on until the rounding is decided
/// (numeric/rounding.hpp).  That fallback costs one construction and one view in the wider type.
template <class T, class ErrorPolicy>
class rounded_speed {
 public:
  using value_type = T;

  /// The views, each correctly rounded (ties to even).
  T beta() const { return view(kind::beta); }
  T beta_deficit() const { return view(kind::beta_deficit); }
  T gamma() const { return view(kind::gamma); }
  T gamma_m1() const { return view(kind::gamma_m1); }
  T inv_gamma() const { return view(kind::inv_gamma); }
  T dilation_fraction() const { return view(kind::dilation_fraction); }
  T rapidity() const { return view(kind::rapidity); }
  T proper_speed() const { return view(kind::proper_speed); }

  /// The speed itself, whose views are the default (<= 1 ulp) ones.
  const speed<T>& value() const { return s_; }
  /// The named constructor and the input (the mass is the second input of the energy ones).
  speed_origin origin() const { return origin_; }
  T input() const { return x_; }
  T mass() const { return y_; }

 private:
  friend class speed<T>;
  enum class kind { beta, beta_deficit, gamma, gamma_m1, inv_gamma, dilation_fraction, rapidity, proper_speed };

  speed<T> s_;
  speed_origin origin_;
  T x_, y_;

  rounded_speed(const speed<T>& s, speed_origin origin, T x, T y) : s_(s), origin_(origin), x_(x), y_(y) {}

  template <class U>
  static U view_of(const speed<U>& s, kind k) {
    switch (k) {
      case kind::beta: return s.beta();
      case kind::beta_deficit: return s.beta_deficit();
      case kind::gamma: return s.gamma();
      case kind::gamma_m1: return s.gamma_m1();
      case kind::inv_gamma: return s.inv_gamma();
      case kind::dilation_fraction: return s.dilation_fraction();
      case kind::rapidity: return s.rapidity();
      case kind::proper_speed: break;
    }
    return s.proper_speed();
  }

  // The same constructor on a wider type W (the input converts exactly).
  template <class W>
  speed<W> rebuild() const {
    const W x(x_), y(y_);
    switch (origin_) {
      case speed_origin::beta: return speed<W>::from_beta(x);
      case speed_origin::beta_deficit: return speed<W>::from_beta_deficit(x);
      case speed_origin::gamma: return speed<W>::from_gamma(x);
      case speed_origin::gamma_m1: return speed<W>::from_gamma_m1(x);
      case speed_origin::rapidity: return speed<W>::from_rapidity(x);
      case speed_origin::proper_speed: return speed<W>::from_proper_speed(x);
      case speed_origin::kinetic_energy: return speed<W>::from_kinetic_energy(x, y);
      case speed_origin::momentum: break;
    }
    return speed<W>::from_momentum(x, y);
  }

  // The fast paths (see the class comment); false leaves the view to the ladder.
  bool fast(kind k, T& out) const {
    const T one(1);
    numeric::dd<T> parts;
    switch (origin_) {
      case speed_origin::beta: {
        const T a = x_;
        switch (k) {
          case kind::beta: out = a; return true;
          case kind::beta_deficit: return numeric::try_decide(numeric::fast_two_sum(one, -a), T(0), out);
          case kind::gamma: { const T err = detail::gamma_parts(a, parts); return numeric::try_decide(parts, err, out); }
          case kind::gamma_m1: { const T err = detail::gamma_m1_parts(a, parts); return numeric::try_decide(parts, err, out); }
          case kind::inv_gamma: { const T err = detail::inv_gamma_parts(a, parts); return numeric::try_decide(parts, err, out); }
          case kind::dilation_fraction: { const T err = detail::dilation_parts(a, parts); return numeric::try_decide(parts, err, out); }
          case kind::proper_speed: { const T err = detail::proper_speed_parts(a, parts); return numeric::try_decide(parts, err, out); }
          case kind::rapidity: return false;
        }
        return false;
      }
      case speed_origin::beta_deficit: {
        if (k == kind::beta_deficit) { out = x_; return true; }
        const numeric::dd<T> b = numeric::fast_two_sum(one, -x_);  // exact
        if (k == kind::beta) return numeric::try_decide(b, T(0), out);
        // q = d (2 - d) = 1 - beta^2, s = sqrt(q): gamma = 1/s, u = beta/s, gamma - 1 =
        // beta^2 / (s (1 + s)); positive terms only.
        const numeric::dd<T> q = numeric::dd_mul(numeric::dd<T>{x_, T(0)}, numeric::fast_two_sum(T(2), -x_));
        if (!(q.hi > numeric::rescale_threshold<T>())) return false;
        const numeric::dd<T> sq = numeric::dd_sqrt(q);
        const numeric::dd<T> g = numeric::dd_div(numeric::dd<T>{one, T(0)}, sq);
        const numeric::dd<T> m = numeric::dd_div(numeric::dd_mul(b, b),
                                                 numeric::dd_mul(sq, numeric::dd_add(numeric::dd<T>{one, T(0)}, sq)));
        return from_mgu(m, g, numeric::dd_div(b, sq), k, out);
      }
      // gamma - 1 = gamma minus one and gamma = 1 + (gamma - 1) are exact pairs: decided with no
      // error bound at all, which also rounds their exact ties (one bit beyond the precision).
      case speed_origin::gamma: {
        const numeric::dd<T> m = numeric::fast_two_sum(x_, -one);
        if (k == kind::gamma) { out = x_; return true; }
        if (k == kind::gamma_m1) return numeric::try_decide(m, T(0), out);
        return from_m(m, {x_, T(0)}, k, out);
      }
      case speed_origin::gamma_m1: {
        const numeric::dd<T> g = numeric::two_sum(one, x_);
        if (k == kind::gamma_m1) { out = x_; return true; }
        if (k == kind::gamma) return numeric::try_decide(g, T(0), out);
        return from_m({x_, T(0)}, g, k, out);
      }
      case speed_origin::kinetic_energy: {
        if (!energies_in_range()) return false;
        const numeric::dd<T> m = numeric::dd_div(numeric::dd<T>{x_, T(0)}, numeric::dd<T>{y_, T(0)});
        const bool exact = m.lo == 0 && numeric::fms(m.hi, y_, x_) == 0;  // K / mass representable
        const numeric::dd<T> g = numeric::dd_add(numeric::dd<T>{one, T(0)}, m);
        if (exact && k == kind::gamma) return numeric::try_decide(numeric::two_sum(one, m.hi), T(0), out);
        if (exact && k == kind::gamma_m1) { out = m.hi; return true; }
        return from_m(m, g, k, out);
      }
      case speed_origin::proper_speed:
        if (k == kind::proper_speed) { out = x_; return true; }
        return from_u({x_, T(0)}, k, out);
      case speed_origin::momentum:
        if (!energies_in_range()) return false;
        return from_u(numeric::dd_div(numeric::dd<T>{x_, T(0)}, numeric::dd<T>{y_, T(0)}), k, out);
      case speed_origin::rapidity:
        if (k == kind::rapidity) { out = x_; return true; }
        return false;
    }
    return false;
  }

  // The quotient of the energy constructors has an exact remainder only while both inputs
  // stay far from the ends of the exponent range; elsewhere the ladder decides.
  bool energies_in_range() const {
    const T big = numeric::pow2_const<T, std::numeric_limits<T>::max_exponent / 2>();
    return x_ > numeric::rescale_threshold<T>() && y_ > numeric::rescale_threshold<T>() &&
           x_ < big && y_ < big;
  }

  // The algebraic views from m = gamma - 1, g = gamma and u = beta gamma, each a double-word
  // number within ~8 u^2 (relative) of its exact value: beta = u / g, 1 - beta = 1 / (g (g + u))
  // (as g^2 - u^2 = 1), 1/gamma, 1 - 1/gamma = m / g.  Every operation adds terms of one sign and
  // costs <= 4 u^2, so each view is within ~32 u^2 before its last rounding; bound 1024 u^2.
  // Tiny m (below rescale_threshold) and huge g (whose square would overflow) go to the ladder.
  static bool from_mgu(numeric::dd<T> m, numeric::dd<T> g, numeric::dd<T> u, kind k, T& out) {
    using std::abs;
    if (!(m.hi > numeric::rescale_threshold<T>()) ||
        !(g.hi < numeric::pow2_const<T, std::numeric_limits<T>::max_exponent / 2 - 2>()))
      return false;
    const numeric::dd<T> one{T(1), T(0)};
    numeric::dd<T> v = g;
    switch (k) {
      case kind::beta: v = numeric::dd_div(u, g); break;
      case kind::beta_deficit: v = numeric::dd_div(one, numeric::dd_mul(g, numeric::dd_add(g, u))); break;
      case kind::gamma: break;
      case kind::gamma_m1: v = m; break;
      case kind::inv_gamma: v = numeric::dd_div(one, g); break;
      case kind::dilation_fraction: v = numeric::dd_div(m, g); break;
      case kind::proper_speed: v = u; break;
      case kind::rapidity: return false;
    }
    return numeric::try_decide(v, numeric::relative_u2<T, 10>() * abs(v.hi), out);
  }

  // From m and g: u = sqrt(m (m + 2)).
  static bool from_m(numeric::dd<T> m, numeric::dd<T> g, kind k, T& out) {
    if (!(g.hi < numeric::pow2_const<T, std::numeric_limits<T>::max_exponent / 2 - 2>())) return false;
    const numeric::dd<T> u = numeric::dd_sqrt(numeric::dd_mul(m, numeric::dd_add(m, numeric::dd<T>{T(2), T(0)})));
    return from_mgu(m, g, u, k, out);
  }

  // From u: g = sqrt(1 + u^2), m = u^2 / (1 + g).
  static bool from_u(numeric::dd<T> u, kind k, T& out) {
    if (!(u.hi < numeric::pow2_const<T, std::numeric_limits<T>::max_exponent / 2 - 2>())) return false;
    const numeric::dd<T> one{T(1), T(0)};
    const numeric::dd<T> u2 = numeric::dd_mul(u, u);
    const numeric::dd<T> g = numeric::dd_sqrt(numeric::dd_add(one, u2));
    return from_mgu(numeric::dd_div(u2, numeric::dd_add(one, g)), g, u, k, out);
  }

  T view(kind k) const {
    using std::isnan;
    const T plain = view_of(s_, k);
    if (isnan(plain)) return plain;  // built from invalid input under a NaN policy
    T out;
    if (fast(k, out)) return out;
    return numeric::climb_ladder<T>(
        [self = this, k](auto tag) {
          using W = typename decltype(tag)::type;
          return view_of(self->template rebuild<W>(), k);
        },
        "eigenzeit::rounded_speed<%1%>::view", x_, ErrorPolicy());
  }
};

}  // namespace eigenzeit

#endif
