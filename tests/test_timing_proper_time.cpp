// Tests of include/eigenzeit/timing/proper_time.hpp: accuracy sweeps against MPFR for speeds
// from every constructor, outside checks, identities, monotonicity, special values and errors.
#include <doctest/doctest.h>

#include <algorithm>
#include <cerrno>
#include <cmath>
#include <cstdio>
#include <limits>
#include <random>
#include <stdexcept>
#include <string>
#include <type_traits>
#include <vector>

#include <eigenzeit/constants.hpp>
#include <eigenzeit/timing/proper_time.hpp>

#include "support/reference.hpp"
#include "support/sampler.hpp"
#include "support/policy_checks.hpp"

using eigenzeit::speed;
using ez_test::ctor;
using ez_test::mp;
using ez_test::type_name;

namespace {

long sample_count(long full) { return ez_test::quick() ? std::max(300L, full / 20) : full; }

const ctor all_ctors[] = {ctor::beta,     ctor::beta_deficit, ctor::gamma,          ctor::gamma_m1,
                          ctor::rapidity, ctor::proper_speed, ctor::kinetic_energy, ctor::momentum};

/// Allowed distance to the correctly rounded value: 1 ulp for speeds built from an algebraic
/// input; 2 ulp where the speed as stored differs from its input by more than O(u^2): a speed
/// built from a rapidity stores gamma with exp's rounding in it (speed.hpp), and one built from
/// inputs below min / eps^2 (subnormal gamma - 1, say) stores low words that lost residuals
/// below the subnormal range (the offset, beta^2 dt / 2, doubles beta's error).
template <class T>
int tolerance(ctor c, T x = T(1), T y = T(1)) {
  const T low = eigenzeit::numeric::rescale_threshold<T>();
  if (c == ctor::rapidity) return 2;
  if (x < low || y < low) return 2;
  if (ez_test::two_inputs(c) && static_cast<long double>(x) / y < low) return 2;
  return 1;
}

/// A coordinate time interval: a third near everyday values (1 ms to 100 days in seconds), a
/// third over the whole range of T, a third small (down to the subnormals).
template <class T>
T draw_interval(ez_test::sampler<T>& gen) {
  switch (gen.rng() % 3) {
    case 0: return T(gen.log_uniform(1e-3L, 1e7L));
    case 1: return T(gen.log_uniform(gen.tiny(), gen.huge()));
    default: return T(gen.log_uniform(gen.lowest(), 1e-3L));
  }
}

/// dt times one exact view, in MPFR: exact (the precision holds both factors).
struct product {
  mp v;
  product(const mpfr_t view, long double dt) : v(mpfr_get_prec(view) + 80) {
    mp d(80);
    mpfr_set_ld(d.v, dt, MPFR_RNDN);
    mpfr_mul(v.v, view, d.v, MPFR_RNDN);
  }
};

template <class T>
void sweep_builtin(long samples, unsigned long long seed) {
  std::printf("\n%s: %ld samples per constructor (max/mean ulps of the correctly rounded result; "
              "cr = share correctly rounded)\n",
              type_name<T>(), samples);
  for (ctor c : all_ctors) {
    std::mt19937_64 engine(seed + static_cast<unsigned long long>(c));
    ez_test::sampler<T> gen(engine);
    ez_test::ulp_stats st[2];
    long beyond_tolerance = 0;
    for (long i = 0; i < samples; ++i) {
      T x = T(0), y = T(1);
      gen.draw(c, x, y);
      const speed<T> s = ez_test::construct(c, x, y);
      const T dt = draw_interval(gen);
      const T got[2] = {eigenzeit::proper_time(s, dt), eigenzeit::dilation_offset(s, dt)};
      const ez_test::reference ref(c, x, y, std::numeric_limits<T>::digits);
      const product want[2] = {product(ref.val[ez_test::v_inv_gamma].v, dt),
                               product(ref.val[ez_test::v_dilation].v, dt)};
      for (int k = 0; k < 2; ++k) {
        const ez_test::ulp_error e = ez_test::measure<T>(got[k], want[k].v.v);
        st[k].add(e, x, dt);
        if (e.normal && e.dist > tolerance<T>(c, x, y)) ++beyond_tolerance;
      }
    }
    INFO(std::string(type_name<T>()), " ", std::string(ez_test::ctor_name(c)));
    CHECK(beyond_tolerance == 0);
    for (int k = 0; k < 2; ++k) {
      const char* name = k == 0 ? "proper_time" : "dilation_offset";
      std::printf("  %-20s %-16s max %.3f (dist %lld) mean %.4f cr %.5f [subnormal %ld, max dist "
                  "%lld]  worst input %.17Lg dt %.6Lg\n",
                  ez_test::ctor_name(c), name, st[k].max_frac,
                  static_cast<long long>(st[k].max_dist), st[k].mean(), st[k].share_exact(),
                  st[k].n_subnormal, static_cast<long long>(st[k].max_dist_subnormal),
                  st[k].worst_input, st[k].worst_input2);
      INFO(std::string(type_name<T>()), " ", std::string(ez_test::ctor_name(c)), " ",
           std::string(name), " worst input ", static_cast<double>(st[k].worst_input), " dt ",
           static_cast<double>(st[k].worst_input2));
      CHECK(st[k].max_dist <= 2);
      CHECK(st[k].n > samples / 4);
    }
  }
}

/// Multiprecision types: relative error in units of the type's epsilon, contract <= 8.
template <class T>
void sweep_multiprecision(long samples, unsigned long long seed) {
  double worst = 0;
  for (ctor c : all_ctors) {
    std::mt19937_64 engine(seed + static_cast<unsigned long long>(c));
    ez_test::sampler<double> gen(engine);
    for (long i = 0; i < samples; ++i) {
      double xd = 0, yd = 1;
      gen.draw(c, xd, yd);
      const double dt = static_cast<double>(gen.log_uniform(1e-200L, 1e200L));
      const speed<T> s = ez_test::construct(c, T(xd), T(yd));
      const T got[2] = {eigenzeit::proper_time(s, T(dt)), eigenzeit::dilation_offset(s, T(dt))};
      const ez_test::reference ref(c, xd, yd, std::numeric_limits<T>::digits);
      const product want[2] = {product(ref.val[ez_test::v_inv_gamma].v, dt),
                               product(ref.val[ez_test::v_dilation].v, dt)};
      for (int k = 0; k < 2; ++k) {
        if (mpfr_zero_p(want[k].v.v)) continue;
        const double e = ez_test::measure_eps(got[k], want[k].v.v);
        INFO(std::string(type_name<T>()), " ", std::string(ez_test::ctor_name(c)), " input ", xd,
             " dt ", dt, k == 0 ? " proper_time" : " dilation_offset");
        CHECK(e <= 8.0);
        worst = std::max(worst, e);
      }
    }
  }
  std::printf("%s, %ld samples per constructor: max relative error %.3f eps\n", type_name<T>(),
              samples, worst);
}

}  // namespace

TEST_CASE("proper_time and dilation_offset against MPFR, every constructor (double)") {
  sweep_builtin<double>(sample_count(20000), 301);
}

TEST_CASE("proper_time and dilation_offset against MPFR, every constructor (long double, float)") {
  sweep_builtin<long double>(sample_count(5000), 302);
  sweep_builtin<float>(sample_count(5000), 303);
}

TEST_CASE("multiprecision types stay within 8 epsilon") {
  sweep_multiprecision<ez_test::cpp50>(sample_count(60), 304);
  sweep_multiprecision<ez_test::mpfr100>(sample_count(60), 305);
}

// =============================================================================================
// Outside checks
// =============================================================================================

TEST_CASE("facts of the trade: a navigation satellite's velocity term and a clock at 0.995 c") {
  const double c = eigenzeit::constants::speed_of_light<double>();
  // Common practice, no source: a clock in a GPS-like orbit moves at about 3.874 km/s (speed
  // from memory) and, from its speed alone, falls behind a clock at rest by about 7.2
  // microseconds per day.
  const auto sat = speed<double>::from_beta(3874.0 / c);
  const double day = 86400.0;
  const double lag = eigenzeit::dilation_offset(sat, day);
  std::printf("3.874 km/s for one day: dilation offset %.17g s\n", lag);
  CHECK(std::fabs(lag / 7.2e-6 - 1) < 0.01);
  // Against MPFR on the exact input (beta as a double, one day exactly).
  {
    const ez_test::reference ref(ctor::beta, 3874.0 / c, 1, 53);
    const product want(ref.val[ez_test::v_dilation].v, day);
    CHECK(ez_test::measure<double>(lag, want.v.v).dist <= 1);
  }
  // The textbook forms in double: day - day * sqrt(1 - b^2) keeps only a few digits, and the
  // rounded view times dt is one more rounding (within 1.5 ulp), here still close.
  const double b = 3874.0 / c;
  const double naive = day - day * std::sqrt(1 - b * b);
  const ez_test::reference ref(ctor::beta, b, 1, 53);
  const product want(ref.val[ez_test::v_dilation].v, day);
  const ez_test::ulp_error naive_err = ez_test::measure<double>(naive, want.v.v);
  std::printf("  naive day - day sqrt(1 - b^2): %.17g (%.3g ulp off)\n", naive, naive_err.frac);
  CHECK(naive_err.frac > 1e4);  // the cancellation these routines remove
  // Common practice, no source: at 0.995 c, gamma is about 10.01, so one second of coordinate
  // time is about 0.0999 s on the moving clock.
  const auto fast = speed<double>::from_beta(0.995);
  const double tau = eigenzeit::proper_time(fast, 1.0);
  CHECK(std::fabs(tau - 0.0999) < 1e-4);
  const ez_test::reference ref995(ctor::beta, 0.995, 1, 53);
  CHECK(ez_test::measure<double>(tau, ref995.val[ez_test::v_inv_gamma].v).dist <= 1);
}

// =============================================================================================
// Identities and monotonicity
// =============================================================================================

namespace {

template <class T>
void identities(long samples, unsigned long long seed) {
  std::mt19937_64 engine(seed);
  ez_test::sampler<T> gen(engine);
  for (long i = 0; i < samples; ++i) {
    T x = T(0), y = T(1);
    const ctor c = all_ctors[gen.rng() % 8];
    gen.draw(c, x, y);
    const speed<T> s = ez_test::construct(c, x, y);
    const T dt = draw_interval(gen);
    const T tau = eigenzeit::proper_time(s, dt);
    const T off = eigenzeit::dilation_offset(s, dt);
    INFO(std::string(type_name<T>()), " ", std::string(ez_test::ctor_name(c)), " input ",
         static_cast<double>(x), " dt ", static_cast<double>(dt));
    // tau + offset = dt: both within 1 ulp of their exact values, which add up to dt.
    if (std::isnormal(tau) && std::isnormal(off)) {
      const long double sum = static_cast<long double>(tau) + static_cast<long double>(off);
      const long double ulp_dt =
          std::ldexp(1.0L, std::ilogb(dt) - std::numeric_limits<T>::digits + 1);
      CHECK(std::fabs(sum - static_cast<long double>(dt)) <=
            static_cast<long double>(ulp_dt) + 2 * std::numeric_limits<T>::epsilon() *
                                                   std::max<long double>(tau, off));
    }
    // Linearity: scaling dt by a power of two scales both results exactly.
    // (Far enough above the subnormal range that the low words of the products stay exact.)
    const T dt2 = std::ldexp(dt, -3);
    const T low = eigenzeit::numeric::rescale_threshold<T>();
    if (std::fabs(eigenzeit::proper_time(s, dt2)) >= low &&
        std::fabs(eigenzeit::dilation_offset(s, dt2)) >= low) {
      CHECK(eigenzeit::proper_time(s, dt2) == std::ldexp(tau, -3));
      CHECK(eigenzeit::dilation_offset(s, dt2) == std::ldexp(off, -3));
    }
    // The rounded views give the same to within 1.5 ulp wherever the view is normal.
    if (std::isnormal(tau) && std::isnormal(s.inv_gamma()))
      CHECK(std::fabs(static_cast<long double>(tau) / (static_cast<long double>(dt) * s.inv_gamma()) - 1) <=
            3 * static_cast<long double>(std::numeric_limits<T>::epsilon()));
  }
}

template <class T>
void monotonic(long samples, unsigned long long seed) {
  std::mt19937_64 engine(seed);
  ez_test::sampler<T> gen(engine);
  std::vector<T> betas;
  for (long i = 0; i < samples; ++i) {
    T x = T(0), y = T(1);
    gen.draw(ctor::beta, x, y);
    betas.push_back(x);
  }
  std::sort(betas.begin(), betas.end());
  long violations = 0;
  for (T dt : {T(1), T(86400), T(1e-9f), T(3.25e30f)}) {
    T prev_tau = std::numeric_limits<T>::infinity(), prev_off = T(0);
    for (T b : betas) {
      const auto s = speed<T>::from_beta(b);
      const T tau = eigenzeit::proper_time(s, dt), off = eigenzeit::dilation_offset(s, dt);
      if (tau > prev_tau || off < prev_off) ++violations;
      prev_tau = tau;
      prev_off = off;
    }
  }
  INFO(std::string(type_name<T>()));
  CHECK(violations == 0);
}

}  // namespace

TEST_CASE("proper time plus dilation offset is dt; both are linear in dt") {
  identities<double>(sample_count(50000), 311);
  identities<long double>(sample_count(10000), 312);
  identities<float>(sample_count(10000), 313);
}

TEST_CASE("proper time falls and the offset grows with speed") {
  monotonic<double>(sample_count(50000), 321);
  monotonic<float>(sample_count(10000), 322);
}

// =============================================================================================
// Special values and errors
// =============================================================================================

TEST_CASE_TEMPLATE("special values", T, float, double, long double) {
  const speed<T> rest;
  const T den = std::numeric_limits<T>::denorm_min(), big = std::numeric_limits<T>::max();
  for (T dt : {T(0), T(1), den, den * 7, std::numeric_limits<T>::min(), big}) {
    CHECK(eigenzeit::proper_time(rest, dt) == dt);
    CHECK(eigenzeit::dilation_offset(rest, dt) == 0);
  }
  // Signed zero keeps its sign; +0 gives +0.  gamma = 5/4 exactly: 3-4-5 triangle.
  const auto s = speed<T>::from_gamma(T(1.25));
  CHECK(std::signbit(eigenzeit::proper_time(s, -T(0))));
  CHECK(std::signbit(eigenzeit::dilation_offset(s, -T(0))));
  CHECK(!std::signbit(eigenzeit::proper_time(s, T(0))));
  CHECK(eigenzeit::proper_time(s, T(5)) == T(4));
  CHECK(eigenzeit::dilation_offset(s, T(5)) == T(1));
  // No overflow at the top of the range.
  CHECK(eigenzeit::proper_time(s, big) < big);
  CHECK(eigenzeit::proper_time(s, big) > big / 2);
  CHECK(std::isfinite(eigenzeit::dilation_offset(s, big)));
  // Integer intervals convert to T.
  CHECK(eigenzeit::proper_time(s, 10) == T(8));

  // Cases whose views are subnormal while the product is normal, and the largest gammas.
  struct probe {
    ctor c;
    T x;
    T dt;
  };
  const probe probes[] = {
      {ctor::beta, T(std::sqrt(std::numeric_limits<T>::min())) / 64, big / 8},  // beta^2/2 subnormal
      {ctor::beta, den * 1024, big},                                          // subnormal beta
      {ctor::gamma, big / 2, T(1e20f)},                                      // 1/gamma subnormal-ish
      {ctor::gamma, std::sqrt(big), T(3)},                                  // the rescaled branch
      {ctor::gamma_m1, big, big},
      {ctor::beta_deficit, den * 9, T(1)},                                   // gamma ~ 2^(range/2)
      {ctor::proper_speed, big / 3, big / 5},
      {ctor::rapidity, T(std::log(big)) - 2, big},
  };
  int normal_results = 0;
  for (const probe& p : probes) {
    const speed<T> sp = ez_test::construct(p.c, p.x, T(1));
    const T got[2] = {eigenzeit::proper_time(sp, p.dt), eigenzeit::dilation_offset(sp, p.dt)};
    // Reference precision: enough for 1 - beta near the subnormal range of long double.
    mp x(256), one(16), dt(256);
    ez_test::set_exact(x.v, p.x);
    ez_test::set_exact(dt.v, p.dt);
    mpfr_set_ui(one.v, 1, MPFR_RNDN);
    const int e = std::abs(std::ilogb(p.x));
    ez_test::reference ref(static_cast<mpfr_prec_t>(512 + 2 * e + 4 * std::numeric_limits<T>::digits));
    ref.compute(p.c, x.v, one.v);
    for (int k = 0; k < 2; ++k) {
      mp want(ref.prec + 300);
      mpfr_mul(want.v, ref.val[k == 0 ? ez_test::v_inv_gamma : ez_test::v_dilation].v, dt.v,
               MPFR_RNDN);
      const ez_test::ulp_error err = ez_test::measure<T>(got[k], want.v);
      INFO(std::string(type_name<T>()), " ", std::string(ez_test::ctor_name(p.c)), "(",
           static_cast<long double>(p.x), "), dt ", static_cast<long double>(p.dt),
           k == 0 ? " proper_time" : " dilation_offset", " got ", static_cast<long double>(got[k]));
      if (!err.normal) continue;  // e.g. the offset of a subnormal beta: outside the contract
      CHECK(err.dist <= tolerance<T>(p.c, p.x));
      ++normal_results;
    }
  }
  CHECK(normal_results >= 14);
  // A speed made invalid under the NaN policy gives NaN.
  const auto bad = speed<T>::from_beta(T(2), eigenzeit::nan_policy());
  CHECK(std::isnan(eigenzeit::proper_time(bad, T(1))));
  CHECK(std::isnan(eigenzeit::dilation_offset(bad, T(1))));
}

TEST_CASE("bad input: every domain error, for each policy") {
  const auto s = speed<double>::from_beta(0.5);
  for (double bad : {-1.0, -1e-300, -std::numeric_limits<double>::denorm_min(),
                     std::numeric_limits<double>::infinity(),
                     -std::numeric_limits<double>::infinity(),
                     std::numeric_limits<double>::quiet_NaN()}) {
    ez_test::check_all_policies("proper_time", bad,
                       [&s](double dt, auto p) { return eigenzeit::proper_time(s, dt, p); });
    ez_test::check_all_policies("dilation_offset", bad,
                       [&s](double dt, auto p) { return eigenzeit::dilation_offset(s, dt, p); });
  }
}
