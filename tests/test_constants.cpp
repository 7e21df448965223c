// Tests of include/eigenzeit/constants.hpp: every constant equals its published decimal value
// correctly rounded to each type (the decimal parsed by MPFR, rounded once to float, double,
// long double and to the precision of the multiprecision types), and the published relations
// between the constants hold to the digits printed in their sources.
//
// Sources of the decimal strings below (each also named beside its row):
//   [SI]    BIPM, SI brochure, 9th edition (2019): c exact; the day of 86 400 s.
//   [IAU]   IAU 2000 Resolution B1.9 (L_G), IAU 2006 Resolution B3 (L_B, TDB0), as quoted in
//           the IERS Conventions (2010), chapter 10; T0 from the same chapter.
//   [IERS]  IERS Conventions (2010), IERS Technical Note 36, table 1.1 (numerical standards).
//   [GPS]   IS-GPS-200, 20.3.3.3.3.1 and table 20-IV (mu, Omega_e dot, F).
// The strings are quoted from memory of those documents; the relations checked further down
// (L_G = W0 / c^2, GM_TT = GM_TCG (1 - L_G), F = -2 sqrt(mu) / c^2) tie them together.
#include <doctest/doctest.h>

#include <cmath>
#include <cstdio>
#include <limits>
#include <string>
#include <type_traits>

#include <eigenzeit/constants.hpp>

#include "support/reference.hpp"

namespace ezc = eigenzeit::constants;
using ez_test::mp;
using ez_test::type_name;

namespace {

constexpr mpfr_prec_t kPrec = 2048;

/// One constant: its name, its published decimal and the library's value in each type.
struct row {
  const char* name;
  const char* decimal;
  const char* source;
  float (*f)();
  double (*d)();
  long double (*ld)();
  ez_test::cpp50 (*c50)();
  ez_test::mpfr100 (*m100)();
};

#define EZ_ROW(fn, text, source)                                                        \
  row {                                                                                 \
    #fn, text, source, &ezc::fn<float>, &ezc::fn<double>, &ezc::fn<long double>,       \
        &ezc::fn<ez_test::cpp50>, &ezc::fn<ez_test::mpfr100>                            \
  }

const row rows[] = {
    EZ_ROW(speed_of_light, "299792458", "[SI] exact"),
    EZ_ROW(seconds_per_day, "86400", "[SI] exact"),
    EZ_ROW(L_G, "6.969290134e-10", "[IAU] 2000 B1.9"),
    EZ_ROW(L_B, "1.550519768e-8", "[IAU] 2006 B3"),
    EZ_ROW(TDB0, "-6.55e-5", "[IAU] 2006 B3"),
    EZ_ROW(T0_day, "2443144.5", "[IERS] ch. 10"),
    EZ_ROW(T0_fraction, "3.725e-4", "[IERS] ch. 10"),
    EZ_ROW(GM_earth, "3.986004418e14", "[IERS] table 1.1, TCG-compatible"),
    EZ_ROW(GM_earth_tt, "3.986004415e14", "[IERS] table 1.1, TT-compatible"),
    EZ_ROW(earth_equatorial_radius, "6378136.6", "[IERS] table 1.1"),
    EZ_ROW(earth_J2, "1.0826359e-3", "[IERS] table 1.1"),
    EZ_ROW(geoid_potential, "62636856.0", "[IERS] table 1.1"),
    EZ_ROW(earth_rotation_rate, "7.292115e-5", "[IERS] table 1.1"),
    EZ_ROW(GM_earth_gps, "3.986005e14", "[GPS] 20.3.3.3.3.1"),
    EZ_ROW(earth_rotation_rate_gps, "7.2921151467e-5", "[GPS] table 20-IV"),
};

#undef EZ_ROW

/// The decimal rounded once to `bits` (round to nearest even).
void rounded_decimal(mpfr_t out, const char* text, mpfr_prec_t bits) {
  mp exact(kPrec);
  REQUIRE(mpfr_set_str(exact.v, text, 10, MPFR_RNDN) == 0);
  mpfr_set_prec(out, bits);
  mpfr_set(out, exact.v, MPFR_RNDN);
}

/// Whether the multiprecision value x is exactly the decimal rounded to T's precision.
template <class T>
bool equals_rounded(const T& x, const char* text) {
  mp want(64), got(kPrec);
  rounded_decimal(want.v, text, std::numeric_limits<T>::digits);
  REQUIRE(ez_test::set_exact_checked(got.v, x));
  return mpfr_equal_p(want.v, got.v) != 0;
}

/// The value of an MPFR number printed with `digits` significant digits, as "%.{d-1}Re".
std::string printed(const mpfr_t x, int digits) {
  char buf[128];
  const std::string format = "%." + std::to_string(digits - 1) + "Re";
  mpfr_snprintf(buf, sizeof buf, format.c_str(), x);
  return buf;
}

}  // namespace

TEST_CASE("every constant is its published decimal, correctly rounded to each type") {
  for (const row& r : rows) {
    INFO(r.name, " = ", r.decimal, " ", r.source);
    mp exact(kPrec);
    REQUIRE(mpfr_set_str(exact.v, r.decimal, 10, MPFR_RNDN) == 0);
    // Built-in types: MPFR's correct rounding of the decimal.
    CHECK(r.f() == mpfr_get_flt(exact.v, MPFR_RNDN));
    CHECK(r.d() == mpfr_get_d(exact.v, MPFR_RNDN));
    CHECK(r.ld() == mpfr_get_ld(exact.v, MPFR_RNDN));
    // Multiprecision types: the decimal rounded once at their own precision.
    CHECK(equals_rounded(r.c50(), r.decimal));
    CHECK(equals_rounded(r.m100(), r.decimal));
  }
  std::printf("constants: %zu values checked in float, double, long double, %s and %s\n",
              sizeof rows / sizeof rows[0], type_name<ez_test::cpp50>(), type_name<ez_test::mpfr100>());
}

TEST_CASE("exact constants are exact where the type can hold them") {
  // c = 299 792 458 m/s has 28 significant bits: exact from double up, rounded in float.
  CHECK(ezc::speed_of_light<double>() == 299792458.0);
  CHECK(ezc::speed_of_light<long double>() == 299792458.0L);
  CHECK(static_cast<double>(ezc::speed_of_light<float>()) != 299792458.0);
  CHECK(ezc::seconds_per_day<float>() == 86400.0f);
  CHECK(ezc::T0_day<float>() == 2443144.5f);  // 22 bits: exact even in float
  // The default template argument is double.
  CHECK(std::is_same<decltype(ezc::L_G()), double>::value);
  CHECK(ezc::L_G() == ezc::L_G<double>());
}

TEST_CASE("relation: L_G = W0 / c^2 to the digits given (IERS Conventions 2010, ch. 1 and 10)") {
  // IAU 2000 Resolution B1.9 fixed L_G = 6.969290134e-10 from W0 = 62 636 856.0 m^2/s^2; the
  // quotient rounded to the 10 digits of L_G must give L_G back.
  mp w0(kPrec), c(kPrec), q(kPrec);
  mpfr_set_str(w0.v, "62636856.0", 10, MPFR_RNDN);
  mpfr_set_ui(c.v, 299792458UL, MPFR_RNDN);
  mpfr_sqr(c.v, c.v, MPFR_RNDN);
  mpfr_div(q.v, w0.v, c.v, MPFR_RNDN);
  std::printf("W0 / c^2 = %s (L_G = 6.969290134e-10)\n", printed(q.v, 15).c_str());
  CHECK(printed(q.v, 10) == "6.969290134e-10");
  // And from the library's own double values: within one ulp of L_G.
  const double lg = ezc::geoid_potential<double>() /
                    (ezc::speed_of_light<double>() * ezc::speed_of_light<double>());
  CHECK(std::fabs(lg - ezc::L_G<double>()) <= 2e-16 * ezc::L_G<double>() + 1e-19);
}

TEST_CASE("relation: GM in TT-compatible units is GM_TCG (1 - L_G) (IERS Conventions 2010, ch. 1)") {
  // From memory of IERS TN36 ch. 1: TT-compatible values of GM are the TCG-compatible ones
  // times (1 - L_G); rounded to the 10 digits printed in table 1.1.
  mp gm(kPrec), lg(kPrec), t(kPrec);
  mpfr_set_str(gm.v, "3.986004418e14", 10, MPFR_RNDN);
  mpfr_set_str(lg.v, "6.969290134e-10", 10, MPFR_RNDN);
  mpfr_ui_sub(t.v, 1, lg.v, MPFR_RNDN);
  mpfr_mul(t.v, gm.v, t.v, MPFR_RNDN);
  CHECK(printed(t.v, 10) == "3.986004415e+14");
}

TEST_CASE("relation: the GPS relativistic constant F = -2 sqrt(mu) / c^2 (IS-GPS-200 20.3.3.3.3.1)") {
  // IS-GPS-200 prints F = -4.442807633e-10 s/m^(1/2), from mu = 3.986005e14 m^3/s^2.
  mp mu(kPrec), c(kPrec), f(kPrec);
  mpfr_set_str(mu.v, "3.986005e14", 10, MPFR_RNDN);
  mpfr_sqrt(f.v, mu.v, MPFR_RNDN);
  mpfr_mul_si(f.v, f.v, -2, MPFR_RNDN);
  mpfr_set_ui(c.v, 299792458UL, MPFR_RNDN);
  mpfr_sqr(c.v, c.v, MPFR_RNDN);
  mpfr_div(f.v, f.v, c.v, MPFR_RNDN);
  CHECK(printed(f.v, 10) == "-4.442807633e-10");
  // With the library's double values: within a few ulp of the printed figure.
  const double F = -2 * std::sqrt(ezc::GM_earth_gps<double>()) /
                   (ezc::speed_of_light<double>() * ezc::speed_of_light<double>());
  CHECK(std::fabs(F / -4.442807633e-10 - 1) < 2e-10);  // the printed figure's own rounding
}

TEST_CASE("relation: the two Earth rotation rates agree to the digits IERS gives") {
  // IERS table 1.1 gives omega = 7.292115e-5 rad/s (7 digits); IS-GPS-200 uses
  // 7.2921151467e-5 rad/s.  The GPS value rounded to 7 digits is the IERS value.
  mp w(kPrec);
  mpfr_set_str(w.v, "7.2921151467e-5", 10, MPFR_RNDN);
  CHECK(printed(w.v, 7) == "7.292115e-05");
  CHECK(std::fabs(ezc::earth_rotation_rate_gps<double>() - ezc::earth_rotation_rate<double>()) < 5e-12);
}

TEST_CASE("relation: T0 = 2443144.5003725 is T0_day + T0_fraction (IERS Conventions 2010, ch. 10)") {
  // T0_day is exact; T0_fraction = 3.725e-4 is not a binary fraction, so it is the decimal
  // rounded once: the sum of the two parts lies within half an ulp of the fraction from T0.
  mp t0(kPrec), sum(kPrec), day(kPrec), frac(kPrec);
  mpfr_set_str(t0.v, "2443144.5003725", 10, MPFR_RNDN);
  ez_test::set_exact(day.v, ezc::T0_day<double>());
  ez_test::set_exact(frac.v, ezc::T0_fraction<double>());
  mpfr_add(sum.v, day.v, frac.v, MPFR_RNDN);
  mpfr_sub(sum.v, sum.v, t0.v, MPFR_RNDN);
  const double err = std::fabs(mpfr_get_d(sum.v, MPFR_RNDN));
  CHECK(err <= std::ldexp(1.0, std::ilogb(3.725e-4) - 53));
  CHECK(ezc::T0_day<double>() + ezc::T0_fraction<double>() == 2443144.5003725);
}
