// Tests of include/eigenzeit/version.hpp and include/eigenzeit/config.hpp: the version macros,
// the fast-fma flag, the host/device marker, and the floating-point environment that the
// compensated arithmetic relies on (no fast-math, IEEE formats, round to nearest, no excess
// precision).
//
// References: C++17 <cfloat> / C11 5.2.4.2.2 (FLT_EVAL_METHOD), <cfenv> (fegetround,
// FE_TONEAREST); the GCC and Clang manuals for the predefined macros __FAST_MATH__,
// __FINITE_MATH_ONLY__ and __FMA__ (-mfma) and C11 7.12 paragraph 7 for FP_FAST_FMA.
#include <doctest/doctest.h>

// version.hpp first: it must stand on its own.
#include <eigenzeit/version.hpp>

#include <eigenzeit/config.hpp>

#include <cfenv>
#include <cfloat>
#include <cmath>
#include <cstring>
#include <limits>
#include <string>

namespace {

#define EZ_TEST_STR2(x) #x
#define EZ_TEST_STR(x) EZ_TEST_STR2(x)

/// True if s is a decimal integer literal, optionally in parentheses: the form that the
/// top-level CMakeLists.txt reads with a regular expression.
bool plain_integer(const std::string& s) {
  std::string t = s;
  if (t.size() >= 2 && t.front() == '(' && t.back() == ')') t = t.substr(1, t.size() - 2);
  if (t.empty()) return false;
  for (char c : t)
    if (c < '0' || c > '9') return false;
  return true;
}

}  // namespace

// Usable in #if: each is an integer constant expression for the preprocessor.
#if !(EIGENZEIT_VERSION_MAJOR >= 0 && EIGENZEIT_VERSION_MINOR >= 0 && EIGENZEIT_VERSION_PATCH >= 0)
#error "version macros must be non-negative integers"
#endif
#if EIGENZEIT_VERSION != EIGENZEIT_VERSION_MAJOR * 10000 + EIGENZEIT_VERSION_MINOR * 100 + EIGENZEIT_VERSION_PATCH
#error "EIGENZEIT_VERSION must be major * 10000 + minor * 100 + patch"
#endif
#if EIGENZEIT_HAS_FAST_FMA != 0 && EIGENZEIT_HAS_FAST_FMA != 1
#error "EIGENZEIT_HAS_FAST_FMA must be 0 or 1"
#endif

TEST_CASE("version macros are integers forming EIGENZEIT_VERSION") {
  const int major = EIGENZEIT_VERSION_MAJOR;
  const int minor = EIGENZEIT_VERSION_MINOR;
  const int patch = EIGENZEIT_VERSION_PATCH;
  CHECK(major >= 0);
  // Two decimal digits each for minor and patch, or the encoding is ambiguous.
  CHECK(minor >= 0);
  CHECK(minor <= 99);
  CHECK(patch >= 0);
  CHECK(patch <= 99);
  const long version = EIGENZEIT_VERSION;
  CHECK(version == 10000L * major + 100L * minor + patch);
  // Decoding gives the parts back.
  CHECK(version / 10000 == major);
  CHECK(version / 100 % 100 == minor);
  CHECK(version % 100 == patch);
  // Plain literals, so that the build reads the same numbers as the compiler.
  CHECK(plain_integer(EZ_TEST_STR(EIGENZEIT_VERSION_MAJOR)));
  CHECK(plain_integer(EZ_TEST_STR(EIGENZEIT_VERSION_MINOR)));
  CHECK(plain_integer(EZ_TEST_STR(EIGENZEIT_VERSION_PATCH)));
}

TEST_CASE("EIGENZEIT_HAS_FAST_FMA is 0 or 1 and follows the target") {
  const int fast = EIGENZEIT_HAS_FAST_FMA;
  CHECK((fast == 0 || fast == 1));
  // A target with the FMA instructions (-mfma, __FMA__) or a library that says its fma is fast
  // (FP_FAST_FMA) has it; x86-64 without either has not.
#if defined(__FMA__) || defined(FP_FAST_FMA)
  CHECK(fast == 1);
#elif defined(__x86_64__) || defined(__i386__)
  CHECK(fast == 0);
#endif
  // Whatever the flag, std::fma rounds once: 1 + 2^-30 squared minus 1 keeps the 2^-60 term
  // that a separate multiply would round away.
  volatile double a = 1.0 + 0x1p-30;
  CHECK(std::fma(a, a, -1.0) == 0x1p-29 + 0x1p-60);
}

TEST_CASE("EIGENZEIT_HOST_DEVICE is empty outside CUDA and HIP") {
#if !defined(__CUDACC__) && !defined(__HIPCC__)
  CHECK(std::strlen(EZ_TEST_STR(EIGENZEIT_HOST_DEVICE)) == 0);
#endif
}

TEST_CASE("the test build is not a fast-math build") {
#if defined(__FAST_MATH__)
  constexpr bool fast_math = true;
#else
  constexpr bool fast_math = false;
#endif
#if defined(__FINITE_MATH_ONLY__) && __FINITE_MATH_ONLY__ > 0
  constexpr bool finite_math_only = true;
#else
  constexpr bool finite_math_only = false;
#endif
#if defined(EIGENZEIT_ALLOW_FAST_MATH)
  constexpr bool opted_out = true;
#else
  constexpr bool opted_out = false;
#endif
  CHECK_FALSE(fast_math);
  CHECK_FALSE(finite_math_only);
  CHECK_FALSE(opted_out);

  // The effects the guard protects against, observed: (a + b) - a recovers the rounding of
  // a + b only without reassociation, and NaN checks must survive.
  volatile double one = 1.0;
  volatile double tiny = 0x1p-60;
  const double a = one;
  const double b = tiny;
  CHECK((a + b) - a == 0.0);
  CHECK(b - ((a + b) - a) == b);
  volatile double zero = 0.0;
  const double nan = zero / zero;
  CHECK(std::isnan(nan));
  CHECK(nan != nan);
}

TEST_CASE("the floating-point environment the error-free transforms assume") {
  // IEEE 754 binary formats, round to nearest, and every operation rounded to its own type
  // (no x87-style excess precision, which would break two_sum and two_prod).
  CHECK(std::numeric_limits<float>::is_iec559);
  CHECK(std::numeric_limits<double>::is_iec559);
  CHECK(std::numeric_limits<double>::round_style == std::round_to_nearest);
  CHECK(std::fegetround() == FE_TONEAREST);
  CHECK(FLT_EVAL_METHOD == 0);
  // Round to nearest, ties to even, observed: 1 + 2^-53 is a tie between 1 and 1 + 2^-52.
  volatile double one = 1.0;
  CHECK(one + 0x1p-53 == 1.0);
  CHECK(one + 0x1.8p-53 == 1.0 + 0x1p-52);
  // Subnormals are kept, not flushed to zero (DESIGN: no flush to zero).
  volatile double m = std::numeric_limits<double>::min();
  CHECK(m / 2 > 0.0);
  CHECK(std::numeric_limits<double>::has_denorm == std::denorm_present);
}
