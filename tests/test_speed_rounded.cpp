// Tests of the correctly rounded mode of include/eigenzeit/speed.hpp: the free functions with
// eigenzeit::correctly_rounded, rounded_speed<T> from every named constructor, and the error
// bounds of the fast paths that the mode relies on.  Reference: MPFR (tests/support/reference.hpp)
// evaluating the definition formulas on the exact input, rounded to nearest by MPFR itself.
#include <doctest/doctest.h>

#include <cerrno>
#include <cmath>
#include <cstdio>
#include <limits>
#include <random>
#include <stdexcept>

#include <eigenzeit/speed.hpp>

#include "support/reference.hpp"
#include "support/sampler.hpp"

namespace ez = eigenzeit;
using ez_test::ctor;
using ez_test::mp;

namespace {

template <class T>
ez::rounded_speed<T> construct_rounded(ctor c, T x, T y) {
  using S = ez::speed<T>;
  const auto& cr = ez::correctly_rounded;
  switch (c) {
    case ctor::beta: return S::from_beta(x, cr);
    case ctor::beta_deficit: return S::from_beta_deficit(x, cr);
    case ctor::gamma: return S::from_gamma(x, cr);
    case ctor::gamma_m1: return S::from_gamma_m1(x, cr);
    case ctor::rapidity: return S::from_rapidity(x, cr);
    case ctor::proper_speed: return S::from_proper_speed(x, cr);
    case ctor::kinetic_energy: return S::from_kinetic_energy(x, y, cr);
    case ctor::momentum: break;
  }
  return S::from_momentum(x, y, cr);
}

// Exact comparison with MPFR's correctly rounded value; both NaN-free here.  Counts, and
// prints the first few failures with their inputs.
struct cr_count {
  long n = 0, wrong = 0;
  void check(double got, double want, const char* what, long double x, long double y) {
    ++n;
    const bool same = got == want && std::signbit(got) == std::signbit(want);
    if (!same) {
      if (++wrong <= 5)
        std::printf("  NOT correctly rounded: %s input %.21Lg (mass %.21Lg): got %.17g, want %.17g\n",
                    what, x, y, got, want);
    }
  }
};

template <class T>
void sweep_views(long per_ctor, unsigned seed) {
  std::mt19937_64 rng(seed);
  ez_test::sampler<T> draw(rng);
  long total = 0, wrong = 0;
  for (int ci = 0; ci <= static_cast<int>(ctor::momentum); ++ci) {
    const ctor c = static_cast<ctor>(ci);
    cr_count count[ez_test::n_views];
    for (long i = 0; i < per_ctor; ++i) {
      T x, y;
      draw.draw(c, x, y);
      const ez_test::reference ref(c, x, y, std::numeric_limits<T>::digits);
      T got[ez_test::n_views];
      ez_test::views_of(construct_rounded(c, x, y), got);
      for (int v = 0; v < ez_test::n_views; ++v) {
        const T want = ez_test::round_to<T>(ref.val[v].v);
        if (std::isinf(want)) continue;  // beyond the largest finite value: not a result
        count[v].check(static_cast<double>(got[v]), static_cast<double>(want), ez_test::view_name(v), x, y);
      }
    }
    for (int v = 0; v < ez_test::n_views; ++v) {
      total += count[v].n;
      wrong += count[v].wrong;
    }
    std::printf("rounded_speed<%s>::%-20s %ld inputs x 8 views, not correctly rounded: %ld\n",
                ez_test::type_name<T>(), ez_test::ctor_name(c), per_ctor,
                count[0].wrong + count[1].wrong + count[2].wrong + count[3].wrong + count[4].wrong +
                    count[5].wrong + count[6].wrong + count[7].wrong);
  }
  CHECK(total > 0);
  CHECK(wrong == 0);
}

template <class T>
void sweep_free_functions(long n, unsigned seed) {
  std::mt19937_64 rng(seed);
  ez_test::sampler<T> draw(rng);
  cr_count count[5];
  const char* names[5] = {"lorentz_factor", "lorentz_factor_m1", "proper_speed", "dilation_fraction", "rapidity"};
  for (long i = 0; i < n; ++i) {
    T a, unused;
    draw.draw(ctor::beta, a, unused);
    const T beta = (rng() & 1) ? -a : a;
    const ez_test::reference ref(ctor::beta, beta, 1, std::numeric_limits<T>::digits);
    const auto& cr = ez::correctly_rounded;
    const T got[5] = {ez::lorentz_factor(beta, cr), ez::lorentz_factor_m1(beta, cr),
                      ez::proper_speed(beta, cr), ez::dilation_fraction(beta, cr),
                      ez::rapidity(beta, cr)};
    const int views[5] = {ez_test::v_gamma, ez_test::v_gamma_m1, ez_test::v_proper_speed,
                          ez_test::v_dilation, ez_test::v_rapidity};
    for (int f = 0; f < 5; ++f) {
      const T want = ez_test::round_to<T>(ref.val[views[f]].v);
      count[f].check(static_cast<double>(got[f]), static_cast<double>(want), names[f], beta, 1);
    }
  }
  for (int f = 0; f < 5; ++f) {
    std::printf("%s(beta, correctly_rounded) <%s>: %ld inputs, not correctly rounded: %ld\n", names[f],
                ez_test::type_name<T>(), count[f].n, count[f].wrong);
    CHECK(count[f].n == n);
    CHECK(count[f].wrong == 0);
  }
}

// The fast path's premise: hi + lo lies within the stated bound of the exact value.  Measured
// against MPFR as (|hi + lo - exact| / bound); the bounds claim at least 4x margin over the
// error analysis, so the measured ratio must stay below 1/4.  Also reports how often the
// fast path decides the rounding on its own.
template <class T>
void check_bounds(long n, unsigned seed) {
  using Parts = T (*)(T, ez::numeric::dd<T>&);
  struct item {
    const char* name;
    Parts parts;
    int view;
  };
  const item items[5] = {{"gamma", ez::detail::gamma_parts<T>, ez_test::v_gamma},
                         {"gamma - 1", ez::detail::gamma_m1_parts<T>, ez_test::v_gamma_m1},
                         {"1/gamma", ez::detail::inv_gamma_parts<T>, ez_test::v_inv_gamma},
                         {"1 - 1/gamma", ez::detail::dilation_parts<T>, ez_test::v_dilation},
                         {"beta gamma", ez::detail::proper_speed_parts<T>, ez_test::v_proper_speed}};
  std::mt19937_64 rng(seed);
  ez_test::sampler<T> draw(rng);
  double worst[5] = {0, 0, 0, 0, 0};
  long decided[5] = {0, 0, 0, 0, 0}, counted[5] = {0, 0, 0, 0, 0};
  for (long i = 0; i < n; ++i) {
    T a, unused;
    draw.draw(ctor::beta, a, unused);
    const ez_test::reference ref(ctor::beta, a, 1, std::numeric_limits<T>::digits);
    for (int k = 0; k < 5; ++k) {
      ez::numeric::dd<T> p;
      const T err = items[k].parts(a, p);
      if (!(std::abs(p.hi) > ez::numeric::rescale_threshold<T>())) continue;  // ladder territory
      ++counted[k];
      T out;
      if (ez::numeric::try_decide(p, err, out)) ++decided[k];
      mp sum(ref.prec + 256), diff(ref.prec + 256);
      ez_test::set_exact(sum.v, p.hi);
      mpfr_add_d(sum.v, sum.v, static_cast<double>(p.lo), MPFR_RNDN);  // exact: p.lo is a T
      mpfr_sub(diff.v, sum.v, ref.val[items[k].view].v, MPFR_RNDN);
      mpfr_abs(diff.v, diff.v, MPFR_RNDN);
      mpfr_div_d(diff.v, diff.v, static_cast<double>(err), MPFR_RNDN);
      const double ratio = mpfr_get_d(diff.v, MPFR_RNDU);
      if (ratio > worst[k]) worst[k] = ratio;
    }
  }
  for (int k = 0; k < 5; ++k) {
    std::printf("fast path of %-12s <%s>: max |error| / bound = %.3g over %ld inputs; decided alone: %.6f%%\n",
                items[k].name, ez_test::type_name<T>(), worst[k], counted[k],
                counted[k] ? 100.0 * static_cast<double>(decided[k]) / static_cast<double>(counted[k]) : 0.0);
    CHECK(counted[k] > n / 2);
    CHECK(worst[k] < 0.25);
    // How often the fast path decides alone is a matter of cost, not correctness: float's
    // u^2 is only 2^-48, so its series bound (8 u x) leaves more roundings open.
    CHECK(decided[k] > counted[k] * (std::numeric_limits<T>::digits > 24 ? 99 : 95) / 100);
  }
}

long scaled(long full) { return ez_test::quick() ? full / 50 : full; }

}  // namespace

TEST_CASE("correctly rounded free functions: 10^6 signed inputs against MPFR (double)") {
  sweep_free_functions<double>(scaled(1000000), 11);
}

TEST_CASE("correctly rounded free functions: float") {
  sweep_free_functions<float>(scaled(200000), 12);
}

TEST_CASE("rounded_speed<double>: every view of every constructor, 10^6 inputs per view") {
  sweep_views<double>(scaled(125000), 13);
}

TEST_CASE("rounded_speed<float>: every view of every constructor, 10^6 inputs per view") {
  sweep_views<float>(scaled(125000), 14);
}

TEST_CASE("rounded_speed<long double>: every view of every constructor") {
  // Not required by the contract (long double's next rung is the slow cpp_bin_float_50),
  // but the mode is generic: a smaller sweep.
  sweep_views<long double>(scaled(2000), 15);
}

TEST_CASE("the fast paths' error bounds hold, with margin, against MPFR") {
  check_bounds<double>(scaled(200000), 16);
  check_bounds<float>(scaled(100000), 17);
}

TEST_CASE("hard inputs: near rounding boundaries, exact results, ends of the domain") {
  const auto& cr = ez::correctly_rounded;
  // Zero gives the exact 1 and 0 with the sign of beta kept; 0.6 (not exactly 3/5) and its
  // neighbours against MPFR.
  for (double b : {0.6, std::nextafter(0.6, 0.0), std::nextafter(0.6, 1.0)}) {
    const ez_test::reference ref(ctor::beta, b, 1, 53);
    CHECK(ez::lorentz_factor(b, cr) == ez_test::round_to<double>(ref.val[ez_test::v_gamma].v));
    CHECK(ez::lorentz_factor_m1(b, cr) == ez_test::round_to<double>(ref.val[ez_test::v_gamma_m1].v));
    CHECK(ez::proper_speed(-b, cr) == -ez_test::round_to<double>(ref.val[ez_test::v_proper_speed].v));
    CHECK(ez::dilation_fraction(b, cr) == ez_test::round_to<double>(ref.val[ez_test::v_dilation].v));
    CHECK(ez::rapidity(b, cr) == ez_test::round_to<double>(ref.val[ez_test::v_rapidity].v));
  }
  CHECK(std::signbit(ez::proper_speed(-0.0, cr)));
  CHECK(std::signbit(ez::rapidity(-0.0, cr)));
  CHECK(ez::lorentz_factor(0.0, cr) == 1.0);
  // Subnormal and tiny: gamma - 1 = beta^2 / 2 rounds to 0 or a subnormal, correctly.
  for (double b : {4.9e-324, 1e-310, 1e-160, 1.5e-154, 2.2250738585072014e-308}) {
    const ez_test::reference ref(ctor::beta, b, 1, 53);
    CHECK(ez::lorentz_factor_m1(b, cr) == ez_test::round_to<double>(ref.val[ez_test::v_gamma_m1].v));
    CHECK(ez::dilation_fraction(b, cr) == ez_test::round_to<double>(ref.val[ez_test::v_dilation].v));
    CHECK(ez::proper_speed(b, cr) == b);
    CHECK(ez::rapidity(b, cr) == b);
  }
  // Largest beta below 1.
  const double top = std::nextafter(1.0, 0.0);
  const ez_test::reference ref(ctor::beta, top, 1, 53);
  CHECK(ez::lorentz_factor(top, cr) == ez_test::round_to<double>(ref.val[ez_test::v_gamma].v));
  CHECK(ez::rapidity(top, cr) == ez_test::round_to<double>(ref.val[ez_test::v_rapidity].v));
}

TEST_CASE("bad input in the correctly rounded mode: the error policy inside it reports it") {
  const auto& cr = ez::correctly_rounded;
  CHECK_THROWS_AS(ez::lorentz_factor(1.0, cr), std::domain_error);
  CHECK_THROWS_AS(ez::rapidity(std::nan(""), cr), std::domain_error);
  CHECK_THROWS_AS(ez::speed<double>::from_gamma(0.5, cr), std::domain_error);
  const ez::correctly_rounded_policy<ez::nan_policy> quiet;
  CHECK(std::isnan(ez::lorentz_factor_m1(-2.0, quiet)));
  CHECK(std::isnan(ez::speed<double>::from_beta(1.5, quiet).gamma()));
  CHECK(std::isnan(ez::speed<double>::from_beta(1.5, quiet).rapidity()));
  errno = 0;
  const ez::correctly_rounded_policy<ez::errno_policy> with_errno;
  CHECK(std::isnan(ez::dilation_fraction(3.0, with_errno)));
  CHECK(errno == EDOM);
  // The message names the function and the value.
  try {
    ez::proper_speed(1.25, cr);
    FAIL("no exception");
  } catch (const std::domain_error& e) {
    const std::string what = e.what();
    CHECK(what.find("proper_speed") != std::string::npos);
    CHECK(what.find("1.25") != std::string::npos);
  }
}

TEST_CASE("rounded_speed keeps its origin and the default-mode speed") {
  const auto s = ez::speed<double>::from_kinetic_energy(3.0, 7.0, ez::correctly_rounded);
  CHECK(s.origin() == ez::speed_origin::kinetic_energy);
  CHECK(s.input() == 3.0);
  CHECK(s.mass() == 7.0);
  CHECK(s.value().gamma() == ez::speed<double>::from_kinetic_energy(3.0, 7.0).gamma());
  CHECK(s.gamma_m1() == 3.0 / 7.0);  // the correctly rounded quotient
}
