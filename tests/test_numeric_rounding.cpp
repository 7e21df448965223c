// Tests of include/eigenzeit/numeric/rounding.hpp: the rounding test of the fast path, the
// climb up the ladder, and its failure report.
#include <doctest/doctest.h>

#include <cerrno>
#include <cmath>
#include <limits>
#include <stdexcept>
#include <string>

#include <boost/math/policies/error_handling.hpp>

#include <eigenzeit/numeric/rounding.hpp>

namespace ez = eigenzeit;
namespace ezn = eigenzeit::numeric;

TEST_CASE("rounding_is_decided: the interval must stay inside one rounding interval") {
  const double u = std::ldexp(1.0, -53);  // half an ulp of 1 (upwards)
  // 1 + lo with lo well inside (-u/2, u): decided, with a small error bound.
  CHECK(ezn::rounding_is_decided(1.0, 0.25 * u, 0.25 * u));
  CHECK(ezn::rounding_is_decided(1.0, -0.2 * u, 0.2 * u));
  // The interval reaches past the midpoint above 1 (1 + u): open.
  CHECK_FALSE(ezn::rounding_is_decided(1.0, 0.75 * u, 0.5 * u));
  // Below 1 the spacing halves: the midpoint is 1 - u/2.
  CHECK_FALSE(ezn::rounding_is_decided(1.0, -0.4 * u, 0.2 * u));
  CHECK(ezn::rounding_is_decided(1.0, -0.2 * u, 0.2 * u));
  // Zero error: hi + lo itself rounds to hi (normalised pairs always do).
  CHECK(ezn::rounding_is_decided(3.0, 0.9 * 2 * u, 0.0));
}

TEST_CASE("try_decide: normalises, and refuses results near the subnormal range") {
  double out = 0;
  CHECK(ezn::try_decide(ezn::dd<double>{1.0, 1e-20}, 1e-30, out));
  CHECK(out == 1.0);
  // Unnormalised pair: 1 + 0.75 ulp rounds to the next double.
  const double ulp = std::ldexp(1.0, -52);
  CHECK(ezn::try_decide(ezn::dd<double>{1.0, 0.75 * ulp}, 1e-30, out));
  CHECK(out == 1.0 + ulp);
  // An exact midpoint with a nonzero bound cannot be decided.
  CHECK_FALSE(ezn::try_decide(ezn::dd<double>{1.0, 0.5 * ulp}, 1e-30, out));
  // Tiny results: left to the ladder, whose wider exponent range rounds subnormals right.
  CHECK_FALSE(ezn::try_decide(ezn::dd<double>{1e-300, 0.0}, 0.0, out));
}

TEST_CASE("climb_ladder: decides on the first rung that separates the candidates") {
  // A quantity whose exact value is 1 + 2^-53 + 2^-90: a double midpoint up to 2^-90.  Long
  // double (64 bits, trusted to 3 ulps) cannot tell; cpp_bin_float_50 can.
  const auto eval = [](auto tag) {
    using W = typename decltype(tag)::type;
    using std::ldexp;
    return W(1) + ldexp(W(1), -53) + ldexp(W(1), -90);
  };
  int rungs = 0;
  const double r = ezn::climb_ladder<double>(eval, "test", 0.0, ez::throw_policy(), &rungs);
  CHECK(r == 1.0 + std::ldexp(1.0, -52));
  CHECK(rungs == 2);
  // A value far from any midpoint is decided on the first rung.
  const auto easy = [](auto tag) {
    using W = typename decltype(tag)::type;
    return W(1) / W(3);
  };
  CHECK(ezn::climb_ladder<double>(easy, "test", 0.0, ez::throw_policy(), &rungs) == 1.0 / 3.0);
  CHECK(rungs == 1);
}

TEST_CASE("climb_ladder: an exact tie on every rung is taken as exact at the top, ties to even") {
  const auto midpoint = [](auto tag) {
    using W = typename decltype(tag)::type;
    using std::ldexp;
    return W(1) + ldexp(W(1), -53);  // exactly between 1 and 1 + 2^-52 at every precision
  };
  int rungs = 0;
  CHECK(ezn::climb_ladder<double>(midpoint, "f", 0.5, ez::throw_policy(), &rungs) == 1.0);
  CHECK(rungs == ezn::rungs_above<double>());
  const auto odd_midpoint = [](auto tag) {
    using W = typename decltype(tag)::type;
    using std::ldexp;
    return W(1) + 3 * ldexp(W(1), -53);  // between 1 + 2^-52 (odd) and 1 + 2^-51 (even)
  };
  CHECK(ezn::climb_ladder<double>(odd_midpoint, "f", 0.5, ez::throw_policy()) == 1.0 + std::ldexp(1.0, -51));
}

TEST_CASE("climb_ladder: undecided on every rung is an evaluation error, not a loop") {
  // Two ulps of each rung above a midpoint: always inside the rung's trusted interval, never
  // the exact tie.
  const auto near_midpoint = [](auto tag) {
    using W = typename decltype(tag)::type;
    using std::ldexp;
    return W(1) + ldexp(W(1), -53) + ldexp(W(2), 1 - std::numeric_limits<W>::digits);
  };
  int rungs = 0;
  try {
    (void)ezn::climb_ladder<double>(near_midpoint, "eigenzeit::test_routine<%1%>(%1%)", 0.5,
                                    ez::throw_policy(), &rungs);
    FAIL("no exception");
  } catch (const boost::math::evaluation_error& e) {
    const std::string what = e.what();
    CHECK(what.find("test_routine") != std::string::npos);
    CHECK(what.find("0.5") != std::string::npos);
    CHECK(what.find("widest") != std::string::npos);
  }
  CHECK(rungs == ezn::rungs_above<double>());
  CHECK(std::isnan(ezn::climb_ladder<double>(near_midpoint, "f", 0.5, ez::nan_policy())));
  errno = 0;
  CHECK(std::isnan(ezn::climb_ladder<double>(near_midpoint, "f", 0.5, ez::errno_policy())));
  CHECK(errno == EDOM);
}

TEST_CASE("the policy argument: correctly_rounded carries an error policy") {
  CHECK(ezn::is_correctly_rounded_v<ez::correctly_rounded_policy<>>);
  CHECK(ezn::is_correctly_rounded_v<std::decay_t<decltype(ez::correctly_rounded)>>);
  CHECK_FALSE(ezn::is_correctly_rounded_v<ez::throw_policy>);
  CHECK(std::is_same<std::decay_t<decltype(ezn::error_policy_of(ez::correctly_rounded_policy<ez::nan_policy>()))>,
                     ez::nan_policy>::value);
  CHECK(std::is_same<std::decay_t<decltype(ezn::error_policy_of(ez::errno_policy()))>, ez::errno_policy>::value);
}
