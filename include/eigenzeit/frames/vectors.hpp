// eigenzeit: vec3<T> and four_vector<T>, with norms that neither overflow nor underflow.
// Distributed under the Boost Software License, Version 1.0 (see LICENSE).
//
// Both are plain aggregates with public members: vec3{x, y, z}, four_vector{t, x, y, z}, where
// t holds c times the time (or the energy, for a four-momentum with p c in x, y, z), so every
// component has one unit.  The arithmetic is the component-wise one users expect; the norms
// and the cross product are the careful parts:
//   norm(v)          |v| from the exact sum of squares (double-word), then one square root:
//                    within 1 ulp, and no overflow or underflow for any finite v (scaled by a
//                    power of two first);
//   cross(a, b)      each component a_i b_j - a_j b_i by an fma-based difference of products
//                    (Kahan's algorithm; Jeannerod, Louvet and Muller, Math. Comp. 82 (2013):
//                    error <= 2 ulp), so nearly parallel vectors keep the digits of their
//                    small cross product;
//   opening_angle    atan2(|a x b|, a . b), accurate from 0 to pi (acos of the normalised dot
//                    product is not, at both ends).
// and the Minkowski norm of a four-vector, invariant_mass(v):
//   t^2 - x^2 - y^2 - z^2 is a sum of eight exact products
//   (two_prod; the vector is scaled by a power of two first), summed exactly as a
//   floating-point expansion (Shewchuk's grow-expansion, J. R. Shewchuk, "Adaptive
//   precision floating-point arithmetic and fast robust geometric predicates", Discrete
//   Comput. Geom. 18 (1997)) and rounded once, then one square root: within 1 ulp of the
//   norm of the exact input, however strong the cancellation.  A double-word sum with an error
//   bound answers first where the cancellation is mild (most inputs); the expansion runs only
//   where that bound leaves more than a quarter ulp open.
//   Spacelike inputs: |r| <= (1 + 4 eps)|t| (a null vector off by rounding, such as a photon's
//   (|p|, p) with |p| rounded) gives 0; beyond that, a domain error through the policy, naming
//   the value of t^2 - r^2.  A past-pointing vector (t < 0) gives the same norm.
#ifndef EIGENZEIT_FRAMES_VECTORS_HPP
#define EIGENZEIT_FRAMES_VECTORS_HPP

#include <algorithm>
#include <cmath>
#include <cstddef>
#include <limits>

#include <eigenzeit/numeric/eft.hpp>
#include <eigenzeit/numeric/policy.hpp>
#include <eigenzeit/numeric/traits.hpp>

namespace eigenzeit {

/// A spatial vector (or the spatial part of a four-vector).
template <class T>
struct vec3 {
  T x, y, z;

  vec3& operator+=(const vec3& o) { x += o.x; y += o.y; z += o.z; return *this; }
  vec3& operator-=(const vec3& o) { x -= o.x; y -= o.y; z -= o.z; return *this; }
  vec3& operator*=(const T& k) { x *= k; y *= k; z *= k; return *this; }
  vec3& operator/=(const T& k) { x /= k; y /= k; z /= k; return *this; }
};

template <class T> inline vec3<T> operator+(vec3<T> a, const vec3<T>& b) { return a += b; }
template <class T> inline vec3<T> operator-(vec3<T> a, const vec3<T>& b) { return a -= b; }
template <class T> inline vec3<T> operator-(const vec3<T>& a) { return {-a.x, -a.y, -a.z}; }
template <class T> inline vec3<T> operator*(vec3<T> a, const numeric::identity_t<T>& k) { return a *= k; }
template <class T> inline vec3<T> operator*(const numeric::identity_t<T>& k, vec3<T> a) { return a *= k; }
template <class T> inline vec3<T> operator/(vec3<T> a, const numeric::identity_t<T>& k) { return a /= k; }
template <class T> inline bool operator==(const vec3<T>& a, const vec3<T>& b) {
  return a.x == b.x && a.y == b.y && a.z == b.z;
}
template <class T> inline bool operator!=(const vec3<T>& a, const vec3<T>& b) { return !(a == b); }

/// A four-vector (c t, x, y, z): an event, a displacement, or a four-momentum (E, p c).
template <class T>
struct four_vector {
  T t, x, y, z;

  /// The spatial part.
  vec3<T> spatial() const { return {x, y, z}; }

  four_vector& operator+=(const four_vector& o) { t += o.t; x += o.x; y += o.y; z += o.z; return *this; }
  four_vector& operator-=(const four_vector& o) { t -= o.t; x -= o.x; y -= o.y; z -= o.z; return *this; }
  four_vector& operator*=(const T& k) { t *= k; x *= k; y *= k; z *= k; return *this; }
  four_vector& operator/=(const T& k) { t /= k; x /= k; y /= k; z /= k; return *this; }
};

/// The four-vector with time part t and spatial part r.
template <class T>
inline four_vector<T> make_four_vector(const T& t, const vec3<T>& r) {
  return {t, r.x, r.y, r.z};
}

template <class T> inline four_vector<T> operator+(four_vector<T> a, const four_vector<T>& b) { return a += b; }
template <class T> inline four_vector<T> operator-(four_vector<T> a, const four_vector<T>& b) { return a -= b; }
template <class T> inline four_vector<T> operator-(const four_vector<T>& a) { return {-a.t, -a.x, -a.y, -a.z}; }
template <class T> inline four_vector<T> operator*(four_vector<T> a, const numeric::identity_t<T>& k) { return a *= k; }
template <class T> inline four_vector<T> operator*(const numeric::identity_t<T>& k, four_vector<T> a) { return a *= k; }
template <class T> inline four_vector<T> operator/(four_vector<T> a, const numeric::identity_t<T>& k) { return a /= k; }
template <class T> inline bool operator==(const four_vector<T>& a, const four_vector<T>& b) {
  return a.t == b.t && a.x == b.x && a.y == b.y && a.z == b.z;
}
template <class T> inline bool operator!=(const four_vector<T>& a, const four_vector<T>& b) { return !(a == b); }

// ---- products ------------------------------------------------------------------------------

/// a . b, plainly (error <= ~3 u sum |a_i b_i|; see norm for the careful square).
template <class T>
inline T dot(const vec3<T>& a, const vec3<T>& b) {
  return a.x * b.x + a.y * b.y + a.z * b.z;
}

/// The Minkowski product a.t b.t - a.x b.x - a.y b.y - a.z b.z (signature +, -, -, -), plainly.
/// For the invariant mass of one four-vector without cancellation see invariant_mass.hpp.
template <class T>
inline T minkowski_dot(const four_vector<T>& a, const four_vector<T>& b) {
  return a.t * b.t - (a.x * b.x + a.y * b.y + a.z * b.z);
}

namespace detail {

/// a b - c d with error <= 2 ulp whatever the cancellation (Kahan's algorithm, see the top).
template <class T>
inline T difference_of_products(T a, T b, T c, T d) {
  const T w = c * d;
  const T e = numeric::fms(c, d, w);  // c d - w, exact
  const T f = numeric::fms(a, b, w);  // a b - w, one rounding
  return f - e;
}

/// The largest |component|.
template <class T>
inline T max_abs(const vec3<T>& v) {
  using std::abs;
  using std::max;
  return max(abs(v.x), max(abs(v.y), abs(v.z)));
}

/// Whether squares and products of two numbers up to `big` (the largest magnitude of the
/// inputs) neither overflow nor lose their exact low parts to underflow, so that the
/// double-word sums of squares need no scaling: 2^(min_exponent/2 + digits) <= big <=
/// 2^(max_exponent/2 - 2).  Smaller inputs' squares may still underflow, but they are below
/// 2^-2digits of big^2 and change nothing.
template <class T>
inline bool in_square_range(const T& big) {
  constexpr int lo = std::numeric_limits<T>::min_exponent / 2 + numeric::digits_v<T>;
  return big >= numeric::pow2_const<T, lo>() &&
         big <= numeric::pow2_const<T, std::numeric_limits<T>::max_exponent / 2 - 2>();
}

/// v scaled by 2^-e with e the exponent of its largest component, so that the largest lies in
/// [1, 2) (exact, except that components below 2^-(digits - min_exponent) of the largest lose
/// bits they contribute nothing to, relatively, below u^2).  v must be finite and nonzero.
template <class T>
inline vec3<T> scaled(const vec3<T>& v, int& e) {
  using std::ilogb;
  using std::ldexp;
  e = static_cast<int>(ilogb(max_abs(v)));
  return {T(ldexp(v.x, -e)), T(ldexp(v.y, -e)), T(ldexp(v.z, -e))};
}

/// The sum of squares of a vector whose largest component lies in [1, 2), as a double-word
/// number with relative error below ~4 u^2 (exact products, sums of positive terms).
template <class T>
inline numeric::dd<T> sum_of_squares_words(const vec3<T>& v) {
  numeric::dd<T> s = numeric::two_prod(v.x, v.x);
  s = numeric::dd_add(s, numeric::two_prod(v.y, v.y));
  return numeric::dd_add(s, numeric::two_prod(v.z, v.z));
}

/// |v| as a double-word number hi + lo, scaled by 2^e: |v| = (hi + lo) 2^e.  v finite, nonzero.
template <class T>
inline numeric::dd<T> norm_words(const vec3<T>& v, int& e) {
  return numeric::dd_sqrt(sum_of_squares_words(scaled(v, e)));
}

/// The unit vector along v in double-word components (hi + lo per component, relative error
/// O(u^2)), for v finite and nonzero.  Formed in two steps, w = v / max|v_i| (the largest
/// component becomes exactly +-1) and then w / |w|: the first quotients are correctly rounded
/// double-word values of the exact ratios, so any two vectors that are exact multiples of one
/// another (3 v, -v, v / 7 where exact) get identical (or exactly opposite) unit words.
template <class T>
struct unit_words {
  numeric::dd<T> x, y, z;
};

template <class T>
inline unit_words<T> unit_words_of(const vec3<T>& v_in) {
  // First a power-of-two scaling (exact) so that the quotients' residuals stay normal even
  // for subnormal components.
  int e = 0;
  const vec3<T> v = scaled(v_in, e);
  const numeric::dd<T> m{max_abs(v), T(0)};
  const numeric::dd<T> w[3] = {numeric::dd_div(numeric::dd<T>{v.x, T(0)}, m),
                               numeric::dd_div(numeric::dd<T>{v.y, T(0)}, m),
                               numeric::dd_div(numeric::dd<T>{v.z, T(0)}, m)};
  numeric::dd<T> q = numeric::dd_mul(w[0], w[0]);
  q = numeric::dd_add(q, numeric::dd_mul(w[1], w[1]));
  q = numeric::dd_add(q, numeric::dd_mul(w[2], w[2]));
  const numeric::dd<T> n = numeric::dd_sqrt(q);
  return {numeric::dd_div(w[0], n), numeric::dd_div(w[1], n), numeric::dd_div(w[2], n)};
}

template <class T>
inline bool all_finite(const vec3<T>& v) {
  using std::isfinite;
  return isfinite(v.x) && isfinite(v.y) && isfinite(v.z);
}

/// Exact sum of n floating-point numbers as a nonoverlapping expansion (grow-expansion), then
/// summed from the smallest component up in double-word arithmetic: the result is the exact
/// sum rounded with an error below ~1 ulp.  Valid while no two_sum overflows.
template <class T, std::size_t N>
inline T exact_sum(const T (&terms)[N]) {
  T h[N];
  std::size_t len = 0;
  for (std::size_t k = 0; k < N; ++k) {
    T q = terms[k];
    std::size_t out = 0;
    for (std::size_t j = 0; j < len; ++j) {
      const numeric::dd<T> s = numeric::two_sum(q, h[j]);
      q = s.hi;
      if (s.lo != 0) h[out++] = s.lo;
    }
    h[out++] = q;
    len = out;
  }
  numeric::dd<T> acc{T(0), T(0)};
  for (std::size_t j = 0; j < len; ++j) {
    const numeric::dd<T> s = numeric::two_sum(acc.hi, h[j]);
    acc = numeric::two_sum(s.hi, s.lo + acc.lo);
  }
  return acc.hi + acc.lo;
}


}  // namespace detail

/// a x b; each component within 2 ulp of the exact one (see the top of the file).
template <class T>
inline vec3<T> cross(const vec3<T>& a, const vec3<T>& b) {
  return {detail::difference_of_products(a.y, b.z, a.z, b.y),
          detail::difference_of_products(a.z, b.x, a.x, b.z),
          detail::difference_of_products(a.x, b.y, a.y, b.x)};
}

// ---- norms ---------------------------------------------------------------------------------

/// |v|, within 1 ulp for every finite v, without overflow or underflow of intermediate
/// squares (the components are scaled by a power of two first).  inf if a component is
/// infinite, NaN if one is NaN (and none infinite).
template <class T>
inline T norm(const vec3<T>& v) {
  using std::isfinite;
  using std::ldexp;
  using std::isinf;
  const T m = detail::max_abs(v);
  if (isinf(v.x) || isinf(v.y) || isinf(v.z)) return std::numeric_limits<T>::infinity();
  if (m == 0 || !isfinite(m)) return m + (v.x + v.y + v.z);  // 0 or NaN
  if (detail::in_square_range(m)) {
    const numeric::dd<T> n = numeric::dd_sqrt(detail::sum_of_squares_words(v));
    return n.hi + n.lo;
  }
  int e = 0;
  const numeric::dd<T> n = detail::norm_words(v, e);
  return T(ldexp(n.hi + n.lo, e));
}

/// x^2 + y^2 + z^2 plainly: may overflow or underflow where norm() does not.
template <class T>
inline T norm_squared(const vec3<T>& v) {
  return dot(v, v);
}

/// The unit vector along v.  A zero, infinite or NaN v is a domain error through the policy
/// (naming the function and the offending component); with a NaN policy the result is NaN.
template <class T, class Policy = throw_policy>
inline vec3<T> unit(const vec3<T>& v, const Policy& pol = Policy()) {
  const T m = detail::max_abs(v);
  if (!(m > 0) || !detail::all_finite(v)) {
    using std::isnan;
    const T bad = isnan(v.x) ? v.x : isnan(v.y) ? v.y : isnan(v.z) ? v.z : m;
    const T nan = numeric::domain_error<T>(
        "eigenzeit::unit(vec3<%1%>)",
        "largest |component| = %1%, but the vector must be finite and nonzero", bad, pol);
    return {nan, nan, nan};
  }
  const detail::unit_words<T> n = detail::unit_words_of(v);
  return {n.x.hi + n.x.lo, n.y.hi + n.y.lo, n.z.hi + n.z.lo};
}

/// The angle between a and b in [0, pi], as atan2(|a x b|, a . b) on the vectors scaled to
/// unit-sized largest components: accurate for nearly parallel and nearly antiparallel
/// vectors (a few ulp).  0 if either vector is zero; NaN if a component is NaN or infinite.
template <class T>
inline T opening_angle(const vec3<T>& a, const vec3<T>& b) {
  using std::atan2;
  const T ma = detail::max_abs(a), mb = detail::max_abs(b);
  if (!detail::all_finite(a) || !detail::all_finite(b)) return std::numeric_limits<T>::quiet_NaN();
  if (ma == 0 || mb == 0) return T(0);
  int ea = 0, eb = 0;
  const vec3<T> sa = detail::scaled(a, ea), sb = detail::scaled(b, eb);
  return atan2(norm(cross(sa, sb)), dot(sa, sb));
}

/// |r| of a four-vector's spatial part (see norm).
template <class T>
inline T spatial_norm(const four_vector<T>& v) {
  return norm(v.spatial());
}

/// The Minkowski norm sqrt(t^2 - |r|^2) of v (the mass of a four-momentum (E, p c)): see the
/// top of the file for the form and the rule on spacelike inputs.  A NaN or infinite
/// component is a domain error through the policy.
template <class T, class Policy = throw_policy>
inline T invariant_mass(const four_vector<T>& v, const Policy& pol = Policy()) {
  using std::abs;
  using std::ilogb;
  using std::isfinite;
  using std::ldexp;
  using std::max;
  using std::sqrt;
  const char* function = "eigenzeit::invariant_mass(four_vector<%1%>)";
  if (!isfinite(v.t) || !detail::all_finite(v.spatial())) {
    const T bad = !isfinite(v.t) ? v.t : !isfinite(v.x) ? v.x : !isfinite(v.y) ? v.y : v.z;
    return numeric::domain_error<T>(function, "component = %1%, but every component must be finite",
                                    bad, pol);
  }
  const T big = max(abs(v.t), detail::max_abs(v.spatial()));
  if (big == 0) return T(0);
  // Scaled by 2^-e only outside the range where the squares are safe (ldexp is a library call).
  const int e = detail::in_square_range(big) ? 0 : static_cast<int>(ilogb(big));
  T t = v.t, x = v.x, y = v.y, z = v.z;
  if (e != 0) {
    t = T(ldexp(t, -e));
    x = T(ldexp(x, -e));
    y = T(ldexp(y, -e));
    z = T(ldexp(z, -e));
  }
  const numeric::dd<T> tt = numeric::two_prod(t, t), xx = numeric::two_prod(x, x),
                       yy = numeric::two_prod(y, y), zz = numeric::two_prod(z, z);
  // Fast path: the high parts summed by two_sum, the errors and low parts added once.  The
  // error of d is below 8 u^2 (t^2 + r^2) (each low term is below u of a partial sum bounded
  // by that); where that is within u/4 of |d|, d is within 3/4 ulp and the root within 1 ulp.
  // Otherwise (cancellation beyond 1 / (32 u)) the exact expansion decides.
  const numeric::dd<T> s1 = numeric::two_sum(tt.hi, -xx.hi);
  const numeric::dd<T> s2 = numeric::two_sum(s1.hi, -yy.hi);
  const numeric::dd<T> s3 = numeric::two_sum(s2.hi, -zz.hi);
  T d = s3.hi + ((s1.lo + s2.lo + s3.lo) + (tt.lo - xx.lo - yy.lo - zz.lo));
  const T u = std::numeric_limits<T>::epsilon() / 2;
  if (!(32 * u * (tt.hi + xx.hi + yy.hi + zz.hi) <= abs(d))) {
    const T terms[8] = {tt.lo, -xx.lo, -yy.lo, -zz.lo, tt.hi, -xx.hi, -yy.hi, -zz.hi};
    d = detail::exact_sum(terms);  // (t^2 - r^2) 2^-2e, rounded once
  }
  if (d < 0) {
    // |r| <= (1 + 4 eps)|t|  <=>  r^2 - t^2 <= (8 eps + 16 eps^2) t^2: a null vector off by
    // rounding.  The bound is formed with a relative margin of 4 eps, so that a vector exactly
    // on the boundary is not refused by the bound's own rounding.
    const T eps = std::numeric_limits<T>::epsilon();
    if (-d <= (8 * eps) * (tt.hi + tt.lo) * (1 + 4 * eps)) return T(0);
    // Reported in the input's units (inf if the square overflows).
    const T shown = e == 0 ? d : T(ldexp(d, 2 * e));
    return numeric::domain_error<T>(
        function,
        "t^2 - |r|^2 = %1%: the vector is spacelike by more than rounding "
        "(|r| > (1 + 4 epsilon)|t|) and has no mass",
        shown, pol);
  }
  const T m = sqrt(d);
  return e == 0 ? m : T(ldexp(m, e));
}

}  // namespace eigenzeit

#endif
