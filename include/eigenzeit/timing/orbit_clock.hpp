// eigenzeit: clock terms of a Kepler orbit (mean rate and the periodic eccentricity term).
// Distributed under the Boost Software License, Version 1.0 (see LICENSE).
//
// A clock on a Kepler orbit (semi-major axis a, eccentricity e, central GM) in an
// Earth-centred inertial frame with coordinate time t (TCG for the Earth), point-mass field,
// to first order in 1/c^2.  With U = GM/r and the energy integral v^2 = GM (2/r - 1/a):
//     d(tau)/dt - 1 = -(U + v^2/2)/c^2 = -3GM/(2ac^2) - (2GM/c^2)(1/r - 1/a).
// The first part is constant.  The second integrates in closed form: with r = a(1 - e cos E)
// and dt = (1 - e cos E) dE / n, n = sqrt(GM/a^3),
//     tau - t = -3GM/(2ac^2) t - 2 sqrt(GM a) e sin(E) / c^2 + constant.
// The time-mean of 1/r over the orbit is 1/a, so -3GM/(2ac^2) is also the mean rate.
//
// Sign conventions, stated once for every function below:
//   * Rates are d(tau)/d(reference) - 1 of the orbiting clock: negative means the orbiting
//     clock runs slow against the reference, positive fast.
//       orbit_rate_offset     reference: the coordinate time t of the frame (TCG)
//       orbit_rate_offset_tt  reference: TT, i.e. a clock on the geoid.  d(TT)/d(TCG) = 1 - L_G
//                             (L_G = W0/c^2, IAU 2000 Resolution B1.9), so the rate is
//                             (1 - 3GM/(2ac^2)) / (1 - L_G) - 1 = (L_G - 3GM/(2ac^2)) / (1 - L_G).
//                             For a GPS orbit (a = 26 561.75 km) this is +4.4647e-10: the
//                             orbiting clock runs fast, and IS-GPS-200 (3.3.1.1) has the
//                             satellite's 10.23 MHz oscillator set low by that fraction.
//   * orbit_periodic_offset is the periodic part of (clock reading - coordinate time):
//         delta = -2 sqrt(GM a) e sin(E) / c^2 = F e sqrt(a) sin(E),  F = -2 sqrt(GM) / c^2,
//     negative while 0 < E < pi (the clock lags while it climbs from perigee).  With the GPS
//     value of GM this is the relativistic term Delta t_r of IS-GPS-200 (20.3.3.3.3.1), one
//     of the terms of Delta t_sv = (satellite time - GPS time); a receiver forms
//     t = t_sv - Delta t_sv, i.e. it subtracts delta from the time the satellite reports.
//     The state-vector form -2 (r . v) / c^2 is the same quantity (Kepler motion has
//     r . v = e sqrt(GM a) sin E), and holds for any orbit given position and velocity.
//
// Neglected: terms of order (GM/(a c^2))^2 (3e-20 for GPS), the Earth's oblateness and
// other perturbations of the orbit (J2 makes periodic clock terms of order 1e-10 s for GPS),
// and the relativistic perturbations of the orbit itself.
//
// Accuracy: <= 1 ulp for the rates and the amplitude (products and quotients in double-word
// arithmetic, one final rounding); the periodic term the same for float and double (sin one
// type wider), <= 2 ulp for long double (glibc's sinl enters).
// orbit_rate_offset_tt keeps its relative accuracy except near a ~ 9 545 km, where L_G and
// 3GM/(2ac^2) cancel; there its absolute error stays below ~4 u^2 L_G.
#ifndef EIGENZEIT_TIMING_ORBIT_CLOCK_HPP
#define EIGENZEIT_TIMING_ORBIT_CLOCK_HPP

#include <array>
#include <cmath>
#include <cstddef>
#include <limits>
#include <type_traits>

#include <eigenzeit/config.hpp>
#include <eigenzeit/constants.hpp>
#include <eigenzeit/numeric/eft.hpp>
#include <eigenzeit/numeric/policy.hpp>
#include <eigenzeit/numeric/traits.hpp>
#include <eigenzeit/numeric/wider.hpp>
#include <eigenzeit/timing/clock_rate.hpp>

namespace eigenzeit {

/// A Kepler orbit: semi-major axis a (m), eccentricity e (0 <= e < 1), central GM (m^3/s^2).
/// Plain aggregate; every function checks it (a finite and > 0, e in [0, 1), GM finite and > 0).
template <class T>
struct kepler_orbit {
  T semi_major_axis;  ///< a in metres
  T eccentricity;     ///< e, dimensionless
  T gm;               ///< GM in m^3/s^2
};

/// The mean-rate budget of an orbiting clock against TT (each a rate, d(tau)/dTT - 1 style):
///   velocity   -GM/(2ac^2), the time-mean of -v^2/(2c^2) (<v^2> = GM/a on a Kepler orbit)
///   potential  L_G - GM/(ac^2), the time-mean of -U/c^2 plus the geoid clock's own L_G
///              (L_G = W0/c^2 holds the geoid clock's potential and rotation together)
///   total      orbit_rate_offset_tt: (L_G - 3GM/(2ac^2)) / (1 - L_G)
/// velocity + potential differs from total by the factor 1 - L_G (for GPS by 3e-19 absolute).
template <class T>
struct orbit_rate_budget {
  T velocity;
  T potential;
  T total;
};

namespace detail {

/// An integer n (|n| < 2^62) as an unevaluated sum hi + lo in T, exact whenever lo fits,
/// which holds for every n used here and every T with >= 24 bits.
template <class T>
inline numeric::dd<T> integer_words(long long n) {
  const T hi = T(n);
  const long long hi_int = static_cast<long long>(hi);
  return {hi, T(n - hi_int)};
}

/// L_G = 6.969290134e-10 = 6969290134 / 10^19 = (6969290134 / 5^19) 2^-19, as a double-word
/// number with relative error below 4u^2: numerator and 5^19 = 19 073 486 328 125 are exact in
/// two words of T, the quotient is a dd_div, and 2^-19 is exact.  The same decimal as
/// constants::L_G (IAU 2000 Resolution B1.9; checked in tests/test_constants.cpp).
template <class T>
inline numeric::dd<T> L_G_words() {
  const numeric::dd<T> q =
      numeric::dd_div(integer_words<T>(6969290134LL), integer_words<T>(19073486328125LL));
  return numeric::dd_ldexp(q, -19);
}

/// sin(x) as a double-word number: for float and double from the next wider built-in type
/// (double, long double) split into two words, which leaves ~u 2^(53-64) relative error for
/// double on x86-64 (64-bit long double) and ~u 2^-29 for float; long double takes sinl itself
/// (low word 0), so glibc's sinl error (measured up to ~1.5 ulp) passes to the result;
/// Boost.Multiprecision types go one rung wider (numeric::wider_t).
template <class T>
inline numeric::dd<T> sin_words(const T& x) {
  using std::sin;
  if constexpr (std::is_same<T, float>::value) {
    const double s = std::sin(static_cast<double>(x));
    const float hi = static_cast<float>(s);
    return {hi, static_cast<float>(s - static_cast<double>(hi))};
  } else if constexpr (std::is_same<T, double>::value &&
                       (std::numeric_limits<long double>::digits > std::numeric_limits<double>::digits)) {
    const long double s = std::sin(static_cast<long double>(x));
    const double hi = static_cast<double>(s);
    return {hi, static_cast<double>(s - static_cast<long double>(hi))};
  } else {
    // Other types: one rung wider (numeric::wider_t, e.g. cpp_bin_float_50 -> _100), whose
    // own sin loses accuracy with the argument as exp and log do (see speed.hpp), then split.
    using W = numeric::wider_t<T>;
    const W s = W(sin(W(x)));
    const T hi = T(s);
    return {hi, T(W(s - W(hi)))};
  }
}

/// Checks an orbit; on failure reports through the policy and returns false with `nan` set.
template <class T, class Policy>
inline bool check_orbit(const char* fn, const kepler_orbit<T>& o, T& nan, const Policy& pol) {
  using std::isfinite;
  if (!(o.semi_major_axis > T(0)) || !isfinite(o.semi_major_axis)) {
    nan = numeric::domain_error<T>(
        fn, "semi-major axis = %1% m, but it must be finite and > 0 (a bound orbit)",
        o.semi_major_axis, pol);
    return false;
  }
  if (!(o.eccentricity >= T(0) && o.eccentricity < T(1))) {
    nan = numeric::domain_error<T>(
        fn, "eccentricity = %1%, but it must lie in [0, 1) (a bound orbit)", o.eccentricity, pol);
    return false;
  }
  if (!(o.gm > T(0)) || !isfinite(o.gm)) {
    nan = numeric::domain_error<T>(fn, "GM = %1% m^3/s^2, but it must be finite and > 0", o.gm,
                                   pol);
    return false;
  }
  return true;
}

/// GM / (a c^2) as a double-word number (relative error below ~8u^2).
template <class T>
inline numeric::dd<T> gm_over_ac2(const kepler_orbit<T>& o) {
  const numeric::dd<T> g = numeric::dd_mul(numeric::dd<T>{o.gm, T(0)}, light_powers_of<T>().inv_c2);
  return numeric::dd_div(g, numeric::dd<T>{o.semi_major_axis, T(0)});
}

/// (L_G - x) / (1 - L_G) for x given as a double-word number.
template <class T>
inline T rate_against_tt(const numeric::dd<T>& x) {
  const numeric::dd<T> lg = L_G_words<T>();
  const numeric::dd<T> num = numeric::dd_add(lg, numeric::dd<T>{-x.hi, -x.lo});
  const numeric::dd<T> den = numeric::dd_add(numeric::dd<T>{T(1), T(0)}, numeric::dd<T>{-lg.hi, -lg.lo});
  const numeric::dd<T> r = numeric::dd_div(num, den);
  return r.hi + r.lo;
}

}  // namespace detail

/// Mean rate offset d(tau)/dt - 1 = -3 GM / (2 a c^2) of a clock on a Kepler orbit, against
/// the coordinate time t of the Earth-centred frame (TCG).  Always < 0.
/// Domain: a finite and > 0, 0 <= e < 1, GM finite and > 0; otherwise a domain error.
/// Accuracy: <= 1 ulp.
template <class T, class Policy = throw_policy>
inline T orbit_rate_offset(const kepler_orbit<T>& orbit, const Policy& pol = Policy()) {
  T nan;
  if (!detail::check_orbit("eigenzeit::orbit_rate_offset<%1%>", orbit, nan, pol)) return nan;
  const numeric::dd<T> x =
      numeric::dd_mul(detail::gm_over_ac2(orbit), numeric::dd<T>{T(1.5), T(0)});
  return -(x.hi + x.lo);
}

/// Mean rate offset of a clock on a Kepler orbit against TT (a clock on the geoid):
/// (L_G - 3GM/(2ac^2)) / (1 - L_G).  Positive above a ~ 9 545 km (the orbiting clock runs
/// fast), e.g. +4.4647e-10 for GPS.  Same domain as orbit_rate_offset.
/// Accuracy: <= 1 ulp away from the zero crossing (file comment).
template <class T, class Policy = throw_policy>
inline T orbit_rate_offset_tt(const kepler_orbit<T>& orbit, const Policy& pol = Policy()) {
  T nan;
  if (!detail::check_orbit("eigenzeit::orbit_rate_offset_tt<%1%>", orbit, nan, pol)) return nan;
  return detail::rate_against_tt(
      numeric::dd_mul(detail::gm_over_ac2(orbit), numeric::dd<T>{T(1.5), T(0)}));
}

/// The budget of the mean rate against TT: velocity, potential and total terms (see
/// orbit_rate_budget).  Same domain as orbit_rate_offset; NaN in every member when the
/// policy returns instead of throwing.  Accuracy: <= 1 ulp each.
template <class T, class Policy = throw_policy>
inline orbit_rate_budget<T> orbit_rate_terms(const kepler_orbit<T>& orbit,
                                             const Policy& pol = Policy()) {
  T nan;
  if (!detail::check_orbit("eigenzeit::orbit_rate_terms<%1%>", orbit, nan, pol))
    return {nan, nan, nan};
  const numeric::dd<T> x = detail::gm_over_ac2(orbit);
  const numeric::dd<T> lg = detail::L_G_words<T>();
  const numeric::dd<T> pot = numeric::dd_add(lg, numeric::dd<T>{-x.hi, -x.lo});
  return {-(x.hi + x.lo) / 2, pot.hi + pot.lo,
          detail::rate_against_tt(numeric::dd_mul(x, numeric::dd<T>{T(1.5), T(0)}))};
}

/// Amplitude 2 sqrt(GM a) e / c^2 (seconds) of the periodic eccentricity term; the term itself
/// is -amplitude * sin(E).  Same domain as orbit_rate_offset.  Accuracy: <= 1 ulp.
template <class T, class Policy = throw_policy>
inline T orbit_periodic_amplitude(const kepler_orbit<T>& orbit, const Policy& pol = Policy()) {
  T nan;
  if (!detail::check_orbit("eigenzeit::orbit_periodic_amplitude<%1%>", orbit, nan, pol))
    return nan;
  const numeric::dd<T> root = numeric::dd_sqrt(numeric::two_prod(orbit.gm, orbit.semi_major_axis));
  const numeric::dd<T> two_over_c2 = numeric::dd_ldexp(detail::light_powers_of<T>().inv_c2, 1);
  const numeric::dd<T> m =
      numeric::dd_mul(numeric::dd_mul(root, numeric::dd<T>{orbit.eccentricity, T(0)}), two_over_c2);
  return m.hi + m.lo;
}

/// Periodic part of (clock reading - coordinate time) on a Kepler orbit at eccentric anomaly
/// E (radians): -2 sqrt(GM a) e sin(E) / c^2 seconds, which is IS-GPS-200's Delta t_r =
/// F e sqrt(a) sin(E) when GM is the GPS value (sign conventions: file comment).
/// Domain: the orbit as for orbit_rate_offset, E finite.
/// Accuracy: <= 1 ulp for float and double (sin taken one type wider, see detail::sin_words);
/// <= 2 ulp for long double, where glibc's sinl error enters (measured max 1.94 ulp); about
/// 1 epsilon for Boost.Multiprecision types.
template <class T, class Policy = throw_policy>
inline T orbit_periodic_offset(const kepler_orbit<T>& orbit, numeric::identity_t<T> eccentric_anomaly,
                               const Policy& pol = Policy()) {
  using std::isfinite;
  const char* fn = "eigenzeit::orbit_periodic_offset<%1%>";
  T nan;
  if (!detail::check_orbit(fn, orbit, nan, pol)) return nan;
  const T E = eccentric_anomaly;
  if (!isfinite(E))
    return numeric::domain_error<T>(fn, "eccentric anomaly = %1% rad, but it must be finite", E, pol);
  const numeric::dd<T> root = numeric::dd_sqrt(numeric::two_prod(orbit.gm, orbit.semi_major_axis));
  const numeric::dd<T> two_over_c2 = numeric::dd_ldexp(detail::light_powers_of<T>().inv_c2, 1);
  const numeric::dd<T> m =
      numeric::dd_mul(numeric::dd_mul(root, numeric::dd<T>{orbit.eccentricity, T(0)}), two_over_c2);
  const numeric::dd<T> p = numeric::dd_mul(m, detail::sin_words(E));
  return -(p.hi + p.lo);
}

/// The same periodic term from a state vector: -2 (r . v) / c^2 seconds, for position r (m)
/// and velocity v (m/s) in an Earth-centred inertial frame.  On a Kepler orbit this equals
/// orbit_periodic_offset(orbit, E); for other motion it is the usual 1/c^2 eccentricity
/// correction of the GPS user algorithms.
/// Domain: every component finite.  Accuracy: the dot product is summed in double-word
/// arithmetic, so the result is within 1 ulp + u^2 |r| |v| / c^2 (absolute) of the formula.
template <class T, class Policy = throw_policy>
inline T orbit_periodic_offset(const std::array<T, 3>& position, const std::array<T, 3>& velocity,
                               const Policy& pol = Policy()) {
  using std::isfinite;
  const char* fn = "eigenzeit::orbit_periodic_offset<%1%>(position, velocity)";
  for (std::size_t i = 0; i < 3; ++i) {
    if (!isfinite(position[i]))
      return numeric::domain_error<T>(fn, "position component = %1% m, but it must be finite",
                                      position[i], pol);
    if (!isfinite(velocity[i]))
      return numeric::domain_error<T>(fn, "velocity component = %1% m/s, but it must be finite",
                                      velocity[i], pol);
  }
  numeric::dd<T> dot = numeric::two_prod(position[0], velocity[0]);
  dot = numeric::dd_add(dot, numeric::two_prod(position[1], velocity[1]));
  dot = numeric::dd_add(dot, numeric::two_prod(position[2], velocity[2]));
  const numeric::dd<T> two_over_c2 = numeric::dd_ldexp(detail::light_powers_of<T>().inv_c2, 1);
  const numeric::dd<T> p = numeric::dd_mul(dot, two_over_c2);
  return -(p.hi + p.lo);
}

}  // namespace eigenzeit

#endif
