// Tests of include/eigenzeit/timing/time_scales.hpp: the TT <-> TCG and TCB <-> TDB relations of
// the IERS Conventions (2010), chapter 10, against the committed mpmath table
// (tools/gen_time_scales_reference.py, mpmath at 60 digits) and against MPFR on random dates over
// +-200 years around J2000; round trips within 1 ps; the values at T0; errors for each policy.
#include <doctest/doctest.h>

#include <algorithm>
#include <cerrno>
#include <cmath>
#include <cstdio>
#include <cstdlib>
#include <limits>
#include <random>
#include <stdexcept>
#include <string>
#include <type_traits>
#include <vector>

#include <eigenzeit/timing/time_scales.hpp>

#include "data/time_scales_reference.hpp"
#include "support/reference.hpp"

using eigenzeit::two_part_time;
using ez_test::mp;

namespace {

using ez_test::cpp50;
using ez_test::type_name;

constexpr mpfr_prec_t kPrec = 2048;  // holds every sum of the words of a tested value exactly
constexpr double kJ2000 = 2451545.0;  // JD of J2000.0 (IAU; common practice, no source)
constexpr double kSpan = 73050.0;     // 200 Julian years, in days

long count(long full) { return ez_test::quick() ? std::max(100L, full / 25) : full; }

/// Exact value of t (days) in r.
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

void set_decimal(mpfr_t r, const char* s) { REQUIRE(mpfr_set_str(r, s, 10, MPFR_RNDN) == 0); }

/// The four relations, named by their function.
enum relation { tcg_from_tt, tt_from_tcg, tdb_from_tcb, tcb_from_tdb, n_relations };
const char* relation_name(int k) {
  static const char* names[] = {"tcg_from_tt", "tt_from_tcg", "tdb_from_tcb", "tcb_from_tdb"};
  return names[k];
}

template <class T>
two_part_time<T> apply(int k, const two_part_time<T>& t) {
  switch (k) {
    case tcg_from_tt: return eigenzeit::tcg_from_tt(t);
    case tt_from_tcg: return eigenzeit::tt_from_tcg(t);
    case tdb_from_tcb: return eigenzeit::tdb_from_tcb(t);
    default: return eigenzeit::tcb_from_tdb(t);
  }
}
/// The inverse relation of k.
int inverse(int k) { return k ^ 1; }

/// The IERS Conventions (2010), chapter 10 relations evaluated in MPFR on the exact value
/// of t, with the defining constants parsed from their decimal strings (independently of
/// constants.hpp): the offset (result - argument) in seconds.
///   TT  = TCG - L_G (JD_TCG - T0) 86400 s           (solved for TCG: L_G / (1 - L_G))
///   TDB = TCB - L_B (JD_TCB - T0) 86400 s + TDB0    (solved for TCB)
/// L_G = 6.969290134e-10, L_B = 1.550519768e-8, TDB0 = -6.55e-5 s, T0 = 2443144.5003725
/// (IERS Conventions (2010), section 10.1; values typed from memory of that section, the same
/// as tools/gen_time_scales_reference.py uses).
template <class T>
void reference_offset(mpfr_t out, int k, const two_part_time<T>& t) {
  mp y(kPrec), c(kPrec), one(kPrec);
  value_of(y.v, t);
  set_decimal(c.v, "2443144.5003725");
  mpfr_sub(y.v, y.v, c.v, MPFR_RNDN);
  mpfr_mul_ui(y.v, y.v, 86400, MPFR_RNDN);  // seconds since T0
  mpfr_set_ui(one.v, 1, MPFR_RNDN);
  const char* lg = "6.969290134e-10";
  const char* lb = "1.550519768e-8";
  switch (k) {
    case tcg_from_tt:
      set_decimal(c.v, lg);
      mpfr_mul(out, y.v, c.v, MPFR_RNDN);
      mpfr_sub(one.v, one.v, c.v, MPFR_RNDN);
      mpfr_div(out, out, one.v, MPFR_RNDN);
      break;
    case tt_from_tcg:
      set_decimal(c.v, lg);
      mpfr_mul(out, y.v, c.v, MPFR_RNDN);
      mpfr_neg(out, out, MPFR_RNDN);
      break;
    case tdb_from_tcb:
      set_decimal(c.v, lb);
      mpfr_mul(out, y.v, c.v, MPFR_RNDN);
      mpfr_neg(out, out, MPFR_RNDN);
      set_decimal(c.v, "-6.55e-5");
      mpfr_add(out, out, c.v, MPFR_RNDN);
      break;
    default:
      set_decimal(c.v, lb);
      mpfr_mul(out, y.v, c.v, MPFR_RNDN);
      mpfr_sub(one.v, one.v, c.v, MPFR_RNDN);
      set_decimal(c.v, "-6.55e-5");
      mpfr_sub(out, out, c.v, MPFR_RNDN);
      mpfr_div(out, out, one.v, MPFR_RNDN);
      break;
  }
}

/// |result - (argument + offset)| in seconds; offset in seconds.
template <class T>
double error_seconds(const two_part_time<T>& arg, const two_part_time<T>& result,
                     const mpfr_t offset) {
  mp a(kPrec), r(kPrec), o(kPrec);
  value_of(a.v, arg);
  value_of(r.v, result);
  mpfr_div_ui(o.v, offset, 86400, MPFR_RNDN);
  mpfr_add(a.v, a.v, o.v, MPFR_RNDN);
  mpfr_sub(r.v, r.v, a.v, MPFR_RNDN);
  mpfr_mul_ui(r.v, r.v, 86400, MPFR_RNDN);
  return std::fabs(mpfr_get_d(r.v, MPFR_RNDN));
}

/// The error bound of the analysis (time_scales.hpp, file comment), in seconds:
/// 8 eps |offset| for the offset's roundings, the shift of T0 by its rounding to T (times the
/// rate, <= 1.6e-8), and the two-part addition (2 u^2 |offset| + 16 u^2 day).
template <class T>
double bound_seconds(double offset) {
  const double eps = std::ldexp(1.0, 1 - std::numeric_limits<T>::digits);
  const double u = eps / 2;
  mp exact(kPrec), mine(kPrec);
  set_decimal(exact.v, "2443144.5003725");
  value_of(mine.v, eigenzeit::time_scale_epoch<T>());
  mpfr_sub(mine.v, mine.v, exact.v, MPFR_RNDN);
  const double t0_shift = std::fabs(mpfr_get_d(mine.v, MPFR_RNDN)) * 86400 * 1.6e-8;
  return 8 * eps * std::fabs(offset) + 1.01 * t0_shift + 2 * u * u * std::fabs(offset) +
         86400 * 16 * u * u;
}

/// A Julian date within +-200 years of J2000 with a fraction that uses all bits of T.
template <class T>
two_part_time<T> draw_date(std::mt19937_64& rng) {
  std::uniform_real_distribution<double> u01(0.0, 1.0);
  const double day = std::floor(kJ2000 + (2 * u01(rng) - 1) * kSpan);
  const T frac = T(u01(rng)) / T(3);  // a third: every bit of T in use
  return two_part_time<T>::from_days(T(day), frac);
}

template <class T>
T parse(const char* s) {
  if constexpr (std::is_floating_point<T>::value) return T(std::strtold(s, nullptr));
  else return T(s);
}

template <class T>
void table_check(bool picosecond_contract) {
  mp off(kPrec);
  double worst = 0, worst_ratio = 0, worst_fn = 0;
  for (const auto& row : eigenzeit_testdata::time_scales_rows) {
    const T whole = parse<T>(row.whole), frac = parse<T>(row.frac);
    REQUIRE(double(whole) == std::strtod(row.whole, nullptr));  // exact in every tested type
    REQUIRE(double(frac) == std::strtod(row.frac, nullptr));
    const two_part_time<T> t = two_part_time<T>::from_days(whole, frac);
    const char* offsets[] = {row.tcg_minus_tt, row.tt_minus_tcg, row.tdb_minus_tcb,
                             row.tcb_minus_tdb};
    for (int k = 0; k < n_relations; ++k) {
      set_decimal(off.v, offsets[k]);
      const two_part_time<T> r = apply(k, t);
      const double o = mpfr_get_d(off.v, MPFR_RNDN);
      const double e = error_seconds(t, r, off.v);
      const double b = bound_seconds<T>(o);
      worst = std::max(worst, e);
      worst_ratio = std::max(worst_ratio, e / b);
      INFO(type_name<T>(), " ", relation_name(k), " at JD ", row.whole, " + ", row.frac,
           " (", row.note, "): error ", e, " s, bound ", b, " s");
      CHECK(e <= b);
      if (picosecond_contract) CHECK(e <= 1e-12);
    }
    // The offset functions against the same columns, compared in MPFR.
    const T fn_values[2] = {eigenzeit::tcg_minus_tt(t), eigenzeit::tdb_minus_tcb(t)};
    const char* columns[2] = {row.tcg_minus_tt, row.tdb_minus_tcb};
    for (int j = 0; j < 2; ++j) {
      mp got(kPrec);
      ez_test::set_exact(got.v, fn_values[j]);
      set_decimal(off.v, columns[j]);
      const double o = mpfr_get_d(off.v, MPFR_RNDN);
      mpfr_sub(got.v, got.v, off.v, MPFR_RNDN);
      const double e = std::fabs(mpfr_get_d(got.v, MPFR_RNDN));
      const double b = bound_seconds<T>(o);
      worst_fn = std::max(worst_fn, e / b);
      INFO(type_name<T>(), (j == 0 ? " tcg_minus_tt" : " tdb_minus_tcb"), " at JD ", row.whole,
           " + ", row.frac, ": error ", e, " s, bound ", b, " s");
      CHECK(e <= b);
    }
  }
  std::printf("%-17s table (%zu dates x 4 relations): max error %.3g s (%.3g of the bound); "
              "offset functions %.3g of the bound\n",
              type_name<T>(), eigenzeit_testdata::time_scales_row_count, worst, worst_ratio,
              worst_fn);
}

template <class T>
void mpfr_sweep(long n, unsigned long long seed, bool picosecond_contract) {
  std::mt19937_64 rng(seed);
  mp off(kPrec);
  double worst[n_relations] = {}, worst_trip[n_relations] = {};
  long over = 0, over_trip = 0, over_ps = 0;
  for (long i = 0; i < n; ++i) {
    const two_part_time<T> t = draw_date<T>(rng);
    for (int k = 0; k < n_relations; ++k) {
      reference_offset(off.v, k, t);
      const two_part_time<T> r = apply(k, t);
      const double o = mpfr_get_d(off.v, MPFR_RNDN);
      const double e = error_seconds(t, r, off.v);
      worst[k] = std::max(worst[k], e);
      if (e > bound_seconds<T>(o)) ++over;
      // Round trip: the inverse relation brings the argument back.
      const two_part_time<T> back = apply(inverse(k), r);
      mpfr_set_ui(off.v, 0, MPFR_RNDN);
      const double et = error_seconds(t, back, off.v);
      worst_trip[k] = std::max(worst_trip[k], et);
      if (et > 2 * bound_seconds<T>(o)) ++over_trip;
      if (picosecond_contract && (e > 1e-12 || et > 1e-12)) ++over_ps;
    }
  }
  std::printf("%-17s %ld random dates over +-200 years, against MPFR (max error, s):\n",
              type_name<T>(), n);
  for (int k = 0; k < n_relations; ++k)
    std::printf("    %-13s %.3g   round trip through %-13s %.3g\n", relation_name(k), worst[k],
                relation_name(inverse(k)), worst_trip[k]);
  INFO(type_name<T>());
  CHECK(over == 0);
  CHECK(over_trip == 0);
  CHECK(over_ps == 0);
}

}  // namespace

TEST_CASE("IERS Conventions (2010) ch. 10 relations: the committed mpmath table") {
  // Table: tools/gen_time_scales_reference.py (mpmath, 60 digits, 55 printed), the relations of the IERS
  // Conventions (2010), section 10.1, at the dates listed there.
  table_check<double>(true);
  table_check<long double>(true);
  table_check<cpp50>(true);
  table_check<float>(false);  // float: only the bound of the analysis (its eps is 1.2e-7)
}

TEST_CASE("the four relations and their round trips against MPFR, +-200 years") {
  mpfr_sweep<double>(count(20000), 11, true);
  mpfr_sweep<long double>(count(10000), 12, true);
  mpfr_sweep<cpp50>(count(500), 13, true);
  mpfr_sweep<ez_test::mpfr100>(count(200), 14, true);  // expression templates on
}

TEST_CASE("at T0 the scales agree: TCG - TT = 0, TDB = TCB + TDB0") {
  // IERS Conventions (2010), section 10.1: T0 = JD 2443144.5003725 is the instant at which
  // TT, TCG and TCB read the same date; the defining TDB relation leaves TDB0 there.
  const auto t0 = eigenzeit::time_scale_epoch<double>();
  CHECK(eigenzeit::tcg_from_tt(t0) == t0);
  CHECK(eigenzeit::tt_from_tcg(t0) == t0);
  CHECK(eigenzeit::tcg_minus_tt(t0) == 0.0);
  CHECK(eigenzeit::seconds_between(t0, eigenzeit::tdb_from_tcb(t0)) == -6.55e-5);
  CHECK(eigenzeit::tdb_minus_tcb(t0) == -6.55e-5);
  // The inverse at T0 (a TDB date): TCB - TDB = -TDB0 / (1 - L_B) = 6.55e-5 (1 + 1.55e-8) s.
  const double back = eigenzeit::seconds_between(t0, eigenzeit::tcb_from_tdb(t0));
  const double expected = 6.55e-5 / (1 - 1.550519768e-8);
  CHECK(std::fabs(back - expected) <= expected * 0x1p-51);
  // The same in long double and cpp_bin_float_50.
  const auto t0l = eigenzeit::time_scale_epoch<long double>();
  CHECK(eigenzeit::tcg_from_tt(t0l) == t0l);
  CHECK(eigenzeit::tdb_minus_tcb(t0l) == -6.55e-5L);
  const auto t0m = eigenzeit::time_scale_epoch<cpp50>();
  CHECK(eigenzeit::tt_from_tcg(t0m) == t0m);
  CHECK(eigenzeit::tdb_minus_tcb(t0m) == cpp50("-6.55e-5"));
  // T0 is 1977 January 1, 00:00:32.184 TT: 32.184 s after JD 2443144.5 (IERS Conventions
  // (2010), section 10.1).
  const auto midnight = two_part_time<double>::from_days(2443144.5, 0.0);
  CHECK(std::fabs(eigenzeit::seconds_between(midnight, t0) - 32.184) <= 32.184 * 0x1p-52);
}

TEST_CASE("rates: TCG gains about 22 ms per year on TT, TCB about 0.49 s per year on TDB") {
  // Common practice, no source: L_G 86400 365.25 = 21.99 ms per Julian year, and
  // L_B 86400 365.25 = 0.489 s per Julian year.
  const auto t0 = eigenzeit::time_scale_epoch<double>();
  const auto year = eigenzeit::add_days(t0, 365.25);
  const double g = eigenzeit::tcg_minus_tt(year) - eigenzeit::tcg_minus_tt(t0);
  CHECK(std::fabs(g * 1e3 - 21.99) < 0.005);
  const double b = eigenzeit::tdb_minus_tcb(t0) - eigenzeit::tdb_minus_tcb(year);
  CHECK(std::fabs(b - 0.489) < 0.0005);
  // The offset grows linearly: ten years give ten times one year, to rounding.
  const auto decade = eigenzeit::add_days(t0, 3652.5);
  CHECK(std::fabs(eigenzeit::tcg_minus_tt(decade) - 10 * g) <= 10 * g * 1e-14);
  // At J2000, TCB - TDB is about 11.25 s (value from memory; it follows from L_B and TDB0).
  const auto j2000 = two_part_time<double>::from_days(2451545.0, 0.0);
  CHECK(std::fabs(-eigenzeit::tdb_minus_tcb(j2000) - 11.25) < 0.01);
  // And TCG - TT about 0.505 s (value from memory; it follows from L_G).
  CHECK(std::fabs(eigenzeit::tcg_minus_tt(j2000) - 0.505) < 0.001);
}

TEST_CASE("the relations keep the order of dates") {
  std::mt19937_64 rng(21);
  std::vector<two_part_time<double>> dates;
  for (long i = 0; i < count(5000); ++i) dates.push_back(draw_date<double>(rng));
  // Neighbours 1 ps apart as well: the rate differs from 1 by < 2e-8, so order must hold.
  const auto j = two_part_time<double>::from_days(2451545.0, 0.3125);
  for (int i = 0; i < 50; ++i) dates.push_back(eigenzeit::add_seconds(j, 1e-12 * i));
  std::sort(dates.begin(), dates.end());
  long broken = 0;
  for (int k = 0; k < n_relations; ++k)
    for (std::size_t i = 1; i < dates.size(); ++i) {
      if (dates[i - 1] == dates[i]) continue;
      if (!(apply(k, dates[i - 1]) < apply(k, dates[i]))) ++broken;
    }
  CHECK(broken == 0);
}

TEST_CASE("bad input: every domain error, for each policy") {
  using P = two_part_time<double>;
  const double qnan = std::numeric_limits<double>::quiet_NaN();
  const double inf = std::numeric_limits<double>::infinity();
  const P bad_day{qnan, 0.0};
  const P bad_fraction{2451545.0, -inf};
  const P bad_tail{2451545.0, 0.0, inf};
  auto message_of = [](auto&& call) -> std::string {
    try {
      call();
    } catch (const std::domain_error& e) {
      return e.what();
    }
    return "";
  };
  auto expect = [&](auto&& call, const char* function, const char* value) {
    const std::string m = message_of(call);
    INFO(m);
    CHECK(m.find(function) != std::string::npos);
    CHECK(m.find(value) != std::string::npos);
  };
  expect([&] { eigenzeit::tcg_from_tt(bad_day); }, "tcg_from_tt<double>", "day = nan");
  expect([&] { eigenzeit::tt_from_tcg(bad_fraction); }, "tt_from_tcg<double>", "fraction = -inf");
  expect([&] { eigenzeit::tdb_from_tcb(bad_tail); }, "tdb_from_tcb<double>", "tail = inf");
  expect([&] { eigenzeit::tcb_from_tdb(bad_day); }, "tcb_from_tdb<double>", "day = nan");
  expect([&] { eigenzeit::tcg_minus_tt(bad_fraction); }, "tcg_minus_tt<double>", "fraction = -inf");
  expect([&] { eigenzeit::tdb_minus_tcb(bad_tail); }, "tdb_minus_tcb<double>", "tail = inf");
  // Beyond the range of exact whole days (2^51 days for double).
  expect([&] { eigenzeit::tcg_from_tt(P{0x1p52, 0.0}); }, "tcg_from_tt<double>", "day = ");

  auto all_nan = [](const P& p) {
    return std::isnan(p.day) && std::isnan(p.fraction) && std::isnan(p.tail);
  };
  const eigenzeit::nan_policy np;
  errno = 0;
  CHECK(all_nan(eigenzeit::tcg_from_tt(bad_day, np)));
  CHECK(all_nan(eigenzeit::tt_from_tcg(bad_fraction, np)));
  CHECK(all_nan(eigenzeit::tdb_from_tcb(bad_tail, np)));
  CHECK(all_nan(eigenzeit::tcb_from_tdb(bad_day, np)));
  CHECK(std::isnan(eigenzeit::tcg_minus_tt(bad_day, np)));
  CHECK(std::isnan(eigenzeit::tdb_minus_tcb(bad_day, np)));
  CHECK(errno == 0);

  const eigenzeit::errno_policy ep;
  errno = 0;
  CHECK(all_nan(eigenzeit::tcg_from_tt(bad_tail, ep)));
  CHECK(errno == EDOM);
  errno = 0;
  CHECK(all_nan(eigenzeit::tcb_from_tdb(bad_fraction, ep)));
  CHECK(errno == EDOM);
  errno = 0;
  CHECK(std::isnan(eigenzeit::tdb_minus_tcb(bad_day, ep)));
  CHECK(errno == EDOM);
  errno = 0;
  const P ok = P::from_days(2451545.0, 0.25);
  CHECK(eigenzeit::tcg_from_tt(ok, ep) > ok);
  CHECK(errno == 0);
}
