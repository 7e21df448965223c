// eigenzeit: gravitational potential models of the Earth for clock rates.
// Distributed under the Boost Software License, Version 1.0 (see LICENSE).
//
// Sign convention: U >= 0, U = GM/r for a point mass (the sign of the IERS Conventions, the
// one clock_rate_offset takes).  Positions are std::array<T, 3> in metres, Cartesian, in an
// Earth-centred frame whose z axis is the Earth's axis of figure (for an inertial frame: the
// GCRS z axis, which follows the Earth's pole up to precession and nutation; the potential of
// a zonal model is the same in any frame rotated about that axis).  A plain std::array keeps
// this header free of the frames layer; x, y, z are elements 0, 1, 2.
//
// Models:
//   point_mass_potential  U = GM / r
//   j2_potential          U = GM / r [1 - J2 (a_E / r)^2 P2(z / r)],  P2(s) = (3 s^2 - 1) / 2
//                         (the zonal degree-2 term of the Earth's field; the next zonal term,
//                         J4 ~ -1.6e-6, changes U by at most ~2e-6 relative at the surface)
// Both have an earth() factory using constants.hpp: GM_E (TCG-compatible), a_E and J2 from the
// IERS Conventions (2010) table 1.1.  Pair the TCG-compatible GM with TCG as coordinate time,
// the TT-compatible one (constants::GM_earth_tt) with TT.
//
// Accuracy.  r^2 = x^2 + y^2 + z^2 is summed in double-word arithmetic (each square split by
// two_prod; positive terms, relative error below 3u^2), r = dd_sqrt(r^2) and GM / r = dd_div,
// each within a few u^2: GM / r is correctly rounded except within ~8 u^2 of a rounding
// boundary.  The J2 factor is below 1.1e-3 and rounded in plain T, which costs at most
// ~5u * 1.1e-3 relative: <= 1 ulp overall (measured: tests/test_timing_potential.cpp).
#ifndef EIGENZEIT_TIMING_POTENTIAL_HPP
#define EIGENZEIT_TIMING_POTENTIAL_HPP

#include <array>
#include <cmath>
#include <cstddef>
#include <limits>

#include <eigenzeit/config.hpp>
#include <eigenzeit/constants.hpp>
#include <eigenzeit/numeric/eft.hpp>
#include <eigenzeit/numeric/policy.hpp>

namespace eigenzeit {

namespace detail {

/// |r|^2 as a double-word number (squares split exactly, summed with two_sum), or {NaN or inf}
/// when a component is not finite.
template <class T>
inline numeric::dd<T> norm_squared_words(const std::array<T, 3>& r) {
  const numeric::dd<T> xx = numeric::two_prod(r[0], r[0]);
  const numeric::dd<T> yy = numeric::two_prod(r[1], r[1]);
  const numeric::dd<T> zz = numeric::two_prod(r[2], r[2]);
  numeric::dd<T> s = numeric::dd_add(xx, yy);
  return numeric::dd_add(s, zz);
}

/// GM / |r| as a double-word number, for positions already checked: r^2 finite and normal.
template <class T>
inline numeric::dd<T> gm_over_r_words(const T& gm, numeric::dd<T> r2) {
  return numeric::dd_div(numeric::dd<T>{gm, T(0)}, numeric::dd_sqrt(r2));
}

/// Common domain checks of the potential models; returns false after reporting through the
/// policy (with `nan` set) when the position or GM is unusable.
template <class T, class Policy>
inline bool check_position(const char* fn, const T& gm, const std::array<T, 3>& r,
                           const numeric::dd<T>& r2, T& nan, const Policy& pol) {
  using std::isfinite;
  using std::isnormal;
  if (!(gm > T(0)) || !isfinite(gm)) {
    nan = numeric::domain_error<T>(fn, "GM = %1% m^3/s^2, but it must be finite and > 0", gm, pol);
    return false;
  }
  for (int i = 0; i < 3; ++i) {
    if (!isfinite(r[static_cast<std::size_t>(i)])) {
      nan = numeric::domain_error<T>(fn, "position component = %1% m, but it must be finite",
                                     r[static_cast<std::size_t>(i)], pol);
      return false;
    }
  }
  if (!isnormal(r2.hi) || !isfinite(r2.hi)) {
    nan = numeric::domain_error<T>(
        fn, "squared distance from the centre = %1% m^2, but it must be a finite normal number "
            "(the position must not be at the centre)", r2.hi, pol);
    return false;
  }
  return true;
}

}  // namespace detail

/// Potential of a point mass, U = GM / r (m^2/s^2), U >= 0.
/// Domain: GM finite and > 0; position finite, not at the centre, with r^2 a normal number.
/// Accuracy: <= 1 ulp (measured, double, long double and float).
template <class T>
struct point_mass_potential {
  T gm;  ///< GM in m^3/s^2

  /// The Earth: GM_E = 3.986004418e14 m^3/s^2 (TCG-compatible, IERS Conventions 2010, table 1.1).
  static point_mass_potential earth() { return {constants::GM_earth<T>()}; }

  /// U at `position` (metres, Earth-centred).
  template <class Policy = throw_policy>
  T operator()(const std::array<T, 3>& position, const Policy& pol = Policy()) const {
    const numeric::dd<T> r2 = detail::norm_squared_words(position);
    T nan;
    if (!detail::check_position("eigenzeit::point_mass_potential<%1%>::operator()", gm,
                                position, r2, nan, pol))
      return nan;
    const numeric::dd<T> u = detail::gm_over_r_words(gm, r2);
    return u.hi + u.lo;
  }
};

/// Point mass plus the zonal J2 term, axis along z:
///     U = GM / r [1 - J2 (R / r)^2 (3 z^2 / r^2 - 1) / 2]
/// (m^2/s^2, U >= 0; larger over the equator than over the pole at the same r).
/// Domain: GM finite and > 0, R finite and >= 0, J2 finite; position as for the point mass.
/// The model describes the field outside the body (r >= R); inside, the J2 term grows as
/// (R/r)^2 and the accuracy statement no longer holds.
/// Accuracy: <= 1 ulp for r >= R and |J2| <= 1e-2 (measured, double, long double and float).
template <class T>
struct j2_potential {
  T gm;      ///< GM in m^3/s^2
  T radius;  ///< reference (equatorial) radius R in m
  T j2;      ///< dimensionless J2 (positive for an oblate body)

  /// The Earth: GM_E = 3.986004418e14 m^3/s^2 (TCG-compatible), a_E = 6 378 136.6 m and
  /// J2 = 1.0826359e-3, all from the IERS Conventions (2010), table 1.1.
  static j2_potential earth() {
    return {constants::GM_earth<T>(), constants::earth_equatorial_radius<T>(),
            constants::earth_J2<T>()};
  }

  /// U at `position` (metres, Earth-centred, z along the axis of figure).
  template <class Policy = throw_policy>
  T operator()(const std::array<T, 3>& position, const Policy& pol = Policy()) const {
    using std::isfinite;
    const char* fn = "eigenzeit::j2_potential<%1%>::operator()";
    const numeric::dd<T> r2 = detail::norm_squared_words(position);
    T nan;
    if (!detail::check_position(fn, gm, position, r2, nan, pol)) return nan;
    if (!(radius >= T(0)) || !isfinite(radius))
      return numeric::domain_error<T>(fn, "reference radius = %1% m, but it must be finite and >= 0",
                                      radius, pol);
    if (!isfinite(j2))
      return numeric::domain_error<T>(fn, "J2 = %1%, but it must be finite", j2, pol);
    const numeric::dd<T> u = detail::gm_over_r_words(gm, r2);
    // k = -J2 (R^2 / r^2) (3 z^2 / r^2 - 1) / 2, |k| <= 1.5 |J2| (R / r)^2: plain T suffices,
    // its relative error (~5u) is scaled by |k| in the result.
    const T inv_r2 = T(1) / r2.hi;
    const T z2 = position[2] * position[2] * inv_r2;
    const T k = -j2 * (radius * radius * inv_r2) * (T(1.5) * z2 - T(0.5));
    return u.hi + (u.lo + u.hi * k);
  }
};

}  // namespace eigenzeit

#endif
