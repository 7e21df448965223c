// Tests of include/eigenzeit/timing/two_part_time.hpp: arithmetic against exact MPFR sums
// (1 ps over +-200 years, and the tighter bound of the error analysis), the canonical form,
// exact comparisons, special values and errors under all three policies.
#include <doctest/doctest.h>

#include <algorithm>
#include <cerrno>
#include <cmath>
#include <cstdio>
#include <limits>
#include <random>
#include <stdexcept>
#include <string>

#include <eigenzeit/timing/two_part_time.hpp>

#include "support/reference.hpp"

using eigenzeit::two_part_time;
using ez_test::mp;

namespace {

using ez_test::cpp50;
using ez_test::type_name;

// Working precision of the exact sums: a double-word value spans at most 22 + 2 * 168 + a
// few bits for cpp_bin_float_50; 2048 bits hold every sum of the tested words exactly.
constexpr mpfr_prec_t kPrec = 2048;

constexpr long double kJ2000 = 2451545.0L;  // JD of J2000.0 (IAU; common practice, no source)
constexpr long double kSpan = 73050.0L;     // 200 Julian years of 365.25 days, in days
constexpr double kYearSeconds = 200 * 365.25 * 86400.0;  // 200 Julian years in seconds

long count(long full) { return ez_test::quick() ? std::max(200L, full / 25) : full; }

/// Exact value of t (days) in r; CHECKs that no rounding happened.
template <class T>
void value_of(mpfr_t r, const two_part_time<T>& t) {
  mp w(kPrec);
  int inexact = 0;
  ez_test::set_exact(r, t.day);
  ez_test::set_exact(w.v, t.fraction);
  inexact |= mpfr_add(r, r, w.v, MPFR_RNDN);
  ez_test::set_exact(w.v, t.tail);
  inexact |= mpfr_add(r, r, w.v, MPFR_RNDN);
  REQUIRE(inexact == 0);
}

/// u = eps / 2 and the grid step 2^-digits of T, as doubles.
template <class T>
double unit_roundoff() {
  return std::ldexp(1.0, -std::numeric_limits<T>::digits);
}

/// The bound of the error analysis (two_part_time.hpp, file comment), in days, for a result
/// that added q days given in seconds: ql's rounding (u^2 |q|) and the rest's roundings
/// (a few u 2^-digits).  Doubled for safety; still ~1e-22 s for double.
template <class T>
double bound_days(double q_days) {
  const double u = unit_roundoff<T>();
  return 2 * (u * u * std::fabs(q_days) + 8 * u * u);
}

/// The canonical form: day integer-valued, fraction on the 2^-digits grid in [0, 1), tail in
/// [-2^-(digits+1), 2^-(digits+1)).
template <class T>
bool canonical(const two_part_time<T>& t) {
  using std::floor;
  using std::ldexp;
  const int p = std::numeric_limits<T>::digits;
  if (!(t.day == floor(t.day))) return false;
  if (!(t.fraction >= T(0) && t.fraction < T(1))) return false;
  const T scaled = T(ldexp(t.fraction, p));
  if (!(scaled == floor(scaled))) return false;
  const T half = T(ldexp(T(1), -p - 1));
  return t.tail >= -half && t.tail < half;
}

/// |got - exact| in seconds, where exact is (ref days).
template <class T>
double error_seconds(const two_part_time<T>& got, const mpfr_t ref) {
  mp g(kPrec);
  value_of(g.v, got);
  mpfr_sub(g.v, g.v, ref, MPFR_RNDN);
  mpfr_mul_ui(g.v, g.v, 86400, MPFR_RNDN);
  return std::fabs(mpfr_get_d(g.v, MPFR_RNDN));
}

/// A random date within +-200 years of J2000, given as an arbitrary split (whole, frac):
/// integer or half-integer whole parts, fractions in [0, 1), [-1, 0) or up to 3 days.
template <class T>
void draw_date(std::mt19937_64& rng, T& whole, T& frac) {
  std::uniform_real_distribution<double> u01(0.0, 1.0);
  const double day = std::floor(static_cast<double>(kJ2000) +
                                (2 * u01(rng) - 1) * static_cast<double>(kSpan));
  switch (rng() % 4) {
    case 0: whole = T(day); frac = T(u01(rng)); break;
    case 1: whole = T(day - 0.5); frac = T(u01(rng)); break;
    case 2: whole = T(day); frac = T(-u01(rng)); break;
    default: whole = T(day); frac = T(3 * u01(rng)); break;
  }
}

/// A random signed number of seconds, log-uniform in magnitude from 1e-12 s to 200 years.
double draw_seconds(std::mt19937_64& rng) {
  std::uniform_real_distribution<double> ul(std::log(1e-12), std::log(kYearSeconds));
  const double s = std::exp(ul(rng));
  if (rng() % 32 == 0) return 0.0;
  return (rng() & 1) ? -s : s;
}

template <class T>
void sweep_arithmetic(long n, unsigned long long seed, bool picosecond_contract) {
  std::mt19937_64 rng(seed);
  mp ref(kPrec), w(kPrec);
  double max_from = 0, max_add = 0, max_add_ratio = 0, max_days = 0, max_days_ratio = 0;
  long not_canonical = 0, over_bound = 0, over_ps = 0;
  for (long i = 0; i < n; ++i) {
    T whole, frac;
    draw_date(rng, whole, frac);
    const two_part_time<T> t = two_part_time<T>::from_days(whole, frac);
    // from_days: exact sum whole + frac.
    ez_test::set_exact(ref.v, whole);
    ez_test::set_exact(w.v, frac);
    mpfr_add(ref.v, ref.v, w.v, MPFR_RNDN);
    const double e0 = error_seconds(t, ref.v);
    max_from = std::max(max_from, e0);
    if (e0 > 86400 * bound_days<T>(0)) ++over_bound;
    if (!canonical(t)) ++not_canonical;

    // add_seconds: exact t + s / 86400.
    const T s = T(draw_seconds(rng));
    const two_part_time<T> r = eigenzeit::add_seconds(t, s);
    value_of(ref.v, t);
    ez_test::set_exact(w.v, s);
    mpfr_div_ui(w.v, w.v, 86400, MPFR_RNDN);  // 2048 bits: error far below anything measured
    mpfr_add(ref.v, ref.v, w.v, MPFR_RNDN);
    const double e1 = error_seconds(r, ref.v);
    const double b1 = 86400 * bound_days<T>(static_cast<double>(s) / 86400);
    max_add = std::max(max_add, e1);
    max_add_ratio = std::max(max_add_ratio, e1 / b1);
    if (e1 > b1) ++over_bound;
    if (picosecond_contract && e1 > 1e-12) ++over_ps;
    if (!canonical(r)) ++not_canonical;

    // add_days / subtract_days with a fractional day count.
    const T d = T(std::ldexp(static_cast<double>(s), -16));  // up to ~1e5 days
    const two_part_time<T> rd = eigenzeit::add_days(t, d);
    const two_part_time<T> rs = eigenzeit::subtract_days(t, d);
    value_of(ref.v, t);
    ez_test::set_exact(w.v, d);
    mpfr_add(ref.v, ref.v, w.v, MPFR_RNDN);
    const double e2 = error_seconds(rd, ref.v);
    value_of(ref.v, t);
    mpfr_sub(ref.v, ref.v, w.v, MPFR_RNDN);
    const double e3 = std::max(e2, error_seconds(rs, ref.v));
    max_days = std::max(max_days, e3);
    max_days_ratio = std::max(max_days_ratio, e3 / (86400 * bound_days<T>(0)));
    if (e3 > 86400 * bound_days<T>(0)) ++over_bound;
    if (picosecond_contract && e3 > 1e-12) ++over_ps;
    if (!canonical(rd) || !canonical(rs)) ++not_canonical;
  }
  std::printf("%-17s %ld dates: max error from_days %.3g s, add_seconds %.3g s (%.3g of the "
              "bound), add/subtract_days %.3g s (%.3g of the bound)\n",
              type_name<T>(), n, max_from, max_add, max_add_ratio, max_days, max_days_ratio);
  INFO(type_name<T>());
  CHECK(not_canonical == 0);
  CHECK(over_bound == 0);
  CHECK(over_ps == 0);
}

/// seconds_between and to_days against the correctly rounded exact value.
template <class T>
void sweep_conversions(long n, unsigned long long seed) {
  std::mt19937_64 rng(seed);
  mp ref(kPrec), w(kPrec);
  ez_test::ulp_stats sec, days;
  for (long i = 0; i < n; ++i) {
    T whole, frac;
    draw_date(rng, whole, frac);
    const two_part_time<T> a = two_part_time<T>::from_days(whole, frac);
    // b: an independent date, or a nearby one (the difference then cancels deeply).
    two_part_time<T> b;
    if (rng() & 1) {
      draw_date(rng, whole, frac);
      b = two_part_time<T>::from_days(whole, frac);
    } else {
      b = eigenzeit::add_seconds(a, T(draw_seconds(rng)));
    }
    // Half the pairs: b an independent date, so that the difference needs rounding (t + s
    // differs from a representable s only by O(u^2)).
    if (rng() & 1) {
      draw_date(rng, whole, frac);
      b = two_part_time<T>::from_days(whole, T(frac / 7));
    }
    const T got = eigenzeit::seconds_between(a, b);
    value_of(ref.v, b);
    value_of(w.v, a);
    mpfr_sub(ref.v, ref.v, w.v, MPFR_RNDN);
    mpfr_mul_ui(ref.v, ref.v, 86400, MPFR_RNDN);
    sec.add(ez_test::measure<T>(got, ref.v), static_cast<long double>(got));
    value_of(ref.v, b);
    days.add(ez_test::measure<T>(eigenzeit::to_days(b), ref.v), static_cast<long double>(b.day));
  }
  std::printf("%-17s %ld pairs: seconds_between max %.3f ulp mean %.4f cr %.5f; to_days max "
              "%.3f ulp cr %.5f\n",
              type_name<T>(), n, sec.max_frac, sec.mean(), sec.share_exact(), days.max_frac,
              days.share_exact());
  INFO(type_name<T>());
  // Error analysis: RN(exact) + O(u^2) relative, so correctly rounded but within ~6u^2 of a
  // rounding boundary: at most 1 ulp, and correctly rounded in practically every case.
  CHECK(sec.max_dist <= 1);
  CHECK(days.max_dist <= 1);
  CHECK(sec.share_exact() >= 0.999);
  CHECK(days.share_exact() >= 0.999);
}

}  // namespace

TEST_CASE("add_seconds, add_days, from_days against exact MPFR sums, +-200 years") {
  sweep_arithmetic<double>(count(200000), 101, true);
  sweep_arithmetic<long double>(count(100000), 102, true);
  sweep_arithmetic<cpp50>(count(5000), 103, true);
  // float: the same algorithm with a 2^-24-day grid; the bound of the analysis holds, the
  // picosecond contract is for double and wider types only.
  sweep_arithmetic<float>(count(50000), 104, false);
}

TEST_CASE("seconds_between and to_days are correctly rounded (against MPFR)") {
  sweep_conversions<double>(count(200000), 201);
  sweep_conversions<long double>(count(100000), 202);
  sweep_conversions<float>(count(50000), 203);
}

template <class T>
void multiprecision_sweep(long n, unsigned long long seed) {
  std::mt19937_64 rng(seed);
  mp ref(kPrec), w(kPrec);
  double worst = 0, worst_add = 0;
  for (long i = 0; i < n; ++i) {
    T whole, frac;
    draw_date(rng, whole, frac);
    // Fractions and seconds with every bit in use (a third of a double), so that the
    // difference is not exact in the type and its rounding is measured.
    const auto a = two_part_time<T>::from_days(whole, T(frac / 3));
    const T s = T(draw_seconds(rng)) / 3;
    auto b = eigenzeit::add_seconds(a, s);
    CHECK(canonical(b));
    value_of(ref.v, a);
    ez_test::set_exact(w.v, s);
    mpfr_div_ui(w.v, w.v, 86400, MPFR_RNDN);
    mpfr_add(ref.v, ref.v, w.v, MPFR_RNDN);
    const double e = error_seconds(b, ref.v);
    worst_add = std::max(worst_add, e / (86400 * bound_days<T>(static_cast<double>(s) / 86400)));
    // Half the pairs: b an independent date, so that the difference needs rounding (t + s
    // differs from a representable s only by O(u^2)).
    if (rng() & 1) {
      draw_date(rng, whole, frac);
      b = two_part_time<T>::from_days(whole, T(frac / 7));
    }
    const T got = eigenzeit::seconds_between(a, b);
    value_of(ref.v, b);
    value_of(w.v, a);
    mpfr_sub(ref.v, ref.v, w.v, MPFR_RNDN);
    mpfr_mul_ui(ref.v, ref.v, 86400, MPFR_RNDN);
    if (mpfr_zero_p(ref.v)) {
      CHECK(got == 0);
      continue;
    }
    worst = std::max(worst, ez_test::measure_eps(got, ref.v));
  }
  std::printf("%-17s add_seconds max %.3g of the bound; seconds_between max %.3f epsilon\n",
              type_name<T>(), worst_add, worst);
  CHECK(worst_add <= 1.0);
  CHECK(worst <= 1.0);
}

TEST_CASE("multiprecision types: add_seconds within the bound, seconds_between within 1 epsilon") {
  multiprecision_sweep<cpp50>(count(3000), 301);
  multiprecision_sweep<ez_test::mpfr100>(count(1000), 302);  // expression templates on
}

TEST_CASE("round trips: t + s - s and seconds_between(t, t + s)") {
  std::mt19937_64 rng(401);
  mp ref(kPrec);
  double worst_back = 0;
  long far = 0;
  for (long i = 0; i < count(100000); ++i) {
    double whole, frac;
    draw_date(rng, whole, frac);
    const auto t = two_part_time<double>::from_days(whole, frac);
    const double s = draw_seconds(rng);
    const auto there = eigenzeit::add_seconds(t, s);
    const auto back = eigenzeit::add_seconds(there, -s);
    value_of(ref.v, t);
    const double e = error_seconds(back, ref.v);
    worst_back = std::max(worst_back, e);
    if (e > 2 * 86400 * bound_days<double>(s / 86400)) ++far;
    // The exact difference is s within ~1e-22 s: it rounds to s unless s is so small that
    // its own ulp is below that.
    const double d = eigenzeit::seconds_between(t, there);
    const double slack = std::fabs(s) * 0x1p-52 + 86400 * bound_days<double>(s / 86400);
    if (!(std::fabs(d - s) <= slack)) ++far;
  }
  std::printf("round trip t + s - s (double): max %.3g s\n", worst_back);
  CHECK(far == 0);
  CHECK(worst_back < 1e-12);
}

TEST_CASE("worked values: J2000 and T0 in Julian dates") {
  // J2000.0 = JD 2451545.0 TT = 2000 January 1, 12h (IAU 1976 system; IERS Conventions (2010),
  // chapter 10 uses it).  The same instant split differently compares equal.
  const auto j2000 = two_part_time<double>::from_days(2451545.0, 0.0);
  CHECK(j2000 == two_part_time<double>::from_days(2451544.5, 0.5));
  CHECK(j2000 == two_part_time<double>::from_days(2451546.0, -1.0));
  CHECK(j2000 == two_part_time<double>::from_seconds(2451545.0 * 86400.0));
  CHECK(j2000.day == 2451545.0);
  CHECK(j2000.fraction == 0.0);
  CHECK(j2000.tail == 0.0);
  // T0 = JD 2443144.5003725 = 1977 January 1, 00:00:32.184 TT [IERS Conventions (2010), ch. 10]:
  // 0.0003725 day is 32.184 s, so T0 = 1977 January 1 0h + 32.184 s.
  const auto t0 = two_part_time<double>::from_days(2443144.5, 0.0003725);
  const auto midnight = two_part_time<double>::from_days(2443144.5, 0.0);
  CHECK(std::fabs(eigenzeit::seconds_between(midnight, t0) - 32.184) <= 32.184 * 0x1p-52);
  // J2000 - T0 = 8400.4996275 d = 725 803 167.816 s exactly (decimal arithmetic); the double
  // nearest to that, within one ulp (the 0.0003725 above is itself rounded to double).
  const double span = eigenzeit::seconds_between(t0, j2000);
  CHECK(std::fabs(span - 725803167.816) <= 725803167.816 * 0x1p-52);
  // MJD = JD - 2400000.5 (IAU 1973; common practice, no source): MJD 51544.5 is J2000.0.
  const auto mjd = eigenzeit::subtract_days(j2000, 2400000.5);
  CHECK(mjd == two_part_time<double>::from_days(51544.0, 0.5));
  // One Julian year is 365.25 d = 31 557 600 s (IAU; common practice, no source).
  const auto next = eigenzeit::add_seconds(j2000, 31557600.0);
  CHECK(next == eigenzeit::add_days(j2000, 365.25));
  CHECK(eigenzeit::seconds_between(j2000, next) == 31557600.0);
}

TEST_CASE("a picosecond near the end of a day is kept") {
  // The fraction's last bit near 1 is 2^-53 day = 9.6 ps: a single fraction could not hold a
  // 1 ps step there.  Here each 1 ps step is kept (exact arithmetic in MPFR as the judge).
  auto t = two_part_time<double>::from_days(2451545.0, 0.999999);
  const auto start = t;
  for (int i = 0; i < 1000; ++i) {
    const auto next = eigenzeit::add_seconds(t, 1e-12);
    CHECK(next > t);
    t = next;
  }
  mp ref(kPrec), w(kPrec);
  value_of(ref.v, start);
  mpfr_set_d(w.v, 1e-12, MPFR_RNDN);
  mpfr_mul_ui(w.v, w.v, 1000, MPFR_RNDN);
  mpfr_div_ui(w.v, w.v, 86400, MPFR_RNDN);
  mpfr_add(ref.v, ref.v, w.v, MPFR_RNDN);
  CHECK(error_seconds(t, ref.v) < 1e-18);
  // Across the day boundary, and back.  1 ps is below half a grid step (4.8 ps), so the
  // nearest grid point is still the day boundary: day and fraction stay, the tail is -1 ps.
  auto u = two_part_time<double>::from_days(2451545.0, 0.0);
  const auto before = eigenzeit::add_seconds(u, -1e-12);
  CHECK(before.day == 2451545.0);
  CHECK(before.fraction == 0.0);
  CHECK(before.tail < 0.0);
  CHECK(before < u);
  const auto earlier = eigenzeit::add_seconds(u, -1e-11);  // beyond half a step: day before
  CHECK(earlier.day == 2451544.0);
  CHECK(earlier.fraction == 1.0 - 0x1p-53);
  CHECK(earlier < before);
  // Back again: the same instant within the tail's own rounding (1e-12 s / 86400 is not a
  // double, so t - 1 ps + 1 ps may differ from t in the tail's last bit, ~1e-33 day).
  CHECK(std::fabs(eigenzeit::seconds_between(eigenzeit::add_seconds(before, 1e-12), u)) <=
        86400 * bound_days<double>(0));
  CHECK(std::fabs(eigenzeit::seconds_between(before, u) - 1e-12) <= 1e-12 * 1e-9);
}

TEST_CASE("comparisons are exact, whatever the split") {
  std::mt19937_64 rng(501);
  mp va(kPrec), vb(kPrec);
  long wrong = 0;
  for (long i = 0; i < count(100000); ++i) {
    double whole, frac;
    draw_date(rng, whole, frac);
    const auto a = two_part_time<double>::from_days(whole, frac);
    two_part_time<double> b;
    switch (rng() % 4) {
      case 0: b = a; break;
      case 1: b = eigenzeit::add_seconds(a, draw_seconds(rng) * 1e-9); break;
      case 2: {  // the same value, split by hand: one day moved into the fraction
        b = a;
        b.day -= 1;
        b.fraction += 1;  // exact: a multiple of 2^-53 below 2
        break;
      }
      default: {  // one unit of the tail's last place either way
        b = a;
        b.tail = (rng() & 1) ? std::nextafter(a.tail, 1.0) : std::nextafter(a.tail, -1.0);
        break;
      }
    }
    value_of(va.v, a);
    value_of(vb.v, b);
    const int c = mpfr_cmp(va.v, vb.v);
    const bool ok = (a == b) == (c == 0) && (a != b) == (c != 0) && (a < b) == (c < 0) &&
                    (a <= b) == (c <= 0) && (a > b) == (c > 0) && (a >= b) == (c >= 0);
    if (!ok) ++wrong;
  }
  CHECK(wrong == 0);
}

TEST_CASE("aggregates outside the canonical form are renormalised") {
  using P = two_part_time<double>;
  const P a{2451545.25, 0.0};   // non-integer day
  const P b{2451544.0, 1.25};   // fraction beyond 1
  const P c{2451546.0, -0.75};  // negative fraction
  const P ref = P::from_days(2451545.0, 0.25);
  CHECK(a == ref);
  CHECK(b == ref);
  CHECK(c == ref);
  const P n = eigenzeit::normalised(b);
  CHECK(n.day == 2451545.0);
  CHECK(n.fraction == 0.25);
  CHECK(n.tail == 0.0);
  CHECK(eigenzeit::seconds_between(a, c) == 0.0);
  CHECK(eigenzeit::to_days(b) == 2451545.25);
  CHECK(canonical(eigenzeit::add_seconds(c, 0.0)));
}

TEST_CASE_TEMPLATE("special values", T, float, double, long double) {
  using P = two_part_time<T>;
  const T inf = std::numeric_limits<T>::infinity();
  const T qnan = std::numeric_limits<T>::quiet_NaN();
  // Signed zeros: the value 0, with +0 words.
  const P z = P::from_days(T(-0.0), T(-0.0));
  CHECK(z.day == 0);
  CHECK(z.fraction == 0);
  CHECK(z.tail == 0);
  CHECK_FALSE(std::signbit(z.day));
  CHECK_FALSE(std::signbit(z.fraction));
  CHECK_FALSE(std::signbit(z.tail));
  CHECK(eigenzeit::seconds_between(z, z) == 0);
  CHECK_FALSE(std::signbit(eigenzeit::seconds_between(z, z)));
  // The smallest subnormal second is an ordinary input: no error, and the value moves by
  // less than the bound of the analysis.
  const P t = P::from_days(T(2451545), T(0.5));
  const P s = eigenzeit::add_seconds(t, std::numeric_limits<T>::denorm_min());
  CHECK(canonical(s));
  CHECK(s >= t);
  CHECK(eigenzeit::seconds_between(t, s) <= T(86400 * bound_days<T>(0)));
  // Negative tiny seconds at day 0: the day borrows, the value stays ordered.
  const P m = eigenzeit::add_seconds(z, T(-1));
  CHECK(m.day == -1);
  CHECK(m < z);
  CHECK(canonical(m));
  // Largest finite and infinite inputs: domain errors.
  CHECK_THROWS_AS(P::from_days(std::numeric_limits<T>::max(), T(0)), std::domain_error);
  CHECK_THROWS_AS(P::from_days(T(0), inf), std::domain_error);
  CHECK_THROWS_AS(P::from_days(qnan, T(0)), std::domain_error);
  CHECK_THROWS_AS(P::from_seconds(-inf), std::domain_error);
  CHECK_THROWS_AS(P::from_seconds(std::numeric_limits<T>::max()), std::domain_error);
  CHECK_THROWS_AS(eigenzeit::add_seconds(t, std::numeric_limits<T>::max()), std::domain_error);
  CHECK_THROWS_AS(eigenzeit::add_days(t, qnan), std::domain_error);
  // The range limit 2^(digits-2) days: each word at the limit is accepted, a result beyond it
  // is not.
  const T limit = std::ldexp(T(1), std::numeric_limits<T>::digits - 2);
  CHECK(P::from_days(limit, T(0)).day == limit);
  CHECK(P::from_days(-limit, T(0)).day == -limit);
  CHECK_THROWS_AS(P::from_days(limit, limit), std::domain_error);
  CHECK_THROWS_AS(eigenzeit::add_days(P::from_days(limit, T(0)), T(1)), std::domain_error);
  // NaN words: unordered.
  const P bad{qnan, T(0)};
  CHECK_FALSE(bad == bad);
  CHECK(bad != bad);
  CHECK_FALSE(bad < t);
  CHECK_FALSE(bad <= t);
  CHECK_FALSE(bad > t);
  CHECK_FALSE(bad >= t);
  CHECK_FALSE(t == bad);
  // Infinite words compare as the IEEE values of their sums.
  const P big{inf, T(0)};
  CHECK(t < big);
  CHECK(big > t);
  CHECK(big == big);
}

TEST_CASE("bad input: every domain error, for each policy") {
  using P = two_part_time<double>;
  const double qnan = std::numeric_limits<double>::quiet_NaN();
  const double inf = std::numeric_limits<double>::infinity();
  const P ok = P::from_days(2451545.0, 0.25);
  const P bad_day{qnan, 0.0};
  const P bad_fraction{2451545.0, inf};
  const P bad_tail{2451545.0, 0.0, -inf};

  // Each call: the function's name and the offending value appear in the message.
  struct expectation {
    const char* function;
    const char* value;
  };
  auto message_of = [](auto&& call) -> std::string {
    try {
      call();
    } catch (const std::domain_error& e) {
      return e.what();
    }
    return "";
  };
  auto expect = [&](auto&& call, expectation e) {
    const std::string m = message_of(call);
    INFO(m);
    CHECK(m.find(e.function) != std::string::npos);
    CHECK(m.find(e.value) != std::string::npos);
  };
  expect([&] { P::from_days(qnan, 0.5); }, {"two_part_time<double>::from_days", "whole = nan"});
  expect([&] { P::from_days(0.5, -inf); }, {"two_part_time<double>::from_days", "frac = -inf"});
  expect([&] { P::from_seconds(inf); }, {"two_part_time<double>::from_seconds", "seconds = inf"});
  expect([&] { eigenzeit::add_seconds(ok, qnan); }, {"add_seconds<double>", "seconds = nan"});
  expect([&] { eigenzeit::add_seconds(bad_day, 1.0); }, {"add_seconds<double>", "day = nan"});
  expect([&] { eigenzeit::add_days(bad_fraction, 1.0); }, {"add_days<double>", "fraction = inf"});
  expect([&] { eigenzeit::subtract_days(bad_tail, 1.0); }, {"subtract_days<double>", "tail = -inf"});
  expect([&] { eigenzeit::seconds_between(ok, bad_day); }, {"seconds_between<double>", "day = nan"});
  expect([&] { eigenzeit::to_days(bad_tail); }, {"to_days<double>", "tail = -inf"});
  expect([&] { eigenzeit::to_seconds(bad_fraction); }, {"seconds_between<double>", "fraction = inf"});
  expect([&] { eigenzeit::normalised(bad_day); }, {"normalised<double>", "day = nan"});
  expect([&] { P::from_days(0x1p51, 0x1p51); }, {"from_days", "beyond 2^(digits-2) days"});

  // NaN policy: every word NaN (or a NaN number), no exception, errno untouched.
  const eigenzeit::nan_policy np;
  errno = 0;
  auto all_nan = [](const P& p) {
    return std::isnan(p.day) && std::isnan(p.fraction) && std::isnan(p.tail);
  };
  CHECK(all_nan(P::from_days(qnan, 0.5, np)));
  CHECK(all_nan(P::from_seconds(inf, np)));
  CHECK(all_nan(eigenzeit::add_seconds(ok, inf, np)));
  CHECK(all_nan(eigenzeit::add_seconds(bad_day, 1.0, np)));
  CHECK(all_nan(eigenzeit::add_days(ok, qnan, np)));
  CHECK(all_nan(eigenzeit::subtract_days(bad_tail, 1.0, np)));
  CHECK(all_nan(eigenzeit::normalised(bad_fraction, np)));
  CHECK(all_nan(P::from_days(0x1p51, 0x1p51, np)));
  CHECK(std::isnan(eigenzeit::seconds_between(bad_day, ok, np)));
  CHECK(std::isnan(eigenzeit::to_days(bad_tail, np)));
  CHECK(errno == 0);

  // errno policy: EDOM and NaN.
  const eigenzeit::errno_policy ep;
  errno = 0;
  CHECK(all_nan(P::from_days(0.0, qnan, ep)));
  CHECK(errno == EDOM);
  errno = 0;
  CHECK(all_nan(eigenzeit::add_seconds(ok, -inf, ep)));
  CHECK(errno == EDOM);
  errno = 0;
  CHECK(std::isnan(eigenzeit::seconds_between(ok, bad_fraction, ep)));
  CHECK(errno == EDOM);
  errno = 0;
  CHECK(all_nan(P::from_seconds(0x1p70, ep)));
  CHECK(errno == EDOM);
  // Valid input leaves errno alone.
  errno = 0;
  CHECK(eigenzeit::add_seconds(ok, 1.0, ep) > ok);
  CHECK(errno == 0);
}
