// Test support: the input sampler of the accuracy sweeps, shared by tests/test_speed.cpp and
// tools/accuracy.cpp, and helpers that build a speed<T> from a constructor tag and read all
// of its views.
#ifndef EIGENZEIT_TESTS_SUPPORT_SAMPLER_HPP
#define EIGENZEIT_TESTS_SUPPORT_SAMPLER_HPP

#include <algorithm>
#include <cmath>
#include <limits>
#include <random>

#include <eigenzeit/speed.hpp>

#include "reference.hpp"

namespace ez_test {

/// True for the constructors that take two inputs (energy or momentum and a mass).
inline bool two_inputs(ctor c) { return c == ctor::kinetic_energy || c == ctor::momentum; }

/// Log-uniform inputs over each constructor's domain, exact in T (drawn in long double, then
/// rounded to T once).
template <class T>
struct sampler {
  std::mt19937_64& rng;
  explicit sampler(std::mt19937_64& engine) : rng(engine) {}

  long double uniform(long double a, long double b) {
    return std::uniform_real_distribution<long double>(a, b)(rng);
  }
  long double log_uniform(long double lo, long double hi) {
    // The bounds pass through volatile so that log is always the run-time logl: with constant
    // bounds the compiler may fold log() at compile time (correctly rounded) or not, depending
    // on inlining, and the drawn inputs would then differ from one build to the next.
    volatile long double vlo = lo, vhi = hi;
    return std::exp(uniform(std::log(vlo), std::log(vhi)));
  }
  // Magnitude limits of the sweep, clamped to what T can hold.
  static long double tiny() {  // smallest input magnitude swept
    return std::max<long double>(1e-300L, std::numeric_limits<T>::denorm_min());
  }
  // Smallest magnitude, subnormals of float and double included; long double stops at 1e-320
  // so that the reference precision stays bounded.
  static long double lowest() {
    return std::max<long double>(1e-320L, std::numeric_limits<T>::denorm_min());
  }
  static long double huge() {
    return std::min<long double>(1e300L, std::numeric_limits<T>::max() / 1e6L);
  }
  static long double max_rapidity() {
    // cosh(eta) must stay below the largest finite T, with a margin.
    return std::min<long double>(700.0L, std::log(static_cast<long double>(std::numeric_limits<T>::max())) - 1);
  }

  /// One input (x, y) for constructor c; y is the mass for the energy constructors.
  void draw(ctor c, T& x, T& y) {
    const long double eps = std::numeric_limits<T>::epsilon();
    y = T(1);
    const int region = static_cast<int>(rng() % 3);
    switch (c) {
      case ctor::beta:
        if (region == 0) x = T(log_uniform(lowest(), 1e-4L));
        else if (region == 1) x = T(log_uniform(1e-4L, 0.5L));
        else x = T(1 - log_uniform(eps / 2, 0.5L));
        if (!(x < T(1))) x = T(0.5);
        break;
      case ctor::beta_deficit:
        if (region == 2) x = T(uniform(0.5L, 1.0L));
        else x = T(log_uniform(tiny(), 0.5L));
        break;
      case ctor::gamma:
        x = T(1 + log_uniform(eps, std::min<long double>(1e150L, huge())));
        break;
      case ctor::gamma_m1:
        x = T(log_uniform(lowest() * 4, huge()));
        break;
      case ctor::rapidity:
        x = T(log_uniform(tiny(), max_rapidity()));
        break;
      case ctor::proper_speed:
        x = T(log_uniform(tiny(), huge()));
        break;
      case ctor::kinetic_energy:
      case ctor::momentum: {
        y = T(log_uniform(1e-3L, 1e6L));
        long double r = log_uniform(tiny() * 1e6L, huge() / 1e6L);
        x = T(r * static_cast<long double>(y));
        break;
      }
    }
  }
};


template <class T>
inline eigenzeit::speed<T> construct(ctor c, T x, T y) {
  using S = eigenzeit::speed<T>;
  switch (c) {
    case ctor::beta: return S::from_beta(x);
    case ctor::beta_deficit: return S::from_beta_deficit(x);
    case ctor::gamma: return S::from_gamma(x);
    case ctor::gamma_m1: return S::from_gamma_m1(x);
    case ctor::rapidity: return S::from_rapidity(x);
    case ctor::proper_speed: return S::from_proper_speed(x);
    case ctor::kinetic_energy: return S::from_kinetic_energy(x, y);
    case ctor::momentum: return S::from_momentum(x, y);
  }
  return S();
}

/// The eight views of a speed<T> (or of a rounded_speed<T>, which has the same ones).
template <class S, class T>
inline void views_of(const S& s, T out[n_views]) {
  out[ez_test::v_beta] = s.beta();
  out[ez_test::v_deficit] = s.beta_deficit();
  out[ez_test::v_gamma] = s.gamma();
  out[ez_test::v_gamma_m1] = s.gamma_m1();
  out[ez_test::v_inv_gamma] = s.inv_gamma();
  out[ez_test::v_dilation] = s.dilation_fraction();
  out[ez_test::v_rapidity] = s.rapidity();
  out[ez_test::v_proper_speed] = s.proper_speed();
}

}  // namespace ez_test

#endif
