// eigenzeit: invariant masses without cancellation -- of one four-vector, of two momenta, and of
// a range of momenta with an error bound and the multiprecision fallback.
// Distributed under the Boost Software License, Version 1.0 (see LICENSE).
//
// The textbook m^2 = E^2 - |p|^2 cancels catastrophically for light, fast systems: a pair of
// photons at an opening angle of 1e-8 rad has m^2 / E^2 ~ 1e-17, below double's resolution,
// and E*E - p*p returns 0 or a negative number.
//
//  * invariant_mass(four_vector v): see vectors.hpp.
//  * invariant_mass(a, b) of two momenta: with E_i^2 = m_i^2 + p_i^2, P_i = |p_i|, d = pa . pb,
//        M^2 = ma^2 + mb^2 + 2 (Ea Eb - d)
//        Ea Eb - Pa Pb = (ma^2 Eb^2 + Pa^2 mb^2) / (Ea Eb + Pa Pb)          (exact identity)
//        Pa Pb - d     = |pa x pb|^2 / (Pa Pb + d)     for d > 0,   Pa Pb - d  for d <= 0
//    (that is 2 Pa Pb sin^2(theta/2), the rearranged 1 - cos(theta) of the opening angle taken
//    from the cross and dot products, without calling atan2), so M^2 is a sum of positive
//    terms, each with a relative error of a few u; the cross product's components come from
//    fma-based differences of products (vectors.hpp).  Massless pairs at 1e-8 rad and heavy
//    slow pairs alike: within a few ulp (measured in tests/test_frames_invariant_mass.cpp).
//  * invariant_mass(range of momenta, tolerance): E = sum E_i and P = sum p_i in double-word
//    arithmetic, M^2 = E^2 - |P|^2 with a rigorous bound on its error computed alongside; where
//    bound / M exceeds the tolerance, numeric::guarded() evaluates the same routine again on
//    the next wider type of the ladder (long double, then 50, 100, ... decimal digits).
#ifndef EIGENZEIT_FRAMES_INVARIANT_MASS_HPP
#define EIGENZEIT_FRAMES_INVARIANT_MASS_HPP

#include <algorithm>
#include <cmath>
#include <cstddef>
#include <iterator>
#include <limits>
#include <type_traits>

#include <eigenzeit/frames/momentum.hpp>
#include <eigenzeit/frames/vectors.hpp>
#include <eigenzeit/numeric/eft.hpp>
#include <eigenzeit/numeric/guarded.hpp>
#include <eigenzeit/numeric/ladder.hpp>
#include <eigenzeit/numeric/policy.hpp>
#include <eigenzeit/numeric/traits.hpp>

namespace eigenzeit {

namespace detail {

template <class T>
struct is_momentum : std::false_type {};
template <class T>
struct is_momentum<momentum<T>> : std::true_type {};

template <class Range>
using range_element_t = std::decay_t<decltype(*std::begin(std::declval<const Range&>()))>;

}  // namespace detail

/// The invariant mass of two particles, sqrt((Ea + Eb)^2 - |pa + pb|^2), in the form without
/// cancellation described at the top of the file.  Momenta are valid by construction, so no
/// input is an error; the result is finite unless it overflows.
template <class T>
inline T invariant_mass(const momentum<T>& a, const momentum<T>& b) {
  using std::ilogb;
  using std::ldexp;
  using std::max;
  using std::sqrt;
  const vec3<T>& pa = a.p();
  const vec3<T>& pb = b.p();
  T ma = a.mass(), mb = b.mass();
  vec3<T> sa = pa, sb = pb;
  // Products of four factors appear (ma^2 Eb^2): keep the largest input within 2^(+-emax/4)
  // by a power-of-two scaling where needed (M is homogeneous of degree 1: exact).
  const T big = max(max(ma, mb), max(detail::max_abs(pa), detail::max_abs(pb)));
  int e = 0;
  if (!(big <= numeric::pow2_const<T, std::numeric_limits<T>::max_exponent / 4 - 1>() &&
        big >= numeric::pow2_const<T, std::numeric_limits<T>::min_exponent / 4 + 1>())) {
    if (!(big > 0)) return big;  // both zero (or NaN)
    e = static_cast<int>(ilogb(big));
    ma = T(ldexp(ma, -e));
    mb = T(ldexp(mb, -e));
    sa = {T(ldexp(pa.x, -e)), T(ldexp(pa.y, -e)), T(ldexp(pa.z, -e))};
    sb = {T(ldexp(pb.x, -e)), T(ldexp(pb.y, -e)), T(ldexp(pb.z, -e))};
  }
  const T ma2 = ma * ma, mb2 = mb * mb;
  const T pa2 = dot(sa, sa), pb2 = dot(sb, sb);
  const T ea2 = ma2 + pa2, eb2 = mb2 + pb2;
  if (ea2 == 0 || eb2 == 0) return T(ldexp(ea2 == 0 ? mb : ma, e));  // a zero four-momentum
  const T eaeb = sqrt(ea2 * eb2);
  const T papb = sqrt(pa2 * pb2);
  const T d = dot(sa, sb);
  // Ea Eb - Pa Pb and Pa Pb - d, both >= 0 (see the top of the file).
  const T energy_part = (ma2 * eb2 + pa2 * mb2) / (eaeb + papb);
  T angle_part;
  if (d > 0) {
    const vec3<T> c = cross(sa, sb);
    angle_part = dot(c, c) / (papb + d);
  } else {
    angle_part = papb - d;
  }
  const T m2 = (ma2 + mb2) + 2 * (energy_part + angle_part);
  const T m = sqrt(m2);
  return e == 0 ? m : T(ldexp(m, e));  // ldexp is a library call: only where scaled
}

/// The invariant mass of a range of momenta (any range whose elements are momentum<T>), with
/// an error bound: evaluated in T in double-word arithmetic, and, where the bound exceeds
/// relative_tolerance times the value, again on the wider types of the numeric/ ladder (see
/// numeric/guarded.hpp for the result: value, error_bound, rung, tolerance_met).  The default
/// tolerance, epsilon, asks for a result within 2 ulp.  An empty range has mass 0.
template <class Range, class Policy = throw_policy,
          class M = detail::range_element_t<Range>,
          class T = std::enable_if_t<detail::is_momentum<M>::value, typename M::value_type>>
inline numeric::guarded_result<T> invariant_mass(const Range& momenta,
                                                 numeric::identity_t<T> relative_tolerance =
                                                     std::numeric_limits<T>::epsilon(),
                                                 const Policy& pol = Policy()) {
  using std::abs;
  using std::ilogb;
  using std::max;
  // One power-of-two scale for all: the largest mass or component goes to [1, 2).
  using std::isfinite;
  T big = T(0);
  std::size_t n = 0;
  for (const momentum<T>& q : momenta) {
    const T largest = max(q.mass(), detail::max_abs(q.p()));
    if (!isfinite(q.mass()) || !detail::all_finite(q.p())) {
      // A momentum made invalid under a NaN policy (its mass and components are NaN).
      const T nan = numeric::domain_error<T>("eigenzeit::invariant_mass(range of momentum<%1%>)",
                                             "a momentum has mass %1%: every momentum in the range "
                                             "must be valid (finite)",
                                             q.mass(), pol);
      return {nan, nan, 0, false};
    }
    big = max(big, largest);
    ++n;
  }
  const int e = big > 0 ? static_cast<int>(ilogb(big)) : 0;
  auto evaluate = [&momenta, e, n](auto tag) {
    using W = typename decltype(tag)::type;
    using numeric::dd;
    using std::ldexp;
    using std::sqrt;
    using std::abs;
    dd<W> en{W(0), W(0)}, px{W(0), W(0)}, py{W(0), W(0)}, pz{W(0), W(0)};
    W abs_sum = W(0);  // sum of |E_i| + |p_i| components, for the bound
    const auto add = [](dd<W> acc, const W& v) {
      // Accurate double-word accumulation, also under cancellation: error <= u^2 (|acc| + |v|).
      const dd<W> s = numeric::two_sum(acc.hi, v);
      return numeric::two_sum(s.hi, W(s.lo + acc.lo));
    };
    for (const momentum<T>& q : momenta) {
      const W m = W(ldexp(W(q.mass()), -e));
      const W x = W(ldexp(W(q.p().x), -e)), y = W(ldexp(W(q.p().y), -e)), z = W(ldexp(W(q.p().z), -e));
      dd<W> s = numeric::two_prod(m, m);
      s = numeric::dd_add(s, numeric::two_prod(x, x));
      s = numeric::dd_add(s, numeric::two_prod(y, y));
      s = numeric::dd_add(s, numeric::two_prod(z, z));
      const dd<W> ei = numeric::dd_sqrt(s);
      en = numeric::dd_add(en, ei);
      px = add(px, x);
      py = add(py, y);
      pz = add(pz, z);
      abs_sum = W(abs_sum + ei.hi + abs(x) + abs(y) + abs(z));
    }
    // M^2 = E^2 - |P|^2 in double-word arithmetic, the final difference by two_sum.
    dd<W> p2 = numeric::dd_mul(px, px);
    p2 = numeric::dd_add(p2, numeric::dd_mul(py, py));
    p2 = numeric::dd_add(p2, numeric::dd_mul(pz, pz));
    const dd<W> e2 = numeric::dd_mul(en, en);
    const dd<W> r = numeric::two_sum(e2.hi, W(-p2.hi));
    const W m2 = W(r.hi + W(r.lo + W(e2.lo - p2.lo)));
    // Error bound on m2: every double-word operation above errs by at most ~4 u^2 of its
    // operands' magnitude, each accumulation step by u^2 (|acc| + |term|); with S = abs_sum
    // (>= E and >= each |P component|) all magnitudes are below S^2, and there are at most
    // 8 n + 16 such steps (that part doubled for margin); u |m2| for the final rounding.
    const W u = W(std::numeric_limits<W>::epsilon() / 2);
    const W m2_error = W(2 * W(8 * W(n) + 16) * u * u * abs_sum * abs_sum + u * abs(m2));
    W value, error;
    if (m2 <= m2_error) {
      // Consistent with zero (or a rounding below it): the mass is at most sqrt(2 m2_error).
      value = m2 > 0 ? W(sqrt(m2)) : W(0);
      error = W(sqrt(W(2 * m2_error)));
    } else {
      value = sqrt(m2);
      const W low = sqrt(W(m2 - m2_error));
      // |sqrt(m2 +- err) - sqrt(m2)| <= err / (sqrt(m2) + sqrt(m2 - err)), plus the square
      // root's own rounding (u value for IEEE types, whose square root is correctly rounded;
      // 2 u value allowed for the others): about 1.5 u value in all when the first term is
      // small, so a well-conditioned event meets the default tolerance (epsilon) in T itself.
      const W root_rounding = std::is_floating_point<W>::value ? u : W(2 * u);
      error = W(W(m2_error / (value + low)) + root_rounding * value);
    }
    return numeric::bounded<W>{W(ldexp(value, e)), W(ldexp(error, e))};
  };
  return numeric::guarded<T>(evaluate, relative_tolerance, pol);
}

}  // namespace eigenzeit

#endif
