// Tests of include/eigenzeit/speed.hpp: accuracy sweeps against MPFR, the committed mpmath
// table, outside checks, identities, round trips, monotonicity, special values and errors.
#include <doctest/doctest.h>

#include <algorithm>
#include <cerrno>
#include <cmath>
#include <cstdio>
#include <cstring>
#include <limits>
#include <random>
#include <stdexcept>
#include <string>
#include <type_traits>
#include <vector>

#include <eigenzeit/speed.hpp>

#include "data/speed_reference.hpp"
#include "support/reference.hpp"
#include "support/sampler.hpp"
#include "support/policy_checks.hpp"

#if defined(BOOST_HAS_FLOAT128)
#include <boost/multiprecision/float128.hpp>
#endif

using eigenzeit::speed;
using ez_test::ctor;
using ez_test::construct;
using ez_test::mp;
using ez_test::sampler;
using ez_test::views_of;

namespace {

using ez_test::type_name;

/// Allowed ulp distance to the correctly rounded value (DESIGN.md, precision contract):
/// 1 for algebraic views of algebraically built speeds, 2 where exp or log enters.
int tolerance(ctor c, int view) {
  if (view == ez_test::v_rapidity || c == ctor::rapidity) return 2;
  return 1;
}

long sample_count(long full) { return ez_test::quick() ? std::max(500L, full / 20) : full; }

const ctor all_ctors[] = {ctor::beta,         ctor::beta_deficit,   ctor::gamma,
                          ctor::gamma_m1,     ctor::rapidity,       ctor::proper_speed,
                          ctor::kinetic_energy, ctor::momentum};

/// The sweep for one built-in type: every constructor, every view, against MPFR.
template <class T>
void sweep_builtin(long samples, unsigned long long seed) {
  std::printf("\n%s: %ld samples per constructor (max/mean in ulps of the correctly rounded "
              "result; 'cr' = share correctly rounded)\n",
              type_name<T>(), samples);
  for (ctor c : all_ctors) {
    std::mt19937_64 engine(seed + static_cast<unsigned long long>(c));
    sampler<T> gen(engine);
    ez_test::ulp_stats stats[ez_test::n_views];
    for (long i = 0; i < samples; ++i) {
      T x = T(0), y = T(1);
      gen.draw(c, x, y);
      const speed<T> s = construct(c, x, y);
      T got[ez_test::n_views];
      views_of(s, got);
      const ez_test::reference ref(c, x, y, std::numeric_limits<T>::digits);
      for (int v = 0; v < ez_test::n_views; ++v)
        stats[v].add(ez_test::measure<T>(got[v], ref.val[v].v), x, y);
    }
    for (int v = 0; v < ez_test::n_views; ++v) {
      const auto& st = stats[v];
      std::printf("  %-20s %-18s max %.3f (dist %lld) mean %.4f cr %.5f  [subnormal results %ld, "
                  "max dist %lld]  worst input %.21Lg %.6Lg\n",
                  ez_test::ctor_name(c), ez_test::view_name(v), st.max_frac,
                  static_cast<long long>(st.max_dist), st.mean(), st.share_exact(),
                  st.n_subnormal, static_cast<long long>(st.max_dist_subnormal), st.worst_input,
                  st.worst_input2);
      INFO(type_name<T>(), " ", ez_test::ctor_name(c), " ", ez_test::view_name(v),
           " worst input ", static_cast<double>(st.worst_input));
      CHECK(st.max_dist <= tolerance(c, v));
      CHECK(st.n > samples / 4);  // the contract region was actually exercised
    }
  }
}

/// Free functions of signed beta against the same reference.
template <class T>
void sweep_free(long samples, unsigned long long seed) {
  std::mt19937_64 engine(seed);
  sampler<T> gen(engine);
  ez_test::ulp_stats st[5];
  const char* names[5] = {"lorentz_factor", "lorentz_factor_m1", "proper_speed",
                          "dilation_fraction", "rapidity"};
  const int view_of[5] = {ez_test::v_gamma, ez_test::v_gamma_m1, ez_test::v_proper_speed,
                          ez_test::v_dilation, ez_test::v_rapidity};
  for (long i = 0; i < samples; ++i) {
    T a = T(0), unused = T(1);
    gen.draw(ctor::beta, a, unused);
    const bool negative = (gen.rng() & 1) != 0;
    const T b = negative ? -a : a;
    const T got[5] = {eigenzeit::lorentz_factor(b), eigenzeit::lorentz_factor_m1(b),
                      eigenzeit::proper_speed(b), eigenzeit::dilation_fraction(b),
                      eigenzeit::rapidity(b)};
    const ez_test::reference ref(ctor::beta, a, 1, std::numeric_limits<T>::digits);
    for (int k = 0; k < 5; ++k) {
      const bool odd = (k == 2 || k == 4);  // proper speed and rapidity keep the sign
      const T g = (odd && negative) ? -got[k] : got[k];
      st[k].add(ez_test::measure<T>(g, ref.val[view_of[k]].v), b);
      if (odd && negative && a != 0) CHECK(got[k] < 0);
    }
  }
  std::printf("\n%s free functions of signed beta, %ld samples:\n", type_name<T>(), samples);
  for (int k = 0; k < 5; ++k) {
    std::printf("  %-18s max %.3f (dist %lld) mean %.4f cr %.5f [subnormal %ld]  worst %.21Lg\n",
                names[k], st[k].max_frac, static_cast<long long>(st[k].max_dist), st[k].mean(),
                st[k].share_exact(), st[k].n_subnormal, st[k].worst_input);
    INFO(type_name<T>(), " ", names[k], " worst input ", static_cast<double>(st[k].worst_input));
    CHECK(st[k].max_dist <= (k == 4 ? 2 : 1));
  }
}

/// Multiprecision types: relative error in units of the type's epsilon, contract <= 8.
template <class T>
void sweep_multiprecision(long samples, unsigned long long seed) {
  double worst[ez_test::n_views] = {};
  for (ctor c : all_ctors) {
    std::mt19937_64 engine(seed + static_cast<unsigned long long>(c));
    sampler<double> gen(engine);
    for (long i = 0; i < samples; ++i) {
      double xd = 0, yd = 1;
      gen.draw(c, xd, yd);
      const T x(xd), y(yd);
      const speed<T> s = construct(c, x, y);
      T got[ez_test::n_views];
      views_of(s, got);
      const ez_test::reference ref(c, xd, yd, std::numeric_limits<T>::digits);
      for (int v = 0; v < ez_test::n_views; ++v) {
        if (mpfr_zero_p(ref.val[v].v)) continue;
        const double e = ez_test::measure_eps(got[v], ref.val[v].v);
        INFO(type_name<T>(), " ", ez_test::ctor_name(c), " ", ez_test::view_name(v), " input ", xd, " ", yd);
        CHECK(e <= 8.0);
        worst[v] = std::max(worst[v], e);
      }
    }
  }
  std::printf("\n%s, %ld samples per constructor: max relative error in eps per view:\n",
              type_name<T>(), samples);
  for (int v = 0; v < ez_test::n_views; ++v)
    std::printf("  %-18s %.3f\n", ez_test::view_name(v), worst[v]);
}

}  // namespace

// =============================================================================================

TEST_CASE("speed<T> views from every constructor: sweep against MPFR (double)") {
  sweep_builtin<double>(sample_count(100000), 1);
}

TEST_CASE("speed<T> views from every constructor: sweep against MPFR (long double)") {
  sweep_builtin<long double>(sample_count(20000), 2);
}

TEST_CASE("speed<T> views from every constructor: sweep against MPFR (float)") {
  sweep_builtin<float>(sample_count(20000), 3);
}

TEST_CASE("free functions of signed beta: sweep against MPFR") {
  sweep_free<double>(sample_count(100000), 11);
  sweep_free<long double>(sample_count(20000), 12);
  sweep_free<float>(sample_count(20000), 13);
}

TEST_CASE("multiprecision types stay within 8 epsilon") {
  sweep_multiprecision<ez_test::cpp50>(sample_count(400), 21);
  sweep_multiprecision<ez_test::mpfr100>(sample_count(400), 22);
#if defined(BOOST_HAS_FLOAT128)
  sweep_multiprecision<boost::multiprecision::float128>(sample_count(1000), 23);
#endif
}

// =============================================================================================
// Outside checks
// =============================================================================================

namespace {

ctor ctor_from_name(const std::string& n) {
  if (n == "beta") return ctor::beta;
  if (n == "beta_deficit") return ctor::beta_deficit;
  if (n == "gamma") return ctor::gamma;
  if (n == "gamma_m1") return ctor::gamma_m1;
  if (n == "rapidity") return ctor::rapidity;
  if (n == "proper_speed") return ctor::proper_speed;
  if (n == "kinetic_energy") return ctor::kinetic_energy;
  return ctor::momentum;
}

/// Parses a decimal string (40 significant digits from the mpmath table) into MPFR.
struct decimal {
  mp v{400};
  explicit decimal(const char* s) { mpfr_set_str(v.v, s, 10, MPFR_RNDN); }
};

/// Every row of the committed mpmath table (tools/gen_speed_reference.py, 60 digits), in T.
template <class T>
void check_table() {
  namespace td = eigenzeit_testdata;
  long checked = 0;
  int worst = 0;
  for (const td::speed_row& row : td::speed_rows) {
    const ctor c = ctor_from_name(row.ctor);
    const T x = ez_test::round_to<T>(decimal(row.input).v);
    const T y = (*row.input2 != 0) ? ez_test::round_to<T>(decimal(row.input2).v) : T(1);
    // Rows whose gamma or proper speed is beyond T's range must be refused by the constructor.
    const decimal g(row.gamma);
    const bool representable = std::isfinite(ez_test::round_to<T>(g.v)) &&
                               std::isfinite(ez_test::round_to<T>(decimal(row.proper_speed).v));
    if (!representable) {
      INFO(type_name<T>(), " row ", row.note);
      CHECK_THROWS_AS(construct(c, x, y), std::domain_error);
      continue;
    }
    const speed<T> s = construct(c, x, y);
    T got[ez_test::n_views];
    views_of(s, got);
    const char* expected[ez_test::n_views] = {row.beta, row.beta_deficit, row.gamma,
                                              row.gamma_m1, row.inv_gamma, row.dilation_fraction,
                                              row.rapidity, row.proper_speed};
    for (int v = 0; v < ez_test::n_views; ++v) {
      const ez_test::ulp_error e = ez_test::measure<T>(got[v], decimal(expected[v]).v);
      if (!e.normal) continue;  // outside the precision contract (subnormal or zero)
      INFO(type_name<T>(), " ", row.ctor, "(", row.input, ", ", row.input2, ") ",
           ez_test::view_name(v), ": ", row.note);
      CHECK(e.dist <= tolerance(c, v));
      worst = std::max<int>(worst, static_cast<int>(e.dist));
      ++checked;
    }
  }
  std::printf("mpmath table, %s: %ld values checked, max distance %d ulp\n", type_name<T>(),
              checked, worst);
  CHECK(checked > 1000);
}

}  // namespace

TEST_CASE("the committed mpmath table (tools/gen_speed_reference.py, 60 digits)") {
  check_table<float>();
  check_table<double>();
  check_table<long double>();
}

TEST_CASE("proton at 6.8 TeV: CODATA 2018 rest energy against mpmath") {
  namespace td = eigenzeit_testdata;
  // Proton rest energy 938.27208816 MeV: CODATA 2018 recommended values (NIST).
  // Beam energy 6.8 TeV per beam: the LHC Run 3 figure, quoted from memory.
  // The mpmath values are for the exact decimal inputs; in double the inputs are rounded
  // once (relative 1.1e-16 each), which can move a view by up to ~2 ulp: 4 ulp allowed here.
  // Against MPFR on the rounded inputs themselves the contract (1 ulp) applies.
  const double mass = 938.27208816;
  const double kinetic = 6799061.72791184;
  const double energy = 6800000.0;
  const auto s = speed<double>::from_kinetic_energy(kinetic, mass);
  const auto s_gamma = speed<double>::from_gamma(energy / mass);
  const decimal gamma(td::proton_lhc_run3.gamma), deficit(td::proton_lhc_run3.beta_deficit),
      eta(td::proton_lhc_run3.rapidity), gm1(td::proton_lhc_run3.gamma_m1);
  CHECK(ez_test::measure<double>(s.gamma(), gamma.v).dist <= 4);
  CHECK(ez_test::measure<double>(s.beta_deficit(), deficit.v).dist <= 4);
  CHECK(ez_test::measure<double>(s.rapidity(), eta.v).dist <= 4);
  CHECK(ez_test::measure<double>(s.gamma_m1(), gm1.v).dist <= 4);
  CHECK(ez_test::measure<double>(s_gamma.beta_deficit(), deficit.v).dist <= 8);
  std::printf("proton 6.8 TeV: gamma %.17g, 1 - beta %.17g, rapidity %.17g\n", s.gamma(),
              s.beta_deficit(), s.rapidity());
  // The naive 1 - beta from beta = sqrt(1 - 1/gamma^2) in double keeps only a few digits.
  const double g = energy / mass;
  const double naive_deficit = 1.0 - std::sqrt(1.0 - 1.0 / (g * g));
  std::printf("  naive 1 - beta: %.17g (%d ulp off)\n", naive_deficit,
              static_cast<int>(std::min<std::int64_t>(
                  1000000000, ez_test::measure<double>(naive_deficit, deficit.v).dist)));
  CHECK(ez_test::measure<double>(naive_deficit, deficit.v).dist > 1000);
}

TEST_CASE("facts of the trade: c/39000 and 0.995 c") {
  namespace td = eigenzeit_testdata;
  // Common practice, no source: a craft in low orbit at about c/39000 has gamma - 1 close to
  // 3.3e-10, and a naive double evaluation of 1/sqrt(1 - b^2) - 1 keeps only a few digits.
  const double b = 1.0 / 39000.0;
  const decimal gm1(td::craft_c_over_39000.gamma_m1);
  const double careful = eigenzeit::lorentz_factor_m1(b);
  const double naive = 1.0 / std::sqrt(1.0 - b * b) - 1.0;
  CHECK(ez_test::measure<double>(careful, gm1.v).dist <= 1);
  CHECK(std::fabs(careful / 3.3e-10 - 1) < 0.01);
  const auto naive_err = ez_test::measure<double>(naive, gm1.v);
  std::printf("c/39000: careful gamma-1 %.17g, naive %.17g (%.3g ulp off)\n", careful, naive,
              naive_err.frac);
  CHECK(naive_err.frac > 1e4);  // the loss the library exists to remove
  // Common practice, no source: at 0.995 c, gamma is close to 10.0.
  const decimal g995(td::beta_0_995.gamma);
  const double gamma = eigenzeit::lorentz_factor(0.995);
  CHECK(ez_test::measure<double>(gamma, g995.v).dist <= 1);
  CHECK(std::fabs(gamma - 10.0) < 0.02);
}

// =============================================================================================
// Identities, round trips, monotonicity
// =============================================================================================

namespace {

template <class T>
std::int64_t dist(T a, T b) {
  return eigenzeit::numeric::ulp_distance(a, b);
}

template <class T>
void round_trips(long samples) {
  std::mt19937_64 engine(31);
  sampler<T> gen(engine);
  std::int64_t worst[8] = {};
  for (long i = 0; i < samples; ++i) {
    T x = T(0), y = T(1);
    gen.draw(ctor::beta, x, y);
    const speed<T> s = speed<T>::from_beta(x);
    // from_X(view X) gives back view X within 2 ulp.
    const T b = s.beta(), d = s.beta_deficit(), g = s.gamma(), m = s.gamma_m1(),
            e = s.rapidity(), u = s.proper_speed();
    const std::int64_t r[8] = {
        dist(speed<T>::from_beta(b).beta(), b),
        d > 0 ? dist(speed<T>::from_beta_deficit(d).beta_deficit(), d) : 0,
        dist(speed<T>::from_gamma(g).gamma(), g),
        dist(speed<T>::from_gamma_m1(m).gamma_m1(), m),
        dist(speed<T>::from_rapidity(e).rapidity(), e),
        dist(speed<T>::from_proper_speed(u).proper_speed(), u),
        dist(speed<T>::from_kinetic_energy(m, T(1)).gamma_m1(), m),
        dist(speed<T>::from_momentum(u, T(1)).proper_speed(), u)};
    for (int k = 0; k < 8; ++k) {
      INFO(type_name<T>(), " round trip ", k, " at beta ", static_cast<double>(x));
      CHECK(r[k] <= 2);
      worst[k] = std::max(worst[k], r[k]);
    }
    // beta back from gamma - 1 and from the proper speed (condition numbers 1/2 and <= 1).
    if (std::isnormal(m)) CHECK(dist(speed<T>::from_gamma_m1(m).beta(), b) <= 2);
    if (std::isnormal(u)) CHECK(dist(speed<T>::from_proper_speed(u).beta(), b) <= 2);
  }
  std::printf("round trips %s: max ulp beta %lld deficit %lld gamma %lld gamma_m1 %lld rapidity "
              "%lld proper_speed %lld kinetic %lld momentum %lld\n",
              type_name<T>(), (long long)worst[0], (long long)worst[1], (long long)worst[2],
              (long long)worst[3], (long long)worst[4], (long long)worst[5], (long long)worst[6],
              (long long)worst[7]);
}

template <class T>
void identities(long samples) {
  std::mt19937_64 engine(41);
  sampler<T> gen(engine);
  for (long i = 0; i < samples; ++i) {
    T x = T(0), y = T(1);
    gen.draw(ctor::gamma_m1, x, y);
    const speed<T> s = speed<T>::from_gamma_m1(x);
    // gamma^2 - (beta gamma)^2 = 1, written without cancellation:
    // (gamma - beta gamma)(gamma + beta gamma) = gamma (1 - beta) (gamma + u) = 1.
    const T d = s.beta_deficit();
    if (std::isnormal(d) && s.gamma() < std::sqrt(std::numeric_limits<T>::max()) / 4) {
      long double lhs = static_cast<long double>(s.gamma()) * static_cast<long double>(d) *
                        (static_cast<long double>(s.gamma()) + static_cast<long double>(s.proper_speed()));
      INFO(type_name<T>(), " gamma_m1 = ", static_cast<double>(x));
      CHECK(std::fabs(lhs - 1.0L) <= 6 * static_cast<long double>(std::numeric_limits<T>::epsilon()));
    }
    // (gamma - 1)(gamma + 1) = u^2, relative.
    const T m = s.gamma_m1(), u = s.proper_speed();
    if (std::isnormal(m) && std::isnormal(u * u) && m < std::sqrt(std::numeric_limits<T>::max()) / 4) {
      long double lhs = static_cast<long double>(m) * (static_cast<long double>(m) + 2);
      long double rhs = static_cast<long double>(u) * static_cast<long double>(u);
      CHECK(std::fabs(lhs / rhs - 1.0L) <= 6 * static_cast<long double>(std::numeric_limits<T>::epsilon()));
    }
    // 1 / gamma times gamma is 1, dilation fraction = (gamma - 1) / gamma.
    CHECK(std::fabs(static_cast<long double>(s.inv_gamma()) * static_cast<long double>(s.gamma()) - 1.0L) <=
          2 * static_cast<long double>(std::numeric_limits<T>::epsilon()));
  }
}

template <class T>
void monotonic(long samples) {
  std::mt19937_64 engine(51);
  sampler<T> gen(engine);
  std::vector<T> betas;
  for (long i = 0; i < samples; ++i) {
    T x = T(0), y = T(1);
    gen.draw(ctor::beta, x, y);
    betas.push_back(x);
  }
  std::sort(betas.begin(), betas.end());
  T prev[ez_test::n_views];
  views_of(speed<T>::from_beta(betas.front()), prev);
  T prev_free[5] = {eigenzeit::lorentz_factor(betas.front()), eigenzeit::lorentz_factor_m1(betas.front()),
                    eigenzeit::proper_speed(betas.front()), eigenzeit::dilation_fraction(betas.front()),
                    eigenzeit::rapidity(betas.front())};
  long violations = 0;
  for (std::size_t i = 1; i < betas.size(); ++i) {
    T cur[ez_test::n_views];
    views_of(speed<T>::from_beta(betas[i]), cur);
    for (int v = 0; v < ez_test::n_views; ++v) {
      const bool decreasing = (v == ez_test::v_deficit || v == ez_test::v_inv_gamma);
      if (decreasing ? cur[v] > prev[v] : cur[v] < prev[v]) ++violations;
      prev[v] = cur[v];
    }
    const T b = betas[i];
    const T cur_free[5] = {eigenzeit::lorentz_factor(b), eigenzeit::lorentz_factor_m1(b),
                           eigenzeit::proper_speed(b), eigenzeit::dilation_fraction(b),
                           eigenzeit::rapidity(b)};
    for (int k = 0; k < 5; ++k) {
      if (cur_free[k] < prev_free[k]) ++violations;
      prev_free[k] = cur_free[k];
    }
  }
  INFO(type_name<T>());
  CHECK(violations == 0);
}

}  // namespace

TEST_CASE("round trips from_X(view X) within 2 ulp") {
  round_trips<double>(sample_count(50000));
  round_trips<long double>(sample_count(10000));
  round_trips<float>(sample_count(10000));
}

TEST_CASE("identities without cancellation") {
  identities<double>(sample_count(50000));
  identities<float>(sample_count(10000));
}

TEST_CASE("every view and free function is monotonic over sorted speeds") {
  monotonic<double>(sample_count(100000));
  monotonic<long double>(sample_count(20000));
  monotonic<float>(sample_count(20000));
}

// =============================================================================================
// Special values, boundaries, layout
// =============================================================================================

TEST_CASE_TEMPLATE("special values of the free functions", T, float, double, long double) {
  const T zero = T(0), nzero = -T(0);
  CHECK(eigenzeit::lorentz_factor(zero) == 1);
  CHECK(eigenzeit::lorentz_factor(nzero) == 1);
  CHECK(eigenzeit::lorentz_factor_m1(nzero) == 0);
  CHECK(eigenzeit::dilation_fraction(nzero) == 0);
  CHECK(std::signbit(eigenzeit::proper_speed(nzero)));
  CHECK(std::signbit(eigenzeit::rapidity(nzero)));
  CHECK(!std::signbit(eigenzeit::proper_speed(zero)));
  // Subnormal beta: gamma = 1, proper speed and rapidity equal beta, gamma - 1 rounds to 0.
  const T sub = std::numeric_limits<T>::denorm_min() * 3;
  CHECK(eigenzeit::lorentz_factor(sub) == 1);
  CHECK(eigenzeit::proper_speed(sub) == sub);
  CHECK(eigenzeit::proper_speed(-sub) == -sub);
  CHECK(eigenzeit::rapidity(sub) == sub);
  CHECK(eigenzeit::lorentz_factor_m1(sub) == 0);
  // The largest beta below 1 against MPFR.
  const T top = std::nextafter(T(1), T(0));
  mp b(512), one(512);
  ez_test::set_exact(b.v, top);
  mpfr_set_ui(one.v, 1, MPFR_RNDN);
  ez_test::reference ref(512);
  ref.compute(ctor::beta, b.v, one.v);
  CHECK(ez_test::measure<T>(eigenzeit::lorentz_factor(top), ref.val[ez_test::v_gamma].v).dist <= 1);
  CHECK(ez_test::measure<T>(eigenzeit::lorentz_factor_m1(-top), ref.val[ez_test::v_gamma_m1].v).dist <= 1);
  CHECK(ez_test::measure<T>(eigenzeit::rapidity(top), ref.val[ez_test::v_rapidity].v).dist <= 2);
  CHECK(ez_test::measure<T>(eigenzeit::dilation_fraction(top), ref.val[ez_test::v_dilation].v).dist <= 1);
  CHECK(ez_test::measure<T>(eigenzeit::proper_speed(top), ref.val[ez_test::v_proper_speed].v).dist <= 1);
  // Integer arguments promote to double.
  CHECK(std::is_same<decltype(eigenzeit::lorentz_factor(0)), double>::value);
  CHECK(eigenzeit::lorentz_factor(0) == 1.0);
}

TEST_CASE_TEMPLATE("speed<T> special values and layout", T, float, double, long double) {
  static_assert(std::is_trivially_copyable<speed<T>>::value, "speed<T> must be trivially copyable");
  static_assert(sizeof(speed<T>) == 4 * sizeof(T), "speed<T> holds four words");
  const speed<T> rest;
  CHECK(rest.beta() == 0);
  CHECK(rest.gamma() == 1);
  CHECK(rest.gamma_m1() == 0);
  CHECK(rest.beta_deficit() == 1);
  CHECK(rest.rapidity() == 0);
  CHECK(speed<T>::from_beta(-T(0)).beta() == 0);
  CHECK(speed<T>::from_gamma(T(1)).beta() == 0);
  CHECK(speed<T>::from_beta_deficit(T(1)).beta() == 0);
  // Subnormal inputs are ordinary inputs.
  const T sub = std::numeric_limits<T>::denorm_min() * 5;
  CHECK(speed<T>::from_beta(sub).proper_speed() == sub);
  CHECK(speed<T>::from_proper_speed(sub).beta() == sub);
  CHECK(speed<T>::from_gamma_m1(sub).gamma_m1() == sub);
  const T tiny_d = std::numeric_limits<T>::denorm_min() * 7;
  const auto fast = speed<T>::from_beta_deficit(tiny_d);
  CHECK(fast.beta_deficit() == tiny_d);
  CHECK(fast.beta() == 1);  // correctly rounded: 1 - tiny rounds to 1
  // 1 - d must be resolved: about |log2 d| bits plus margin (16500 for long double).
  const mpfr_prec_t prec = 256 + 2 * std::abs(std::ilogb(tiny_d));
  mp d(prec), one(16);
  ez_test::set_exact(d.v, tiny_d);
  mpfr_set_ui(one.v, 1, MPFR_RNDN);
  ez_test::reference ref(prec);
  ref.compute(ctor::beta_deficit, d.v, one.v);
  CHECK(ez_test::measure<T>(fast.gamma(), ref.val[ez_test::v_gamma].v).dist <= 1);
  CHECK(ez_test::measure<T>(fast.inv_gamma(), ref.val[ez_test::v_inv_gamma].v).dist <= 1);
  CHECK(ez_test::measure<T>(fast.rapidity(), ref.val[ez_test::v_rapidity].v).dist <= 2);
  // Largest finite inputs.
  const T big = std::numeric_limits<T>::max();
  CHECK(speed<T>::from_proper_speed(big).gamma() == big);
  CHECK(speed<T>::from_gamma(big).gamma() == big);
  CHECK(speed<T>::from_gamma(big).beta() == 1);
  CHECK(speed<T>::from_gamma(big).beta_deficit() == 0);  // 1/(2 gamma^2) underflows
  CHECK(std::isfinite(speed<T>::from_gamma(big).rapidity()));
  CHECK(speed<T>::from_kinetic_energy(big, big / 2).gamma() == 3);
}

namespace {

template <class Policy>
void expect_invalid(const speed<double>& s, const Policy&) {
  double v[ez_test::n_views];
  views_of(s, v);
  for (double x : v) CHECK(std::isnan(x));
}


}  // namespace

TEST_CASE("bad input: every domain error, for each policy") {
  const double nan = std::numeric_limits<double>::quiet_NaN();
  const double inf = std::numeric_limits<double>::infinity();
  for (double bad : {1.0, -1.0, 1.5, -2.0, inf, -inf, nan}) {
    ez_test::check_all_policies("lorentz_factor", bad, [](double b, auto p) { return eigenzeit::lorentz_factor(b, p); });
    ez_test::check_all_policies("lorentz_factor_m1", bad, [](double b, auto p) { return eigenzeit::lorentz_factor_m1(b, p); });
    ez_test::check_all_policies("rapidity", bad, [](double b, auto p) { return eigenzeit::rapidity(b, p); });
    ez_test::check_all_policies("proper_speed", bad, [](double b, auto p) { return eigenzeit::proper_speed(b, p); });
    ez_test::check_all_policies("dilation_fraction", bad, [](double b, auto p) { return eigenzeit::dilation_fraction(b, p); });
  }
  using S = speed<double>;
  for (double bad : {-0.1, 1.0, 2.0, inf, nan})
    ez_test::check_all_policies("from_beta", bad, [](double x, auto p) { return S::from_beta(x, p).gamma(); });
  for (double bad : {0.0, -0.5, 1.5, inf, nan})
    ez_test::check_all_policies("from_beta_deficit", bad, [](double x, auto p) { return S::from_beta_deficit(x, p).gamma(); });
  for (double bad : {0.5, -1.0, inf, nan})
    ez_test::check_all_policies("from_gamma", bad, [](double x, auto p) { return S::from_gamma(x, p).beta(); });
  for (double bad : {-1e-300, -1.0, inf, nan})
    ez_test::check_all_policies("from_gamma_m1", bad, [](double x, auto p) { return S::from_gamma_m1(x, p).beta(); });
  for (double bad : {-1e-300, -1.0, inf, nan, 800.0})
    ez_test::check_all_policies("from_rapidity", bad, [](double x, auto p) { return S::from_rapidity(x, p).beta(); });
  for (double bad : {-1e-300, -1.0, inf, nan})
    ez_test::check_all_policies("from_proper_speed", bad, [](double x, auto p) { return S::from_proper_speed(x, p).beta(); });
  // Energy constructors: bad kinetic energy or momentum, then bad mass, then overflow.
  for (double bad : {-1.0, inf, nan}) {
    ez_test::check_all_policies("from_kinetic_energy", bad, [](double x, auto p) { return S::from_kinetic_energy(x, 1.0, p).beta(); });
    ez_test::check_all_policies("from_momentum", bad, [](double x, auto p) { return S::from_momentum(x, 1.0, p).beta(); });
  }
  for (double bad : {0.0, -1.0, inf, nan}) {
    ez_test::check_all_policies("from_kinetic_energy", bad, [](double m, auto p) { return S::from_kinetic_energy(1.0, m, p).beta(); });
    ez_test::check_all_policies("from_momentum", bad, [](double m, auto p) { return S::from_momentum(1.0, m, p).beta(); });
  }
  ez_test::check_all_policies("from_kinetic_energy", 1e300, [](double k, auto p) { return S::from_kinetic_energy(k, 1e-300, p).beta(); });
  ez_test::check_all_policies("from_momentum", 1e300, [](double k, auto p) { return S::from_momentum(k, 1e-300, p).beta(); });
  // An invalid speed built under the NaN policy has every view NaN.
  expect_invalid(S::from_beta(2.0, eigenzeit::nan_policy()), eigenzeit::nan_policy());
  expect_invalid(S::from_gamma(0.0, eigenzeit::nan_policy()), eigenzeit::nan_policy());
}
