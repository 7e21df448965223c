// Tests of include/eigenzeit/speed.hpp: accuracy sweeps against MPFR, the committed mpmath
// table, outside checks, identities, round trips, monotonicity, special values and errors.
#include <doctest/doctest.h>

#include <algorithm>
#include <cerrno>
#include <cmath>
#include <cstdio>
#include <cstring>
#include <limits>
#include <random>
#include <stdexcept>
#include <string>
#include <type_traits>
#include <vector>

#include <eigenzeit/speed.hpp>

#include "data/speed_reference.hpp"
#include "support/reference.hpp"

#if defined(BOOST_HAS_FLOAT128)
#include <boost/multiprecision/float128.hpp>
#endif

using eigenzeit::speed;
using ez_test::ctor;
using ez_test::mp;

namespace {

template <class T>
const char* type_name() {
  if constexpr (std::is_same<T, float>::value) return "float";
  else if constexpr (std::is_same<T, double>::value) return "double";
  else if constexpr (std::is_same<T, long double>::value) return "long double";
  else if constexpr (std::is_same<T, ez_test::cpp50>::value) return "cpp_bin_float_50";
  else if constexpr (std::is_same<T, ez_test::mpfr100>::value) return "mpfr_float_100";
  else return "float128";
}

template <class T>
void views_of(const speed<T>& s, T out[ez_test::n_views]) {
  out[ez_test::v_beta] = s.beta();
  out[ez_test::v_deficit] = s.beta_deficit();
  out[ez_test::v_gamma] = s.gamma();
  out[ez_test::v_gamma_m1] = s.gamma_m1();
  out[ez_test::v_inv_gamma] = s.inv_gamma();
  out[ez_test::v_dilation] = s.dilation_fraction();
  out[ez_test::v_rapidity] = s.rapidity();
  out[ez_test::v_proper_speed] = s.proper_speed();
}

template <class T>
speed<T> construct(ctor c, T x, T y) {
  switch (c) {
    case ctor::beta: return speed<T>::from_beta(x);
    case ctor::beta_deficit: return speed<T>::from_beta_deficit(x);
    case ctor::gamma: return speed<T>::from_gamma(x);
    case ctor::gamma_m1: return speed<T>::from_gamma_m1(x);
    case ctor::rapidity: return speed<T>::from_rapidity(x);
    case ctor::proper_speed: return speed<T>::from_proper_speed(x);
    case ctor::kinetic_energy: return speed<T>::from_kinetic_energy(x, y);
    case ctor::momentum: return speed<T>::from_momentum(x, y);
  }
  return speed<T>();
}

/// Allowed ulp distance to the correctly rounded value (DESIGN.md, precision contract):
/// 1 for algebraic views of algebraically built speeds, 2 where exp or log enters.
int tolerance(ctor c, int view) {
  if (view == ez_test::v_rapidity || c == ctor::rapidity) return 2;
  return 1;
}

// ---- input generation: log-uniform over each constructor's domain, exact in T ------------

template <class T>
struct sampler {
  std::mt19937_64 rng;
  explicit sampler(unsigned long long seed) : rng(seed) {}

  long double uniform(long double a, long double b) {
    return std::uniform_real_distribution<long double>(a, b)(rng);
  }
  long double log_uniform(long double lo, long double hi) {
    return std::exp(uniform(std::log(lo), std::log(hi)));
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

double magnitude(ctor c, long double x, long double y) {
  if (c == ctor::kinetic_energy || c == ctor::momentum) return static_cast<double>(x / y);
  if (x != 0 && std::fabs(x) < 1e-4900L) return 0.0;
  return static_cast<double>(x);
}

long sample_count(long full) { return ez_test::quick() ? std::max(500L, full / 20) : full; }

const ctor all_ctors[] = {ctor::beta,         ctor::beta_deficit,   ctor::gamma,
                          ctor::gamma_m1,     ctor::rapidity,       ctor::proper_speed,
                          ctor::kinetic_energy, ctor::momentum};

/// The sweep for one built-in type: every constructor, every view, against MPFR.
template <class T>
void sweep_builtin(long samples, unsigned long long seed) {
  std::printf("\n%s: %ld samples per constructor (max/mean in ulps of the correctly rounded "
              "result; 'cr' = share correctly rounded)\n",
              type_name<T>(), samples);
  for (ctor c : all_ctors) {
    sampler<T> gen(seed + static_cast<unsigned long long>(c));
    ez_test::ulp_stats stats[ez_test::n_views];
    for (long i = 0; i < samples; ++i) {
      T x = T(0), y = T(1);
      gen.draw(c, x, y);
      const speed<T> s = construct(c, x, y);
      T got[ez_test::n_views];
      views_of(s, got);
      ez_test::reference ref(ez_test::precision_for(magnitude(c, x, y), c, std::numeric_limits<T>::digits));
      mp mx(ref.prec), my(ref.prec);
      ez_test::set_exact(mx.v, x);
      ez_test::set_exact(my.v, y);
      ref.compute(c, mx.v, my.v);
      for (int v = 0; v < ez_test::n_views; ++v)
        stats[v].add(ez_test::measure<T>(got[v], ref.val[v].v), x, y);
    }
    for (int v = 0; v < ez_test::n_views; ++v) {
      const auto& st = stats[v];
      std::printf("  %-20s %-18s max %.3f (dist %lld) mean %.4f cr %.5f  [subnormal results %ld, "
                  "max dist %lld]  worst input %.21Lg %.6Lg\n",
                  ez_test::ctor_name(c), ez_test::view_name(v), st.max_frac,
                  static_cast<long long>(st.max_dist), st.mean(), st.share_exact(),
                  st.n_subnormal, static_cast<long long>(st.max_dist_subnormal), st.worst_input,
                  st.worst_input2);
      INFO(type_name<T>(), " ", ez_test::ctor_name(c), " ", ez_test::view_name(v),
           " worst input ", static_cast<double>(st.worst_input));
      CHECK(st.max_dist <= tolerance(c, v));
      CHECK(st.n > samples / 4);  // the contract region was actually exercised
    }
  }
}

/// Free functions of signed beta against the same reference.
template <class T>
void sweep_free(long samples, unsigned long long seed) {
  sampler<T> gen(seed);
  ez_test::ulp_stats st[5];
  const char* names[5] = {"lorentz_factor", "lorentz_factor_m1", "proper_speed",
                          "dilation_fraction", "rapidity"};
  const int view_of[5] = {ez_test::v_gamma, ez_test::v_gamma_m1, ez_test::v_proper_speed,
                          ez_test::v_dilation, ez_test::v_rapidity};
  for (long i = 0; i < samples; ++i) {
    T a = T(0), unused = T(1);
    gen.draw(ctor::beta, a, unused);
    const bool negative = (gen.rng() & 1) != 0;
    const T b = negative ? -a : a;
    const T got[5] = {eigenzeit::lorentz_factor(b), eigenzeit::lorentz_factor_m1(b),
                      eigenzeit::proper_speed(b), eigenzeit::dilation_fraction(b),
                      eigenzeit::rapidity(b)};
    ez_test::reference ref(ez_test::precision_for(static_cast<double>(a), ctor::beta, std::numeric_limits<T>::digits));
    mp mx(ref.prec), my(ref.prec);
    ez_test::set_exact(mx.v, a);
    mpfr_set_ui(my.v, 1, MPFR_RNDN);
    ref.compute(ctor::beta, mx.v, my.v);
    for (int k = 0; k < 5; ++k) {
      const bool odd = (k == 2 || k == 4);  // proper speed and rapidity keep the sign
      const T g = (odd && negative) ? -got[k] : got[k];
      st[k].add(ez_test::measure<T>(g, ref.val[view_of[k]].v), b);
      if (odd && negative && a != 0) CHECK(got[k] < 0);
    }
  }
  std::printf("\n%s free functions of signed beta, %ld samples:\n", type_name<T>(), samples);
  for (int k = 0; k < 5; ++k) {
    std::printf("  %-18s max %.3f (dist %lld) mean %.4f cr %.5f [subnormal %ld]  worst %.21Lg\n",
                names[k], st[k].max_frac, static_cast<long long>(st[k].max_dist), st[k].mean(),
                st[k].share_exact(), st[k].n_subnormal, st[k].worst_input);
    INFO(type_name<T>(), " ", names[k], " worst input ", static_cast<double>(st[k].worst_input));
    CHECK(st[k].max_dist <= (k == 4 ? 2 : 1));
  }
}

/// Multiprecision types: relative error in units of the type's epsilon, contract <= 8.
template <class T>
void sweep_multiprecision(long samples, unsigned long long seed) {
  double worst[ez_test::n_views] = {};
  for (ctor c : all_ctors) {
    sampler<double> gen(seed + static_cast<unsigned long long>(c));
    for (long i = 0; i < samples; ++i) {
      double xd = 0, yd = 1;
      gen.draw(c, xd, yd);
      const T x(xd), y(yd);
      const speed<T> s = construct(c, x, y);
      T got[ez_test::n_views];
      views_of(s, got);
      ez_test::reference ref(ez_test::precision_for(magnitude(c, xd, yd), c, std::numeric_limits<T>::digits));
      mp mx(ref.prec), my(ref.prec);
      ez_test::set_exact(mx.v, xd);
      ez_test::set_exact(my.v, yd);
      ref.compute(c, mx.v, my.v);
      for (int v = 0; v < ez_test::n_views; ++v) {
        if (mpfr_zero_p(ref.val[v].v)) continue;
        const double e = ez_test::measure_eps(got[v], ref.val[v].v);
        INFO(type_name<T>(), " ", ez_test::ctor_name(c), " ", ez_test::view_name(v), " input ", xd, " ", yd);
        CHECK(e <= 8.0);
        worst[v] = std::max(worst[v], e);
      }
    }
  }
  std::printf("\n%s, %ld samples per constructor: max relative error in eps per view:\n",
              type_name<T>(), samples);
  for (int v = 0; v < ez_test::n_views; ++v)
    std::printf("  %-18s %.3f\n", ez_test::view_name(v), worst[v]);
}

}  // namespace

// =============================================================================================

TEST_CASE("speed<T> views from every constructor: sweep against MPFR (double)") {
  sweep_builtin<double>(sample_count(100000), 1);
}

TEST_CASE("speed<T> views from every constructor: sweep against MPFR (long double)") {
  sweep_builtin<long double>(sample_count(20000), 2);
}

TEST_CASE("speed<T> views from every constructor: sweep against MPFR (float)") {
  sweep_builtin<float>(sample_count(20000), 3);
}

TEST_CASE("free functions of signed beta: sweep against MPFR") {
  sweep_free<double>(sample_count(100000), 11);
  sweep_free<long double>(sample_count(20000), 12);
  sweep_free<float>(sample_count(20000), 13);
}

TEST_CASE("multiprecision types stay within 8 epsilon") {
  sweep_multiprecision<ez_test::cpp50>(sample_count(400), 21);
  sweep_multiprecision<ez_test::mpfr100>(sample_count(400), 22);
#if defined(BOOST_HAS_FLOAT128)
  sweep_multiprecision<boost::multiprecision::float128>(sample_count(1000), 23);
#endif
}
