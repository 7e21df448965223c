// Tests of include/eigenzeit/numeric/ladder.hpp: the rungs of the widening ladder and the
// correctly rounded conversion back down it, against MPFR's own rounding (mpfr_get_d).
#include <doctest/doctest.h>

#include <cmath>
#include <cstdio>
#include <limits>
#include <random>
#include <type_traits>

#include <boost/multiprecision/cpp_bin_float.hpp>

#include <eigenzeit/numeric/ladder.hpp>

#include "support/reference.hpp"

namespace ezn = eigenzeit::numeric;
namespace bmp = boost::multiprecision;
using ez_test::cpp50;
using ez_test::mp;

namespace {
// A user type the ladder does not know.
struct user_real {
  double v;
};
}  // namespace

TEST_CASE("the rungs: float -> double -> long double -> cpp_bin_float_50 -> ... -> none") {
  CHECK(std::is_same<ezn::next_rung_t<float>, double>::value);
  if (std::numeric_limits<long double>::digits > 53) {
    CHECK(std::is_same<ezn::next_rung_t<double>, long double>::value);
  }
  CHECK(std::is_same<ezn::next_rung_t<long double>, cpp50>::value);
  CHECK(std::is_same<ezn::next_rung_t<cpp50>, bmp::cpp_bin_float_100>::value);
  // Each rung is strictly wider than the one below it, and the ladder is finite.
  CHECK(std::numeric_limits<ezn::next_rung_t<bmp::cpp_bin_float_100>>::digits >
        std::numeric_limits<bmp::cpp_bin_float_100>::digits);
  CHECK(ezn::rungs_above<float>() >= 5);
  CHECK(ezn::rungs_above<double>() == ezn::rungs_above<float>() - 1);
  // The top: no rung above ladder_max_digits10 decimal digits; unknown types have none.
  using top = bmp::number<bmp::backends::cpp_bin_float<ezn::ladder_max_digits10>>;
  CHECK(std::is_void<ezn::next_rung_t<top>>::value);
  CHECK(!ezn::has_next_rung_v<top>);
  CHECK(!ezn::has_next_rung_v<user_real>);
  CHECK(!ezn::has_next_rung_v<ez_test::mpfr100>);
  std::printf("rungs above float: %d, above double: %d\n", ezn::rungs_above<float>(), ezn::rungs_above<double>());
}

TEST_CASE("round_to: built-in conversions round to nearest (IEEE 754), checked against MPFR") {
  std::mt19937_64 rng(5);
  std::uniform_int_distribution<int> ex(-1070, 1020);
  long n = 0, wrong = 0;
  for (int i = 0; i < 20000; ++i) {
    const long double x = std::ldexp(std::uniform_real_distribution<long double>(1, 2)(rng), ex(rng));
    mp r(64);
    mpfr_set_ld(r.v, x, MPFR_RNDN);
    const double want = mpfr_get_d(r.v, MPFR_RNDN);
    ++n;
    if (ezn::round_to<double>(x) != want) ++wrong;
  }
  CHECK(n == 20000);
  CHECK(wrong == 0);
}

TEST_CASE("round_to from cpp_bin_float_50: nearest, ties to even, subnormals, overflow") {
  std::mt19937_64 rng(6);
  long wrong = 0, n = 0;
  // Random values with bits far below double's precision.
  for (int i = 0; i < 20000; ++i) {
    const int e = static_cast<int>(rng() % 2000) - 1000;
    cpp50 x = ldexp(cpp50(1) + cpp50(static_cast<double>(rng() >> 11)) / 9007199254740992.0 +
                        cpp50(static_cast<double>(rng() >> 11)) / cpp50("8.1129638414606681695789005144064e31"),
                    e);
    if (rng() & 1) x = -x;
    mp r(200);
    ez_test::set_exact(r.v, x);
    const double want = mpfr_get_d(r.v, MPFR_RNDN);
    ++n;
    if (ezn::round_to<double>(x) != want) ++wrong;
  }
  CHECK(n == 20000);
  CHECK(wrong == 0);

  // Exact midpoints: 1 + 2^-53 (between 1 and 1 + 2^-52) goes to 1 (even); 1 + 3 * 2^-53 goes
  // to 1 + 2^-51 (even); the same one place up and down.
  const cpp50 half_ulp = ldexp(cpp50(1), -53);
  CHECK(ezn::round_to<double>(cpp50(1) + half_ulp) == 1.0);
  CHECK(ezn::round_to<double>(cpp50(1) + 3 * half_ulp) == 1.0 + std::ldexp(1.0, -51));
  CHECK(ezn::round_to<double>(cpp50(1) + half_ulp + ldexp(cpp50(1), -150)) == 1.0 + std::ldexp(1.0, -52));
  CHECK(ezn::round_to<double>(-(cpp50(1) + 3 * half_ulp)) == -(1.0 + std::ldexp(1.0, -51)));
  // Just below 1: spacing 2^-53, midpoint 1 - 2^-54 goes to 1 (even).
  CHECK(ezn::round_to<double>(cpp50(1) - ldexp(cpp50(1), -54)) == 1.0);
  CHECK(ezn::round_to<double>(cpp50(1) - ldexp(cpp50(1), -54) - ldexp(cpp50(1), -120)) ==
        std::nextafter(1.0, 0.0));
  // Subnormal results: spacing denorm_min; half of it goes to 0, 1.5 of it to 2 (even).
  const cpp50 dmin = ldexp(cpp50(1), -1074);
  CHECK(ezn::round_to<double>(dmin / 2) == 0.0);
  CHECK(ezn::round_to<double>(dmin * 3 / 2) == 2 * std::numeric_limits<double>::denorm_min());
  CHECK(ezn::round_to<double>(dmin * 5 / 4) == std::numeric_limits<double>::denorm_min());
  CHECK(ezn::round_to<double>(ldexp(cpp50(3), -1075)) == 2 * std::numeric_limits<double>::denorm_min());
  // Overflow: above max + half an ulp is infinity, just below it is max.
  const cpp50 max = cpp50(std::numeric_limits<double>::max());
  const cpp50 half_top = ldexp(cpp50(1), 1023 - 53);
  CHECK(ezn::round_to<double>(max + half_top / 2) == std::numeric_limits<double>::max());
  CHECK(std::isinf(ezn::round_to<double>(max + half_top)));
  CHECK(std::isinf(ezn::round_to<double>(-(max * 2))));
  // float as the target.
  CHECK(ezn::round_to<float>(cpp50(1) + ldexp(cpp50(1), -24)) == 1.0f);
  CHECK(ezn::round_to<float>(cpp50(1) + ldexp(cpp50(1), -24) + ldexp(cpp50(1), -60)) ==
        1.0f + std::ldexp(1.0f, -23));
}
