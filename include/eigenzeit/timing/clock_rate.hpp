// eigenzeit: rate of a clock moving in a weak static gravitational field.
// Distributed under the Boost Software License, Version 1.0 (see LICENSE).
//
// The model.  A clock at speed v in a static potential U (U >= 0, U = GM/r for a point mass,
// the sign of the IERS Conventions; U = 0 far from all masses) ticks at the rate
//
//     d(tau)/dt = 1 - (U + v^2/2) / c^2 + (U^2/2 - 3 U v^2 / 2 - v^4 / 8) / c^4 + O(c^-6),
//
// with t the coordinate time of the frame in which v and U are given (for an Earth-centred
// inertial frame: TCG).  This is the square root of -g_00 - g_ij v^i v^j / c^2 for the
// isotropic weak-field metric of general relativity, g_00 = -(1 - 2U/c^2 + 2U^2/c^4),
// g_ij = (1 + 2U/c^2) delta_ij, expanded to second order in 1/c^2.  The vector potential of a
// rotating body and the tidal fields of other bodies are not part of the model.
//
// Which orders are kept.  Every term through 1/c^4 is kept, so the first term dropped is of
// order (U/c^2)^3 or (v/c)^6: about 3e-28 for a clock on the ground (U/c^2 = 7e-10) and
// below 1e-21 even for v = 1e5 m/s; the 1/c^4 terms themselves are ~5e-19 near the Earth.
// The formula is exact in its own terms: the routine returns it to within 1 ulp (that is
// what "accuracy" means below; the physics error is the dropped terms).
//
// How the accuracy is reached.  With u = U/c^2 and b = v^2/c^2, the offset is
// -(u + b/2) + (u^2/2 - 3ub/2 - b^2/8).  All leading terms share one sign, so nothing
// cancels at any size of U or v (the textbook sqrt(1 - 2U/c^2 - v^2/c^2) - 1 loses every
// digit for a walking clock).  S = U + v^2/2 is formed as a double-word number (v^2 split
// exactly by two_prod, the sum by two_sum: relative error below 2u^2), multiplied by 1/c^2
// held as a double-word constant (product split by one fms, error below 3u^2 relative), and
// the 1/c^4 terms, below 2 max(u, b) of the result, are added in plain T (their error is
// below 8u max(u, b) relative: < 1e-6 u near the Earth, < u/8 while u and b stay below 1/64).
// Only the last addition rounds at full weight: in that range the result is correctly
// rounded except within ~5u^2 + 8u max(u, b) of a rounding boundary.
#ifndef EIGENZEIT_TIMING_CLOCK_RATE_HPP
#define EIGENZEIT_TIMING_CLOCK_RATE_HPP

#include <cmath>
#include <limits>
#include <type_traits>

#include <eigenzeit/config.hpp>
#include <eigenzeit/constants.hpp>
#include <eigenzeit/numeric/eft.hpp>
#include <eigenzeit/numeric/policy.hpp>
#include <eigenzeit/numeric/traits.hpp>

namespace eigenzeit {

namespace detail {

/// c^2 and 1/c^2 as double-word numbers.  c^2 = 89 875 517 873 681 764 has 57 significant
/// bits: exact in two words of any type with >= 29 bits, and within 2^-48 relative in two
/// floats.  1/c^2 from dd_div: relative error below 4u^2.  Built-in types compute them
/// inline, where every operation has constant operands and is folded by the compiler; other
/// types keep them in a function-local static.
template <class T>
struct light_powers {
  numeric::dd<T> c2;
  numeric::dd<T> inv_c2;
};

template <class T>
inline light_powers<T> make_light_powers() {
  const numeric::dd<T> c = constants::speed_of_light_words<T>();
  const numeric::dd<T> c2 = numeric::dd_mul(c, c);
  const numeric::dd<T> inv = numeric::dd_div(numeric::dd<T>{T(1), T(0)}, c2);
  return {c2, inv};
}

template <class T>
inline light_powers<T> light_powers_of() {
  if constexpr (std::is_floating_point<T>::value) {
    return make_light_powers<T>();
  } else {
    static const light_powers<T> value = make_light_powers<T>();
    return value;
  }
}

/// x < hi + lo for a double-word bound (exact comparison when lo is the exact remainder).
template <class T>
inline bool less_than_words(const T& x, const numeric::dd<T>& bound) {
  return x < bound.hi || (x == bound.hi && bound.lo > T(0));
}

/// The weak-field offset (file comment) from v^2 = vv.hi + vv.lo (exact or within u^2) and U,
/// for inputs already checked.  Shared by clock_rate_offset and the trajectory integrator,
/// which has v^2 from three components without taking a square root.
template <class R>
inline R weak_field_offset(const numeric::dd<R>& vv, const R& U, const light_powers<R>& k) {
  // S = U + v^2/2 as hi + lo: halving is exact, the sum is split exactly by two_sum.
  const R half = vv.hi / 2;
  numeric::dd<R> s = numeric::two_sum(U, half);
  s.lo = s.lo + vv.lo / 2;
  // S / c^2 = S * (1/c^2): the product of the high words split by one fms; the cross terms
  // are below u of it and carry their own rounding only at weight u^2.
  const numeric::dd<R> p = numeric::two_prod(s.hi, k.inv_c2.hi);
  const R p_lo = p.lo + (s.hi * k.inv_c2.lo + s.lo * k.inv_c2.hi);
  // 1/c^4 terms from u and b rounded once each: relative error ~4u on terms below
  // 2 max(u, b) of the result (file comment).
  const R u = U * k.inv_c2.hi;
  const R b = vv.hi * k.inv_c2.hi;
  const R corr = u * (u / 2 - R(1.5) * b) - b * b / 8;
  // -(p + p_lo) + corr, written so that a clock at rest far away gets +0, not -0.
  return (corr - p_lo) - p.hi;
}

}  // namespace detail

/// Rate offset d(tau)/dt - 1 of a clock at speed `speed_m_per_s` (m/s) in a static
/// gravitational potential `potential` (m^2/s^2, U >= 0 with U = GM/r for a point mass, the
/// IERS sign; U = 0 far from all masses), in the weak-field model kept to 1/c^4 (file comment):
///     -(U + v^2/2)/c^2 + (U^2/2 - 3 U v^2/2 - v^4/8)/c^4.
/// Always <= 0: a moving clock, or one deeper in a potential, runs slow.  Near the Earth the
/// terms dropped are below 1e-27.  A clock on the geoid gives about -L_G = -6.97e-10.
/// Domain: 0 <= v < c, 0 <= U < c^2, and d(tau)/dt = 1 + offset in (0, 1] (the model is meant
/// for U/c^2 and v^2/c^2 far below 1); NaN, infinity or anything outside is a domain error
/// through the policy naming the function and the value.
/// Accuracy: <= 1 ulp of the formula above while U/c^2 and v^2/c^2 stay below 1/64 (measured
/// over v in [0, 1e5] m/s and U in [0, 1e9] m^2/s^2: see tests/test_timing_clock_rate.cpp).
template <class T1, class T2, class Policy = throw_policy>
inline numeric::promote_t<std::common_type_t<T1, T2>> clock_rate_offset(
    T1 speed_m_per_s, T2 potential, const Policy& pol = Policy()) {
  using R = numeric::promote_t<std::common_type_t<T1, T2>>;
  const char* fn = "eigenzeit::clock_rate_offset<%1%>(%1%, %1%)";
  const R v = R(speed_m_per_s);
  const R U = R(potential);
  const detail::light_powers<R> k = detail::light_powers_of<R>();
  if (!(v >= R(0)) || !detail::less_than_words(v, constants::speed_of_light_words<R>()))
    return numeric::domain_error<R>(
        fn, "speed = %1% m/s, but it must lie in [0, c) with c = 299792458 m/s", v, pol);
  if (!(U >= R(0)) || !detail::less_than_words(U, k.c2))
    return numeric::domain_error<R>(
        fn, "potential U = %1% m^2/s^2, but it must lie in [0, c^2) (U >= 0, e.g. GM/r)", U, pol);

  const R offset = detail::weak_field_offset(numeric::two_prod(v, v), U, k);
  if (!(offset > R(-1) && offset <= R(0)))
    return numeric::domain_error<R>(
        fn, "speed and potential give d(tau)/dt - 1 = %1%, outside (-1, 0] where the weak-field "
            "model applies", offset, pol);
  return offset;
}

}  // namespace eigenzeit

#endif
