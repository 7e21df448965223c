// Tests of include/eigenzeit/numeric/traits.hpp: promote_t, pow2, the series threshold and its
// exponent, and the rescale threshold, for float, double, long double, cpp_bin_float_50 and a
// 100-digit MPFR type.
//
// References: MPFR (exact powers of two with mpfr_set_ui_2exp, exact comparisons); the
// significand sizes of IEEE 754-2008 binary32 and binary64 (p = 24 and 53, table 3.5) and of the
// x87 extended format (p = 64, Intel 64 and IA-32 Architectures Software Developer's Manual,
// vol. 1, section 4.2); the correctly rounded square root of IEEE 754-2008 (section 5.4.1).
#include <doctest/doctest.h>

#include <mpfr.h>

#include <cmath>
#include <cstdlib>
#include <limits>
#include <random>
#include <string>
#include <type_traits>

#include <boost/multiprecision/cpp_bin_float.hpp>
#include <boost/multiprecision/mpfr.hpp>

#include <eigenzeit/numeric/traits.hpp>

#include "support/reference.hpp"

namespace ezn = eigenzeit::numeric;

namespace {

using cpp50 = boost::multiprecision::cpp_bin_float_50;
using mpfr100 = boost::multiprecision::number<boost::multiprecision::mpfr_float_backend<100>>;

using ez_test::mp;  // RAII holder of one mpfr_t (tests/support/reference.hpp)

using ez_test::set_exact_checked;

using ez_test::type_name;

/// A random value in [1, 2) with all p bits of the significand random.
template <class T>
T random_significand(std::mt19937_64& rng) {
  const int p = std::numeric_limits<T>::digits;
  T m = 1;
  for (int have = 1; have < p;) {
    const int take = (p - have < 32) ? p - have : 32;
    m = std::ldexp(m, take) + T(static_cast<unsigned long>(rng() >> (64 - take)));
    have += take;
  }
  return std::ldexp(m, 1 - p);
}

bool quick() {
  const char* q = std::getenv("EIGENZEIT_QUICK");
  return q && *q && *q != '0';
}

}  // namespace

// ---- promote_t ----------------------------------------------------------------------------

TEST_CASE("promote_t: integers become double, real types stay") {
  // As <cmath> does for integer arguments (C++17 [cmath.syn] paragraph 2).
  CHECK(std::is_same<ezn::promote_t<int>, double>::value);
  CHECK(std::is_same<ezn::promote_t<long>, double>::value);
  CHECK(std::is_same<ezn::promote_t<unsigned long long>, double>::value);
  CHECK(std::is_same<ezn::promote_t<short>, double>::value);
  CHECK(std::is_same<ezn::promote_t<char>, double>::value);
  CHECK(std::is_same<ezn::promote_t<float>, float>::value);
  CHECK(std::is_same<ezn::promote_t<double>, double>::value);
  CHECK(std::is_same<ezn::promote_t<long double>, long double>::value);
  CHECK(std::is_same<ezn::promote_t<cpp50>, cpp50>::value);
  CHECK(std::is_same<ezn::promote_t<mpfr100>, mpfr100>::value);
  // std::sqrt's own promotion agrees for int.
  CHECK(std::is_same<decltype(std::sqrt(2)), ezn::promote_t<int>>::value);
}

TEST_CASE("is_builtin_float_v and digits_v") {
  CHECK(ezn::is_builtin_float_v<float>);
  CHECK(ezn::is_builtin_float_v<double>);
  CHECK(ezn::is_builtin_float_v<long double>);
  CHECK_FALSE(ezn::is_builtin_float_v<cpp50>);
  CHECK_FALSE(ezn::is_builtin_float_v<mpfr100>);
  CHECK_FALSE(ezn::is_builtin_float_v<int>);
  // IEEE 754 binary32 and binary64 significands.
  CHECK(ezn::digits_v<float> == 24);
  CHECK(ezn::digits_v<double> == 53);
  // cpp_bin_float_50 and the 100-digit MPFR type hold at least 50 and 100 decimal digits:
  // ceil(50 log2 10) = 167 and ceil(100 log2 10) = 333 bits.
  CHECK(ezn::digits_v<cpp50> >= 167);
  CHECK(ezn::digits_v<mpfr100> >= 333);
}

TEST_CASE("wider_t: the built-in types and unknown types map to themselves") {
  // The primary template in traits.hpp: built-in types keep their own std:: functions, and a
  // type with no specialisation gets no wider rung.
  CHECK(std::is_same<ezn::wider_t<float>, float>::value);
  CHECK(std::is_same<ezn::wider_t<double>, double>::value);
  CHECK(std::is_same<ezn::wider_t<long double>, long double>::value);
  CHECK(std::is_same<ezn::wider_t<mpfr100>, mpfr100>::value);
}

// ---- pow2 ---------------------------------------------------------------------------------

TEST_CASE_TEMPLATE("pow2 is exact over the whole exponent range", T, float, double, long double) {
  using L = std::numeric_limits<T>;
  // From the smallest subnormal 2^(min_exponent - digits) to the largest power 2^(max_exponent - 1).
  const int lo = L::min_exponent - L::digits;
  const int hi = L::max_exponent - 1;
  mp want(64), got(64);
  int bad = 0, first_bad = 0;
  for (int e = lo; e <= hi; ++e) {
    mpfr_set_ui_2exp(want.v, 1, e, MPFR_RNDN);
    const T p = ezn::pow2<T>(e);
    if (!set_exact_checked(got.v, p) || !mpfr_equal_p(want.v, got.v)) {
      if (bad++ == 0) first_bad = e;
    }
  }
  INFO(type_name<T>() << ": first wrong exponent " << first_bad);
  CHECK(bad == 0);
  CHECK(ezn::pow2<T>(lo) == L::denorm_min());
  CHECK(ezn::pow2<T>(L::min_exponent - 1) == (L::min)());
  CHECK(ezn::pow2<T>(0) == T(1));
  CHECK(ezn::pow2<T>(1 - L::digits) == L::epsilon());
  // One past the top overflows; half the smallest subnormal is a tie that rounds to even, 0.
  CHECK(ezn::pow2<T>(hi + 1) == L::infinity());
  CHECK(ezn::pow2<T>(lo - 1) == T(0));
}

TEST_CASE_TEMPLATE("pow2 is exact for multiprecision types", T, cpp50, mpfr100) {
  using L = std::numeric_limits<T>;
  mp want(64), got(L::digits + 64);
  std::mt19937_64 rng(5);
  std::uniform_int_distribution<int> any(-100000, 100000);
  int bad = 0;
  long first_bad = 0;
  auto check_one = [&](int e) {
    mpfr_set_ui_2exp(want.v, 1, e, MPFR_RNDN);
    const T p = ezn::pow2<T>(e);
    if (!set_exact_checked(got.v, p) || !mpfr_equal_p(want.v, got.v)) {
      if (bad++ == 0) first_bad = e;
    }
  };
  for (int e = -2000; e <= 2000; ++e) check_one(e);
  for (int i = 0; i < 2000; ++i) check_one(any(rng));
  INFO(type_name<T>() << ": first wrong exponent " << first_bad);
  CHECK(bad == 0);
  CHECK(ezn::pow2<T>(1 - L::digits) == L::epsilon());
  using std::frexp;
  int e = 0;
  const T f = frexp(ezn::pow2<T>(-123456), &e);
  CHECK(f == T(0.5));
  CHECK(e == -123455);
}

// ---- the series threshold -----------------------------------------------------------------

TEST_CASE("series_exponent_v for the built-in types") {
  // The exponent k is the smallest integer with 2^-k < eps^(1/3), eps = 2^(1 - p): 3k > p - 1.
  //   float    p = 24: 3k > 23 -> k = 8
  //   double   p = 53: 3k > 52 -> k = 18
  //   x87 long double p = 64: 3k > 63 -> k = 22
  CHECK(ezn::series_exponent_v<float> == 8);
  CHECK(ezn::series_exponent_v<double> == 18);
  if (std::numeric_limits<long double>::digits == 64) {
    CHECK(ezn::series_exponent_v<long double> == 22);
  }
  CHECK(ezn::small_square_threshold<float>() == 0.00390625f);  // 2^-8
  CHECK(ezn::small_square_threshold<double>() == 0x1p-18);
  if (std::numeric_limits<long double>::digits == 64) {
    CHECK(ezn::small_square_threshold<long double>() == 0x1p-22L);
  }
}

TEST_CASE_TEMPLATE("small_square_threshold: a power of two near eps^(1/3), fourth power below eps/16", T,
                   float, double, long double, cpp50, mpfr100) {
  using L = std::numeric_limits<T>;
  const int k = ezn::series_exponent_v<T>;
  const T t = ezn::small_square_threshold<T>();
  const mpfr_prec_t prec = 4 * L::digits + 64;
  mp tt(prec), eps(prec), x(prec), y(prec);
  REQUIRE(set_exact_checked(tt.v, t));
  REQUIRE(set_exact_checked(eps.v, T(L::epsilon())));
  INFO(type_name<T>() << ": digits " << L::digits << ", k " << k);

  // Exactly 2^-k.
  mpfr_set_ui_2exp(x.v, 1, -k, MPFR_RNDN);
  CHECK(mpfr_equal_p(tt.v, x.v));

  // The claim in the header: t^4 < eps / 16, so 4 terms of a series in x < t leave a
  // remainder far below one ulp.
  mpfr_pow_ui(x.v, tt.v, 4, MPFR_RNDN);  // exact: a power of two
  mpfr_div_2ui(y.v, eps.v, 4, MPFR_RNDN);
  CHECK(mpfr_less_p(x.v, y.v));

  // t < eps^(1/3) <= 2 t: the crossover sits at the cube root of eps, as the comment says,
  // and k is the smallest exponent with that property.
  mpfr_pow_ui(x.v, tt.v, 3, MPFR_RNDN);
  CHECK(mpfr_less_p(x.v, eps.v));
  mpfr_mul_2ui(y.v, x.v, 3, MPFR_RNDN);  // (2t)^3
  CHECK(mpfr_greaterequal_p(y.v, eps.v));
}

// ---- the rescale threshold ----------------------------------------------------------------

TEST_CASE_TEMPLATE("rescale_threshold is positive, finite and below 1", T, float, double, long double,
                   cpp50, mpfr100) {
  using std::isfinite;
  const T r = ezn::rescale_threshold<T>();
  INFO(type_name<T>());
  CHECK(r > 0);
  CHECK(isfinite(r));
  CHECK(r < T(1));
  CHECK(r > (std::numeric_limits<T>::min)());
}

TEST_CASE_TEMPLATE("rescale_threshold: sqrt residuals above it are normal numbers", T, float, double,
                   long double) {
  // The claim in the header: for q >= rescale_threshold and s = RN(sqrt(q)), the residual
  // q - s^2 is zero or a normal number.  Checked on q in [r, 2^40 r] with random significands,
  // the residual computed exactly in MPFR.
  using L = std::numeric_limits<T>;
  const T r = ezn::rescale_threshold<T>();
  const int n = quick() ? 2000 : 20000;
  std::mt19937_64 rng(11);
  std::uniform_int_distribution<int> ex(0, 40);
  mp qq(4 * L::digits), ss(4 * L::digits), res(4 * L::digits), lmin(4 * L::digits);
  REQUIRE(set_exact_checked(lmin.v, (L::min)()));
  int subnormal = 0;
  T worst_q = 0;
  for (int i = 0; i < n; ++i) {
    T q = std::ldexp(random_significand<T>(rng), ex(rng)) * r;  // r is a power of two: exact
    if (i == 0) q = r;
    const T s = std::sqrt(q);
    set_exact_checked(qq.v, q);
    set_exact_checked(ss.v, s);
    mpfr_sqr(res.v, ss.v, MPFR_RNDN);        // exact at 4p bits
    mpfr_sub(res.v, qq.v, res.v, MPFR_RNDN);  // exact: q and s^2 are close
    mpfr_abs(res.v, res.v, MPFR_RNDN);
    if (!mpfr_zero_p(res.v) && mpfr_less_p(res.v, lmin.v)) {
      if (subnormal++ == 0) worst_q = q;
    }
  }
  INFO(type_name<T>() << ": first q with a subnormal residual " << worst_q);
  CHECK(subnormal == 0);

  // Control: near min / eps = r eps (residuals of size eps q ~ min), many residuals are
  // subnormal, so the check above can fail.
  int low_subnormal = 0;
  for (int i = 0; i < 2000; ++i) {
    const T q = std::ldexp(random_significand<T>(rng), -2 + (i % 2)) * (r * L::epsilon());
    const T s = std::sqrt(q);
    set_exact_checked(qq.v, q);
    set_exact_checked(ss.v, s);
    mpfr_sqr(res.v, ss.v, MPFR_RNDN);
    mpfr_sub(res.v, qq.v, res.v, MPFR_RNDN);
    mpfr_abs(res.v, res.v, MPFR_RNDN);
    if (!mpfr_zero_p(res.v) && mpfr_less_p(res.v, lmin.v)) ++low_subnormal;
  }
  CHECK(low_subnormal > 0);
}
