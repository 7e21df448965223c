// Test support: one invalid input through the three error policies.
#ifndef EIGENZEIT_TESTS_SUPPORT_POLICY_CHECKS_HPP
#define EIGENZEIT_TESTS_SUPPORT_POLICY_CHECKS_HPP

#include <doctest/doctest.h>

#include <cerrno>
#include <cmath>
#include <cstdio>
#include <stdexcept>
#include <string>

#include <eigenzeit/numeric/policy.hpp>

namespace ez_test {

/// call(policy) evaluates the routine on one invalid input.  throw_policy must throw a
/// std::domain_error whose message names `function` and contains `text` (the value as
/// printed); nan_policy must return NaN; errno_policy must return NaN and set errno = EDOM.
template <class F>
void check_all_policies(const char* function, const std::string& text, F call) {
  INFO(function, " bad input ", text);
  try {
    call(eigenzeit::throw_policy());
    FAIL_CHECK("no exception");
  } catch (const std::domain_error& e) {
    const std::string what = e.what();
    CHECK(what.find(function) != std::string::npos);
    CHECK(what.find(text) != std::string::npos);
  }
  using std::isnan;
  CHECK(isnan(call(eigenzeit::nan_policy())));
  errno = 0;
  CHECK(isnan(call(eigenzeit::errno_policy())));
  CHECK(errno == EDOM);
}

/// The same for a routine of one argument: call(bad, policy).  The message must contain the
/// value as Boost prints it (17 significant digits, "nan", "inf").
template <class F>
void check_all_policies(const char* function, double bad, F call) {
  std::string text;
  if (std::isnan(bad)) {
    text = "nan";
  } else if (std::isinf(bad)) {
    text = "inf";
  } else {
    char buf[64];
    std::snprintf(buf, sizeof buf, "%.17g", bad);
    text = buf;
  }
  check_all_policies(function, text, [&call, bad](auto pol) { return call(bad, pol); });
}

}  // namespace ez_test

#endif
