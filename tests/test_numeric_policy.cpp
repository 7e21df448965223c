// Tests of include/eigenzeit/numeric/policy.hpp: the three error policies (throw, NaN, errno)
// and numeric::domain_error, which reports an invalid input through them.
//
// References: the C++17 standard library (std::domain_error, errno and EDOM from <cerrno>,
// std::strtof / strtod / strtold to read the printed value back) and Boost.Math's documented
// error-handling behaviours (Boost.Math, "Error Handling Policies": throw_on_error throws
// std::domain_error, ignore_error returns a quiet NaN, errno_on_error sets errno to EDOM and
// returns a quiet NaN).
#include <doctest/doctest.h>

#include <cerrno>
#include <cmath>
#include <cstdlib>
#include <limits>
#include <stdexcept>
#include <string>
#include <type_traits>

#include <boost/math/special_functions/acosh.hpp>
#include <boost/multiprecision/cpp_bin_float.hpp>

#include <eigenzeit/numeric/policy.hpp>

namespace ezn = eigenzeit::numeric;

namespace {

using cpp50 = boost::multiprecision::cpp_bin_float_50;

/// what() of the exception that domain_error<T> throws under throw_policy ("" if none).
template <class T>
std::string thrown_message(const char* function, const char* message, const T& value) {
  try {
    (void)ezn::domain_error<T>(function, message, value, eigenzeit::throw_policy());
  } catch (const std::domain_error& e) {
    return e.what();
  }
  return "";
}

/// The number printed after "x = " in a message built from "x = %1% is bad".
std::string printed_value(const std::string& what) {
  const std::string head = "x = ";
  const std::string tail = " is bad";
  const auto b = what.find(head);
  const auto e = what.find(tail);
  if (b == std::string::npos || e == std::string::npos || e < b + head.size()) return "";
  return what.substr(b + head.size(), e - b - head.size());
}

template <class T>
T parse(const std::string& s) {
  if constexpr (std::is_same<T, float>::value) return std::strtof(s.c_str(), nullptr);
  else if constexpr (std::is_same<T, double>::value) return std::strtod(s.c_str(), nullptr);
  else if constexpr (std::is_same<T, long double>::value) return std::strtold(s.c_str(), nullptr);
  else return T(s);
}

bool contains(const std::string& s, const std::string& part) { return s.find(part) != std::string::npos; }

}  // namespace

TEST_CASE("throw_policy: std::domain_error naming the function, the type and the value") {
  std::string what;
  bool thrown = false;
  try {
    (void)ezn::domain_error<double>("f<%1%>(%1%)", "x = %1% is bad", 2.5, eigenzeit::throw_policy());
  } catch (const std::domain_error& e) {
    thrown = true;
    what = e.what();
  }
  REQUIRE(thrown);
  INFO("what(): " << what);
  CHECK(contains(what, "f<double>"));
  CHECK(contains(what, "f<double>(double)"));  // every %1% in the function is replaced
  CHECK(contains(what, "2.5"));
  CHECK(contains(what, "is bad"));
  CHECK_FALSE(contains(what, "%1%"));

  CHECK_THROWS_AS((void)ezn::domain_error<double>("f", "x = %1%", 1.0, eigenzeit::throw_policy()),
                  std::domain_error);
}

TEST_CASE_TEMPLATE("throw_policy: the type name and the value for each built-in type", T, float, double,
                   long double) {
  const std::string what = thrown_message<T>("g<%1%>", "x = %1% is bad", T(-0.75));
  INFO("what(): " << what);
  const std::string name = std::is_same<T, float>::value    ? "g<float>"
                           : std::is_same<T, double>::value ? "g<double>"
                                                            : "g<long double>";
  CHECK(contains(what, name));
  CHECK(contains(what, "-0.75"));
}

TEST_CASE_TEMPLATE("throw_policy: the value is printed to full precision (reads back exactly)", T, float,
                   double, long double, cpp50) {
  // Values with long binary expansions: a decimal printed with too few digits reads back as a
  // different number.
  const T values[] = {T(1) / T(3), T(0.1), -T(2) / T(7), std::numeric_limits<T>::epsilon() * T(3) / T(7),
                      T(1) + std::numeric_limits<T>::epsilon(), (std::numeric_limits<T>::max)() / T(3),
                      (std::numeric_limits<T>::min)() * T(5) / T(3)};
  for (const T& v : values) {
    const std::string what = thrown_message<T>("h", "x = %1% is bad", v);
    const std::string printed = printed_value(what);
    INFO("what(): " << what);
    REQUIRE_FALSE(printed.empty());
    CHECK(parse<T>(printed) == v);
  }
}

TEST_CASE("throw_policy: a NaN input is reported as such") {
  const std::string what = thrown_message<double>("k", "x = %1% is bad",
                                                  std::numeric_limits<double>::quiet_NaN());
  INFO("what(): " << what);
  CHECK(contains(what, "k"));
  CHECK((contains(what, "nan") || contains(what, "NaN") || contains(what, "NAN")));
}

TEST_CASE_TEMPLATE("nan_policy: a quiet NaN, no exception, errno untouched", T, float, double, long double,
                   cpp50) {
  using std::isnan;
  errno = 0;
  T r = T(0);
  CHECK_NOTHROW(r = ezn::domain_error<T>("f<%1%>(%1%)", "x = %1% is bad", T(2.5), eigenzeit::nan_policy()));
  CHECK(isnan(r));
  CHECK(errno == 0);
}

TEST_CASE_TEMPLATE("errno_policy: a quiet NaN and errno = EDOM", T, float, double, long double, cpp50) {
  using std::isnan;
  errno = 0;
  T r = T(0);
  CHECK_NOTHROW(r = ezn::domain_error<T>("f<%1%>(%1%)", "x = %1% is bad", T(2.5), eigenzeit::errno_policy()));
  const int saved = errno;
  CHECK(isnan(r));
  CHECK(saved == EDOM);
}

TEST_CASE("the named policies are ordinary Boost.Math policies") {
  // boost::math::acosh(x) has a domain error for x < 1 (Boost.Math documentation, "acosh").
  using std::isnan;
  CHECK_THROWS_AS((void)boost::math::acosh(0.5, eigenzeit::throw_policy()), std::domain_error);
  errno = 0;
  CHECK(isnan(boost::math::acosh(0.5, eigenzeit::nan_policy())));
  CHECK(errno == 0);
  errno = 0;
  CHECK(isnan(boost::math::acosh(0.5, eigenzeit::errno_policy())));
  CHECK(errno == EDOM);
  // A valid argument is unaffected by the policy: acosh(1) = 0.
  CHECK(boost::math::acosh(1.0, eigenzeit::nan_policy()) == 0.0);
}
