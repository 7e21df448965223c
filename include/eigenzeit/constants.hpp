// eigenzeit: exact SI constants and published defining constants, each with its source.
// Distributed under the Boost Software License, Version 1.0 (see LICENSE).
//
// Every constant is a function template returning T, so that a multiprecision type gets the
// decimal value rounded once to its own precision (from the decimal string), not a double
// widened.  Built-in types get the long double literal converted once more, which is the
// correctly rounded value for every constant below (checked against MPFR in
// tests/test_constants.cpp).
//
// Sources:
//   [SI]    BIPM, The International System of Units (SI brochure, 9th edition, 2019).
//   [IERS]  IERS Conventions (2010), IERS Technical Note 36, G. Petit and B. Luzum (eds.):
//           chapter 1 table 1.1 (numerical standards) and chapter 10 (general relativistic
//           models for space-time coordinates and equations of motion).  Values typed from
//           memory of those tables; the tests check the relations between them.
//   [GPS]   IS-GPS-200 (Navstar GPS Space Segment / Navigation User Interfaces), section
//           20.3.3.3.3.1 and table 20-IV: the values the GPS user algorithms are defined with.
#ifndef EIGENZEIT_CONSTANTS_HPP
#define EIGENZEIT_CONSTANTS_HPP

#include <type_traits>

#include <eigenzeit/config.hpp>
#include <eigenzeit/numeric/eft.hpp>

namespace eigenzeit {
namespace constants {

namespace detail {
/// A decimal constant in T: built-in types from the long double literal, other types from the
/// decimal string (one rounding at T's own precision).
template <class T>
inline T decimal(long double value, const char* text) {
  if constexpr (std::is_floating_point<T>::value) {
    (void)text;
    return static_cast<T>(value);
  } else {
    (void)value;
    return T(text);
  }
}
}  // namespace detail

// ---- exact by definition --------------------------------------------------------------------

/// Speed of light in vacuum, c = 299 792 458 m/s, exact [SI].
template <class T = double>
inline T speed_of_light() { return T(299792458); }

/// Seconds per day, 86 400 s, exact (the day of Julian dates) [IERS ch. 10].
template <class T = double>
inline T seconds_per_day() { return T(86400); }

/// c as a double-word number hi + lo, exact in every type with at least 14 bits (c has 28
/// significant bits): hi = c rounded to T, lo = the integer remainder.
template <class T = double>
inline numeric::dd<T> speed_of_light_words() {
  const T hi = speed_of_light<T>();
  return {hi, T(299792458LL - static_cast<long long>(hi))};
}

// ---- IAU/IERS defining constants of the time scales [IERS ch. 10] --------------------------

/// L_G = 1 - d(TT)/d(TCG) = 6.969290134e-10, defining (IAU 2000 Resolution B1.9) [IERS 10.1].
template <class T = double>
inline T L_G() { return detail::decimal<T>(6.969290134e-10L, "6.969290134e-10"); }

/// L_B = 1 - d(TDB)/d(TCB) = 1.550519768e-8, defining (IAU 2006 Resolution B3) [IERS 10.1].
template <class T = double>
inline T L_B() { return detail::decimal<T>(1.550519768e-8L, "1.550519768e-8"); }

/// TDB0 = -6.55e-5 s, defining (IAU 2006 Resolution B3) [IERS 10.1].
template <class T = double>
inline T TDB0() { return detail::decimal<T>(-6.55e-5L, "-6.55e-5"); }

/// T0 = 2443144.5003725, the Julian date (in TT, TCG and TCB alike) of 1977 January 1,
/// 00:00:32.184 TT, where the three scales agree [IERS 10.1].  Split in two parts: the whole
/// day 2443144.5, exact, and the fraction 0.0003725 of a day, rounded once (0.0003725 is not a
/// binary fraction; in double the rounding is below 2.7e-20 day, 2.4e-15 s).
template <class T = double>
inline T T0_day() { return T(2443144.5); }
template <class T = double>
inline T T0_fraction() { return detail::decimal<T>(3.725e-4L, "3.725e-4"); }

// ---- Earth [IERS table 1.1] and [GPS] --------------------------------------------------------

/// Geocentric gravitational constant GM_E = 3.986004418e14 m^3/s^2 (TCG-compatible) [IERS 1.1].
template <class T = double>
inline T GM_earth() { return detail::decimal<T>(3.986004418e14L, "3.986004418e14"); }

/// GM_E in TT-compatible units, 3.986004415e14 m^3/s^2 [IERS 1.1].
template <class T = double>
inline T GM_earth_tt() { return detail::decimal<T>(3.986004415e14L, "3.986004415e14"); }

/// Equatorial radius of the Earth a_E = 6 378 136.6 m (zero-frequency tide system) [IERS 1.1].
template <class T = double>
inline T earth_equatorial_radius() { return detail::decimal<T>(6378136.6L, "6378136.6"); }

/// Dynamical form factor of the Earth J2 = 1.0826359e-3 [IERS 1.1].
template <class T = double>
inline T earth_J2() { return detail::decimal<T>(1.0826359e-3L, "1.0826359e-3"); }

/// Potential of the geoid W0 = 62 636 856.0 m^2/s^2 [IERS 1.1]; L_G = W0 / c^2.
template <class T = double>
inline T geoid_potential() { return detail::decimal<T>(62636856.0L, "62636856.0"); }

/// Nominal mean angular velocity of the Earth omega = 7.292115e-5 rad/s [IERS 1.1].
template <class T = double>
inline T earth_rotation_rate() { return detail::decimal<T>(7.292115e-5L, "7.292115e-5"); }

/// GM of the Earth as the GPS user algorithms define it, mu = 3.986005e14 m^3/s^2 [GPS].
template <class T = double>
inline T GM_earth_gps() { return detail::decimal<T>(3.986005e14L, "3.986005e14"); }

/// Earth rotation rate of the GPS user algorithms, 7.2921151467e-5 rad/s [GPS].
template <class T = double>
inline T earth_rotation_rate_gps() { return detail::decimal<T>(7.2921151467e-5L, "7.2921151467e-5"); }

}  // namespace constants
}  // namespace eigenzeit

#endif
