// eigenzeit: lorentz_boost<T> -- a pure boost, applied without losing the digits of either
// end of the speed range, one four-vector at a time or over arrays.
// Distributed under the Boost Software License, Version 1.0 (see LICENSE).
//
// Convention (passive): a boost with velocity beta n (|n| = 1, 0 <= beta < 1) maps the
// coordinates of an event in a frame S to its coordinates in the frame S' that moves with
// velocity beta n relative to S, axes parallel:
//     t' = gamma (t - beta a),   a' = gamma (a - beta t),   x'_perp = x_perp,
// with a = n . x the component along n.  (So a body at rest in S moves with -beta n in S'.)
//
// Why the textbook matrix fails, and the forms used here (u = unit roundoff of T):
//  * The 4x4 matrix built from rounded gamma and beta gamma makes errors of u gamma |x| in
//    outputs that may be as small as |x| / (2 gamma) (a body moving with the boost, a photon
//    along n): relative errors up to ~4 u gamma^2, every digit gone at gamma ~ 1e8.
//  * Fast boosts (beta > 1/4): the light-cone form.  With p = t + a and m = t - a,
//        t' + a' = D p,   t' - a' = m / D,   D = gamma (1 - beta) = 1 / (gamma (1 + beta)),
//    two products with no cancellation.  p and m are formed from a = n . x held as a
//    double-word number (exact products against the double-word unit vector n), so they
//    carry the full relative accuracy however light-like the input; t' = (D p + m/D) / 2 and
//    a' = (D p - m/D) / 2 then err by a few u times max(|t'|, |a'|).  The perpendicular part
//    x - a n comes from one fma against the double-word a and n (error u |x_perp| + u^2 |x|),
//    so it keeps its digits when x lies nearly along n.
//  * Slow boosts (beta <= 1/4): the (gamma - 1), beta gamma form
//        t' = t + ((gamma - 1) t - beta gamma a),   x' = x + ((gamma - 1) a - beta gamma t) n,
//    where the corrections, however small (beta = 1e-12), are formed from gamma - 1 and
//    beta gamma held to full relative accuracy and added once.  Every term is at most
//    (1 + beta) gamma <= 1.3 times the input, and the input is at most gamma (1 + beta)
//    times the output, so the error stays within a few ulp of the largest output component.
//    The threshold 1/4 is where that product of factors (1.67) stops being small; it is a
//    property of the error bound, not of the type.
//  * displacement() returns (t' - t, x' - x) directly, from double-word products of
//    gamma - 1, beta gamma and a, so each change keeps its relative accuracy (to a few ulp)
//    even when beta = 1e-12 and the change is 1e-12 of the coordinate.
// Accuracy (measured against MPFR in tests/test_frames_lorentz_boost.cpp): apply within 4 ulp of
// the largest output component, displacement within 4 ulp of each change.
#ifndef EIGENZEIT_FRAMES_LORENTZ_BOOST_HPP
#define EIGENZEIT_FRAMES_LORENTZ_BOOST_HPP

#include <algorithm>
#include <cmath>
#include <cstddef>
#include <iterator>
#include <limits>
#include <type_traits>

#include <eigenzeit/frames/vectors.hpp>
#include <eigenzeit/numeric/eft.hpp>
#include <eigenzeit/numeric/policy.hpp>
#include <eigenzeit/speed.hpp>

namespace eigenzeit {

namespace detail {

/// gamma - 1 and beta gamma of a speed as double-word numbers with relative errors O(u^2) at
/// every speed.  Below gamma = 2 they come from the beta words alone: q = 1 - beta^2 (no
/// cancellation there), s = sqrt(q), gamma - 1 = beta^2 / (s (1 + s)) and beta gamma = beta / s
/// (the speed core keeps gamma - 1 of slow speeds to one word, which would put an error of
/// u (gamma - 1) into them).  From gamma = 2 on, from the gamma words: g.hi - 1 + g.lo (exact
/// two_sum, no cancellation) and beta gamma as the product of the words.
template <class T>
struct boost_speed_words {
  numeric::dd<T> gamma_m1;
  numeric::dd<T> proper_speed;
};

template <class T>
inline boost_speed_words<T> boost_speed_words_of(const speed<T>& s) {
  const numeric::dd<T> one{T(1), T(0)};
  const numeric::dd<T> b = s.beta_words(), g = s.gamma_words();
  if (g.hi < T(2)) {
    const numeric::dd<T> b2 = numeric::dd_mul(b, b);
    const numeric::dd<T> root = numeric::dd_sqrt(numeric::dd_sub(one, b2));
    return {numeric::dd_div(b2, numeric::dd_mul(root, numeric::dd_add(one, root))), numeric::dd_div(b, root)};
  }
  const numeric::dd<T> h = numeric::two_sum(g.hi, T(-1));
  return {numeric::fast_two_sum(h.hi, h.lo + g.lo), numeric::dd_mul(b, g)};
}

/// The type the boost kernels compute in: double for float (a float double-word number
/// carries 48 bits, and the fast kernel's u^2 gamma^2 error would reach float's ulp near
/// gamma = 4e3), T itself otherwise.
template <class T>
struct boost_work {
  using type = T;
};
template <>
struct boost_work<float> {
  using type = double;
};

/// A double-word number of T converted to W (normalised again).
template <class W, class T>
inline numeric::dd<W> words_as(const numeric::dd<T>& a) {
  if constexpr (std::is_same<W, T>::value) {
    return a;
  } else {
    return numeric::fast_two_sum(W(a.hi), W(a.lo));
  }
}

/// Whether hi + lo (a normalised double-word number >= 0) is below 1, decided exactly: a
/// rounded sum would call 1 - 2^-60 equal to 1.
template <class T>
inline bool words_below_one(const numeric::dd<T>& a) {
  return a.hi < T(1) || (a.hi == T(1) && a.lo < T(0));
}

}  // namespace detail

template <class T>
class lorentz_boost {
  using W = typename detail::boost_work<T>::type;

 public:
  using value_type = T;

  /// The identity (beta = 0, direction +z).
  lorentz_boost() : n_{{W(0), W(0)}, {W(0), W(0)}, {W(1), W(0)}}, s_() { prepare(); }

  /// A boost with speed s along direction (any nonzero finite length; it is normalised to
  /// double-word accuracy).  A zero, infinite or NaN direction, or a NaN speed (from a NaN
  /// policy upstream), is a domain error through the policy; with a NaN policy the boost is
  /// NaN-filled and every result it gives is NaN.
  template <class Policy = throw_policy>
  lorentz_boost(const vec3<T>& direction, const eigenzeit::speed<T>& s, const Policy& pol = Policy())
      : s_(s) {
    using std::isnan;
    if (!(detail::max_abs(direction) > 0) || !detail::all_finite(direction)) {
      set_invalid("eigenzeit::lorentz_boost<%1%>::lorentz_boost(direction, speed)",
                  "largest |direction component| = %1%, but the direction must be finite and "
                  "nonzero",
                  bad_component(direction), pol);
      return;
    }
    if (isnan(s.beta()) || isnan(s.gamma())) {
      set_invalid("eigenzeit::lorentz_boost<%1%>::lorentz_boost(direction, speed)",
                  "beta = %1%, but the speed must be a number in [0, 1)", s.beta(), pol);
      return;
    }
    set_direction(direction);
    prepare_checked(pol);
  }

  /// The boost with velocity beta (the vector v / c): direction beta / |beta|, speed |beta|,
  /// with |beta| formed as a double-word number so that 1 - |beta| keeps its digits near c.
  /// |beta| >= 1 (the speed of light or beyond; decided exactly, so 1 - |beta| = 1e-17 is
  /// accepted), an infinite or NaN component are domain errors through the policy.  beta = 0
  /// gives the identity.
  template <class Policy = throw_policy>
  static lorentz_boost from_velocity(const vec3<T>& beta, const Policy& pol = Policy()) {
    lorentz_boost b;
    if (!detail::all_finite(beta)) {
      b.set_invalid("eigenzeit::lorentz_boost<%1%>::from_velocity(beta)",
                    "beta component = %1%, but every component must be finite",
                    bad_component(beta), pol);
      return b;
    }
    if (detail::max_abs(beta) == 0) return b;
    int e = 0;
    const vec3<T> s = detail::scaled(beta, e);
    const numeric::dd<T> norm = numeric::dd_sqrt(detail::sum_of_squares_words(s));
    numeric::dd<T> speed_words = numeric::dd_ldexp(norm, e);
    speed_words = numeric::fast_two_sum(speed_words.hi, speed_words.lo);
    if (!detail::words_below_one(speed_words)) {
      b.set_invalid("eigenzeit::lorentz_boost<%1%>::from_velocity(beta)",
                    "|beta| = %1%, but a boost needs a speed below that of light (|beta| < 1)",
                    T(speed_words.hi + speed_words.lo), pol);
      return b;
    }
    b.s_ = eigenzeit::speed<T>::from_beta_words(speed_words, pol);
    b.set_direction(beta);
    b.prepare_checked(pol);
    return b;
  }

  /// The boost with speed s along the unit vector given by double-word components (hi + lo,
  /// each with relative error O(u^2) and |n| = 1 to that accuracy), for code that already
  /// holds one (compose() does).  Not checked: a vector that is not a unit vector gives a
  /// transformation that is not a Lorentz boost.
  static lorentz_boost from_unit_words(numeric::dd<T> nx, numeric::dd<T> ny, numeric::dd<T> nz,
                                       const eigenzeit::speed<T>& s) {
    lorentz_boost b;
    b.n_[0] = detail::words_as<W>(nx);
    b.n_[1] = detail::words_as<W>(ny);
    b.n_[2] = detail::words_as<W>(nz);
    b.s_ = s;
    b.prepare();
    return b;
  }

  // ---- views -------------------------------------------------------------------------------

  /// The speed of the moving frame.
  const eigenzeit::speed<T>& speed() const { return s_; }

  /// The unit direction of motion (the double-word unit vector rounded to T).
  vec3<T> direction() const { return {T(n_[0].hi), T(n_[1].hi), T(n_[2].hi)}; }

  /// The velocity beta n of the moving frame (components rounded once).
  vec3<T> velocity() const {
    const W b = W(s_.beta());
    return {T(b * n_[0].hi), T(b * n_[1].hi), T(b * n_[2].hi)};
  }

  /// The inverse boost (same speed, opposite direction): exact.
  lorentz_boost inverse() const {
    lorentz_boost r = *this;
    for (auto& c : r.n_) c = {-c.hi, -c.lo};
    return r;
  }

  /// The double-word unit vector in T, for code that carries the extra precision further.
  numeric::dd<T> direction_words(int i) const {
    const T hi = T(n_[i].hi);
    return {hi, T((n_[i].hi - W(hi)) + n_[i].lo)};
  }

  // ---- application -------------------------------------------------------------------------

  /// The coordinates of v in the moving frame (see the top of the file for the forms).
  EIGENZEIT_FORCE_INLINE four_vector<T> apply(const four_vector<T>& v) const {
    return apply(numeric::dd<T>{v.t, T(0)}, v.spatial());
  }

  /// The same for a four-vector whose time part is given as a double-word number t.hi + t.lo
  /// (an energy computed to twice the precision: momentum::boosted() uses it, so that an
  /// on-shell momentum is boosted as if its energy were exact).
  EIGENZEIT_FORCE_INLINE four_vector<T> apply(numeric::dd<T> t, const vec3<T>& r) const {
    four_vector<T> o{T(0), r.x, r.y, r.z};
    switch (kind_) {
      case kind::axis_fast:
      case kind::axis_slow: {
        T* comp[3] = {&o.x, &o.y, &o.z};
        if (kind_ == kind::axis_fast) {
          kernel_axis<true>(W(t.hi), W(t.lo), W(*comp[axis_]), o.t, *comp[axis_]);
        } else {
          kernel_axis<false>(W(t.hi), W(t.lo), W(*comp[axis_]), o.t, *comp[axis_]);
        }
        break;
      }
      case kind::fast: kernel_fast(W(t.hi), W(t.lo), W(r.x), W(r.y), W(r.z), o.t, o.x, o.y, o.z); break;
      default: kernel_slow(W(t.hi), W(t.lo), W(r.x), W(r.y), W(r.z), o.t, o.x, o.y, o.z); break;
    }
    return o;
  }

  /// The four-momentum (E', p') of a particle of rest energy `mass` >= 0 and momentum p (energy
  /// E = sqrt(mass^2 + |p|^2) implied), in the moving frame.  The light-cone form with
  /// E + a and E - a, a = n . p, taken without cancellation: the one of them that would cancel
  /// is (mass^2 + |p_perp|^2) / (the other), with p_perp = p - a n in double-word arithmetic.
  /// So even a particle and a boost both ultra-relativistic and aligned (E - a ~ E / (2 gamma^2)
  /// far below u E) keep every digit; apply() on (E, p) rounded cannot, since E's rounding
  /// already exceeds E - a there.  Within 4 ulp of the largest output component.
  four_vector<T> apply_on_shell(T mass, const vec3<T>& p) const {
    using numeric::dd;
    using std::ilogb;
    using std::ldexp;
    using std::max;
    // A power-of-two scale that keeps every square finite and normal (linear: exact).
    const W big = W(max(mass, detail::max_abs(p)));
    int e = 0;
    if (big > 0 && !detail::in_square_range(big)) e = static_cast<int>(ilogb(big));
    const W ms = W(ldexp(W(mass), -e));
    const W px = W(ldexp(W(p.x), -e)), py = W(ldexp(W(p.y), -e)), pz = W(ldexp(W(p.z), -e));
    const dd<W> a = along(px, py, pz);
    // p_perp = p - a n, component by component in double-word arithmetic.
    const W comp[3] = {px, py, pz};
    dd<W> perp[3];
    for (int i = 0; i < 3; ++i) perp[i] = numeric::dd_sub(dd<W>{comp[i] + W(0), W(0)}, numeric::dd_mul(a, n_[i]));  // -0 in, +0 out
    dd<W> q = numeric::two_prod(ms, ms);  // mass^2 + |p_perp|^2
    for (int i = 0; i < 3; ++i) q = numeric::dd_add(q, numeric::dd_mul(perp[i], perp[i]));
    const dd<W> energy = numeric::dd_sqrt(numeric::dd_add(q, numeric::dd_mul(a, a)));
    dd<W> plus, minus;  // E + a, E - a
    if (a.hi >= 0) {
      plus = numeric::dd_add(energy, a);
      minus = numeric::dd_div(q, plus);
    } else {
      minus = numeric::dd_sub(energy, a);
      plus = numeric::dd_div(q, minus);
    }
    W t2, a2;
    if (kind_ == kind::slow || kind_ == kind::axis_slow) {
      // gamma (E - beta a) = E + (gamma - 1) E - beta gamma a, and a + (gamma - 1) a - beta gamma E.
      dd<W> ts, as;
      changes(energy, a, ts, as);
      t2 = energy.hi + (energy.lo + (ts.hi + ts.lo));
      a2 = a.hi + (a.lo + (as.hi + as.lo));
    } else {
      const W dp = dh_ * (plus.hi + plus.lo), em = eh_ * (minus.hi + minus.lo);
      t2 = dp + em;
      a2 = dp - em;
    }
    W out[3];
    for (int i = 0; i < 3; ++i) out[i] = perp[i].hi + (perp[i].lo + a2 * n_[i].hi);
    if (e == 0) return {T(t2), T(out[0]), T(out[1]), T(out[2])};
    return {T(ldexp(t2, e)), T(ldexp(out[0], e)), T(ldexp(out[1], e)), T(ldexp(out[2], e))};
  }

  /// The change of each coordinate, (t' - t, x' - x, y' - y, z' - z), accurate relative to
  /// each change (a few ulp) at every speed, including beta = 1e-12 where the change is far
  /// below an ulp of the coordinate: gamma - 1, beta gamma and a = n . x are double-word
  /// numbers with relative errors O(u^2), so a change survives a cancellation between its two
  /// terms of up to ~1/u.
  four_vector<T> displacement(const four_vector<T>& v) const {
    using numeric::dd;
    const dd<W> a = along(W(v.x), W(v.y), W(v.z));
    const dd<W> t{W(v.t), W(0)};
    dd<W> dt, da;
    changes(t, a, dt, da);
    return {T(dt.hi + dt.lo), T(times(da, n_[0])), T(times(da, n_[1])), T(times(da, n_[2]))};
  }

  /// Applies the boost in place to n four-vectors held as separate arrays (structure of
  /// arrays): the same forms and accuracy as apply(), one branch per call (not per element),
  /// so that the loop vectorises.  The arrays may not overlap one another.  (Where the
  /// compiler contracts a * b + c into fused multiply-adds, it may do so differently here and
  /// in apply(), so the two can differ in the last bit; both keep the accuracy contract.)
  void apply_in_place(T* t, T* x, T* y, T* z, std::size_t n) const {
    T* comp[3] = {x, y, z};
    switch (kind_) {
      case kind::axis_fast: axis_loop<true>(t, comp[axis_], n); break;
      case kind::axis_slow: axis_loop<false>(t, comp[axis_], n); break;
      case kind::fast: blocks<true>(t, x, y, z, n); break;
      default: blocks<false>(t, x, y, z, n); break;
    }
  }

  /// The same over four contiguous ranges of T (std::span<T>, std::vector<T>, std::array...):
  /// anything with data() and size().  Ranges of different lengths are a domain error through
  /// the policy, naming the two lengths; nothing is changed then.
  template <class Range, class Policy = throw_policy>
  void apply_in_place(Range&& t, Range&& x, Range&& y, Range&& z, const Policy& pol = Policy()) const {
    const std::size_t n = std::size(t);
    for (std::size_t other : {std::size(x), std::size(y), std::size(z)}) {
      if (other != n) {
        numeric::domain_error<T>(
            "eigenzeit::lorentz_boost<%1%>::apply_in_place(t, x, y, z)",
            "a component array has %1% elements, but all four must have as many as t", T(other), pol);
        return;
      }
    }
    apply_in_place(std::data(t), std::data(x), std::data(y), std::data(z), n);
  }

 private:
  numeric::dd<W> n_[3];            // unit direction, double-word components
  eigenzeit::speed<T> s_;
  numeric::dd<W> m_{W(0), W(0)};   // gamma - 1
  numeric::dd<W> u_{W(0), W(0)};   // beta gamma
  W gm1_ = W(0), bg_ = W(0);       // the same, rounded (slow kernels)
  W dh_ = W(0.5), eh_ = W(0.5);    // gamma (1 - beta) / 2 and gamma (1 + beta) / 2 (light cone)
  // slow / fast: general direction, beta <= 1/4 or above; axis_*: the direction is +-x, +-y
  // or +-z exactly (the along-axis component alone changes).
  enum class kind : unsigned char { slow, fast, axis_slow, axis_fast };
  kind kind_ = kind::axis_slow;
  int axis_ = 2;  // which axis (axis_* kinds)

  // The changes of the time and along-n parts, double-word throughout:
  // dt = (gamma - 1) t - beta gamma a,  da = (gamma - 1) a - beta gamma t.
  void changes(numeric::dd<W> t, numeric::dd<W> a, numeric::dd<W>& dt, numeric::dd<W>& da) const {
    dt = numeric::dd_sub(numeric::dd_mul(m_, t), numeric::dd_mul(u_, a));
    da = numeric::dd_sub(numeric::dd_mul(m_, a), numeric::dd_mul(u_, t));
  }

  void set_direction(const vec3<T>& d) {
    const detail::unit_words<W> n = detail::unit_words_of(vec3<W>{W(d.x), W(d.y), W(d.z)});
    n_[0] = n.x;
    n_[1] = n.y;
    n_[2] = n.z;
  }

  template <bool Fast>
  EIGENZEIT_FORCE_INLINE void kernel(T t, T x, T y, T z, T& to, T& xo, T& yo, T& zo) const {
    if constexpr (Fast) {
      kernel_fast(W(t), W(0), W(x), W(y), W(z), to, xo, yo, zo);
    } else {
      kernel_slow(W(t), W(0), W(x), W(y), W(z), to, xo, yo, zo);
    }
  }

  // The batch loop in blocks of `lanes` elements copied to local arrays: the block's
  // straight-line body has no aliasing between the four arrays, so the compiler's
  // superword-level vectoriser packs the lanes into SIMD registers even at -O2 (where GCC 12
  // does not version a plain loop for possible aliasing).  The tail runs element by element.
  // 32 lanes: measured fastest with g++ 12 and clang++ 14 at -O2 -mfma (8 and 16 leave the
  // copies as library calls or the body partly scalar).
  template <bool Fast>
  void blocks(T* t, T* x, T* y, T* z, std::size_t n) const {
    constexpr std::size_t lanes = 32;
    const std::size_t full = n - n % lanes;
    for (std::size_t i = 0; i < full; i += lanes) {
      T bt[lanes], bx[lanes], by[lanes], bz[lanes];
      for (std::size_t k = 0; k < lanes; ++k) {
        bt[k] = t[i + k];
        bx[k] = x[i + k];
        by[k] = y[i + k];
        bz[k] = z[i + k];
      }
      for (std::size_t k = 0; k < lanes; ++k)
        kernel<Fast>(bt[k], bx[k], by[k], bz[k], bt[k], bx[k], by[k], bz[k]);
      for (std::size_t k = 0; k < lanes; ++k) {
        t[i + k] = bt[k];
        x[i + k] = bx[k];
        y[i + k] = by[k];
        z[i + k] = bz[k];
      }
    }
    for (std::size_t i = full; i < n; ++i) kernel<Fast>(t[i], x[i], y[i], z[i], t[i], x[i], y[i], z[i]);
  }

  template <bool Fast>
  void axis_loop(T* t, T* xk, std::size_t n) const {
    for (std::size_t i = 0; i < n; ++i) kernel_axis<Fast>(W(t[i]), W(0), W(xk[i]), t[i], xk[i]);
  }

  // (a.hi + a.lo)(n.hi + n.lo) rounded: the product's O(u^2) terms are kept.
  static W times(numeric::dd<W> a, numeric::dd<W> n) {
    const numeric::dd<W> p = numeric::two_prod(a.hi, n.hi);
    return p.hi + (p.lo + (a.hi * n.lo + a.lo * n.hi));
  }

  // a = n . x as a double-word number: exact products against n.hi, sums by two_sum, the
  // n.lo terms and the product errors added once (error O(u^2) sum |n_i x_i|).
  EIGENZEIT_FORCE_INLINE numeric::dd<W> along(W x, W y, W z) const {
    const numeric::dd<W> px = numeric::two_prod(n_[0].hi, x);
    const numeric::dd<W> py = numeric::two_prod(n_[1].hi, y);
    const numeric::dd<W> pz = numeric::two_prod(n_[2].hi, z);
    const numeric::dd<W> s1 = numeric::two_sum(px.hi, py.hi);
    const numeric::dd<W> s2 = numeric::two_sum(s1.hi, pz.hi);
    const W lo = (s1.lo + s2.lo) + ((px.lo + py.lo + pz.lo) + (n_[0].lo * x + n_[1].lo * y + n_[2].lo * z));
    return numeric::fast_two_sum(s2.hi, lo);
  }

  // t_lo: the low word of the time part (0 for a plain four-vector).
  EIGENZEIT_FORCE_INLINE void kernel_slow(W t, W t_lo, W x, W y, W z, T& to, T& xo, T& yo, T& zo) const {
    const W nx = n_[0].hi, ny = n_[1].hi, nz = n_[2].hi;
    const W a = nx * x + ny * y + nz * z;
    const W k = gm1_ * a - bg_ * t;
    to = T(t + (t_lo + (gm1_ * t - bg_ * a)));
    xo = T(x + k * nx);
    yo = T(y + k * ny);
    zo = T(z + k * nz);
  }

  // Along an exact axis (n = sign e_k, so a = sign x_k exactly).  Fast: the light-cone form,
  // p = t + a and m = t - a with one rounding each (any cancellation in them is exact).
  // Slow: the (gamma - 1), beta gamma form on the one component, which leaves every
  // coordinate exact for the identity and keeps the digits of a small a beside a large t.
  template <bool Fast>
  EIGENZEIT_FORCE_INLINE void kernel_axis(W t, W t_lo, W xk, T& to, T& xko) const {
    const W sign = n_[axis_].hi;
    const W a = sign * xk;
    if constexpr (Fast) {
      const W p = (t + a) + t_lo;
      const W m = (t - a) + t_lo;
      const W dp = dh_ * p, em = eh_ * m;
      to = T(dp + em);
      xko = T(sign * (dp - em));
    } else {
      to = T(t + (t_lo + (gm1_ * t - bg_ * a)));
      xko = T(xk + sign * (gm1_ * a - bg_ * t));
    }
  }

  EIGENZEIT_FORCE_INLINE void kernel_fast(W t, W t_lo, W x, W y, W z, T& to, T& xo, T& yo, T& zo) const {
    const numeric::dd<W> a = along(x, y, z);
    // p = t + a, m = t - a: two_sum of t and a.hi is exact, a.lo added once.
    const numeric::dd<W> ps = numeric::two_sum(t, a.hi);
    const numeric::dd<W> ms = numeric::two_sum(t, -a.hi);
    const W p = ps.hi + (ps.lo + (a.lo + t_lo));
    const W m = ms.hi + (ms.lo - (a.lo - t_lo));
    const W dp = dh_ * p, em = eh_ * m;
    const W ta = dp + em;
    const W aa = dp - em;
    // x' = (x - a n) + a' n, the perpendicular part from one fma against a.hi n.hi.
    const W nx = n_[0].hi, ny = n_[1].hi, nz = n_[2].hi;
    const W px = -numeric::fms(a.hi, nx, x) - (a.lo * nx + a.hi * n_[0].lo);
    const W py = -numeric::fms(a.hi, ny, y) - (a.lo * ny + a.hi * n_[1].lo);
    const W pz = -numeric::fms(a.hi, nz, z) - (a.lo * nz + a.hi * n_[2].lo);
    to = T(ta);
    xo = T(px + aa * nx);
    yo = T(py + aa * ny);
    zo = T(pz + aa * nz);
  }

  template <class V>
  static T bad_component(const V& v) {
    using std::isnan;
    using std::isinf;
    if (isnan(v.x)) return v.x;
    if (isnan(v.y)) return v.y;
    if (isnan(v.z)) return v.z;
    if (isinf(v.x)) return v.x;
    if (isinf(v.y)) return v.y;
    if (isinf(v.z)) return v.z;
    return detail::max_abs(v);
  }

  template <class Policy>
  void set_invalid(const char* function, const char* message, T value, const Policy& pol) {
    const T nan = numeric::domain_error<T>(function, message, value, pol);
    const W wnan = W(nan);
    for (auto& c : n_) c = {wnan, wnan};
    m_ = u_ = {wnan, wnan};
    gm1_ = bg_ = dh_ = eh_ = wnan;
    s_ = eigenzeit::speed<T>::from_beta(nan, nan_policy());
    kind_ = kind::slow;
  }

  // Derived constants from the speed; refuses Lorentz factors whose gamma (1 + beta) overflows.
  template <class Policy>
  void prepare_checked(const Policy& pol) {
    using std::isfinite;
    prepare();
    if (!isfinite(eh_) || !isfinite(T(eh_)))
      set_invalid("eigenzeit::lorentz_boost<%1%>", "gamma = %1%, but gamma (1 + beta) must be finite",
                  s_.gamma(), pol);
  }

  void prepare() {
    const numeric::dd<W> g = detail::words_as<W>(s_.gamma_words());
    const detail::boost_speed_words<T> w = detail::boost_speed_words_of(s_);
    m_ = detail::words_as<W>(w.gamma_m1);
    u_ = detail::words_as<W>(w.proper_speed);
    gm1_ = m_.hi + m_.lo;
    bg_ = u_.hi + u_.lo;
    const numeric::dd<W> e = numeric::dd_add(g, u_);  // gamma (1 + beta) = e^rapidity
    const numeric::dd<W> d = numeric::dd_div(numeric::dd<W>{W(1), W(0)}, e);
    eh_ = (e.hi + e.lo) / 2;  // halving is exact (e >= 1, d >= 1 / max)
    dh_ = (d.hi + d.lo) / 2;
    classify();
  }

  // Chooses the kernel: beta > 1/4 takes a fast form (see the top of the file), and an exact
  // coordinate axis its one-component variant.
  void classify() {
    const bool fast = s_.beta() > T(0.25);
    for (int k = 0; k < 3; ++k) {
      const bool unit = (n_[k].hi == W(1) || n_[k].hi == W(-1)) && n_[k].lo == 0;
      const bool others_zero = n_[(k + 1) % 3].hi == 0 && n_[(k + 2) % 3].hi == 0 &&
                               n_[(k + 1) % 3].lo == 0 && n_[(k + 2) % 3].lo == 0;
      if (unit && others_zero) {
        kind_ = fast ? kind::axis_fast : kind::axis_slow;
        axis_ = k;
        return;
      }
    }
    kind_ = fast ? kind::fast : kind::slow;
  }
};

}  // namespace eigenzeit

#endif
