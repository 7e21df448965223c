// eigenzeit: proper time of a clock moving at constant speed, and the offset it accumulates.
// Distributed under the Boost Software License, Version 1.0 (see LICENSE).
//
// A clock that moves at the constant speed s for a coordinate time dt (the time of the frame in
// which s is measured) shows the proper time
//
//     tau = dt / gamma = dt sqrt(1 - beta^2),
//
// and falls behind a clock at rest in that frame by the dilation offset
//
//     dt - tau = dt (1 - 1/gamma).
//
// Both are linear in dt, so their accuracy is that of 1/gamma and 1 - 1/gamma times one
// rounding.  Neither is formed from the rounded views of speed<T>: the views are themselves
// rounded (0.5 ulp) and can be subnormal while the product with a large dt is a normal number
// (1 - 1/gamma = 5e-321 for beta = 1e-160, times dt = 1e20); here the stored double-word
// beta and gamma of speed<T> enter the product directly, so that only the last addition rounds
// at full weight.  Away from the underflow threshold the result is then within 0.5 ulp + O(u^2)
// of the exact value for the speed as stored, i.e. for a speed built from an exact algebraic
// input (beta, 1 - beta, gamma, gamma - 1, proper speed, energy and mass) within 0.5 ulp +
// O(u^2) of the exact value for that input; a speed built from a rapidity carries exp's
// rounding (see speed<T>::from_rapidity).
//
// Not certified for safety-of-life use: users of timing results must follow the interface
// specifications that govern their system and validate the results themselves.
#ifndef EIGENZEIT_TIMING_PROPER_TIME_HPP
#define EIGENZEIT_TIMING_PROPER_TIME_HPP

#include <cmath>
#include <limits>

#include <eigenzeit/numeric/eft.hpp>
#include <eigenzeit/numeric/policy.hpp>
#include <eigenzeit/numeric/traits.hpp>
#include <eigenzeit/speed.hpp>

namespace eigenzeit {

namespace detail {
namespace proper_time_impl {

/// dt must be finite and >= 0 (-0 included); otherwise the policy decides what to return.
template <class T, class Policy>
inline bool interval_invalid(const char* function, T dt, const Policy& pol, T& out) {
  using std::isfinite;
  if (dt >= T(0) && isfinite(dt)) return false;
  out = numeric::domain_error<T>(function,
                                 "coordinate time interval dt = %1%, but it must be finite and "
                                 ">= 0",
                                 dt, pol);
  return true;
}

/// dt / gamma for gamma = g.hi + g.lo, g.hi <= 2^(max_exponent/2).
/// With y = RN(1/g.hi) and t = 1 - y g.hi (exact: a division residual),
/// 1/gamma = y (1 + t)(1 - y g.lo) + O(u^2) = y + y (t - y g.lo) + O(u^2); dt y is split exactly
/// by two_prod, the correction dt y (t - y g.lo) is below 2u dt y and carries a relative error
/// of ~3u.  Only the last addition rounds at full weight: error <= 0.5 ulp + 4u^2 relative.
template <class T>
inline T divide_by_gamma(T dt, numeric::dd<T> g) {
  const T y = T(1) / g.hi;
  const T t = -numeric::fms(y, g.hi, T(1));
  const T c = y * (t - y * g.lo);
  const numeric::dd<T> p = numeric::two_prod(dt, y);
  return p.hi + (p.lo + dt * c);
}

}  // namespace proper_time_impl
}  // namespace detail

/// Proper time shown by a clock moving at speed s during the coordinate time dt:
/// tau = dt / gamma = dt sqrt(1 - beta^2).
/// Domain: dt finite and >= 0 (dt = -0 gives -0); otherwise (NaN, infinite or negative dt) a
/// domain error through the policy naming the function and the value.
/// Accuracy: <= 1 ulp for a speed built from an algebraic input (correctly rounded in 99.9% of
/// random double cases, max 0.80 ulp, the excess over 0.5 only within 2^digits of the underflow
/// threshold, where the low word of dt y loses bits; see tests/test_timing_proper_time.cpp);
/// <= 2 ulp for a speed built from a rapidity.  Results below the smallest normal number are
/// outside the precision contract.
template <class T, class Policy = throw_policy>
inline T proper_time(const speed<T>& s, numeric::identity_t<T> dt, const Policy& pol = Policy()) {
  T out;
  if (detail::proper_time_impl::interval_invalid("eigenzeit::proper_time<%1%>(speed<%1%>, %1%)",
                                                 dt, pol, out))
    return out;
  if (dt == 0) return dt;  // +-0 / gamma keeps the sign of zero
  numeric::dd<T> g = s.gamma_words();
  // 1/g.hi must be a normal number for the residual t to be exact: above 2^(max_exponent/2)
  // gamma is scaled down by that power of two (exact) and the result scaled back (exact for
  // every normal result).
  constexpr int half_range = std::numeric_limits<T>::max_exponent / 2;
  if (g.hi > numeric::pow2_const<T, half_range>()) {
    const T down = numeric::pow2_const<T, -half_range>();
    g = {g.hi * down, g.lo * down};
    return detail::proper_time_impl::divide_by_gamma(dt, g) * down;
  }
  return detail::proper_time_impl::divide_by_gamma(dt, g);
}

/// Dilation offset: how far a clock moving at speed s falls behind a clock at rest during the
/// coordinate time dt, dt - tau = dt (1 - 1/gamma) = dt (1 - sqrt(1 - beta^2)), formed without
/// the cancellation of dt - tau.
/// Domain: dt finite and >= 0 (dt = -0 gives -0); otherwise a domain error through the policy.
/// Accuracy: as proper_time (<= 1 ulp; max 0.80 ulp measured in double).  A speed built from an
/// input below min / eps^2 (a subnormal gamma - 1, say) may store beta with more than O(u^2)
/// error, which beta^2 doubles: <= 2 ulp there.  Results below the smallest normal number are
/// outside the contract.
template <class T, class Policy = throw_policy>
inline T dilation_offset(const speed<T>& s, numeric::identity_t<T> dt, const Policy& pol = Policy()) {
  T out;
  if (detail::proper_time_impl::interval_invalid(
          "eigenzeit::dilation_offset<%1%>(speed<%1%>, %1%)", dt, pol, out))
    return out;
  if (dt == 0) return dt;  // +-0 (1 - 1/gamma) keeps the sign of zero
  const numeric::dd<T> b = s.beta_words();
  if (b.hi * b.hi < numeric::small_square_threshold<T>()) {
    // beta^2 = x < 2^-k (k = series_exponent_v<T>): 1 - sqrt(1 - x) = (x/2)(1 + x/4 + x^2/8 +
    // 5x^3/64 + 7x^4/128 + ...).  The first term dropped is below 0.06 x^4 < 2^-(digits+7), since
    // 4k >= digits + 3.  dt beta^2 is formed as (dt beta) beta in double-word arithmetic (both
    // products split exactly; b.lo enters as 2 dt beta b.lo), never as dt times a rounded and
    // possibly subnormal beta^2: it overflows or underflows only where the result does.  The
    // tail (< 2^-k/3 relative) carries ~4u relative error: <= 0.5 ulp + u 2^-k overall.
    const numeric::dd<T> p = numeric::two_prod(dt, b.hi);
    const numeric::dd<T> q = numeric::two_prod(p.hi, b.hi);
    const T lo = q.lo + (p.lo * b.hi + 2 * p.hi * b.lo);
    const T x = b.hi * b.hi;
    const T tail = x * (T(1) / 4 + x * (T(1) / 8 + x * (T(5) / 64)));
    return (q.hi + (lo + q.hi * tail)) / 2;
  }
  // beta^2 >= 2^-k: 1 - 1/gamma = (1 - y) - y (t - y g.lo) with y, t as in divide_by_gamma.
  // 1 - y is split exactly (y <= 1), and the result is at least 2^-(k+1), so the rounding of the
  // low word (~2u^2 absolute) stays below u^2 2^(k+2) relative.  For gamma beyond 2^max_exponent
  // y is subnormal and t inexact, but then the correction is below u^2 of the result.
  const numeric::dd<T> g = s.gamma_words();
  const T y = T(1) / g.hi;
  const T t = -numeric::fms(y, g.hi, T(1));
  const T c = y * (t - y * g.lo);
  const numeric::dd<T> h = numeric::fast_two_sum(T(1), -y);
  const numeric::dd<T> p = numeric::two_prod(dt, h.hi);
  return p.hi + (p.lo + dt * (h.lo - c));
}

}  // namespace eigenzeit

#endif
