// Tests of include/eigenzeit/numeric/series.hpp: sum_series (stopping rule, term count, the
// cap and its report) and series_cap_v (enough terms below the series threshold).
//
// References: the closed form of the geometric series, sum_{k>=0} x^k = 1 / (1 - x); the exact
// sum of the terms actually produced, computed in MPFR; the error bound of recursive summation,
// |computed - exact| <= (n - 1) u sum |t_k| to first order with u = eps / 2 (N. J. Higham,
// Accuracy and Stability of Numerical Algorithms, 2nd ed., SIAM 2002, section 4.2).
#include <doctest/doctest.h>

#include <mpfr.h>

#include <cmath>
#include <limits>
#include <type_traits>
#include <vector>

#include <boost/multiprecision/cpp_bin_float.hpp>

#include <eigenzeit/numeric/series.hpp>
#include <eigenzeit/numeric/traits.hpp>

#include "support/reference.hpp"

namespace ezn = eigenzeit::numeric;

namespace {

using cpp50 = boost::multiprecision::cpp_bin_float_50;

using ez_test::mp;  // RAII holder of one mpfr_t (tests/support/reference.hpp)

void set_exact(mpfr_t r, float x) { REQUIRE(mpfr_set_flt(r, x, MPFR_RNDN) == 0); }
void set_exact(mpfr_t r, double x) { REQUIRE(mpfr_set_d(r, x, MPFR_RNDN) == 0); }
void set_exact(mpfr_t r, long double x) { REQUIRE(mpfr_set_ld(r, x, MPFR_RNDN) == 0); }

/// Terms x^0, x^1, x^2, ... computed by repeated multiplication; remembers every term it gave.
template <class T>
struct geometric {
  T x;
  T term;
  int calls = 0;
  std::vector<T> given;
  explicit geometric(T ratio) : x(ratio), term(1) {}
  T operator()() {
    ++calls;
    const T t = term;
    term *= x;
    given.push_back(t);
    return t;
  }
};

}  // namespace

TEST_CASE_TEMPLATE("sum_series: geometric series with ratio 1/2, exact in binary", T, float, double,
                   long double) {
  // Terms 2^-k and partial sums 2 - 2^-k are exact.  The rule stops at the first k with
  // 2^-k <= eps (2 - 2^-k); with eps = 2^(1-p) that is k = p - 1, after p terms, and the sum
  // is 2 - 2^(1-p) = 2 - eps.
  const T eps = std::numeric_limits<T>::epsilon();
  const int p = std::numeric_limits<T>::digits;
  geometric<T> g(T(0.5));
  const ezn::series_result<T> r = ezn::sum_series(g, eps, 1000);
  CHECK(r.converged);
  CHECK(r.terms == p);
  CHECK(g.calls == p);
  CHECK(r.sum == T(2) - eps);
}

TEST_CASE_TEMPLATE("sum_series: geometric series with an inexact ratio, against MPFR", T, float, double,
                   long double) {
  using L = std::numeric_limits<T>;
  const T eps = L::epsilon();
  const T ratios[] = {T(0.1), T(-0.1), T(0.3), T(-0.7), T(1) / T(3), T(0.01)};
  const mpfr_prec_t prec = 1024;
  for (const T& x : ratios) {
    INFO("ratio " << x);
    geometric<T> g(x);
    const ezn::series_result<T> r = ezn::sum_series(g, eps, 10000);
    REQUIRE(r.converged);
    CHECK(r.terms == g.calls);
    REQUIRE(static_cast<int>(g.given.size()) == r.terms);

    // The stopping rule, replayed on the terms given: the last term is the first that is
    // within eps of the running sum (magnitudes).
    mp sum(prec), abs_sum(prec), t(prec), lim(prec), epsm(prec), run(prec);
    set_exact(epsm.v, eps);
    mpfr_set_ui(sum.v, 0, MPFR_RNDN);
    mpfr_set_ui(abs_sum.v, 0, MPFR_RNDN);
    T running = 0;
    for (int k = 0; k < r.terms; ++k) {
      const T tk = g.given[static_cast<std::size_t>(k)];
      running += tk;  // the recursive sum in T, the same order
      set_exact(t.v, tk);
      mpfr_add(sum.v, sum.v, t.v, MPFR_RNDN);  // exact at 1024 bits for these ranges
      mpfr_abs(t.v, t.v, MPFR_RNDN);
      mpfr_add(abs_sum.v, abs_sum.v, t.v, MPFR_RNDN);
      using std::abs;
      const bool small = abs(tk) <= eps * abs(running);
      if (k + 1 < r.terms) CHECK_FALSE(small);
      else CHECK(small);
    }
    // The result is the recursive sum of those terms: Higham's first-order bound
    // (n - 1) u sum |t_k|, taken here as n eps sum |t_k| (a factor 2 for the higher orders).
    set_exact(run.v, r.sum);
    mpfr_sub(run.v, run.v, sum.v, MPFR_RNDN);
    mpfr_abs(run.v, run.v, MPFR_RNDN);
    mpfr_mul(lim.v, abs_sum.v, epsm.v, MPFR_RNDN);
    mpfr_mul_ui(lim.v, lim.v, static_cast<unsigned long>(r.terms), MPFR_RNDN);
    CHECK(mpfr_lessequal_p(run.v, lim.v));

    // And it is close to the infinite sum 1 / (1 - x) of the exact ratio.  Error sources,
    // relative to |1 / (1 - x)| and in units of eps, with a = |x|: the summation (n / (1 - a)
    // times the ratio below), the roundings of the terms (term k carries k roundings: at most
    // a / (1 - a)^2 in all), the tail left after the stop (below a / (1 - a)), all scaled by
    // |1 - x| / (1 - a) to be relative to the closed form.
    mp inf_sum(prec), xx(prec);
    set_exact(xx.v, x);
    mpfr_ui_sub(inf_sum.v, 1, xx.v, MPFR_RNDN);
    mpfr_ui_div(inf_sum.v, 1, inf_sum.v, MPFR_RNDN);
    set_exact(run.v, r.sum);
    mpfr_sub(run.v, run.v, inf_sum.v, MPFR_RNDN);
    mpfr_div(run.v, run.v, inf_sum.v, MPFR_RNDN);
    mpfr_abs(run.v, run.v, MPFR_RNDN);
    mpfr_div(run.v, run.v, epsm.v, MPFR_RNDN);
    const double rel_in_eps = mpfr_get_d(run.v, MPFR_RNDN);
    const double xa = std::fabs(static_cast<double>(x));
    const double scale = std::fabs(1.0 - static_cast<double>(x)) / (1.0 - xa);
    const double bound = scale * (r.terms + xa / (1.0 - xa) + 1.0 / (1.0 - xa));
    INFO("error " << rel_in_eps << " eps, bound " << bound << " eps");
    CHECK(rel_in_eps <= bound);
  }
}

TEST_CASE_TEMPLATE("sum_series: reports failure when the cap is reached", T, float, double, long double) {
  const T eps = std::numeric_limits<T>::epsilon();
  SUBCASE("a convergent series cut short") {
    // Ratio 1/2 needs p terms (test above); with a cap of 10 the sum is 2 - 2^-9, exactly.
    geometric<T> g(T(0.5));
    const ezn::series_result<T> r = ezn::sum_series(g, eps, 10);
    CHECK_FALSE(r.converged);
    CHECK(r.terms == 10);
    CHECK(g.calls == 10);
    CHECK(r.sum == T(2) - T(1) / T(512));
  }
  SUBCASE("a divergent series") {
    geometric<T> g(T(1));  // 1 + 1 + 1 + ...
    const ezn::series_result<T> r = ezn::sum_series(g, eps, 37);
    CHECK_FALSE(r.converged);
    CHECK(r.terms == 37);
    CHECK(r.sum == T(37));
  }
  SUBCASE("a cap of zero adds nothing") {
    geometric<T> g(T(0.5));
    const ezn::series_result<T> r = ezn::sum_series(g, eps, 0);
    CHECK_FALSE(r.converged);
    CHECK(r.terms == 0);
    CHECK(g.calls == 0);
    CHECK(r.sum == T(0));
  }
  SUBCASE("the cap equal to the terms needed still converges") {
    geometric<T> g(T(0.5));
    const int p = std::numeric_limits<T>::digits;
    const ezn::series_result<T> r = ezn::sum_series(g, eps, p);
    CHECK(r.converged);
    CHECK(r.terms == p);
    geometric<T> g2(T(0.5));
    const ezn::series_result<T> r2 = ezn::sum_series(g2, eps, p - 1);
    CHECK_FALSE(r2.converged);
    CHECK(r2.terms == p - 1);
  }
}

TEST_CASE("sum_series: a lambda as the term source, tolerance deduces the type") {
  int calls = 0;
  double term = 1.0;
  auto next = [&]() {
    ++calls;
    const double t = term;
    term /= 4.0;
    return t;
  };
  const auto r = ezn::sum_series(next, 1e-3, 50);
  static_assert(std::is_same<decltype(r.sum), double>::value,
                "sum_series<double> from a double tolerance");
  // Terms 4^-k; stops at the first k with 4^-k <= 1e-3 * (4/3)(1 - 4^-(k+1)): k = 5 (1/1024).
  CHECK(r.converged);
  CHECK(r.terms == 6);
  CHECK(calls == 6);
  CHECK(r.sum == 1.0 + 0.25 + 0.0625 + 0.015625 + 0.00390625 + 0.0009765625);
}

TEST_CASE("sum_series: a zero term with zero tolerance ends the sum") {
  // |0| <= 0 * |sum|: a series whose terms reach exactly zero converges even with tolerance 0.
  int k = 0;
  auto next = [&]() {
    const double t = k < 3 ? 3.0 - k : 0.0;
    ++k;
    return t;
  };
  const auto r = ezn::sum_series(next, 0.0, 100);
  CHECK(r.converged);
  CHECK(r.terms == 4);  // 3, 2, 1, 0
  CHECK(r.sum == 6.0);
}

TEST_CASE_TEMPLATE("series_cap_v suffices below small_square_threshold", T, float, double, long double, cpp50) {
  // For |x| < 2^-k (k = series_exponent_v) each term shrinks by 2^-k; the header says
  // digits / k + 2 terms always suffice and the cap is twice that.  Checked with the worst
  // ratio, just below the threshold, of either sign, with tolerance eps.
  using L = std::numeric_limits<T>;
  const T eps = L::epsilon();
  const T t = ezn::small_square_threshold<T>();
  const int k = ezn::series_exponent_v<T>;
  const int needed = L::digits / k + 2;
  CHECK(ezn::series_cap_v<T> >= needed);
  const T ratios[] = {t * (T(1) - eps), -t * (T(1) - eps), t / T(3)};
  for (const T& x : ratios) {
    INFO("ratio " << x);
    geometric<T> g(x);
    const ezn::series_result<T> r = ezn::sum_series(g, eps, ezn::series_cap_v<T>);
    CHECK(r.converged);
    CHECK(r.terms <= needed);
    // Independent count: the sum stops at the first n with |x|^n <= eps |S_n|, after n + 1
    // terms, and 1 / (1 + |x|) <= |S_n| <= 1 / (1 - |x|); one term of slack for rounding.
    using std::abs;
    using std::log;
    const T a = abs(x);
    const double n_lo = std::ceil(static_cast<double>(log(eps / (T(1) - a)) / log(a)));
    const double n_hi = std::ceil(static_cast<double>(log(eps / (T(1) + a)) / log(a)));
    CHECK(r.terms >= static_cast<int>(n_lo));
    CHECK(r.terms <= static_cast<int>(n_hi) + 2);
  }
}
