// eigenzeit: uniform proper acceleration from rest (hyperbolic motion).
// Distributed under the Boost Software License, Version 1.0 (see LICENSE).
//
// A body at rest at the origin at t = tau = 0 keeps a constant proper acceleration a (what an
// accelerometer on board reads) along one line.  After the proper time tau its rapidity is
// phi = a tau / c, and
//
//     coordinate time   t        = (c / a) sinh(phi)
//     distance          x        = (c^2 / a) (cosh(phi) - 1)
//     lag               t - tau  = (c / a) (sinh(phi) - phi)
//     speed             beta = tanh(phi), gamma = cosh(phi), proper speed sinh(phi) = a t / c
//     inverse           tau(t)   = (c / a) asinh(a t / c).
//
// Units.  uniform_acceleration<T>::natural(a) sets c = 1: choose a time unit, give a in units of
// c per time unit (an inverse time); times come out in that unit and lengths in c times it
// (a in 1/s: seconds and light-seconds; a in 1/yr: years and light-years).  Then a tau is the
// rapidity itself.  uniform_acceleration<T>::si(a) takes a in m/s^2 and works in seconds and
// metres with c = 299 792 458 m/s exactly (carried as two words of T, so float loses nothing).
//
// How the accuracy is reached.
//   * phi = a tau / c is formed as a double-word number (two_prod, then a double-word division
//     by c), so the product's rounding, which sinh and cosh would amplify phi-fold (350 ulp at
//     phi = 700), never enters.
//   * phi <= 4: power series in z = phi^2 with positive terms, F_2(z) = 2 (cosh phi - 1) / phi^2
//     and F_3(z) = 6 (sinh phi - phi) / phi^3 (both 1 + O(z)); then
//       x = c tau phi F_2 / 2,  t - tau = tau phi^2 F_3 / 6,  t = tau + (t - tau),
//       proper speed = phi (1 + z F_3 / 6),  gamma - 1 = z F_2 / 2.
//     No division by a, so tiny accelerations and tiny times cost nothing in accuracy, and the
//     cancellations in cosh - 1 and sinh - phi never occur.  The number of terms follows from
//     epsilon (see series below).  The bound 4 is where the exponential forms take over
//     without harm: at phi = 4 sinh(phi) - phi loses only the factor sinh / (sinh - phi) = 1.17.
//   * phi > 4: E = exp(phi.hi), corrected to first order by phi.lo, and 1/E with its division
//     residual give sinh, cosh - 1 and sinh - phi as double-word numbers; exp's own rounding is
//     the only error of weight, amplified at most 1.17-fold.
//   * inverse: asinh(a t / c) from log1p or log of a double-word argument (the library function
//     enters once), or a 4-term series for (a t / c)^2 < 2^-k.
//   * Inputs whose products leave the normal range (subnormal or huge tau, a) are split into
//     significand and power of two first, so subnormal inputs are ordinary inputs.
// Accuracy: <= 2 ulp for every output, a tau / c from 1e-300 to 700 (to cosh's limit in float),
// wherever the result is a finite normal number.  Measured against MPFR on 2 x 10^4 random
// cases per unit system in double, 5000 in long double and float, over a wide range of a
// (tests/test_timing_accelerated.cpp): max 1.37 ulp in double (every result within 1 ulp of
// the correctly rounded one, 93-96% correctly rounded), 1.51 ulp in long double, 1.39 ulp in
// float; the rows of the mpmath table (tools/gen_timing_accelerated.py) within 1 ulp.
//
// Not certified for safety-of-life use: users must follow the interface specifications that
// govern their system and validate the results themselves.
#ifndef EIGENZEIT_TIMING_ACCELERATED_HPP
#define EIGENZEIT_TIMING_ACCELERATED_HPP

#include <cmath>
#include <limits>
#include <type_traits>

#include <eigenzeit/constants.hpp>
#include <eigenzeit/numeric/eft.hpp>
#include <eigenzeit/numeric/policy.hpp>
#include <eigenzeit/numeric/traits.hpp>
#include <eigenzeit/speed.hpp>

namespace eigenzeit {

namespace detail {
namespace hyperbolic {

using numeric::dd;

/// c = 299 792 458 m/s as hi + lo in T: exact for every type with at least 14 bits (c has 28
/// significant bits; hi holds the first `digits` of them, lo the rest).
template <class T>
inline dd<T> half(dd<T> v) {
  return {v.hi / 2, v.lo / 2};
}

template <class T>
inline dd<T> negated(dd<T> v) {
  return {-v.hi, -v.lo};
}

/// v^2 as a double-word number, relative error O(u^2).
template <class T>
inline dd<T> square(dd<T> v) {
  const dd<T> p = numeric::two_prod(v.hi, v.hi);
  return numeric::fast_two_sum(p.hi, p.lo + 2 * v.hi * v.lo);
}

/// Upper end of the series tier (see the top of the file): phi <= 4.
template <class T>
inline T series_limit() {
  return T(4);
}

/// The reciprocals r_k = 1 / ((M + 2k - 1)(M + 2k)) of the nested series below.  The table
/// holds more levels than any z <= 16 needs: the n-th term is below 16^n / (2n)! <= (30/n^2)^n,
/// under 2^-(digits + 4) for n = digits/2 + 8 (17 levels are used for double at z = 16).
template <class T, int M>
struct series_table {
  static constexpr int size = numeric::digits_v<T> / 2 + 8;
  T r[size + 1];
};

template <class T, int M>
constexpr series_table<T, M> make_series_table() {
  series_table<T, M> table{};
  table.r[0] = T(1);
  for (int k = 1; k <= series_table<T, M>::size; ++k)
    table.r[k] = T(1) / T((M + 2 * k - 1) * (M + 2 * k));
  return table;
}

template <class T, int M>
inline const series_table<T, M>& series_coefficients() {
  if constexpr (std::is_floating_point<T>::value) {
    static constexpr series_table<T, M> table = make_series_table<T, M>();
    return table;
  } else {
    static const series_table<T, M> table = make_series_table<T, M>();
    return table;
  }
}

/// F_M(z) = sum_{n >= 0} M! z^n / (2n + M)!  for 0 <= z <= 16 (z = phi^2), as a double-word
/// number: F_2 = 2 (cosh phi - 1) / phi^2, F_3 = 6 (sinh phi - phi) / phi^3.
/// Nested form F = 1 + z r_1 (1 + z r_2 (1 + ...)); levels are added until the n-th term falls
/// below eps/16 (the tail beyond is below eps/8 of F >= 1).  Levels n..3 run in T: each
/// rounds by ~3u at most (product, coefficient, fused add), and these errors reach F weighted
/// by the share of F beyond its first three terms, <= 0.09 at z = 16 (0.04 for M = 3), so they
/// cost < 0.3u; the top two levels are double-word operations (O(u^2)).
template <int M, class T>
inline dd<T> series(dd<T> z) {
  const series_table<T, M>& c = series_coefficients<T, M>();
  const T tol = std::numeric_limits<T>::epsilon() / 16;
  int n = 0;
  T term = T(1);
  while (n < series_table<T, M>::size && term > tol) {
    ++n;
    term = term * z.hi * c.r[n];
  }
  T p = T(1);
  for (int k = n; k >= 3; --k) p = T(1) + (z.hi * c.r[k]) * p;
  dd<T> q{p, T(0)};
  for (int k = (n < 2 ? n : 2); k >= 1; --k) {
    const dd<T> level = numeric::dd_div(numeric::dd_mul(z, q),
                                        dd<T>{T((M + 2 * k - 1) * (M + 2 * k)), T(0)});
    q = numeric::dd_add(dd<T>{T(1), T(0)}, level);
  }
  return q;
}

/// The arguments of the series tier: phi = Phi 2^e1 and tau phi / 2 = Wh 2^e2, with Phi and Wh
/// double-word numbers whose words are normal, and z = phi^2 at its true scale (only its size
/// matters when it is tiny).
template <class T>
struct series_point {
  dd<T> phi;
  dd<T> wh;
  dd<T> z;
  int e1;
  int e2;
};

template <class T>
inline series_point<T> series_point_of(T a, T tau, dd<T> c, dd<T> phi) {
  const T thr = numeric::rescale_threshold<T>();  // min / eps^2: low words stay normal above
  if (phi.hi >= thr) {
    const dd<T> p = numeric::two_prod(tau, phi.hi);
    const dd<T> w = numeric::fast_two_sum(p.hi, p.lo + tau * phi.lo);
    if (w.hi >= 2 * thr) return {phi, half(w), square(phi), 0, 0};
  }
  // Rare: a tau or tau phi near or below the smallest normal number.  a and tau are split into
  // significands in [1/2, 1) and powers of two (exact, subnormals included).
  using std::frexp;
  using std::ldexp;
  int ea = 0, et = 0;
  const T ma = frexp(a, &ea);
  const T mt = frexp(tau, &et);
  const dd<T> Phi = numeric::dd_div(numeric::two_prod(ma, mt), c);
  const dd<T> p = numeric::two_prod(mt, Phi.hi);
  const dd<T> Wh = half(numeric::fast_two_sum(p.hi, p.lo + mt * Phi.lo));
  const int e1 = ea + et;
  return {Phi, Wh, numeric::dd_ldexp(square(Phi), 2 * e1), e1, e1 + et};
}

/// t - tau = tau phi^2 F_3 / 6 = (Wh / 3) Phi F_3 2^(e1 + e2), as a double-word number.
template <class T>
inline dd<T> lag_series(const series_point<T>& s) {
  const dd<T> w3 = numeric::dd_div(s.wh, dd<T>{T(3), T(0)});
  const dd<T> v = numeric::dd_mul(numeric::dd_mul(w3, s.phi), series<3>(s.z));
  return numeric::dd_ldexp(v, s.e1 + s.e2);
}

/// x = c tau phi F_2 / 2 = c Wh F_2 2^e2, as a double-word number.
template <class T>
inline dd<T> distance_series(const series_point<T>& s, dd<T> c) {
  return numeric::dd_ldexp(numeric::dd_mul(numeric::dd_mul(c, s.wh), series<2>(s.z)), s.e2);
}

/// The speed at a series point (phi <= 4).  speed<T> is built from one rounded input, and
/// each view inherits that rounding times its condition number with respect to the input; the
/// input is chosen so that this stays <= 1 for every view:
///   cosh - 1 = m < 1 (phi < 1.317): from_gamma_m1(m), m = z F_2 / 2 (from the proper speed
///     instead, gamma - 1 would carry twice its rounding); where m is subnormal (phi tiny),
///     from_proper_speed(phi (1 + z F_3 / 6)), which keeps beta = phi exact;
///   m >= 1: from_beta_deficit(2 / (E^2 + 1)), E = e^phi = 1 + m + sinh phi (from the proper
///     speed or m, 1 - beta would carry twice the rounding).
template <class T, class Policy>
inline speed<T> speed_from_series(const series_point<T>& s, const Policy& pol) {
  const dd<T> one{T(1), T(0)};
  const dd<T> m = numeric::dd_ldexp(half(numeric::dd_mul(square(s.phi), series<2>(s.z))), 2 * s.e1);
  const dd<T> u = numeric::dd_ldexp(
      numeric::dd_add(s.phi, numeric::dd_div(numeric::dd_mul(numeric::dd_mul(s.phi, s.z),
                                                             series<3>(s.z)),
                                             dd<T>{T(6), T(0)})),
      s.e1);
  if (m.hi < T(1)) {
    if (m.hi >= std::numeric_limits<T>::min()) return speed<T>::from_gamma_m1(m.hi + m.lo, pol);
    return speed<T>::from_proper_speed(u.hi + u.lo, pol);
  }
  const dd<T> e = numeric::dd_add(numeric::dd_add(one, m), u);
  const dd<T> d = numeric::dd_div(dd<T>{T(2), T(0)},
                                  numeric::dd_add(numeric::dd_mul(e, e), one));
  return speed<T>::from_beta_deficit(d.hi + d.lo, pol);
}

/// sinh(phi) and cosh(phi) - 1 for phi > 4 from one exp call: E = exp(phi.hi) (1 + phi.lo) and
/// 1/E = y (1 + t)(1 - phi.lo) with y = RN(1/E) and t = 1 - y E exact, all to O(u^2) beyond
/// exp's own rounding.  Where E overflows but cosh(phi) does not, E/2 = exp(phi - ln 2) with
/// ln 2 in two words (detail::ln2_words), and 1/E and 1 are far below an ulp of it.  False
/// where cosh(phi), the Lorentz factor, is beyond the largest finite value.
template <class T>
inline bool exp_parts(dd<T> phi, dd<T>& sinh_phi, dd<T>& cosh_m1) {
  using std::isfinite;
  const T big = eigenzeit::detail::exp_(phi.hi);
  if (!isfinite(big)) {
    const dd<T> ln2 = eigenzeit::detail::ln2_words<T>();
    dd<T> r = numeric::two_sum(phi.hi, -ln2.hi);
    r = numeric::fast_two_sum(r.hi, r.lo + (phi.lo - ln2.lo));
    const T h = eigenzeit::detail::exp_(r.hi);
    if (!isfinite(h)) return false;
    sinh_phi = numeric::fast_two_sum(h, h * r.lo);
    cosh_m1 = sinh_phi;
    return true;
  }
  const dd<T> e = numeric::fast_two_sum(big, big * phi.lo);
  const T y = T(1) / big;
  const dd<T> inv{y, y * (-numeric::fms(y, big, T(1)) - phi.lo)};
  sinh_phi = half(numeric::dd_add(e, negated(inv)));
  cosh_m1 = half(numeric::dd_add(numeric::dd_add(e, dd<T>{T(-2), T(0)}), inv));
  return true;
}

/// v c^p / a as a double-word number (p = 1 or 2; c = 1 in natural units), ordered so that no
/// step overflows or underflows unless the result does: v c^p first while it is far from the
/// largest finite value (c^2 < 2^57), the division by a first otherwise (v is then huge, and
/// v / a cannot underflow).
template <class T>
inline dd<T> times_c_over_a(dd<T> v, int p, T a, dd<T> c) {
  const dd<T> divisor{a, T(0)};
  if (v.hi <= std::numeric_limits<T>::max() * numeric::pow2_const<T, -64>()) {
    for (int i = 0; i < p; ++i) v = numeric::dd_mul(v, c);
    return numeric::dd_div(v, divisor);
  }
  v = numeric::dd_div(v, divisor);
  for (int i = 0; i < p; ++i) v = numeric::dd_mul(v, c);
  return v;
}

/// asinh(psi) for psi = psi.hi + psi.lo >= 2^-(k/2) (k = series_exponent_v<T>), as hi + lo
/// where hi carries the one rounding of the library log or log1p (< 1 ulp, see
/// detail::log1p_small) and lo the first-order correction for the argument's low word.
///   psi > 2^(digits/2 + 1): sqrt(1 + psi^2) = psi + 1/(2 psi) + ..., so asinh = log(2 psi) +
///     1/(4 psi^2) + ..., the second term below 2^-(digits+4) of the first: log(psi) + log 2.
///   otherwise z = psi + psi^2 / (1 + sqrt(1 + psi^2)) (= e^asinh - 1, no cancellation) in
///     double-word arithmetic; log1p(z) for z <= 1/4, log(1 + z) above (where the library log1p
///     is less accurate for long double, as measured for speed.hpp).
template <class T>
inline dd<T> asinh_words(dd<T> psi) {
  const dd<T> one{T(1), T(0)};
  if (psi.hi > numeric::pow2_const<T, numeric::digits_v<T> / 2 + 1>()) {
    const dd<T> l = numeric::two_sum(eigenzeit::detail::log_(psi.hi),
                                     eigenzeit::detail::log_(T(2)));
    return {l.hi, l.lo + psi.lo / psi.hi};
  }
  const dd<T> p2 = square(psi);
  const dd<T> root = numeric::dd_sqrt(numeric::dd_add(one, p2));
  const dd<T> z = numeric::dd_add(psi, numeric::dd_div(p2, numeric::dd_add(one, root)));
  if (z.hi <= T(1) / 4)
    return {eigenzeit::detail::log1p_small(z.hi), z.lo / (T(1) + z.hi)};
  const dd<T> w = numeric::dd_add(one, z);
  return {eigenzeit::detail::log_(w.hi), w.lo / w.hi};
}

}  // namespace hyperbolic
}  // namespace detail

/// Uniform proper acceleration from rest at the origin (hyperbolic motion), see the top of
/// this file for the formulas and the two unit systems.  Holds the acceleration and the unit
/// system; every query takes the elapsed proper time tau (or, for proper_time, the coordinate
/// time t) of the frame in which the body started at rest.  Trivially copyable.
///
/// Errors (through the policy, default: throw std::domain_error naming the function and the
/// value): an acceleration that is not finite and > 0; a time that is not finite and >= 0
/// (-0 counts as +0); a result beyond the largest finite value; a rapidity a tau / c whose
/// cosh, the Lorentz factor of the motion, is beyond the largest finite value (beyond about
/// 710.48 in double; the same limit as speed<T>::from_rapidity).
template <class T>
class uniform_acceleration {
  static_assert(!std::is_integral<T>::value, "uniform_acceleration<T> needs a real type");

 public:
  using value_type = T;

  /// Natural units, c = 1: a in units of c per time unit (an inverse time).
  template <class Policy = throw_policy>
  static uniform_acceleration natural(T a, const Policy& pol = Policy()) {
    return make(a, numeric::dd<T>{T(1), T(0)},
                "eigenzeit::uniform_acceleration<%1%>::natural(%1%)", pol);
  }

  /// SI units: a in m/s^2; times in seconds, lengths in metres; c = 299 792 458 m/s exactly.
  template <class Policy = throw_policy>
  static uniform_acceleration si(T a, const Policy& pol = Policy()) {
    return make(a, constants::speed_of_light_words<T>(),
                "eigenzeit::uniform_acceleration<%1%>::si(%1%)", pol);
  }

  /// The proper acceleration as given (c per time unit, or m/s^2).
  T acceleration() const { return a_; }

  /// Rapidity phi = a tau / c after the proper time tau.  Accuracy: <= 0.5 ulp + O(u^2).
  /// Only a product a tau / c beyond the largest finite value is an error here.
  template <class Policy = throw_policy>
  T rapidity(T tau, const Policy& pol = Policy()) const {
    constexpr const char* function = "eigenzeit::uniform_acceleration<%1%>::rapidity(%1%)";
    T out;
    if (time_invalid(function, tau, pol, out)) return out;
    if (unusable()) return a_;
    numeric::dd<T> phi;
    if (!rapidity_words(tau + T(0), phi)) return beyond(function, tau, pol);
    return phi.hi + phi.lo;
  }

  /// Coordinate time t = (c/a) sinh(a tau / c) after the proper time tau (t >= tau).
  /// Accuracy: <= 2 ulp (measured max 1.27 ulp, double).
  template <class Policy = throw_policy>
  T coordinate_time(T tau, const Policy& pol = Policy()) const {
    constexpr const char* function =
        "eigenzeit::uniform_acceleration<%1%>::coordinate_time(%1%)";
    T out;
    if (time_invalid(function, tau, pol, out)) return out;
    if (unusable()) return a_;
    tau = tau + T(0);
    numeric::dd<T> phi;
    if (!rapidity_words(tau, phi)) return beyond(function, tau, pol);
    T result;
    if (phi.hi <= detail::hyperbolic::series_limit<T>()) {
      const numeric::dd<T> lag = detail::hyperbolic::lag_series(
          detail::hyperbolic::series_point_of(a_, tau, c_, phi));
      const numeric::dd<T> s = numeric::two_sum(tau, lag.hi);
      result = s.hi + (s.lo + lag.lo);
    } else {
      numeric::dd<T> sh, ch;
      if (!detail::hyperbolic::exp_parts(phi, sh, ch)) return beyond(function, tau, pol);
      const numeric::dd<T> t = detail::hyperbolic::times_c_over_a(sh, 1, a_, c_);
      result = t.hi + t.lo;
    }
    if (!(result <= std::numeric_limits<T>::max())) return beyond(function, tau, pol);
    return result;
  }

  /// Distance covered, x = (c^2/a) (cosh(a tau / c) - 1), after the proper time tau.
  /// Accuracy: <= 2 ulp (measured max 1.23 ulp, double).
  template <class Policy = throw_policy>
  T distance(T tau, const Policy& pol = Policy()) const {
    constexpr const char* function = "eigenzeit::uniform_acceleration<%1%>::distance(%1%)";
    T out;
    if (time_invalid(function, tau, pol, out)) return out;
    if (unusable()) return a_;
    tau = tau + T(0);
    numeric::dd<T> phi;
    if (!rapidity_words(tau, phi)) return beyond(function, tau, pol);
    numeric::dd<T> x;
    if (phi.hi <= detail::hyperbolic::series_limit<T>()) {
      x = detail::hyperbolic::distance_series(detail::hyperbolic::series_point_of(a_, tau, c_, phi),
                                              c_);
    } else {
      numeric::dd<T> sh, ch;
      if (!detail::hyperbolic::exp_parts(phi, sh, ch)) return beyond(function, tau, pol);
      x = detail::hyperbolic::times_c_over_a(ch, 2, a_, c_);
    }
    const T result = x.hi + x.lo;
    if (!(result <= std::numeric_limits<T>::max())) return beyond(function, tau, pol);
    return result;
  }

  /// How far the moving clock falls behind coordinate time: t - tau =
  /// (c/a) (sinh(a tau / c) - a tau / c), without the cancellation of t - tau.
  /// Accuracy: <= 2 ulp (measured max 1.34 ulp, double).
  template <class Policy = throw_policy>
  T time_lag(T tau, const Policy& pol = Policy()) const {
    constexpr const char* function = "eigenzeit::uniform_acceleration<%1%>::time_lag(%1%)";
    T out;
    if (time_invalid(function, tau, pol, out)) return out;
    if (unusable()) return a_;
    tau = tau + T(0);
    numeric::dd<T> phi;
    if (!rapidity_words(tau, phi)) return beyond(function, tau, pol);
    numeric::dd<T> lag;
    if (phi.hi <= detail::hyperbolic::series_limit<T>()) {
      lag = detail::hyperbolic::lag_series(detail::hyperbolic::series_point_of(a_, tau, c_, phi));
    } else {
      numeric::dd<T> sh, ch;
      if (!detail::hyperbolic::exp_parts(phi, sh, ch)) return beyond(function, tau, pol);
      lag = detail::hyperbolic::times_c_over_a(
          numeric::dd_add(sh, detail::hyperbolic::negated(phi)), 1, a_, c_);
    }
    const T result = lag.hi + lag.lo;
    if (!(result <= std::numeric_limits<T>::max())) return beyond(function, tau, pol);
    return result;
  }

  /// The speed after the proper time tau: rapidity a tau / c, gamma = cosh(a tau / c).
  /// Built from whichever of gamma - 1, 1 - beta, gamma or the proper speed (each formed as a
  /// double-word number, rounded once) keeps every view within 2 ulp (measured max 1.37 ulp,
  /// double).
  template <class Policy = throw_policy>
  speed<T> speed_at(T tau, const Policy& pol = Policy()) const {
    constexpr const char* function = "eigenzeit::uniform_acceleration<%1%>::speed_at(%1%)";
    T out;
    // An invalid speed is reported once, here, and then built quietly as all-NaN.
    if (time_invalid(function, tau, pol, out)) return speed<T>::from_proper_speed(out, nan_policy());
    if (unusable()) return speed<T>::from_proper_speed(a_, nan_policy());
    tau = tau + T(0);
    numeric::dd<T> phi;
    if (!rapidity_words(tau, phi))
      return speed<T>::from_proper_speed(beyond(function, tau, pol), nan_policy());
    if (phi.hi <= detail::hyperbolic::series_limit<T>())
      return detail::hyperbolic::speed_from_series(
          detail::hyperbolic::series_point_of(a_, tau, c_, phi), pol);
    numeric::dd<T> sh, ch;
    if (!detail::hyperbolic::exp_parts(phi, sh, ch))
      return speed<T>::from_proper_speed(beyond(function, tau, pol), nan_policy());
    // phi > 4: 1 - beta = 2 e^(-2 phi) / (1 + e^(-2 phi)) from its own exp call (-2 phi.hi is
    // exact; the low word enters to first order), so that it carries one exp rounding, not the
    // doubled one of 1/E^2; from it gamma, beta gamma and gamma - 1 inherit half of it.  Where
    // 1 - beta is subnormal (phi > ~354 in double) it is outside the contract anyway, and
    // gamma = 1 + (cosh - 1) is the input.
    const T e2 = eigenzeit::detail::exp_(T(-2 * phi.hi));
    const numeric::dd<T> f = numeric::fast_two_sum(e2, -2 * e2 * phi.lo);
    const numeric::dd<T> d = numeric::dd_div(numeric::dd<T>{2 * f.hi, 2 * f.lo},
                                             numeric::dd_add(numeric::dd<T>{T(1), T(0)}, f));
    if (d.hi >= std::numeric_limits<T>::min()) return speed<T>::from_beta_deficit(d.hi + d.lo, pol);
    const numeric::dd<T> g = numeric::dd_add(ch, numeric::dd<T>{T(1), T(0)});
    return speed<T>::from_gamma(g.hi + g.lo, pol);
  }

  /// Proper time elapsed on board when the coordinate time t has passed (inverse of
  /// coordinate_time): tau = (c/a) asinh(a t / c).  Accuracy: <= 2 ulp (measured max
  /// 1.32 ulp, double).
  template <class Policy = throw_policy>
  T proper_time(T t, const Policy& pol = Policy()) const {
    constexpr const char* function = "eigenzeit::uniform_acceleration<%1%>::proper_time(%1%)";
    if (!(t >= T(0) && t <= std::numeric_limits<T>::max()))
      return numeric::domain_error<T>(
          function, "coordinate time t = %1%, but it must be finite and >= 0", t, pol);
    if (unusable()) return a_;
    t = t + T(0);
    namespace hb = detail::hyperbolic;
    const numeric::dd<T> p = numeric::two_prod(a_, t);
    if (!(p.hi <= std::numeric_limits<T>::max())) {
      // a t beyond the largest finite value (so a > 1 and t > 1): asinh(psi) = log(2 psi) to
      // far below an ulp, summed from log a + log t - log c + log 2 (all but log c positive,
      // condition number below 1.1 since log c < 20 and the sum exceeds 690).
      const numeric::dd<T> s = numeric::two_sum(eigenzeit::detail::log_(a_),
                                                eigenzeit::detail::log_(t));
      const numeric::dd<T> l2{eigenzeit::detail::log_(T(2)), T(0)};
      const numeric::dd<T> lc{-eigenzeit::detail::log_(c_.hi), -c_.lo / c_.hi};
      const numeric::dd<T> v =
          hb::times_c_over_a(numeric::dd_add(numeric::dd_add(s, l2), lc), 1, a_, c_);
      return v.hi + v.lo;
    }
    const numeric::dd<T> psi = numeric::dd_div(p, c_);
    const T y = psi.hi * psi.hi;
    if (y < numeric::small_square_threshold<T>()) {
      // asinh(psi)/psi = 1 - y/6 + 3y^2/40 - 5y^3/112 + 35y^4/1152 - ...: the first term
      // dropped is below 0.031 y^4 < 2^-(digits+8) (4k >= digits + 3).  t - t corr rounds once
      // at full weight; corr (< 2^-k/6) carries ~3u relative error.  Also covers psi below the
      // normal range, where the correction is far below an ulp.
      const T corr = y * (T(1) / 6 - y * (T(3) / 40 - y * (T(5) / 112)));
      return t - t * corr;
    }
    const numeric::dd<T> v = hb::times_c_over_a(hb::asinh_words(psi), 1, a_, c_);
    return v.hi + v.lo;
  }

 private:
  T a_;
  numeric::dd<T> c_;  // c in the unit system: {1, 0}, or 299 792 458 m/s in two words

  uniform_acceleration(T a, numeric::dd<T> c) : a_(a), c_(c) {}

  template <class Policy>
  static uniform_acceleration make(T a, numeric::dd<T> c, const char* function,
                                   const Policy& pol) {
    using std::isfinite;
    if (!(a > T(0)) || !isfinite(a)) {
      const T nan = numeric::domain_error<T>(
          function, "proper acceleration a = %1%, but it must be finite and > 0", a, pol);
      return uniform_acceleration(nan, c);
    }
    return uniform_acceleration(a, c);
  }

  template <class Policy>
  static bool time_invalid(const char* function, T tau, const Policy& pol, T& out) {
    if (tau >= T(0) && tau <= std::numeric_limits<T>::max()) return false;
    out = numeric::domain_error<T>(function,
                                   "proper time tau = %1%, but it must be finite and >= 0", tau,
                                   pol);
    return true;
  }

  template <class Policy>
  static T beyond(const char* function, T tau, const Policy& pol) {
    return numeric::domain_error<T>(
        function,
        "proper time tau = %1% gives a result (or a Lorentz factor) beyond the largest finite "
        "value",
        tau, pol);
  }

  // An acceleration made invalid under a NaN-returning policy: every query returns NaN.
  bool unusable() const {
    using std::isnan;
    return isnan(a_);
  }

  // phi = a tau / c as a double-word number; false if a tau overflows (then exp(phi) does).
  bool rapidity_words(T tau, numeric::dd<T>& phi) const {
    const numeric::dd<T> p = numeric::two_prod(a_, tau);
    if (!(p.hi <= std::numeric_limits<T>::max())) return false;
    phi = numeric::dd_div(p, c_);
    return true;
  }
};

}  // namespace eigenzeit

#endif
