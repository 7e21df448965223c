// eigenzeit: composition of two boosts -- one pure boost and the Wigner (Thomas) rotation.
// Distributed under the Boost Software License, Version 1.0 (see LICENSE).
//
// Order convention.  compose(first, second) describes applying `first`, then `second` (with the
// passive convention of lorentz_boost.hpp: second's velocity is measured in the frame that
// first leads to, along that frame's axes).  The product is written as
//     second.apply(first.apply(v)) == result.boost.apply(result.rotation.apply(v)),
// i.e. rotation first, then the pure boost.  The rotation turns by `angle` in [0, pi] about
// `axis` = (n1 x n2) / |n1 x n2| (right-handed, acting on the components), n1 and n2 the two
// directions; the composite boost's velocity is the relativistic sum v2 (+) v1 (Einstein's
// addition, second's velocity first), whose proper velocity is
//     U = u1 + u2 (gamma1 + (u1 . u2) / (gamma2 + 1)),   u_i = gamma_i beta_i n_i.
//
// Accuracy.  Everything is formed in double-word arithmetic from the two boosts' double-word
// speeds and directions, in forms without cancellation (u = unit roundoff):
//  * gamma - 1 of the composite, from gamma_c = gamma1 gamma2 + U1 U2 cos(theta):
//      cos >= 0:  (g1 - 1)(g2 - 1) + (g1 - 1) + (g2 - 1) + U1 U2 cos     (positive terms)
//      cos <  0:  Y + U1 U2 (1 + cos), with 1 + cos = |n1 + n2|^2 / 2 and
//                 Y = gamma1 gamma2 - U1 U2 - 1 = X^2 / (1 + sqrt(1 + X^2)), X = gamma1 U2 - U1 gamma2
//    (the identity (g1 g2 - U1 U2)^2 - (g1 U2 - U1 g2)^2 = 1), so nearly antiparallel equal
//    speeds and nearly collinear near-c speeds keep their digits; the speed is then built
//    from that double-word gamma - 1 and every view is within a few ulp.
//  * The rotation angle: eps = 2 atan2(t1 t2 sin(theta), 1 + t1 t2 cos(theta)), t_i =
//    tanh(rapidity_i / 2) = U_i / (gamma_i + 1) (the half-angle form of the classical result
//    tan(eps/2) = sin(theta) / (coth(eta1/2) coth(eta2/2) + cos(theta)), common practice, no
//    source).  sin(theta) is |n1 x n2| from double-word cross products, accurate for nearly
//    parallel directions; for cos < 0 the denominator is (1 - t1) + t1 (1 - t2) + t1 t2 (1 + cos)
//    with 1 - t_i = (1 + 1/(gamma_i + U_i)) / (gamma_i + 1), so it keeps its digits when both
//    speeds are near c and the directions nearly opposite.  Small limit: eps ~ beta1 beta2
//    sin(theta) / 2, with no cancellation anywhere.  Within a few ulp (atan2's own error and
//    two roundings to T).
#ifndef EIGENZEIT_FRAMES_COMPOSE_HPP
#define EIGENZEIT_FRAMES_COMPOSE_HPP

#include <cmath>
#include <limits>

#include <eigenzeit/frames/lorentz_boost.hpp>
#include <eigenzeit/frames/vectors.hpp>
#include <eigenzeit/numeric/eft.hpp>
#include <eigenzeit/numeric/policy.hpp>
#include <eigenzeit/speed.hpp>

namespace eigenzeit {

/// A rotation by `angle` (radians, right-handed) about the unit vector `axis`; angle 0 comes
/// with a zero axis.
template <class T>
struct wigner_rotation {
  vec3<T> axis;
  T angle;

  /// R v (Rodrigues' formula; 1 - cos(angle) taken as 2 sin^2(angle / 2), no cancellation).
  vec3<T> apply(const vec3<T>& v) const {
    using std::sin;
    const T s = sin(angle);
    const T h = sin(angle / 2);
    const T one_minus_cos = 2 * h * h;
    const vec3<T> k = axis;
    const vec3<T> kv = cross(k, v);
    const T along = dot(k, v);
    return {v.x + (s * kv.x + one_minus_cos * (k.x * along - v.x)),
            v.y + (s * kv.y + one_minus_cos * (k.y * along - v.y)),
            v.z + (s * kv.z + one_minus_cos * (k.z * along - v.z))};
  }

  /// The rotation acting on the spatial part (t unchanged).
  four_vector<T> apply(const four_vector<T>& v) const {
    return make_four_vector(v.t, apply(v.spatial()));
  }
};

/// What compose() returns: second after first == boost after rotation.
template <class T>
struct boost_composition {
  lorentz_boost<T> boost;
  wigner_rotation<T> rotation;
};

namespace detail {

template <class T>
inline numeric::dd<T> dd_dot3(const numeric::dd<T>* a, const numeric::dd<T>* b) {
  numeric::dd<T> s = numeric::dd_mul(a[0], b[0]);
  s = numeric::dd_add(s, numeric::dd_mul(a[1], b[1]));
  return numeric::dd_add(s, numeric::dd_mul(a[2], b[2]));
}

template <class T>
inline numeric::dd<T> dd_one() {
  return {T(1), T(0)};
}

}  // namespace detail

/// The composition of two boosts (first, then second): see the top of the file for the order
/// convention and the forms.  A composite Lorentz factor beyond the largest finite value is a
/// domain error through the policy.
template <class T, class Policy = throw_policy>
inline boost_composition<T> compose(const lorentz_boost<T>& first, const lorentz_boost<T>& second,
                                    const Policy& pol = Policy()) {
  using numeric::dd;
  using numeric::dd_add;
  using numeric::dd_div;
  using numeric::dd_mul;
  using std::atan2;
  using std::ldexp;
  const dd<T> n1[3] = {first.direction_words(0), first.direction_words(1), first.direction_words(2)};
  const dd<T> n2[3] = {second.direction_words(0), second.direction_words(1), second.direction_words(2)};
  const speed<T>& s1 = first.speed();
  const speed<T>& s2 = second.speed();
  const dd<T> g1 = s1.gamma_words(), g2 = s2.gamma_words();
  const detail::boost_speed_words<T> w1 = detail::boost_speed_words_of(s1), w2 = detail::boost_speed_words_of(s2);
  const dd<T> m1 = w1.gamma_m1, m2 = w2.gamma_m1;
  const dd<T> u1 = w1.proper_speed, u2 = w2.proper_speed;
  const dd<T> one = detail::dd_one<T>();

  // The products below reach gamma1 gamma2: refuse, naming compose, where they would overflow
  // (gamma1 gamma2 > max / 16, e.g. two boosts with gamma 1e160 and 1e150 in double, even
  // where the composite itself would be finite: a domain error, never a wrong number).
  {
    using std::isfinite;
    const T product = g1.hi * g2.hi;
    if (!(product <= std::numeric_limits<T>::max() / 16)) {
      const T nan = numeric::domain_error<T>(
          "eigenzeit::compose(lorentz_boost<%1%>, lorentz_boost<%1%>)",
          "gamma1 gamma2 = %1%: the composition of two boosts this fast is beyond the range of "
          "the type (gamma1 gamma2 must stay below its largest finite value / 16)",
          isfinite(product) ? product : std::numeric_limits<T>::infinity(), pol);
      const speed<T> bad = speed<T>::from_beta(nan, nan_policy());
      return {lorentz_boost<T>::from_unit_words({nan, nan}, {nan, nan}, {nan, nan}, bad),
              {{nan, nan, nan}, nan}};
    }
  }

  // cos(theta), and sin(theta) = |n1 x n2| (absolute errors O(u^2)).  Each component of the
  // cross product is written n1_i n2_j - n2_i n1_j, with the factor from n1 first in both
  // products, so that equal or opposite unit words give exactly zero (whatever contraction
  // of a * b + c the compiler applies inside dd_mul).  Parallel directions given with
  // lengths that are not a power of two apart have unit words that differ by ~u^2, and give
  // an angle of that order (about 1e-32 rad in double) instead of 0.
  const dd<T> c = detail::dd_dot3(n1, n2);
  const dd<T> cr[3] = {numeric::dd_sub(dd_mul(n1[1], n2[2]), dd_mul(n2[1], n1[2])),
                       numeric::dd_sub(dd_mul(n1[2], n2[0]), dd_mul(n2[2], n1[0])),
                       numeric::dd_sub(dd_mul(n1[0], n2[1]), dd_mul(n2[0], n1[1]))};
  const dd<T> sin_theta = numeric::dd_sqrt(detail::dd_dot3(cr, cr));
  const dd<T> u1u2 = dd_mul(u1, u2);

  // gamma_c - 1, and the composite proper velocity U = u1 n1 + k u2 n2 with
  // k = gamma1 + U1 U2 cos / (gamma2 + 1), each in a form without cancellation.
  dd<T> gm1;
  dd<T> one_plus_cos{T(0), T(0)};
  dd<T> w[3];
  if (c.hi >= 0) {
    gm1 = dd_add(dd_add(dd_mul(m1, m2), dd_add(m1, m2)), dd_mul(u1u2, c));
    const dd<T> k = dd_add(g1, dd_div(dd_mul(u1u2, c), dd_add(g2, one)));
    const dd<T> uk = dd_mul(u2, k);
    for (int i = 0; i < 3; ++i) w[i] = dd_add(dd_mul(u1, n1[i]), dd_mul(uk, n2[i]));
  } else {
    // sigma = n1 + n2 (short: nearly opposite directions) and 1 + cos = |sigma|^2 / 2.
    const dd<T> sigma[3] = {dd_add(n1[0], n2[0]), dd_add(n1[1], n2[1]), dd_add(n1[2], n2[2])};
    const dd<T> q = detail::dd_dot3(sigma, sigma);
    one_plus_cos = {q.hi / 2, q.lo / 2};
    // X = gamma1 U2 - U1 gamma2 = gamma1 gamma2 (beta2 - beta1), the difference of the betas
    // taken from their words (exact where both high words are 1: the deficits' difference).
    const dd<T> b1 = s1.beta_words(), b2 = s2.beta_words();
    const dd<T> db0 = numeric::two_sum(b2.hi, -b1.hi);
    const dd<T> db = numeric::two_sum(db0.hi, db0.lo + (b2.lo - b1.lo));
    const dd<T> x = dd_mul(dd_mul(g1, g2), db);
    const dd<T> x2 = dd_mul(x, x);
    const dd<T> y = dd_div(x2, dd_add(one, numeric::dd_sqrt(dd_add(one, x2))));  // g1 g2 - U1 U2 - 1
    gm1 = dd_add(y, dd_mul(u1u2, one_plus_cos));
    // U = (U1 - k U2) n1 + k U2 sigma, with
    //   U1 - k U2 = -X - U1 U2^2 (1 + cos) / (gamma2 + 1)
    //   k = 1/(gamma1 + U1) + U1 (1 - t2) + U1 t2 (1 + cos),  t2 = U2 / (gamma2 + 1),
    //   1 - t2 = (1 + 1/(gamma2 + U2)) / (gamma2 + 1)          (positive terms)
    const dd<T> g2p1 = dd_add(g2, one);
    const dd<T> t2 = dd_div(u2, g2p1);
    const dd<T> one_minus_t2 = dd_div(dd_add(one, dd_div(one, dd_add(g2, u2))), g2p1);
    const dd<T> k = dd_add(dd_add(dd_div(one, dd_add(g1, u1)), dd_mul(u1, one_minus_t2)),
                           dd_mul(dd_mul(u1, t2), one_plus_cos));
    const dd<T> along = numeric::dd_sub(numeric::dd_neg(x), dd_div(dd_mul(dd_mul(u1u2, u2), one_plus_cos), g2p1));
    const dd<T> uk = dd_mul(u2, k);
    for (int i = 0; i < 3; ++i) w[i] = dd_add(dd_mul(along, n1[i]), dd_mul(uk, sigma[i]));
  }
  gm1 = numeric::fast_two_sum(gm1.hi, gm1.lo);
  const speed<T> sc = speed<T>::from_gamma_m1_words(gm1, pol);

  lorentz_boost<T> boost;
  const T wmax = detail::max_abs(vec3<T>{w[0].hi, w[1].hi, w[2].hi});
  using std::isfinite;
  if (wmax > 0 && isfinite(wmax)) {
    using std::ilogb;
    const int e = static_cast<int>(ilogb(wmax));
    for (auto& wi : w) wi = numeric::dd_ldexp(wi, -e);
    const dd<T> norm = numeric::dd_sqrt(detail::dd_dot3(w, w));
    boost = lorentz_boost<T>::from_unit_words(dd_div(w[0], norm), dd_div(w[1], norm), dd_div(w[2], norm), sc);
  } else {
    // Opposite equal boosts: the composite is at rest (or a NaN input); keep a unit direction.
    boost = lorentz_boost<T>::from_unit_words(n2[0], n2[1], n2[2], sc);
  }

  // The Wigner rotation.
  const dd<T> t1 = dd_div(u1, dd_add(g1, one)), t2 = dd_div(u2, dd_add(g2, one));
  const dd<T> tt = dd_mul(t1, t2);
  const dd<T> num = dd_mul(tt, sin_theta);
  dd<T> den;
  if (c.hi >= 0) {
    den = dd_add(one, dd_mul(tt, c));
  } else {
    // 1 - t_i = (1 + 1/(gamma_i + U_i)) / (gamma_i + 1)
    const dd<T> a1 = dd_div(dd_add(one, dd_div(one, dd_add(g1, u1))), dd_add(g1, one));
    const dd<T> a2 = dd_div(dd_add(one, dd_div(one, dd_add(g2, u2))), dd_add(g2, one));
    den = dd_add(dd_add(a1, dd_mul(t1, a2)), dd_mul(tt, one_plus_cos));
  }
  wigner_rotation<T> rot{{T(0), T(0), T(0)}, T(0)};
  const T sin_hi = sin_theta.hi + sin_theta.lo;
  if (sin_hi > 0) {
    rot.angle = 2 * atan2(num.hi + num.lo, den.hi + den.lo);
    if (rot.angle > 0) {
      rot.axis = {(cr[0].hi + cr[0].lo) / sin_hi, (cr[1].hi + cr[1].lo) / sin_hi,
                  (cr[2].hi + cr[2].lo) / sin_hi};
    }
  }
  return {boost, rot};
}

}  // namespace eigenzeit

#endif
