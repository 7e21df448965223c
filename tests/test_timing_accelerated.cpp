// Tests of include/eigenzeit/timing/accelerated.hpp (uniform proper acceleration from rest):
// accuracy sweeps against MPFR in natural and SI units, the committed mpmath table, round
// trips, identities, an outside check, special values and errors under every policy.
#include <doctest/doctest.h>

#include <algorithm>
#include <cerrno>
#include <cmath>
#include <cstdio>
#include <limits>
#include <random>
#include <stdexcept>
#include <string>
#include <type_traits>
#include <vector>

#include <eigenzeit/constants.hpp>
#include <eigenzeit/timing/accelerated.hpp>

#include "data/timing_accelerated_reference.hpp"
#include "support/reference.hpp"
#include "support/sampler.hpp"
#include "support/policy_checks.hpp"

using eigenzeit::uniform_acceleration;
using ez_test::mp;
using ez_test::type_name;

namespace {

long sample_count(long full) { return ez_test::quick() ? std::max(300L, full / 20) : full; }

enum output : int { o_t, o_x, o_lag, o_beta, o_gamma, o_gamma_m1, o_deficit, o_proper_speed, n_outputs };
const char* output_name(int o) {
  static const char* names[] = {"coordinate_time", "distance", "time_lag", "beta", "gamma",
                                "gamma_m1", "beta_deficit", "proper_speed"};
  return names[o];
}

/// The outputs of hyperbolic motion for exact a and tau (c = 1, or c = 299 792 458 exactly),
/// by their definitions, in MPFR.  The precision absorbs the cancellation of cosh - 1 and
/// sinh - phi (3 |log2 phi| bits: the lag is phi^3/6 against sinh(phi) ~ phi) and that of
/// 1 - tanh(phi) (3 phi bits), with 256 bits of margin.
struct motion_reference {
  mpfr_prec_t prec;
  mp val[n_outputs];
  mp phi;

  explicit motion_reference(mpfr_prec_t p)
      : prec(p), val{mp(p), mp(p), mp(p), mp(p), mp(p), mp(p), mp(p), mp(p)}, phi(p) {}

  static mpfr_prec_t precision_for(long double phi_estimate, int digits) {
    int e = 0;
    if (phi_estimate > 0 && std::isfinite(phi_estimate)) e = std::ilogb(phi_estimate);
    long p = 256 + 2L * digits + 3L * std::abs(e) +
             static_cast<long>(3 * std::min(std::fabs(phi_estimate), 1e6L));
    return static_cast<mpfr_prec_t>(std::min(p, 60000L));
  }

  /// a, tau and c exact in MPFR (c = 1 for natural units).
  void compute(const mpfr_t a, const mpfr_t tau, const mpfr_t c) {
    mp s(prec), ch(prec), t(prec);
    mpfr_mul(phi.v, a, tau, MPFR_RNDN);
    mpfr_div(phi.v, phi.v, c, MPFR_RNDN);
    mpfr_sinh_cosh(s.v, ch.v, phi.v, MPFR_RNDN);
    // t = c sinh / a, x = c^2 (cosh - 1) / a, lag = c (sinh - phi) / a
    mpfr_mul(t.v, s.v, c, MPFR_RNDN);
    mpfr_div(val[o_t].v, t.v, a, MPFR_RNDN);
    mpfr_sub_ui(t.v, ch.v, 1, MPFR_RNDN);
    mpfr_set(val[o_gamma_m1].v, t.v, MPFR_RNDN);
    mpfr_mul(t.v, t.v, c, MPFR_RNDN);
    mpfr_mul(t.v, t.v, c, MPFR_RNDN);
    mpfr_div(val[o_x].v, t.v, a, MPFR_RNDN);
    mpfr_sub(t.v, s.v, phi.v, MPFR_RNDN);
    mpfr_mul(t.v, t.v, c, MPFR_RNDN);
    mpfr_div(val[o_lag].v, t.v, a, MPFR_RNDN);
    mpfr_tanh(val[o_beta].v, phi.v, MPFR_RNDN);
    mpfr_set(val[o_gamma].v, ch.v, MPFR_RNDN);
    mpfr_ui_sub(val[o_deficit].v, 1, val[o_beta].v, MPFR_RNDN);
    mpfr_set(val[o_proper_speed].v, s.v, MPFR_RNDN);
  }
};

/// c in MPFR: 1 (natural units) or 299 792 458 m/s (SI, exact).
void set_c(mpfr_t c, bool si) { mpfr_set_ui(c, si ? 299792458UL : 1UL, MPFR_RNDN); }

template <class T>
uniform_acceleration<T> motion(T a, bool si) {
  return si ? uniform_acceleration<T>::si(a) : uniform_acceleration<T>::natural(a);
}

/// Every output for one (a, tau), NaN where the library refuses (NaN policy).
template <class T>
void outputs(const uniform_acceleration<T>& m, T tau, T out[n_outputs]) {
  const eigenzeit::nan_policy nan;
  out[o_t] = m.coordinate_time(tau, nan);
  out[o_x] = m.distance(tau, nan);
  out[o_lag] = m.time_lag(tau, nan);
  const eigenzeit::speed<T> s = m.speed_at(tau, nan);
  out[o_beta] = s.beta();
  out[o_gamma] = s.gamma();
  out[o_gamma_m1] = s.gamma_m1();
  out[o_deficit] = s.beta_deficit();
  out[o_proper_speed] = s.proper_speed();
}

/// Sweep for one built-in type in one unit system: (a, tau) with a tau / c log-uniform over
/// [1e-300, 700] (clamped to the type), a log-uniform over a wide range, and a third of the
/// draws with a and tau independent over the whole range of T (products near the ends of the
/// range, subnormal inputs).  Also the inverse, proper_time(t), on t drawn the same way.
template <class T>
void sweep(bool si, long samples, unsigned long long seed) {
  std::mt19937_64 engine(seed);
  ez_test::sampler<T> gen(engine);
  const long double c = si ? 299792458.0L : 1.0L;
  const long double phi_top = gen.max_rapidity();
  const long double phi_low = std::max<long double>(1e-300L, std::numeric_limits<T>::min());
  ez_test::ulp_stats st[n_outputs], inv;
  long refused = 0, refused_wrongly = 0;
  for (long i = 0; i < samples; ++i) {
    const int region = static_cast<int>(engine() % 3);
    T a, tau;
    if (region < 2) {
      a = T(gen.log_uniform(si ? 1e-6L : 1e-12L, si ? 1e14L : 1e12L));
      const long double phi = region == 0 ? gen.log_uniform(phi_low, phi_top)
                                          : gen.log_uniform(1e-3L, phi_top);
      tau = T(phi * c / static_cast<long double>(a));
    } else {
      a = T(gen.log_uniform(gen.lowest(), gen.huge()));
      tau = T(gen.log_uniform(gen.lowest(), gen.huge()));
    }
    if (!(tau > 0) || !std::isfinite(tau) || !(a > 0) || !std::isfinite(a)) continue;
    const long double phi_est = static_cast<long double>(a) * static_cast<long double>(tau) / c;
    if (!(phi_est <= phi_top)) continue;  // the exp limit: refusals are tested separately
    const auto m = motion(a, si);
    T got[n_outputs];
    outputs(m, tau, got);
    motion_reference ref(motion_reference::precision_for(phi_est, std::numeric_limits<T>::digits));
    mp ma(128), mt(128), mc(64);
    ez_test::set_exact(ma.v, a);
    ez_test::set_exact(mt.v, tau);
    set_c(mc.v, si);
    ref.compute(ma.v, mt.v, mc.v);
    for (int o = 0; o < n_outputs; ++o) {
      const T cr = ez_test::round_to<T>(ref.val[o].v);
      if (!std::isfinite(cr)) {
        // Beyond the range of T: the library must refuse (NaN under the NaN policy).
        ++refused;
        if (!std::isnan(got[o])) ++refused_wrongly;
        continue;
      }
      INFO(std::string(type_name<T>()), std::string(si ? " SI" : " natural"), " ", std::string(output_name(o)), " a = ",
           static_cast<double>(a), " tau = ", static_cast<double>(tau));
      // Outputs whose exact value is finite but is a view of a speed with infinite gamma
      // (cosh(phi) > max) are refused too; none occurs below the exp limit.
      const ez_test::ulp_error e = ez_test::measure<T>(got[o], ref.val[o].v);
      st[o].add(e, static_cast<long double>(a), static_cast<long double>(tau));
    }
    // The inverse: t drawn as the coordinate time of this case, rounded to T.
    const T t = got[o_t];
    if (std::isfinite(t) && t > 0) {
      const T back = m.proper_time(t);
      mp mtt(128), psi(ref.prec), r(ref.prec);
      ez_test::set_exact(mtt.v, t);
      mpfr_mul(psi.v, ma.v, mtt.v, MPFR_RNDN);
      mpfr_div(psi.v, psi.v, mc.v, MPFR_RNDN);
      mpfr_asinh(r.v, psi.v, MPFR_RNDN);
      mpfr_mul(r.v, r.v, mc.v, MPFR_RNDN);
      mpfr_div(r.v, r.v, ma.v, MPFR_RNDN);
      inv.add(ez_test::measure<T>(back, r.v), static_cast<long double>(a),
              static_cast<long double>(t));
    }
  }
  std::printf("\n%s, %s units, %ld draws (max/mean ulps of the correctly rounded result; cr = "
              "share correctly rounded):\n",
              type_name<T>(), si ? "SI" : "natural", samples);
  for (int o = 0; o <= n_outputs; ++o) {
    const ez_test::ulp_stats& s = o < n_outputs ? st[o] : inv;
    std::printf("  %-16s n %6ld  max %.3f (dist %lld) mean %.4f cr %.5f [subnormal %ld]  worst a "
                "%.6Lg, %s %.6Lg\n",
                o < n_outputs ? output_name(o) : "proper_time(t)", s.n, s.max_frac,
                static_cast<long long>(s.max_dist), s.mean(), s.share_exact(), s.n_subnormal,
                s.worst_input, o < n_outputs ? "tau" : "t", s.worst_input2);
    INFO(std::string(type_name<T>()), std::string(si ? " SI " : " natural "), std::string(o < n_outputs ? output_name(o) : "inverse"),
         " worst a = ", static_cast<double>(s.worst_input), " second input ",
         static_cast<double>(s.worst_input2));
    CHECK(s.max_dist <= 2);
    CHECK(s.n > samples / 4);
  }
  std::printf("  results beyond the range of %s: %ld, all refused: %s\n", type_name<T>(), refused,
              refused_wrongly == 0 ? "yes" : "NO");
  CHECK(refused_wrongly == 0);
}

}  // namespace

TEST_CASE("hyperbolic motion against MPFR: double") {
  sweep<double>(false, sample_count(20000), 101);
  sweep<double>(true, sample_count(20000), 102);
}

TEST_CASE("hyperbolic motion against MPFR: long double and float") {
  sweep<long double>(false, sample_count(5000), 103);
  sweep<long double>(true, sample_count(5000), 104);
  sweep<float>(false, sample_count(5000), 105);
  sweep<float>(true, sample_count(5000), 106);
}

TEST_CASE("hyperbolic motion in cpp_bin_float_50 stays within 16 epsilon") {
  using T = ez_test::cpp50;
  std::mt19937_64 engine(107);
  ez_test::sampler<double> gen(engine);
  double worst = 0;
  for (long i = 0; i < sample_count(150); ++i) {
    const bool si = (i % 2) != 0;
    const double a = static_cast<double>(gen.log_uniform(1e-6L, 1e6L));
    const double phi = static_cast<double>(gen.log_uniform(1e-200L, 600.0L));
    const double tau = phi * (si ? 299792458.0 : 1.0) / a;
    const auto m = motion(T(a), si);
    T got[n_outputs];
    outputs(m, T(tau), got);
    motion_reference ref(motion_reference::precision_for(phi, std::numeric_limits<T>::digits));
    mp ma(64), mt(64), mc(64);
    mpfr_set_d(ma.v, a, MPFR_RNDN);
    mpfr_set_d(mt.v, tau, MPFR_RNDN);
    set_c(mc.v, si);
    ref.compute(ma.v, mt.v, mc.v);
    for (int o = 0; o < n_outputs; ++o) {
      const double e = ez_test::measure_eps(got[o], ref.val[o].v);
      INFO(std::string(output_name(o)), " a = ", a, " tau = ", tau, std::string(si ? " SI" : " natural"));
      CHECK(e <= 16.0);
      worst = std::max(worst, e);
    }
  }
  std::printf("cpp_bin_float_50: max relative error %.3f eps over all outputs\n", worst);
}

// =============================================================================================
// The committed mpmath table
// =============================================================================================

namespace {

struct decimal {
  mp v{512};
  explicit decimal(const char* s) { mpfr_set_str(v.v, s, 10, MPFR_RNDN); }
};

/// Every row with a = 2^j for a few j (exact scaling of tau and of t, x, lag), in T.
template <class T>
void check_table() {
  namespace td = eigenzeit_testdata;
  long checked = 0, refused = 0;
  std::int64_t worst = 0;
  for (const td::hyperbolic_row& row : td::hyperbolic_rows) {
    const decimal phi(row.phi);
    const T phi_t = ez_test::round_to<T>(phi.v);
    if (mpfr_cmp_ld(phi.v, static_cast<long double>(phi_t)) != 0) continue;  // not exact in T
    const char* expected[5] = {row.t, row.x, row.lag, row.beta, row.gamma};
    for (int j : {0, -7, 12}) {
      const T a = std::ldexp(T(1), j);
      const T tau = std::ldexp(phi_t, -j);
      const auto m = uniform_acceleration<T>::natural(a);
      T got[5];
      const eigenzeit::nan_policy nan;
      got[0] = m.coordinate_time(tau, nan);
      got[1] = m.distance(tau, nan);
      got[2] = m.time_lag(tau, nan);
      const auto s = m.speed_at(tau, nan);
      got[3] = s.beta();
      got[4] = s.gamma();
      for (int k = 0; k < 5; ++k) {
        decimal want(expected[k]);
        if (k < 3) mpfr_mul_2si(want.v.v, want.v.v, -j, MPFR_RNDN);  // t, x, lag scale as 1/a
        const T cr = ez_test::round_to<T>(want.v);
        INFO(std::string(type_name<T>()), " phi = ", std::string(row.phi), " a = 2^", j, " value ", k, ": ", std::string(row.note));
        const long double cosh_limit =
            std::log(static_cast<long double>(std::numeric_limits<T>::max())) + std::log(2.0L);
        if (!std::isfinite(cr) || !(static_cast<long double>(phi_t) < cosh_limit)) {
          CHECK(std::isnan(got[k]));  // beyond the range of T (or gamma is): refused
          ++refused;
          continue;
        }
        const ez_test::ulp_error e = ez_test::measure<T>(got[k], want.v);
        if (!e.normal) continue;  // outside the contract (subnormal or zero)
        CHECK(e.dist <= 2);
        worst = std::max(worst, e.dist);
        ++checked;
      }
    }
  }
  std::printf("mpmath table (tools/gen_timing_accelerated.py), %s: %ld values checked, max "
              "distance %lld ulp, %ld refused as beyond range\n",
              type_name<T>(), checked, static_cast<long long>(worst), refused);
  CHECK(checked > 100);
}

}  // namespace

TEST_CASE("the committed mpmath table (tools/gen_timing_accelerated.py, 50 digits)") {
  check_table<double>();
  check_table<long double>();
  check_table<float>();
}

// =============================================================================================
// Outside check
// =============================================================================================

TEST_CASE("1 g for one year of proper time: about 0.77 c, rapidity about 1.03") {
  // Standard acceleration of gravity g_n = 9.80665 m/s^2, exact by definition: declaration of
  // the 3rd CGPM (1901) (value quoted from memory).
  // Julian year = 365.25 d = 31 557 600 s, the year of the IAU time scales (common practice, no
  // source).
  // Fact of the trade (common practice, no source): one year at 1 g from rest reaches about
  // 0.77 c, rapidity g tau / c ~ 1.03.
  const double g = 9.80665;
  const double year = 365.25 * 86400.0;
  const auto m = uniform_acceleration<double>::si(g);
  const double phi = m.rapidity(year);
  const auto s = m.speed_at(year);
  std::printf("1 g for a Julian year: rapidity %.17g, beta %.17g, t %.17g s, x %.17g m\n", phi,
              s.beta(), m.coordinate_time(year), m.distance(year));
  CHECK(std::fabs(phi - 1.03) < 0.005);
  CHECK(std::fabs(s.beta() - 0.77) < 0.01);
  // The same against MPFR on the exact inputs.
  motion_reference ref(512);
  mp ma(64), mt(64), mc(64);
  mpfr_set_d(ma.v, g, MPFR_RNDN);
  mpfr_set_d(mt.v, year, MPFR_RNDN);
  set_c(mc.v, true);
  ref.compute(ma.v, mt.v, mc.v);
  CHECK(ez_test::measure<double>(phi, ref.phi.v).dist <= 1);
  CHECK(ez_test::measure<double>(s.beta(), ref.val[o_beta].v).dist <= 2);
  CHECK(ez_test::measure<double>(m.coordinate_time(year), ref.val[o_t].v).dist <= 2);
  CHECK(ez_test::measure<double>(m.distance(year), ref.val[o_x].v).dist <= 2);
  CHECK(ez_test::measure<double>(m.time_lag(year), ref.val[o_lag].v).dist <= 2);
  // In natural units with the year as time unit: a = g * year / c per year, tau = 1 year.
  const auto n = uniform_acceleration<double>::natural(g * year / 299792458.0);
  CHECK(std::fabs(n.speed_at(1.0).beta() - s.beta()) < 1e-15);
}

// =============================================================================================
// Round trips and identities
// =============================================================================================

namespace {

template <class T>
void round_trips_and_identities(bool si, long samples, unsigned long long seed) {
  std::mt19937_64 engine(seed);
  ez_test::sampler<T> gen(engine);
  const long double c = si ? 299792458.0L : 1.0L;
  std::int64_t worst_trip = 0;
  long double worst_id = 0;
  for (long i = 0; i < samples; ++i) {
    const T a = T(gen.log_uniform(1e-6L, 1e6L));
    const long double phi = gen.log_uniform(1e-30L, gen.max_rapidity());
    const T tau = T(phi * c / static_cast<long double>(a));
    const auto m = motion(a, si);
    const eigenzeit::nan_policy nan;
    const T t = m.coordinate_time(tau, nan);
    if (!std::isfinite(t)) continue;
    // tau(t(tau)) = tau: t carries <= 2 ulp, and d(tau)/tau = tanh(phi)/phi dt/t <= dt/t.
    const T back = m.proper_time(t);
    const std::int64_t d = eigenzeit::numeric::ulp_distance(back, tau);
    INFO(std::string(type_name<T>()), std::string(si ? " SI" : " natural"), " a = ", static_cast<double>(a), " tau = ",
         static_cast<double>(tau));
    CHECK(d <= 3);
    worst_trip = std::max(worst_trip, d);
    // x (x + 2 c^2 / a) = c^2 t^2, i.e. (cosh - 1)(cosh + 1) = sinh^2: every term positive.
    const T x = m.distance(tau, nan);
    if (std::isnormal(x) && x < std::sqrt(std::numeric_limits<T>::max()) / 1e20L &&
        t < std::sqrt(std::numeric_limits<T>::max()) / 1e20L) {
      const long double lx = x, lt = t, la = a;
      const long double lhs = lx * (lx + 2 * c * c / la);
      const long double rhs = c * c * lt * lt;
      const long double rel = std::fabs(lhs / rhs - 1);
      CHECK(rel <= 8 * static_cast<long double>(std::numeric_limits<T>::epsilon()));
      worst_id = std::max(worst_id, rel);
    }
    // The proper speed at tau is a t / c (sinh(phi) = a t / c).
    const auto s = m.speed_at(tau, nan);
    const long double u = static_cast<long double>(a) * static_cast<long double>(t) / c;
    if (std::isnormal(s.proper_speed()) && std::isnormal(static_cast<T>(u)))
      CHECK(std::fabs(s.proper_speed() / u - 1) <=
            4 * static_cast<long double>(std::numeric_limits<T>::epsilon()));
    // t - tau from time_lag against t and tau where no cancellation hides it (lag >= tau).
    const T lag = m.time_lag(tau, nan);
    if (std::isnormal(lag) && lag >= tau)
      CHECK(std::fabs((static_cast<long double>(lag) + tau) / t - 1) <=
            3 * static_cast<long double>(std::numeric_limits<T>::epsilon()));
  }
  std::printf("%s %s: round trip tau(t(tau)) max %lld ulp, x(x + 2c^2/a) = c^2 t^2 to %.3Lg\n",
              type_name<T>(), si ? "SI" : "natural", static_cast<long long>(worst_trip), worst_id);
}

}  // namespace

TEST_CASE("round trips and identities") {
  round_trips_and_identities<double>(false, sample_count(20000), 201);
  round_trips_and_identities<double>(true, sample_count(20000), 202);
  round_trips_and_identities<float>(false, sample_count(5000), 203);
  round_trips_and_identities<long double>(true, sample_count(5000), 204);
}

TEST_CASE("every output grows with the proper time") {
  std::mt19937_64 engine(211);
  ez_test::sampler<double> gen(engine);
  std::vector<double> taus;
  for (long i = 0; i < sample_count(20000); ++i) taus.push_back(static_cast<double>(gen.log_uniform(1e-300L, 700.0L)));
  std::sort(taus.begin(), taus.end());
  const auto m = uniform_acceleration<double>::natural(1.0);
  double prev[4] = {0, 0, 0, 0};
  long violations = 0;
  for (double tau : taus) {
    const double cur[4] = {m.coordinate_time(tau), m.distance(tau), m.time_lag(tau),
                           m.speed_at(tau).gamma()};
    for (int k = 0; k < 4; ++k) {
      if (cur[k] < prev[k]) ++violations;
      prev[k] = cur[k];
    }
  }
  CHECK(violations == 0);
}

// =============================================================================================
// Special values, range ends, errors
// =============================================================================================

namespace {

/// One case against MPFR with its own precision: every output within 2 ulp, or refused.
template <class T>
void check_case(T a, T tau, bool si) {
  const auto m = motion(a, si);
  T got[n_outputs];
  outputs(m, tau, got);
  const long double phi_est =
      static_cast<long double>(a) * static_cast<long double>(tau) / (si ? 299792458.0L : 1.0L);
  if (!(phi_est < std::log(static_cast<long double>(std::numeric_limits<T>::max())) +
                       std::log(2.0L))) {
    // cosh(phi) beyond the range: the Lorentz factor is not representable, all is refused.
    for (int o = 0; o < n_outputs; ++o) {
      INFO(std::string(type_name<T>()), " a = ", static_cast<double>(a), " tau = ", static_cast<double>(tau),
           " ", std::string(output_name(o)));
      CHECK(std::isnan(got[o]));
    }
    return;
  }
  motion_reference ref(motion_reference::precision_for(phi_est, std::numeric_limits<T>::digits));
  mp ma(128), mt(128), mc(64);
  ez_test::set_exact(ma.v, a);
  ez_test::set_exact(mt.v, tau);
  set_c(mc.v, si);
  ref.compute(ma.v, mt.v, mc.v);
  for (int o = 0; o < n_outputs; ++o) {
    INFO(std::string(type_name<T>()), " a = ", static_cast<double>(a), " tau = ", static_cast<double>(tau),
         std::string(si ? " SI " : " natural "), output_name(o));
    const T cr = ez_test::round_to<T>(ref.val[o].v);
    if (!std::isfinite(cr)) {
      CHECK(std::isnan(got[o]));
      continue;
    }
    INFO("got ", static_cast<long double>(got[o]), " want ", static_cast<long double>(cr));
    const ez_test::ulp_error e = ez_test::measure<T>(got[o], ref.val[o].v);
    if (e.normal) {
      CHECK(e.dist <= 2);
    } else {
      // Below the normal range (outside the contract): within a few subnormal steps.
      CHECK(std::fabs(static_cast<long double>(got[o]) - static_cast<long double>(cr)) <=
            4 * static_cast<long double>(std::numeric_limits<T>::denorm_min()));
    }
  }
}

}  // namespace

TEST_CASE_TEMPLATE("range ends: subnormal, tiny and huge accelerations and times", T, float, double,
                   long double) {
  const T den = std::numeric_limits<T>::denorm_min();
  const T tiny = std::numeric_limits<T>::min();
  const T big = std::numeric_limits<T>::max();
  for (bool si : {false, true}) {
    check_case<T>(den * 3, big / 1e10f, si);        // subnormal a, huge tau: phi small
    check_case<T>(tiny, T(1), si);                  // x = a tau^2 / 2 far below the normal range
    check_case<T>(T(1), den * 5, si);               // subnormal tau
    check_case<T>(tiny * 8, std::sqrt(big), si);    // a tau tiny, tau phi normal
    check_case<T>(big / 4, tiny * 64, si);          // huge a, tiny tau: phi ~ 16 / c
    check_case<T>(big / 2, T(2) * 2 / (big / 2), si);  // phi = 4 (natural) from huge a
    check_case<T>(T(1) / 1024, big / 2, si);        // results overflow: refused
    check_case<T>(T(0.5), T(8), si);
    check_case<T>(big, big, si);                    // a tau overflows: refused
  }
  // Rapidity at the limit of cosh (the Lorentz factor) in T: refused beyond; between the
  // limits of exp and of cosh, finite and accurate.
  const T limit = std::log(big) + std::log(T(2));
  const auto n = uniform_acceleration<T>::natural(T(1));
  CHECK(std::isnan(n.coordinate_time(limit * T(1.0001), eigenzeit::nan_policy())));
  CHECK_THROWS_AS(n.distance(limit * T(1.0001)), std::domain_error);
  CHECK_THROWS_AS(n.speed_at(limit * T(1.0001)), std::domain_error);
  CHECK(std::isfinite(n.coordinate_time(limit - T(0.01f))));
  for (bool si : {false, true}) {
    const T c = si ? T(299792458.0) : T(1);
    check_case<T>(T(1), std::log(big) + T(0.5), si);        // e^phi overflows, cosh does not
    check_case<T>(T(4) * c, (std::log(big) + T(0.25)) / 4, si);
  }
  // Inverse with a t beyond the largest finite value: asinh(a t / c) from logarithms.
  for (bool si : {false, true}) {
    const T a = big / 16, t = T(1e4f);
    const auto m = motion(a, si);
    const T got = m.proper_time(t);
    mp ma(128), mtt(128), mc(64), r(1024);
    ez_test::set_exact(ma.v, a);
    ez_test::set_exact(mtt.v, t);
    set_c(mc.v, si);
    mpfr_mul(r.v, ma.v, mtt.v, MPFR_RNDN);
    mpfr_div(r.v, r.v, mc.v, MPFR_RNDN);
    mpfr_asinh(r.v, r.v, MPFR_RNDN);
    mpfr_mul(r.v, r.v, mc.v, MPFR_RNDN);
    mpfr_div(r.v, r.v, ma.v, MPFR_RNDN);
    INFO(std::string(type_name<T>()), " inverse with a t overflowing, si = ", si);
    CHECK(ez_test::measure<T>(got, r.v).dist <= 2);
  }
}

TEST_CASE_TEMPLATE("zero, signed zero and rest", T, float, double, long double) {
  for (bool si : {false, true}) {
    const auto m = motion(T(3), si);
    for (T zero : {T(0), -T(0)}) {
      CHECK(m.coordinate_time(zero) == 0);
      CHECK(!std::signbit(m.coordinate_time(zero)));  // -0 counts as +0
      CHECK(m.distance(zero) == 0);
      CHECK(m.time_lag(zero) == 0);
      CHECK(m.rapidity(zero) == 0);
      CHECK(m.proper_time(zero) == 0);
      CHECK(!std::signbit(m.proper_time(zero)));
      const auto s = m.speed_at(zero);
      CHECK(s.beta() == 0);
      CHECK(s.gamma() == 1);
    }
    CHECK(m.acceleration() == 3);
  }
  // Tiny times: t = tau, tau(t) = t to the last bit.
  const auto m = uniform_acceleration<T>::natural(T(1));
  const T small = std::sqrt(std::numeric_limits<T>::epsilon()) / 64;
  CHECK(m.coordinate_time(small) == small);
  CHECK(m.proper_time(small) == small);
  CHECK(m.rapidity(small) == small);
}

TEST_CASE("bad input: every domain error, for each policy") {
  using M = uniform_acceleration<double>;
  const double nan = std::numeric_limits<double>::quiet_NaN();
  const double inf = std::numeric_limits<double>::infinity();
  for (double bad : {0.0, -0.0, -1.0, -1e-300, inf, -inf, nan}) {
    ez_test::check_all_policies("natural", bad, [](double a, auto p) { return M::natural(a, p).acceleration(); });
    ez_test::check_all_policies("si", bad, [](double a, auto p) { return M::si(a, p).acceleration(); });
  }
  const M m = M::natural(2.0);
  for (double bad : {-1.0, -1e-300, inf, -inf, nan}) {
    ez_test::check_all_policies("coordinate_time", bad, [&m](double x, auto p) { return m.coordinate_time(x, p); });
    ez_test::check_all_policies("distance", bad, [&m](double x, auto p) { return m.distance(x, p); });
    ez_test::check_all_policies("time_lag", bad, [&m](double x, auto p) { return m.time_lag(x, p); });
    ez_test::check_all_policies("rapidity", bad, [&m](double x, auto p) { return m.rapidity(x, p); });
    ez_test::check_all_policies("speed_at", bad, [&m](double x, auto p) { return m.speed_at(x, p).gamma(); });
    ez_test::check_all_policies("proper_time", bad, [&m](double x, auto p) { return m.proper_time(x, p); });
  }
  // Results beyond the largest finite value, and rapidities beyond exp's range.
  const M slow = M::natural(1e-10);
  ez_test::check_all_policies("coordinate_time", 7e12, [&slow](double x, auto p) { return slow.coordinate_time(x, p); });
  ez_test::check_all_policies("distance", 7e12, [&slow](double x, auto p) { return slow.distance(x, p); });
  ez_test::check_all_policies("time_lag", 7e12, [&slow](double x, auto p) { return slow.time_lag(x, p); });
  for (double bad : {710.0, 1e300}) {
    ez_test::check_all_policies("coordinate_time", bad, [&m](double x, auto p) { return m.coordinate_time(x, p); });
    ez_test::check_all_policies("speed_at", bad, [&m](double x, auto p) { return m.speed_at(x, p).beta(); });
  }
  ez_test::check_all_policies("rapidity", 1e308, [&m](double x, auto p) { return m.rapidity(x, p); });
  // An acceleration made invalid under the NaN policy answers NaN to every query, quietly.
  const M broken = M::natural(-1.0, eigenzeit::nan_policy());
  errno = 0;
  CHECK(std::isnan(broken.coordinate_time(1.0)));
  CHECK(std::isnan(broken.distance(1.0)));
  CHECK(std::isnan(broken.proper_time(1.0)));
  CHECK(std::isnan(broken.speed_at(1.0).gamma()));
  CHECK(errno == 0);
  static_assert(std::is_trivially_copyable<M>::value, "uniform_acceleration is a plain value");
}
