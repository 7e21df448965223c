// eigenzeit: mean decay length and survival of an unstable particle in flight.
// Distributed under the Boost Software License, Version 1.0 (see LICENSE).
//
// A particle with proper mean life tau (given as the length c tau) that moves at the constant
// speed s travels on average the mean decay length
//
//     L = beta gamma c tau,
//
// and survives a path of length d (same unit as c tau) with probability P = exp(-d / L); it
// decays on that path with probability 1 - P = -expm1(-d / L), formed without cancellation for
// short paths.
//
// How the accuracy is reached.  beta gamma comes from the double-word beta and gamma stored in
// speed<T> (two_prod plus the cross terms: relative error O(u^2)), so L is one rounding away
// from exact.  exp(-r) has condition number r: a rounded ratio r = d / L would cost up to
// r/2 ulp (350 ulp at r = 700).  Here r is formed as a double-word number r.hi + r.lo
// (relative error O(u^2), so r u^2 <= 1e-28 absolute for every r that leaves exp(-r) normal),
// and exp(-r) = exp(-r.hi)(1 - r.lo) + O(u^2), -expm1(-r) = -expm1(-r.hi) + exp(-r.hi) r.lo +
// O(u^2): the library exp or expm1 enters once, plus the last rounding.
//
// Not certified for safety-of-life use: users must follow the interface specifications that
// govern their system and validate the results themselves.
#ifndef EIGENZEIT_TIMING_DECAY_HPP
#define EIGENZEIT_TIMING_DECAY_HPP

#include <cmath>
#include <limits>

#include <eigenzeit/numeric/eft.hpp>
#include <eigenzeit/numeric/policy.hpp>
#include <eigenzeit/numeric/traits.hpp>
#include <eigenzeit/numeric/wider.hpp>
#include <eigenzeit/speed.hpp>

namespace eigenzeit {

namespace detail {
namespace decay_impl {

using numeric::dd;

/// expm1 for built-in types; one rung wider for Boost.Multiprecision types (see
/// detail::log1p_small in speed.hpp for why).
template <class T>
inline T expm1_(T x) {
  using std::expm1;
  using W = numeric::wider_t<T>;
  return T(expm1(W(x)));
}

/// beta gamma from the stored words as hi + lo (|lo| <= ~2u hi, not renormalised): error
/// O(u^2) relative; never overflows, since beta < 1.
template <class T>
inline dd<T> proper_speed_words(const speed<T>& s) {
  const dd<T> b = s.beta_words();
  const dd<T> g = s.gamma_words();
  const dd<T> p = numeric::two_prod(b.hi, g.hi);
  return {p.hi, p.lo + (b.hi * g.lo + b.lo * g.hi)};
}

template <class T, class Policy>
inline bool length_invalid(const char* function, const char* message, T value, const Policy& pol,
                           T& out) {
  if (value >= T(0) && value <= std::numeric_limits<T>::max()) return false;  // NaN fails too
  out = numeric::domain_error<T>(function, message, value, pol);
  return true;
}

/// What a decay probability reduces to: an ordinary ratio, or one of the two limits.
enum class ratio_kind { ordinary, certain_decay };

/// A ratio r = d / L as hi + lo, or one of the limits.
template <class T>
struct ratio {
  dd<T> r;
  ratio_kind kind;
};

/// The rare case of decay_ratio: L or d near the ends of the range.  Each factor is split into
/// a significand in [1/2, 1) and a power of two (exact); the ratio of significands is formed as
/// in decay_ratio and scaled back, to infinity or to zero where the ratio leaves the range.
template <class T>
ratio<T> decay_ratio_scaled(T d, dd<T> u, T c_tau) {
  using std::frexp;
  using std::isnan;
  using std::ldexp;
  if (isnan(u.hi)) return {u, ratio_kind::ordinary};  // a speed made invalid under a NaN policy
  int ed = 0, ec = 0, eu = 0;
  const T md = frexp(d, &ed);
  const T mc = frexp(c_tau, &ec);
  const T mu = frexp(u.hi, &eu);
  const T mul = ldexp(u.lo, -eu);
  const dd<T> m = numeric::two_prod(mc, mu);
  const T q = md / m.hi;
  const T rest = -numeric::fms(q, m.hi, md) - q * (m.lo + mc * mul);
  const long e = static_cast<long>(ed) - ec - eu;
  if (e > static_cast<long>(std::numeric_limits<T>::max_exponent) + 1)
    return {{T(0), T(0)}, ratio_kind::certain_decay};
  if (e < static_cast<long>(std::numeric_limits<T>::min_exponent) - numeric::digits_v<T> - 4)
    return {{T(0), T(0)}, ratio_kind::ordinary};  // below half the smallest subnormal
  const int ei = static_cast<int>(e);
  const dd<T> r{T(ldexp(q, ei)), T(ldexp(rest / m.hi, ei))};
  if (!(r.hi <= std::numeric_limits<T>::max())) return {r, ratio_kind::certain_decay};
  return {r, ratio_kind::ordinary};
}

/// r = d / (u c_tau) as a double-word number, for finite d > 0, c_tau >= 0, u >= 0.
/// u c_tau = 0 (at rest, or c_tau = 0) means decay before any distance is covered; a ratio
/// beyond the largest finite value means exp(-r) = 0 as well.
template <class T>
inline ratio<T> decay_ratio(T d, dd<T> u, T c_tau) {
  if (u.hi == 0 || c_tau == 0) return {{T(0), T(0)}, ratio_kind::certain_decay};
  const T thr = numeric::rescale_threshold<T>();
  const dd<T> L = numeric::two_prod(c_tau, u.hi);
  if (!(L.hi >= thr && L.hi <= std::numeric_limits<T>::max() && d >= thr))
    return decay_ratio_scaled(d, u, c_tau);
  // One division: y = RN(1 / L.hi), q = RN(d y) is within 2u of d / L.hi, so the remainder
  // d - q L.hi (one fms: relative error <= u, normal since L.hi and d are above min / eps^2)
  // is below 2.1u d; with the low word of L (L.lo + c_tau u.lo) it gives r.lo = rest y to a
  // relative u, i.e. r = q + r.lo to O(u^2) relative.
  const T y = T(1) / L.hi;
  const T q = d * y;
  if (!(q <= std::numeric_limits<T>::max())) return {{q, T(0)}, ratio_kind::certain_decay};
  const T rest = -numeric::fms(q, L.hi, d) - q * (L.lo + c_tau * u.lo);
  return {{q, rest * y}, ratio_kind::ordinary};
}

}  // namespace decay_impl
}  // namespace detail

/// Mean decay length L = beta gamma c tau of a particle with proper mean life tau (given as the
/// length c_tau) moving at speed s; same length unit as c_tau.  At rest (beta = 0) L = 0.
/// Domain: c_tau finite and >= 0 (c_tau = -0 gives -0); otherwise a domain error through the
/// policy; a length beyond the largest finite value is a domain error as well.
/// Accuracy: <= 1 ulp (measured max 0.58 ulp in double, 0.87 in float).  Results below the
/// smallest normal number are outside the contract.
template <class T, class Policy = throw_policy>
inline T mean_decay_length(const speed<T>& s, numeric::identity_t<T> c_tau,
                           const Policy& pol = Policy()) {
  constexpr const char* function = "eigenzeit::mean_decay_length<%1%>(speed<%1%>, %1%)";
  T out;
  if (detail::decay_impl::length_invalid(function, "c tau = %1%, but it must be finite and >= 0",
                                         c_tau, pol, out))
    return out;
  const numeric::dd<T> u = detail::decay_impl::proper_speed_words(s);
  using std::isnan;
  if (isnan(u.hi)) return u.hi;  // a speed made invalid under a NaN-returning policy
  // c_tau (u.hi + u.lo): the product split exactly, error <= 0.5 ulp + 2u^2 relative.
  const T p = c_tau * u.hi;
  if (p == 0) return p;  // at rest, or c_tau = +-0 (the sign of c_tau is kept)
  T L = p;
  if (p <= std::numeric_limits<T>::max()) L = p + (numeric::fms(c_tau, u.hi, p) + c_tau * u.lo);
  if (!(L <= std::numeric_limits<T>::max()))
    return numeric::domain_error<T>(function,
                                    "c tau = %1% gives a mean decay length beyond the largest "
                                    "finite value",
                                    c_tau, pol);
  return L;
}

/// Probability that a particle with proper mean life tau (given as the length c_tau), moving
/// at speed s, survives a path of length `distance` (same unit): P = exp(-distance / L) with
/// L = beta gamma c tau.  Limits: P = 1 for distance = 0 (whatever the speed); P = 0 for
/// distance > 0 when L = 0 (at rest, or c_tau = 0: the particle decays where it is).
/// Domain: distance and c_tau finite and >= 0; otherwise a domain error through the policy.
/// Accuracy: <= 2 ulp (exp's rounding enters once; measured max 0.99 ulp in double, 1.24 in
/// long double), relative to the speed as given: an error already in the speed (exp's rounding
/// in a speed built from a rapidity, say) is amplified distance / L-fold, as by the exact
/// function.  Results below the smallest normal number (distance / L beyond ~708 in double)
/// are outside the contract.
template <class T, class Policy = throw_policy>
inline T survival_probability(numeric::identity_t<T> distance, const speed<T>& s,
                              numeric::identity_t<T> c_tau, const Policy& pol = Policy()) {
  constexpr const char* function =
      "eigenzeit::survival_probability<%1%>(%1%, speed<%1%>, %1%)";
  T out;
  if (detail::decay_impl::length_invalid(
          function, "distance = %1%, but it must be finite and >= 0", distance, pol, out) ||
      detail::decay_impl::length_invalid(function, "c tau = %1%, but it must be finite and >= 0",
                                         c_tau, pol, out))
    return out;
  if (distance == 0) return T(1);
  const numeric::dd<T> u = detail::decay_impl::proper_speed_words(s);
  const detail::decay_impl::ratio<T> q = detail::decay_impl::decay_ratio<T>(distance, u, c_tau);
  if (q.kind == detail::decay_impl::ratio_kind::certain_decay) return T(0);
  const T e = detail::exp_(T(-q.r.hi));
  return e - e * q.r.lo;
}

/// Probability that the particle decays on the path: 1 - P = -expm1(-distance / L), with
/// L = beta gamma c tau; accurate for short paths, where 1 - exp(-d/L) would cancel.
/// Limits: 0 for distance = 0 (distance = -0 gives -0), 1 for distance > 0 when L = 0.
/// Domain: distance and c_tau finite and >= 0; otherwise a domain error through the policy.
/// Accuracy: within 2 ulp of the correctly rounded value (expm1's rounding enters once;
/// measured max 1.23 ulp in double; in long double up to 2.1 ulp from the exact value, i.e. 2
/// from the correctly rounded one, as the library expm1l itself errs by up to 1.9 ulp below 1/2).
template <class T, class Policy = throw_policy>
inline T decay_probability(numeric::identity_t<T> distance, const speed<T>& s,
                           numeric::identity_t<T> c_tau, const Policy& pol = Policy()) {
  constexpr const char* function = "eigenzeit::decay_probability<%1%>(%1%, speed<%1%>, %1%)";
  T out;
  if (detail::decay_impl::length_invalid(
          function, "distance = %1%, but it must be finite and >= 0", distance, pol, out) ||
      detail::decay_impl::length_invalid(function, "c tau = %1%, but it must be finite and >= 0",
                                         c_tau, pol, out))
    return out;
  if (distance == 0) return distance;
  const numeric::dd<T> u = detail::decay_impl::proper_speed_words(s);
  const detail::decay_impl::ratio<T> q = detail::decay_impl::decay_ratio<T>(distance, u, c_tau);
  if (q.kind == detail::decay_impl::ratio_kind::certain_decay) return T(1);
  // -expm1(-r) = -m + (1 + m) r.lo with m = expm1(-r.hi) in (-1, 0]: 1 + m = exp(-r.hi) is
  // needed only to first order in the correction r.lo (< 2.1u r), so its rounding is harmless.
  const T m = detail::decay_impl::expm1_(T(-q.r.hi));
  return (T(1) + m) * q.r.lo - m;
}

}  // namespace eigenzeit

#endif
