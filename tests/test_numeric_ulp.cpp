// Tests of include/eigenzeit/numeric/ulp.hpp: ulp_distance on neighbours, equal values, signed
// zeros, the subnormal range, the ends of the finite range, NaN and infinities.
//
// The outside references: std::nextafter (C++ standard library) for the neighbours of the
// built-in types; for cpp_bin_float_50, neighbours built here from frexp and an exact power of
// two (one unit in the last place of a p-bit significand); and counts of representable values
// derived from the IEEE 754-2008 binary formats (section 3.4: 2^(p-1) significands per binade,
// 2^(p-1) - 1 subnormals; the x87 80-bit format stores p = 64 bits with an explicit leading bit,
// Intel 64 and IA-32 Architectures Software Developer's Manual, vol. 1, section 4.2.2).
#include <doctest/doctest.h>

#include <cmath>
#include <cstdint>
#include <cstdlib>
#include <limits>
#include <random>
#include <type_traits>
#include <vector>

#include <boost/multiprecision/cpp_bin_float.hpp>

#include <eigenzeit/numeric/ulp.hpp>

using eigenzeit::numeric::ulp_distance;

namespace {

using cpp50 = boost::multiprecision::cpp_bin_float_50;

constexpr std::int64_t far = std::numeric_limits<std::int64_t>::max();

// Builds with AddressSanitizer (CI pairs it with UndefinedBehaviorSanitizer and stops at the
// first report): calls with undefined behaviour in the header under test are skipped there.
#if defined(__SANITIZE_ADDRESS__)
#define EZ_TEST_SANITIZED 1
#elif defined(__has_feature)
#if __has_feature(address_sanitizer) || __has_feature(undefined_behavior_sanitizer)
#define EZ_TEST_SANITIZED 1
#endif
#endif
#ifndef EZ_TEST_SANITIZED
#define EZ_TEST_SANITIZED 0
#endif

bool quick() {
  const char* q = std::getenv("EIGENZEIT_QUICK");
  return q && *q && *q != '0';
}

/// Smallest positive value: denorm_min where T has subnormals, else min.
template <class T>
T smallest_positive() {
  if (std::numeric_limits<T>::has_denorm == std::denorm_present)
    return std::numeric_limits<T>::denorm_min();
  return (std::numeric_limits<T>::min)();
}

/// Next value of T above x (x finite, x < max).  Built-in types: std::nextafter.
/// cpp_bin_float_50 (no subnormals): with |x| = f 2^e, f in [1/2, 1) from frexp, the
/// neighbour has significand f +- 2^-p (p = digits), or (1 - 2^-p) 2^(e-1) when the step goes
/// from a power of two towards zero; zero and -min() step to min() and zero.
template <class T>
T next_up(const T& x) {
  if constexpr (std::is_floating_point<T>::value) {
    return std::nextafter(x, std::numeric_limits<T>::infinity());
  } else {
    using std::abs;
    using std::frexp;
    using std::ldexp;
    const int p = std::numeric_limits<T>::digits;
    if (x == 0) return (std::numeric_limits<T>::min)();
    if (x == -(std::numeric_limits<T>::min)()) return T(0);
    int e = 0;
    const T f = frexp(abs(x), &e);
    const T u = ldexp(T(1), -p);
    if (x > 0) return ldexp(T(f + u), e);
    if (f == T(0.5)) return -ldexp(T(T(1) - u), e - 1);
    return -ldexp(T(f - u), e);
  }
}

template <class T>
T next_down(const T& x) {
  return -next_up<T>(-x);
}

template <class T>
T walk(T x, int steps) {
  for (int i = 0; i < steps; ++i) x = next_up(x);
  return x;
}

/// A random value of T: random sign, a significand with all p bits random, exponent uniform
/// in [lo, hi].
template <class T>
T random_value(std::mt19937_64& rng, int lo, int hi) {
  using std::ldexp;
  const int p = std::numeric_limits<T>::digits;
  std::uniform_int_distribution<int> ex(lo, hi);
  T m = 0;
  int have = 0;
  while (have < p) {
    int take = (p - have < 32) ? p - have : 32;
    auto bits = static_cast<unsigned long>(rng() >> (64 - take));
    if (have == 0) bits |= 1UL << (take - 1);  // leading bit set: full precision
    m = ldexp(m, take) + T(bits);
    have += take;
  }
  T v = ldexp(m, ex(rng) - p);
  return (rng() & 1) ? -v : v;
}

template <class T>
std::vector<T> sample_points() {
  using L = std::numeric_limits<T>;
  std::vector<T> v = {T(1), T(-1), T(0.1), T(-3.75), T(2), T(0.5), (L::min)(), -(L::min)(),
                      smallest_positive<T>(), -smallest_positive<T>(), (L::max)() / 4,
                      -(L::max)() / 4, L::epsilon(), T(1) + L::epsilon()};
  if (L::has_denorm == std::denorm_present) {
    v.push_back((L::min)() / 2);
    v.push_back(next_down((L::min)()));
    v.push_back(-(L::min)() / 3);
  }
  std::mt19937_64 rng(20240611);
  for (int i = 0; i < 40; ++i) v.push_back(random_value<T>(rng, L::min_exponent, L::max_exponent - 1));
  return v;
}

}  // namespace

#define EZ_ULP_TYPES float, double, long double, cpp50

TEST_CASE_TEMPLATE("ulp_distance: neighbours are 1 apart, in either order", T, EZ_ULP_TYPES) {
  for (const T& x : sample_points<T>()) {
    const T up = next_up(x);
    const T down = next_down(x);
    INFO("x = " << x);
    CHECK(ulp_distance<T>(x, up) == 1);
    CHECK(ulp_distance<T>(up, x) == 1);
    CHECK(ulp_distance<T>(x, down) == 1);
    CHECK(ulp_distance<T>(down, up) == 2);
  }
}

TEST_CASE_TEMPLATE("ulp_distance: equal values are 0 apart, signed zeros are equal", T, EZ_ULP_TYPES) {
  for (const T& x : sample_points<T>()) {
    INFO("x = " << x);
    CHECK(ulp_distance<T>(x, x) == 0);
  }
  const T pz = T(0);
  const T nz = -T(0);
  using std::signbit;
  REQUIRE(signbit(nz));
  CHECK(ulp_distance<T>(pz, nz) == 0);
  CHECK(ulp_distance<T>(nz, pz) == 0);
  CHECK(ulp_distance<T>(nz, nz) == 0);
  const T inf = std::numeric_limits<T>::infinity();
  CHECK(ulp_distance<T>(inf, inf) == 0);
  CHECK(ulp_distance<T>(-inf, -inf) == 0);
}

TEST_CASE_TEMPLATE("ulp_distance: across zero", T, EZ_ULP_TYPES) {
  // +0 and -0 are one value: the smallest positive value is one step from either zero, and the
  // smallest positive and smallest negative values are two steps apart.
  const T s = smallest_positive<T>();
  REQUIRE(s > 0);
  CHECK(ulp_distance<T>(s, -s) == 2);
  CHECK(ulp_distance<T>(-s, s) == 2);
  CHECK(ulp_distance<T>(s, T(0)) == 1);
  CHECK(ulp_distance<T>(-T(0), s) == 1);
  CHECK(ulp_distance<T>(-s, T(0)) == 1);
  CHECK(ulp_distance<T>(next_up(s), -s) == 3);
}

TEST_CASE_TEMPLATE("ulp_distance: NaN against a number is the largest int64", T, EZ_ULP_TYPES) {
  const T nan = std::numeric_limits<T>::quiet_NaN();
  for (const T& x : sample_points<T>()) {
    INFO("x = " << x);
    CHECK(ulp_distance<T>(nan, x) == far);
    CHECK(ulp_distance<T>(x, nan) == far);
  }
  CHECK(ulp_distance<T>(nan, T(0)) == far);
  CHECK(ulp_distance<T>(nan, std::numeric_limits<T>::infinity()) == far);
  // NaN against NaN is 0: the accuracy helpers of the suite count "expected NaN, got NaN" as a
  // match through this. (The header comment says "NaN against anything" gives the largest
  // int64; the code deliberately treats two NaNs as equal.)
  CHECK(ulp_distance<T>(nan, nan) == 0);
}

TEST_CASE_TEMPLATE("ulp_distance: the largest finite values and infinity", T, EZ_ULP_TYPES) {
  const T big = (std::numeric_limits<T>::max)();
  const T below = next_down(big);
  REQUIRE(below < big);
  CHECK(ulp_distance<T>(big, below) == 1);
  CHECK(ulp_distance<T>(below, big) == 1);
  CHECK(ulp_distance<T>(-big, -below) == 1);
  CHECK(ulp_distance<T>(big, next_down(below)) == 2);
  const T inf = std::numeric_limits<T>::infinity();
  CHECK(ulp_distance<T>(big, inf) == far);
  CHECK(ulp_distance<T>(inf, T(1)) == far);
  CHECK(ulp_distance<T>(-inf, inf) == far);
  CHECK(ulp_distance<T>(-inf, -big) == far);
}

TEST_CASE_TEMPLATE("ulp_distance: k steps of next_up are k apart", T, EZ_ULP_TYPES) {
  // Random starts over the whole exponent range (subnormals included where T has them), walks
  // of up to 300 steps, some of them across zero and across binade boundaries.
  using L = std::numeric_limits<T>;
  std::mt19937_64 rng(77);
  std::uniform_int_distribution<int> steps(0, 300);
  const int n = std::is_floating_point<T>::value ? (quick() ? 300 : 3000) : (quick() ? 30 : 300);
  std::vector<T> starts;
  for (int i = 0; i < n; ++i) {
    int lo = L::min_exponent - (L::has_denorm == std::denorm_present ? L::digits - 1 : 0);
    starts.push_back(random_value<T>(rng, lo, L::max_exponent - 1));
  }
  // Starts that walk across zero, and just below a power of two.
  T s = -smallest_positive<T>();
  for (int i = 0; i < 20; ++i) s = next_down(s);
  starts.push_back(s);
  starts.push_back(next_down(next_down(T(1))));
  starts.push_back(-T(2));
  starts.push_back(next_down(next_down((L::min)())));
  long failures = 0;
  for (const T& x : starts) {
    const int k = steps(rng);
    const T y = walk(x, k);
    if (ulp_distance<T>(x, y) != k || ulp_distance<T>(y, x) != k) {
      if (failures++ < 5) {
        CHECK_MESSAGE(ulp_distance<T>(x, y) == k, "x = " << x << ", steps " << k);
      }
    }
  }
  CHECK(failures == 0);
}

TEST_CASE_TEMPLATE("ulp_distance: opposite signs, counted from the binary format", T, float, double) {
  // Values of (0, x] for x = 1.5 (a binade [1, 2) half way): 2^(p-1) - 1 subnormals, one
  // binade of 2^(p-1) values for each exponent from min_exponent - 1 to -1, then the 2^(p-2) + 1
  // values 1, ..., 1.5.  The distance from -x to x is twice that count.
  using L = std::numeric_limits<T>;
  const std::int64_t per_binade = std::int64_t(1) << (L::digits - 1);
  const std::int64_t binades = -(L::min_exponent - 1);  // exponents min_exponent-1 .. -1
  const std::int64_t count = (per_binade - 1) + binades * per_binade + per_binade / 2 + 1;
  CHECK(ulp_distance<T>(T(1.5), -T(1.5)) == 2 * count);
  CHECK(ulp_distance<T>(-T(1.5), T(1.5)) == 2 * count);
  CHECK(ulp_distance<T>(T(1.5), T(0)) == count);
}

TEST_CASE("ulp_distance<float>: the whole finite range fits in int64") {
  // Positive finite floats: 2^23 - 1 subnormals and 254 binades of 2^23 normal values.
  const std::int64_t n = (std::int64_t(1) << 23) - 1 + 254 * (std::int64_t(1) << 23);
  const float big = (std::numeric_limits<float>::max)();
  CHECK(ulp_distance<float>(big, -big) == 2 * n);
  CHECK(ulp_distance<float>(-big, big) == 2 * n);
  CHECK(ulp_distance<float>(big, 0.0f) == n);
}

// Regression test (fixed): for double, ulp_distance once subtracted two signed 64-bit codes;
// with opposite signs and an exact count above 2^63 - 1 that overflowed (undefined behaviour),
// so ulp_distance(2.0, -2.0) returned -2^63 and a result of the wrong sign passed dist <= 1.  The exact count from 2.0 to -2.0 is 2 * 2^62 = 2^63 (2^52 - 1 subnormals, 1023
// binades of 2^52 values in (0, 2), and 2 itself), which int64 cannot hold: the result must be
// the saturated largest int64, as for the other types.
TEST_CASE("ulp_distance<double>: distances beyond int64 saturate") {
  volatile double two = 2.0;  // keeps the compiler from folding the undefined operation
  CHECK(ulp_distance<double>(two, -two) == far);
  CHECK(ulp_distance<double>(-two, two) == far);
  CHECK(ulp_distance<double>(1e300, -1e300) == far);
  const double big = (std::numeric_limits<double>::max)();
  CHECK(ulp_distance<double>(big, -big) == far);
}

TEST_CASE("ulp_distance<long double>: the end of the subnormal range") {
  // x87 extended: subnormal significands 1 .. 2^63 - 1, so min() is 2^63 steps above zero,
  // more than int64 holds: the result saturates.
  if (std::numeric_limits<long double>::digits != 64) {
    MESSAGE("long double is not the x87 80-bit format here; skipped");
    return;
  }
  const long double lmin = (std::numeric_limits<long double>::min)();
  CHECK(ulp_distance<long double>(lmin, 0.0L) == far);
  CHECK(ulp_distance<long double>(lmin / 4, 0.0L) == (std::int64_t(1) << 61));
  CHECK(ulp_distance<long double>(lmin / 8, -lmin / 8) == (std::int64_t(1) << 61));
}

// Regression test (fixed): the generic path once returns the largest int64 for every distance above
// 2^62 - 1, although distances up to 2^63 - 1 fit.  min()/2 is the subnormal with significand
// 2^62, exactly 2^62 steps above zero; ulp_distance<long double>(LDBL_MIN / 2, 0) returns
// 2^63 - 1 instead of 2^62.
TEST_CASE("ulp_distance<long double>: distances between 2^62 and 2^63 - 1") {
  if (std::numeric_limits<long double>::digits != 64) {
    MESSAGE("long double is not the x87 80-bit format here; skipped");
    return;
  }
  const long double lmin = (std::numeric_limits<long double>::min)();
  CHECK(ulp_distance<long double>(lmin / 2, 0.0L) == (std::int64_t(1) << 62));
}

TEST_CASE("ulp_distance<cpp_bin_float_50>: no subnormals, wide range saturates") {
  const cpp50 m = (std::numeric_limits<cpp50>::min)();
  CHECK(ulp_distance<cpp50>(m, cpp50(0)) == 1);
  CHECK(ulp_distance<cpp50>(cpp50(1), -cpp50(1)) == far);
  // One binade: 2^167 values in [1, 2), far more than int64 holds.
  CHECK(ulp_distance<cpp50>(cpp50(1), cpp50(2)) == far);
  // 2^40 ulps of 1 above 1: exact.
  const cpp50 step = ldexp(cpp50(1), 1 - std::numeric_limits<cpp50>::digits);
  CHECK(ulp_distance<cpp50>(cpp50(1), cpp50(1) + ldexp(step, 40)) == (std::int64_t(1) << 40));
}

// Regression test (fixed; the overflow is in Boost.Math): the generic path once handed any pair to
// boost::math::float_distance, which for cpp_bin_float_50 (binary exponents up to about 2^31)
// overflows an int when the exponents are far apart (or, across zero, when one value is
// above about 2^336, since the distance is then counted from min()):
// ulp_distance<cpp_bin_float_50>(max, -max)
// evaluates expon2 - expon - 1 = 2147483312 - (-2147483311) - 1 in int at
// boost/math/special_functions/next.hpp:505 (Boost 1.74), undefined behaviour that
// UndefinedBehaviorSanitizer reports.  Any exponent gap above ~64 already means a distance
// beyond int64, so the header can return the saturated value before calling Boost.  Skipped
// under the sanitizers, which stop at the overflow.
TEST_CASE("ulp_distance<cpp_bin_float_50>: the ends of the range saturate") {
  const cpp50 big = (std::numeric_limits<cpp50>::max)();
  CHECK(ulp_distance<cpp50>(big, -big) == far);
  CHECK(ulp_distance<cpp50>(-big, (std::numeric_limits<cpp50>::min)()) == far);
  CHECK(ulp_distance<cpp50>(ldexp(cpp50(1), 1000000), -ldexp(cpp50(1), -1000000)) == far);
}
