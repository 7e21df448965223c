// Tests of include/eigenzeit/numeric/wider.hpp: the first rung of the widening ladder.
#include <doctest/doctest.h>

#include <cmath>
#include <cstdio>
#include <limits>
#include <type_traits>

#include <eigenzeit/numeric/wider.hpp>
#include <eigenzeit/speed.hpp>

#include "support/reference.hpp"

namespace ezn = eigenzeit::numeric;
using ez_test::cpp50;
using ez_test::mp;

TEST_CASE("wider_t: built-in types keep their own functions; cpp_bin_float doubles its digits") {
  CHECK(std::is_same<ezn::wider_t<double>, double>::value);
  CHECK(std::is_same<ezn::wider_t<float>, float>::value);
  CHECK(std::is_same<ezn::wider_t<long double>, long double>::value);
  using W = ezn::wider_t<cpp50>;
  CHECK(std::numeric_limits<W>::digits >= 2 * std::numeric_limits<cpp50>::digits - 2);
  CHECK(std::is_same<ezn::wider_t<ez_test::mpfr100>, ez_test::mpfr100>::value);
}

TEST_CASE("exp through the wider rung keeps cpp_bin_float_50 within a few eps at large arguments") {
  // Boost 1.74's own exp for cpp_bin_float_50 loses accuracy roughly in proportion to the
  // argument (measured here first, as a fact about the dependency, not asserted); the wider
  // evaluation used by speed<T>::from_rapidity must stay within 2 eps against MPFR.
  double worst_own = 0, worst_wide = 0;
  for (int k = 1; k <= 60; ++k) {
    const cpp50 x = cpp50(k) * 11 + cpp50(1) / 7;  // up to ~660
    mp mx(1024), ref(1024);
    ez_test::set_exact(mx.v, x);
    mpfr_exp(ref.v, mx.v, MPFR_RNDN);
    using std::exp;
    const cpp50 own = exp(x);
    const cpp50 wide = cpp50(exp(ezn::wider_t<cpp50>(x)));
    worst_own = std::max(worst_own, ez_test::measure_eps(own, ref.v));
    const double e = ez_test::measure_eps(wide, ref.v);
    worst_wide = std::max(worst_wide, e);
    INFO("x = ", x.str(20));
    CHECK(e <= 2.0);
  }
  std::printf("cpp_bin_float_50 exp up to x = 660: own %.1f eps, through the wider rung %.2f eps\n",
              worst_own, worst_wide);
}

TEST_CASE("from_rapidity in cpp_bin_float_50 at large rapidity stays within 8 eps") {
  const cpp50 eta = cpp50(586) + cpp50(1) / 3;
  const auto s = eigenzeit::speed<cpp50>::from_rapidity(eta);
  mp mx(4096), my(64);
  ez_test::set_exact(mx.v, eta);
  mpfr_set_ui(my.v, 1, MPFR_RNDN);
  ez_test::reference ref(4096);
  ref.compute(ez_test::ctor::rapidity, mx.v, my.v);
  CHECK(ez_test::measure_eps(s.gamma(), ref.val[ez_test::v_gamma].v) <= 8.0);
  CHECK(ez_test::measure_eps(s.beta_deficit(), ref.val[ez_test::v_deficit].v) <= 8.0);
  CHECK(ez_test::measure_eps(s.rapidity(), ref.val[ez_test::v_rapidity].v) <= 8.0);
}
