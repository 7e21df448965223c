// Tests of include/eigenzeit/timing/clock_rate.hpp: clock_rate_offset against MPFR (its own
// formula evaluated exactly), against special relativity (speed.hpp and MPFR), outside checks
// (the geoid clock and L_G, the gravitational shift g h / c^2), monotonicity, special values
// and domain errors under the three policies.
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
#include <utility>
#include <vector>

#include <eigenzeit/constants.hpp>
#include <eigenzeit/speed.hpp>
#include <eigenzeit/timing/clock_rate.hpp>
#include <eigenzeit/timing/potential.hpp>

#include "support/reference.hpp"
#include "support/policy_checks.hpp"

using ez_test::mp;
using ez_test::type_name;

namespace {

long sample_count(long full) { return ez_test::quick() ? std::max(500L, full / 20) : full; }

/// The model's formula, exactly (to `prec` bits), on exact inputs v (m/s) and U (m^2/s^2):
///   -(u + b/2) + (u^2/2 - 3 u b / 2 - b^2/8),  u = U/c^2, b = v^2/c^2.
void reference_offset(mpfr_t out, const mpfr_t v, const mpfr_t U, mpfr_prec_t prec) {
  mp c2(prec), u(prec), b(prec), t(prec), acc(prec);
  mpfr_set_ui(c2.v, 299792458UL, MPFR_RNDN);
  mpfr_sqr(c2.v, c2.v, MPFR_RNDN);
  mpfr_div(u.v, U, c2.v, MPFR_RNDN);
  mpfr_sqr(b.v, v, MPFR_RNDN);
  mpfr_div(b.v, b.v, c2.v, MPFR_RNDN);
  // acc = -(u + b/2)
  mpfr_div_ui(t.v, b.v, 2, MPFR_RNDN);
  mpfr_add(acc.v, u.v, t.v, MPFR_RNDN);
  mpfr_neg(acc.v, acc.v, MPFR_RNDN);
  // + u^2/2
  mpfr_sqr(t.v, u.v, MPFR_RNDN);
  mpfr_div_ui(t.v, t.v, 2, MPFR_RNDN);
  mpfr_add(acc.v, acc.v, t.v, MPFR_RNDN);
  // - 3 u b / 2
  mpfr_mul(t.v, u.v, b.v, MPFR_RNDN);
  mpfr_mul_ui(t.v, t.v, 3, MPFR_RNDN);
  mpfr_div_ui(t.v, t.v, 2, MPFR_RNDN);
  mpfr_sub(acc.v, acc.v, t.v, MPFR_RNDN);
  // - b^2/8
  mpfr_sqr(t.v, b.v, MPFR_RNDN);
  mpfr_div_ui(t.v, t.v, 8, MPFR_RNDN);
  mpfr_sub(out, acc.v, t.v, MPFR_RNDN);
}

constexpr mpfr_prec_t kPrec = 1024;  // inputs need < 130 bits and nothing cancels

/// Inputs of the sweep: v in [0, 1e5] m/s and U in [0, 1e9] m^2/s^2, each drawn as exactly
/// zero (1 in 10), uniform (the physical ranges) or log-uniform from 1e-3 (tiny terms).
template <class T>
struct rate_inputs {
  std::mt19937_64 rng;
  explicit rate_inputs(unsigned long long seed) : rng(seed) {}
  long double uniform(long double a, long double b) {
    return std::uniform_real_distribution<long double>(a, b)(rng);
  }
  long double log_uniform(long double a, long double b) {
    volatile long double va = a, vb = b;  // run-time logs, the same draws in every build
    return std::exp(uniform(std::log(va), std::log(vb)));
  }
  T draw(long double top) {
    const unsigned kind = static_cast<unsigned>(rng() % 20);
    if (kind < 2) return T(0);
    if (kind < 11) return T(uniform(0, top));
    return T(log_uniform(1e-3L, top));
  }
};

template <class T>
void sweep_builtin(long samples, unsigned long long seed) {
  rate_inputs<T> in(seed);
  ez_test::ulp_stats st;
  long zero_results = 0;
  long double worst_v = 0, worst_u = 0;
  double worst_frac = 0;
  for (long i = 0; i < samples; ++i) {
    const T v = in.draw(1e5L);
    const T U = in.draw(1e9L);
    const T got = eigenzeit::clock_rate_offset(v, U);
    mp mv(kPrec), mu(kPrec), ref(kPrec);
    ez_test::set_exact(mv.v, v);
    ez_test::set_exact(mu.v, U);
    reference_offset(ref.v, mv.v, mu.v, kPrec);
    if (mpfr_zero_p(ref.v)) {
      ++zero_results;
      CHECK(got == 0);
      CHECK(!std::signbit(got));  // a clock at rest far from all masses: +0
      continue;
    }
    const ez_test::ulp_error e = ez_test::measure<T>(got, ref.v);
    if (e.frac > worst_frac) {
      worst_frac = e.frac;
      worst_v = v;
      worst_u = U;
    }
    st.add(e, v, U);
    CHECK(got < 0);
  }
  std::printf("clock_rate_offset %s, %ld samples (v in [0, 1e5] m/s, U in [0, 1e9] m^2/s^2): "
              "max %.3f ulp (dist %lld) mean %.4f cr %.5f [zero %ld, subnormal %ld] worst at "
              "v = %.17Lg, U = %.17Lg\n",
              type_name<T>(), samples, st.max_frac, static_cast<long long>(st.max_dist), st.mean(),
              st.share_exact(), zero_results, st.n_subnormal, worst_v, worst_u);
  INFO(type_name<T>(), " worst v = ", static_cast<double>(worst_v), " U = ",
       static_cast<double>(worst_u));
  CHECK(st.max_dist <= 1);          // the contract: 1 ulp of its own formula
  CHECK(st.share_exact() >= 0.999);  // the goal: correctly rounded nearly always
  CHECK(st.n > samples / 2);
}

template <class T>
void sweep_multiprecision(long samples, unsigned long long seed) {
  rate_inputs<double> in(seed);
  double worst = 0;
  for (long i = 0; i < samples; ++i) {
    const double vd = in.draw(1e5L), ud = in.draw(1e9L);
    if (vd == 0 && ud == 0) continue;
    const T got = eigenzeit::clock_rate_offset(T(vd), T(ud));
    mp mv(kPrec), mu(kPrec), ref(kPrec);
    ez_test::set_exact(mv.v, vd);
    ez_test::set_exact(mu.v, ud);
    reference_offset(ref.v, mv.v, mu.v, kPrec);
    const double e = ez_test::measure_eps(got, ref.v);
    INFO(type_name<T>(), " v = ", vd, " U = ", ud);
    CHECK(e <= 2.0);
    worst = std::max(worst, e);
  }
  std::printf("clock_rate_offset %s, %ld samples: max relative error %.3f eps\n", type_name<T>(),
              samples, worst);
}

}  // namespace

TEST_CASE("clock_rate_offset against MPFR: 1 ulp of its own formula") {
  sweep_builtin<double>(sample_count(200000), 101);
  sweep_builtin<long double>(sample_count(50000), 102);
  sweep_builtin<float>(sample_count(50000), 103);
  sweep_multiprecision<ez_test::cpp50>(sample_count(2000), 104);
  sweep_multiprecision<ez_test::mpfr100>(sample_count(2000), 105);
}

TEST_CASE("tiny terms keep every digit (speed 1 m/s, U = 1e-3 m^2/s^2)") {
  // The textbook form sqrt(1 - 2U/c^2 - v^2/c^2) - 1 cancels to nothing here; the library
  // keeps the full offset -(U + v^2/2)/c^2 = -5.6e-18.
  const double v = 1.0, U = 1e-3;
  mp mv(kPrec), mu(kPrec), ref(kPrec);
  ez_test::set_exact(mv.v, v);
  ez_test::set_exact(mu.v, U);
  reference_offset(ref.v, mv.v, mu.v, kPrec);
  const double careful = eigenzeit::clock_rate_offset(v, U);
  const double c2 = 299792458.0 * 299792458.0;
  const double naive = std::sqrt(1.0 - 2.0 * U / c2 - v * v / c2) - 1.0;
  const auto e = ez_test::measure<double>(careful, ref.v);
  const auto en = ez_test::measure<double>(naive, ref.v);
  std::printf("v = 1 m/s, U = 1e-3: careful %.17g (%.3f ulp), textbook %.17g (%.3g ulp)\n",
              careful, e.frac, naive, en.frac);
  CHECK(e.dist <= 1);
  CHECK(en.frac > 1e6);  // the loss the library exists to remove
  // Also at the tiniest normal scale: both terms near the bottom of the range.
  const double vt = 1e-140, Ut = 1e-270;
  mp mv2(kPrec), mu2(kPrec), ref2(kPrec);
  ez_test::set_exact(mv2.v, vt);
  ez_test::set_exact(mu2.v, Ut);
  reference_offset(ref2.v, mv2.v, mu2.v, kPrec);
  CHECK(ez_test::measure<double>(eigenzeit::clock_rate_offset(vt, Ut), ref2.v).dist <= 1);
}

TEST_CASE("velocity part against special relativity (speed.hpp and MPFR)") {
  // With U = 0 the model is d(tau)/dt = sqrt(1 - b) to second order in b = v^2/c^2:
  // 1 - sqrt(1 - b) = b/2 + b^2/8 + b^3/16 + ..., so the offset differs from
  // -dilation_fraction(v/c) by b^3/16 (common practice, no source: the binomial series).
  std::mt19937_64 rng(106);
  std::uniform_real_distribution<double> speed(1.0, 1e5);
  const long n = sample_count(20000);
  for (long i = 0; i < n; ++i) {
    const double v = speed(rng);
    const double beta = v / 299792458.0;
    const double sr = -eigenzeit::dilation_fraction(beta);
    const double model = eigenzeit::clock_rate_offset(v, 0.0);
    const double b = beta * beta;
    const double bound = b * b * b / 16 * 1.01 + 4 * std::numeric_limits<double>::epsilon() * std::fabs(sr);
    INFO("v = ", v);
    CHECK(std::fabs(model - sr) <= bound);
  }
}

TEST_CASE("outside check: a clock on the geoid runs at 1 - L_G against TCG") {
  // IERS Conventions (2010), ch. 10 and IAU 2000 Resolution B1.9: TT is the time of a clock on
  // the geoid, d(TT)/d(TCG) = 1 - L_G with L_G = W0/c^2 = 6.969290134e-10.  A clock at rest on
  // the rotating Earth at the equator moves at omega a_E and sits in the potential of the
  // J2 model at r = a_E; at the pole it is at rest at r = b = a_E (1 - f).  Omega, a_E, J2 and
  // W0: IERS Conventions (2010) table 1.1 (constants.hpp); 1/f = 298.25642 from memory of the
  // same table.  The J2 model leaves out J4 (~ -1.6e-6, from memory) and higher zonal terms,
  // which move the potential at the surface by a few 1e-6: hence the 5e-6 tolerance.
  using eigenzeit::constants::earth_equatorial_radius;
  using eigenzeit::constants::earth_rotation_rate;
  using eigenzeit::constants::L_G;
  const auto model = eigenzeit::j2_potential<double>::earth();
  const double a = earth_equatorial_radius<double>();
  const double v_eq = earth_rotation_rate<double>() * a;
  const double rate_eq = eigenzeit::clock_rate_offset(v_eq, model({a, 0.0, 0.0}));
  const double b = a * (1.0 - 1.0 / 298.25642);
  const double rate_pole = eigenzeit::clock_rate_offset(0.0, model({0.0, 0.0, b}));
  std::printf("geoid clock rate against TCG: equator %.10e, pole %.10e, -L_G %.10e\n", rate_eq,
              rate_pole, -L_G<double>());
  CHECK(std::fabs(rate_eq / -L_G<double>() - 1) < 5e-6);
  CHECK(std::fabs(rate_pole / -L_G<double>() - 1) < 5e-6);
  CHECK(std::fabs(rate_eq / rate_pole - 1) < 5e-6);
}

TEST_CASE("outside check: gravitational shift g h / c^2 near the ground") {
  // Common practice, no source: a clock raised by h near the ground gains g h / c^2 in rate,
  // 1.09e-16 per metre with standard gravity g_n = 9.80665 m/s^2 (the value of g_n is the
  // conventional one of the CGPM, quoted from memory).  Local g varies by ~0.5% with latitude
  // and the point-mass field has no rotation: 1% tolerance.
  const auto model = eigenzeit::point_mass_potential<double>::earth();
  const double r = 6371000.0;
  const double h = 1000.0;
  const double low = eigenzeit::clock_rate_offset(0.0, model({r, 0.0, 0.0}));
  const double high = eigenzeit::clock_rate_offset(0.0, model({r + h, 0.0, 0.0}));
  const double expected = 9.80665 * h / (299792458.0 * 299792458.0);
  std::printf("raised 1 km: rate gain %.6e, g_n h / c^2 = %.6e\n", high - low, expected);
  CHECK(std::fabs((high - low) / expected - 1) < 0.01);
}

TEST_CASE("monotonic: faster or deeper clocks run slower") {
  std::mt19937_64 rng(107);
  std::uniform_real_distribution<double> speed(0.0, 1e5), pot(0.0, 1e9);
  std::vector<double> vs(static_cast<std::size_t>(sample_count(20000)));
  for (double& x : vs) x = speed(rng);
  std::sort(vs.begin(), vs.end());
  const double U = pot(rng);
  long violations = 0;
  for (std::size_t i = 1; i < vs.size(); ++i)
    if (eigenzeit::clock_rate_offset(vs[i], U) > eigenzeit::clock_rate_offset(vs[i - 1], U)) ++violations;
  std::vector<double> us(vs.size());
  for (double& x : us) x = pot(rng);
  std::sort(us.begin(), us.end());
  const double v = speed(rng);
  for (std::size_t i = 1; i < us.size(); ++i)
    if (eigenzeit::clock_rate_offset(v, us[i]) > eigenzeit::clock_rate_offset(v, us[i - 1])) ++violations;
  CHECK(violations == 0);
}

TEST_CASE_TEMPLATE("special values", T, float, double, long double) {
  // At rest far from all masses: exactly +0.
  CHECK(eigenzeit::clock_rate_offset(T(0), T(0)) == 0);
  CHECK(!std::signbit(eigenzeit::clock_rate_offset(T(0), T(0))));
  CHECK(!std::signbit(eigenzeit::clock_rate_offset(-T(0), -T(0))));
  // Subnormal inputs are ordinary inputs: tiny non-positive results.
  const T sub = std::numeric_limits<T>::denorm_min();
  const T r1 = eigenzeit::clock_rate_offset(sub, sub);
  CHECK(r1 <= 0);
  CHECK(r1 > -std::numeric_limits<T>::min());
  // The largest admissible inputs: just below c and below c^2 give a finite offset or a
  // domain error for the combination, never a silent wrong sign.
  const T vmax = std::nextafter(T(299792458.0L), T(0));
  CHECK_THROWS_AS(eigenzeit::clock_rate_offset(vmax, T(8.9e16L)), std::domain_error);
  const T r2 = eigenzeit::clock_rate_offset(vmax, T(0));
  CHECK(r2 < 0);
  CHECK(r2 > -1);
}

TEST_CASE("argument types: integers promote to double, mixed types to the common type") {
  CHECK(std::is_same<decltype(eigenzeit::clock_rate_offset(0, 0)), double>::value);
  CHECK(std::is_same<decltype(eigenzeit::clock_rate_offset(1.0f, 2.0)), double>::value);
  CHECK(std::is_same<decltype(eigenzeit::clock_rate_offset(1.0f, 2.0f)), float>::value);
  CHECK(eigenzeit::clock_rate_offset(0, 62636856) == eigenzeit::clock_rate_offset(0.0, 62636856.0));
  CHECK(eigenzeit::clock_rate_offset(3874, 0) == eigenzeit::clock_rate_offset(3874.0, 0.0));
}


TEST_CASE("bad input: domain errors under every policy") {
  const double nan = std::numeric_limits<double>::quiet_NaN();
  const double inf = std::numeric_limits<double>::infinity();
  // Speed: negative, NaN, infinite, c and beyond (with the value as the message prints it).
  const std::pair<double, const char*> speeds[] = {{-1.0, "speed = -1 m/s"},
                                                   {-1e-300, "-1e-300"},
                                                   {nan, "nan"},
                                                   {inf, "inf"},
                                                   {299792458.0, "speed = 299792458 m/s"},
                                                   {3e8, "300000000"}};
  for (const auto& [v, text] : speeds)
    ez_test::check_all_policies("clock_rate_offset", text, [v = v](auto p) { return eigenzeit::clock_rate_offset(v, 1e7, p); });
  // Potential: negative (the wrong sign convention), NaN, infinite, at and beyond c^2
  // (89875517873681776 is the first double above c^2 = 89875517873681764).
  const std::pair<double, const char*> potentials[] = {{-62636856.0, "U = -62636856 m^2/s^2"},
                                                       {-1e-300, "-1e-300"},
                                                       {nan, "nan"},
                                                       {inf, "inf"},
                                                       {89875517873681776.0, "89875517873681776"},
                                                       {1e17, "1e+17"}};
  for (const auto& [U, text] : potentials)
    ez_test::check_all_policies("clock_rate_offset", text, [U = U](auto p) { return eigenzeit::clock_rate_offset(1000.0, U, p); });
  // A combination outside the weak-field model: d(tau)/dt would be <= 0.
  ez_test::check_all_policies("clock_rate_offset", "potential", [](auto p) {
    return eigenzeit::clock_rate_offset(0.999 * 299792458.0, 0.9 * 299792458.0 * 299792458.0, p);
  });
  ez_test::check_all_policies("clock_rate_offset", "-2.", [](auto p) {
    return eigenzeit::clock_rate_offset(0.999 * 299792458.0, 0.9 * 299792458.0 * 299792458.0, p);
  });
}
