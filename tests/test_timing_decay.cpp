// Tests of include/eigenzeit/timing/decay.hpp: accuracy sweeps against MPFR, outside checks
// (PDG muon mean life), identities, limits, special values and errors under every policy.
#include <doctest/doctest.h>

#include <algorithm>
#include <cerrno>
#include <cmath>
#include <cstdio>
#include <limits>
#include <random>
#include <stdexcept>
#include <string>
#include <vector>

#include <eigenzeit/constants.hpp>
#include <eigenzeit/timing/decay.hpp>

#include "support/reference.hpp"
#include "support/sampler.hpp"
#include "support/policy_checks.hpp"

using eigenzeit::speed;
using ez_test::ctor;
using ez_test::mp;
using ez_test::type_name;

namespace {

long sample_count(long full) { return ez_test::quick() ? std::max(300L, full / 20) : full; }

const ctor all_ctors[] = {ctor::beta,     ctor::beta_deficit, ctor::gamma,          ctor::gamma_m1,
                          ctor::rapidity, ctor::proper_speed, ctor::kinetic_energy, ctor::momentum};

enum output : int { o_length, o_survival, o_decay, n_outputs };
const char* output_name(int o) {
  static const char* names[] = {"mean_decay_length", "survival_probability", "decay_probability"};
  return names[o];
}

/// The three quantities for exact inputs, by their definitions, in MPFR: L = u c_tau,
/// P = exp(-d / L), 1 - P = -expm1(-d / L), with u = beta gamma given exactly.
struct decay_reference {
  mp val[n_outputs];
  explicit decay_reference(mpfr_prec_t p) : val{mp(p), mp(p), mp(p)} {}
  void compute(const mpfr_t u, const mpfr_t c_tau, const mpfr_t d) {
    const mpfr_prec_t p = mpfr_get_prec(val[0].v);
    mp r(p);
    mpfr_mul(val[o_length].v, u, c_tau, MPFR_RNDN);
    mpfr_div(r.v, d, val[o_length].v, MPFR_RNDN);
    mpfr_neg(r.v, r.v, MPFR_RNDN);
    mpfr_exp(val[o_survival].v, r.v, MPFR_RNDN);
    mpfr_expm1(val[o_decay].v, r.v, MPFR_RNDN);
    mpfr_neg(val[o_decay].v, val[o_decay].v, MPFR_RNDN);
  }
};

/// beta gamma of a speed exactly as stored: (b.hi + b.lo)(g.hi + g.lo).  The function's
/// contract is relative to the speed it is given; for speeds from algebraic inputs the stored
/// words are within O(u^2) of the exact values, and the sweep below uses the exact input there.
template <class T>
void stored_proper_speed(const speed<T>& s, mpfr_t out) {
  const auto b = s.beta_words();
  const auto g = s.gamma_words();
  mp bh(256), bl(256), gh(256), gl(256), bb(512), gg(512);
  ez_test::set_exact(bh.v, b.hi);
  ez_test::set_exact(bl.v, b.lo);
  ez_test::set_exact(gh.v, g.hi);
  ez_test::set_exact(gl.v, g.lo);
  mpfr_add(bb.v, bh.v, bl.v, MPFR_RNDN);
  mpfr_add(gg.v, gh.v, gl.v, MPFR_RNDN);
  mpfr_mul(out, bb.v, gg.v, MPFR_RNDN);
}

/// Sweep for one built-in type: speeds from every constructor, c tau log-uniform, and the path
/// drawn so that d / L spans [1e-20, 700] (two thirds) or the whole range of T (a third).
/// The reference is the exact input of the constructor, except where the speed as stored may
/// differ from it by more than O(u^2): speeds from a rapidity (exp's rounding is part of the
/// stored speed, see speed.hpp) and speeds from inputs below min / eps^2 (their low words can
/// lose residuals that fall below the subnormal range).  exp(-d/L) amplifies any error of the
/// speed d/L-fold, so there the stored words are the reference: the contract is relative to
/// the speed given.
template <class T>
void sweep_builtin(long samples, unsigned long long seed) {
  std::printf("\n%s: %ld samples per constructor (max/mean ulps of the correctly rounded result; "
              "cr = share correctly rounded)\n",
              type_name<T>(), samples);
  const T min_ratio = T(1e-20f);
  const T max_ratio = std::min<T>(T(700), T(-std::log(std::numeric_limits<T>::min())));
  for (ctor c : all_ctors) {
    std::mt19937_64 engine(seed + static_cast<unsigned long long>(c));
    ez_test::sampler<T> gen(engine);
    ez_test::ulp_stats st[n_outputs];
    long from_stored = 0;
    for (long i = 0; i < samples; ++i) {
      T x = T(0), y = T(1);
      gen.draw(c, x, y);
      const long double low = eigenzeit::numeric::rescale_threshold<T>();
      const bool stored = c == ctor::rapidity || x < low || y < low ||
                          (ez_test::two_inputs(c) && static_cast<long double>(x) / y < low);
      const speed<T> s = ez_test::construct(c, x, y);
      const T c_tau = (gen.rng() % 2) ? T(gen.log_uniform(1e-6L, 1e6L))
                                      : T(gen.log_uniform(gen.tiny(), gen.huge()));
      const long double length = static_cast<long double>(s.proper_speed()) * c_tau;
      T d;
      if (gen.rng() % 3 != 0) {
        d = T(gen.log_uniform(min_ratio, max_ratio) * length);
      } else {
        d = T(gen.log_uniform(gen.lowest(), gen.huge()));
      }
      if (!std::isfinite(d) || !std::isfinite(static_cast<T>(length))) continue;
      const T got[n_outputs] = {eigenzeit::mean_decay_length(s, c_tau),
                                eigenzeit::survival_probability(d, s, c_tau),
                                eigenzeit::decay_probability(d, s, c_tau)};
      const ez_test::reference ref(c, x, y, std::numeric_limits<T>::digits);
      decay_reference want(ref.prec + 256);
      mp mc(128), md(128), u(ref.prec);
      ez_test::set_exact(mc.v, c_tau);
      ez_test::set_exact(md.v, d);
      if (stored) {
        stored_proper_speed(s, u.v);
        ++from_stored;
      } else {
        mpfr_set(u.v, ref.val[ez_test::v_proper_speed].v, MPFR_RNDN);
      }
      want.compute(u.v, mc.v, md.v);
      for (int o = 0; o < n_outputs; ++o)
        st[o].add(ez_test::measure<T>(got[o], want.val[o].v), x, d);
    }
    std::printf("  %s: %ld of %ld draws against the speed as stored\n", ez_test::ctor_name(c),
                from_stored, samples);
    for (int o = 0; o < n_outputs; ++o) {
      std::printf("  %-20s %-21s max %.3f (dist %lld) mean %.4f cr %.5f [subnormal %ld]  worst "
                  "input %.10Lg, d %.6Lg\n",
                  ez_test::ctor_name(c), output_name(o), st[o].max_frac,
                  static_cast<long long>(st[o].max_dist), st[o].mean(), st[o].share_exact(),
                  st[o].n_subnormal, st[o].worst_input, st[o].worst_input2);
      INFO(std::string(type_name<T>()), " ", std::string(ez_test::ctor_name(c)), " ",
           std::string(output_name(o)), " worst input ", static_cast<double>(st[o].worst_input),
           " d ", static_cast<double>(st[o].worst_input2));
      // Lengths: 1 ulp; probabilities: 2 ulp (the library exp or expm1 enters once).
      CHECK(st[o].max_dist <= (o == o_length ? 1 : 2));
      CHECK(st[o].n > samples / 3);
    }
  }
}

}  // namespace

TEST_CASE("decay length and probabilities against MPFR, every constructor (double)") {
  sweep_builtin<double>(sample_count(20000), 401);
}

TEST_CASE("decay length and probabilities against MPFR (long double, float)") {
  sweep_builtin<long double>(sample_count(5000), 402);
  sweep_builtin<float>(sample_count(5000), 403);
}

TEST_CASE("cpp_bin_float_50 stays within 8 epsilon") {
  using T = ez_test::cpp50;
  std::mt19937_64 engine(404);
  ez_test::sampler<double> gen(engine);
  double worst = 0;
  for (long i = 0; i < sample_count(200); ++i) {
    double b = 0, unused = 1;
    gen.draw(ctor::beta, b, unused);
    const double c_tau = static_cast<double>(gen.log_uniform(1e-3L, 1e3L));
    const double ratio = static_cast<double>(gen.log_uniform(1e-20L, 50.0L));
    const auto s = speed<T>::from_beta(T(b));
    const double d = ratio * static_cast<double>(s.proper_speed()) * c_tau;
    if (!(d > 0) || !std::isfinite(d)) continue;
    const T got[n_outputs] = {eigenzeit::mean_decay_length(s, T(c_tau)),
                              eigenzeit::survival_probability(T(d), s, T(c_tau)),
                              eigenzeit::decay_probability(T(d), s, T(c_tau))};
    const ez_test::reference ref(ctor::beta, b, 1, std::numeric_limits<T>::digits);
    decay_reference want(ref.prec + 256);
    mp mc(64), md(64);
    mpfr_set_d(mc.v, c_tau, MPFR_RNDN);
    mpfr_set_d(md.v, d, MPFR_RNDN);
    want.compute(ref.val[ez_test::v_proper_speed].v, mc.v, md.v);
    for (int o = 0; o < n_outputs; ++o) {
      if (mpfr_zero_p(want.val[o].v)) continue;
      const double e = ez_test::measure_eps(got[o], want.val[o].v);
      INFO(std::string(output_name(o)), " beta ", b, " c tau ", c_tau, " d ", d);
      CHECK(e <= 8.0);
      worst = std::max(worst, e);
    }
  }
  std::printf("cpp_bin_float_50: max relative error %.3f eps\n", worst);
}

// =============================================================================================
// Outside checks
// =============================================================================================

TEST_CASE("the muon: PDG mean life, and the 0.995 c fact") {
  const double c = eigenzeit::constants::speed_of_light<double>();
  // PDG (Particle Data Group, Review of Particle Physics, muon summary table):
  // mean life tau = 2.1969811e-6 s, c tau = 658.6384 m (values quoted from memory of the table).
  const double tau_mu = 2.1969811e-6;
  const double c_tau = c * tau_mu;
  std::printf("muon: c tau = %.10g m (PDG: 658.6384 m)\n", c_tau);
  CHECK(std::fabs(c_tau - 658.6384) < 0.5e-4);  // the table's last digit

  // Common practice, no source: at 0.995 c a particle with a mean life of 2.2 microseconds
  // would go about 657 m on average without time dilation (beta c tau) and about ten times
  // further with it (gamma ~ 10.01).
  const auto s = speed<double>::from_beta(0.995);
  const double no_dilation = 0.995 * c * 2.2e-6;
  const double L = eigenzeit::mean_decay_length(s, c * 2.2e-6);
  std::printf("0.995 c, 2.2 us: beta c tau %.6g m, mean decay length %.6g m, ratio %.6g\n",
              no_dilation, L, L / no_dilation);
  CHECK(std::fabs(no_dilation - 657) < 1.5);
  CHECK(std::fabs(L / no_dilation - 10.01) < 0.01);

  // The muon itself at 0.995 c: L against MPFR, and survival over one mean decay length.
  const double L_mu = eigenzeit::mean_decay_length(s, c_tau);
  const ez_test::reference ref(ctor::beta, 0.995, 1, 53);
  decay_reference want(1024);
  mp mc(64), md(64);
  mpfr_set_d(mc.v, c_tau, MPFR_RNDN);
  mpfr_set_d(md.v, L_mu, MPFR_RNDN);
  want.compute(ref.val[ez_test::v_proper_speed].v, mc.v, md.v);
  CHECK(ez_test::measure<double>(L_mu, want.val[o_length].v).dist <= 1);
  const double p = eigenzeit::survival_probability(L_mu, s, c_tau);
  CHECK(ez_test::measure<double>(p, want.val[o_survival].v).dist <= 2);
  CHECK(std::fabs(p - std::exp(-1.0)) < 4e-16);  // d = L rounded: exp(-1) to within ~1 ulp
  // A short path: the naive 1 - exp(-d/L) keeps almost nothing, -expm1 keeps everything.
  const double d_short = 1e-12;
  const double q = eigenzeit::decay_probability(d_short, s, c_tau);
  decay_reference short_ref(1024);
  mpfr_set_d(md.v, d_short, MPFR_RNDN);
  short_ref.compute(ref.val[ez_test::v_proper_speed].v, mc.v, md.v);
  const double naive = 1.0 - std::exp(-d_short / L_mu);
  const ez_test::ulp_error naive_err = ez_test::measure<double>(naive, short_ref.val[o_decay].v);
  std::printf("decay over 1 pm: %.17g, naive 1 - exp(-d/L) %.17g (%.3g ulp off)\n", q, naive,
              naive_err.frac);
  CHECK(ez_test::measure<double>(q, short_ref.val[o_decay].v).dist <= 1);
  CHECK(naive_err.frac > 1e4);
}

// =============================================================================================
// Identities, monotonicity, limits
// =============================================================================================

TEST_CASE_TEMPLATE("P + (1 - P) = 1, P falls with distance, scaling", T, float, double, long double) {
  std::mt19937_64 engine(411);
  ez_test::sampler<T> gen(engine);
  std::vector<T> paths;
  const auto s = speed<T>::from_beta(T(0.75));
  const T c_tau = T(3.5);
  for (long i = 0; i < sample_count(20000); ++i) {
    const T d = T(gen.log_uniform(gen.lowest(), 1e3L));
    paths.push_back(d);
    const T p = eigenzeit::survival_probability(d, s, c_tau);
    const T q = eigenzeit::decay_probability(d, s, c_tau);
    INFO(std::string(type_name<T>()), " d = ", static_cast<long double>(d));
    CHECK(std::fabs(static_cast<long double>(p) + q - 1) <=
          2 * static_cast<long double>(std::numeric_limits<T>::epsilon()));
    // Scaling d and c tau by the same power of two changes nothing.
    if (d >= eigenzeit::numeric::rescale_threshold<T>() * 1024) {
      CHECK(eigenzeit::survival_probability(std::ldexp(d, -9), s, std::ldexp(c_tau, -9)) == p);
      CHECK(eigenzeit::decay_probability(std::ldexp(d, 7), s, std::ldexp(c_tau, 7)) == q);
    }
  }
  std::sort(paths.begin(), paths.end());
  T prev_p = T(1), prev_q = T(0);
  long violations = 0;
  for (T d : paths) {
    const T p = eigenzeit::survival_probability(d, s, c_tau);
    const T q = eigenzeit::decay_probability(d, s, c_tau);
    if (p > prev_p || q < prev_q) ++violations;
    prev_p = p;
    prev_q = q;
  }
  CHECK(violations == 0);
}

TEST_CASE_TEMPLATE("limits and special values", T, float, double, long double) {
  const speed<T> rest;
  const auto s = speed<T>::from_beta(T(0.5));
  const T big = std::numeric_limits<T>::max(), den = std::numeric_limits<T>::denorm_min();
  // At rest, or with c tau = 0: L = 0, the particle decays where it is.
  CHECK(eigenzeit::mean_decay_length(rest, T(5)) == 0);
  CHECK(eigenzeit::mean_decay_length(s, T(0)) == 0);
  CHECK(std::signbit(eigenzeit::mean_decay_length(s, -T(0))));
  CHECK(eigenzeit::survival_probability(T(1), rest, T(5)) == 0);
  CHECK(eigenzeit::survival_probability(den, rest, T(5)) == 0);
  CHECK(eigenzeit::survival_probability(T(0), rest, T(5)) == 1);
  CHECK(eigenzeit::decay_probability(T(1), rest, T(5)) == 1);
  CHECK(eigenzeit::decay_probability(T(0), rest, T(5)) == 0);
  CHECK(eigenzeit::survival_probability(T(1), s, T(0)) == 0);
  CHECK(eigenzeit::survival_probability(T(0), s, T(0)) == 1);
  CHECK(eigenzeit::decay_probability(T(1), s, T(0)) == 1);
  // Zero path: P = 1 and 1 - P = 0 whatever the speed; -0 keeps its sign.
  CHECK(eigenzeit::survival_probability(-T(0), s, T(2)) == 1);
  CHECK(std::signbit(eigenzeit::decay_probability(-T(0), s, T(2))));
  CHECK(!std::signbit(eigenzeit::decay_probability(T(0), s, T(2))));
  // Ratios beyond the range: P = 0, 1 - P = 1; tiny ratios: P = 1, 1 - P = d/L.
  CHECK(eigenzeit::survival_probability(big, s, den) == 0);
  CHECK(eigenzeit::decay_probability(big, s, den) == 1);
  CHECK(eigenzeit::survival_probability(den, s, big) == 1);
  CHECK(eigenzeit::decay_probability(den, s, big) == 0);
  // Integer arguments convert to T.
  CHECK(eigenzeit::survival_probability(0, s, 1) == 1);

  // Ends of the range against MPFR: subnormal and huge distances and lengths.
  struct probe {
    T beta, c_tau, d;
  };
  const T tiny = std::numeric_limits<T>::min();
  const probe probes[] = {
      {T(0.5), den * 3, den * 5},         // L and d subnormal, ratio ordinary
      {T(0.5), big, big / 3},             // L = u c tau beyond max/2, ratio ordinary
      {T(0.999f), big, big},              // L overflows in T, ratio ordinary
      {T(0.25), tiny * 4, tiny * 32},     // near the bottom of the normal range
      {den * 64, T(1), den * 64 * T(0.125f)},  // subnormal speed
      {T(0.5), T(1e-3f), den * 7},        // d subnormal, ratio subnormal-ish
      {T(0.9f), tiny, big / 1024},        // ratio beyond the range
  };
  for (const probe& p : probes) {
    const auto sp = speed<T>::from_beta(p.beta);
    const T got[2] = {eigenzeit::survival_probability(p.d, sp, p.c_tau),
                      eigenzeit::decay_probability(p.d, sp, p.c_tau)};
    mp b(256), one(16), c_tau(256), d(256);
    ez_test::set_exact(b.v, p.beta);
    ez_test::set_exact(c_tau.v, p.c_tau);
    ez_test::set_exact(d.v, p.d);
    mpfr_set_ui(one.v, 1, MPFR_RNDN);
    ez_test::reference ref(static_cast<mpfr_prec_t>(1024 + 2 * std::abs(std::ilogb(p.beta))));
    ref.compute(ctor::beta, b.v, one.v);
    decay_reference want(ref.prec + 256);
    want.compute(ref.val[ez_test::v_proper_speed].v, c_tau.v, d.v);
    for (int k = 0; k < 2; ++k) {
      const ez_test::ulp_error e = ez_test::measure<T>(got[k], want.val[k + 1].v);
      INFO(std::string(type_name<T>()), " beta ", static_cast<long double>(p.beta), " c tau ",
           static_cast<long double>(p.c_tau), " d ", static_cast<long double>(p.d), " ",
           std::string(output_name(k + 1)), " got ", static_cast<long double>(got[k]));
      if (e.normal) CHECK(e.dist <= 2);
      else CHECK(std::fabs(static_cast<long double>(got[k]) - mpfr_get_ld(want.val[k + 1].v, MPFR_RNDN)) <=
                 4 * static_cast<long double>(den));
    }
  }
  // A speed made invalid under the NaN policy gives NaN.
  const auto bad = speed<T>::from_beta(T(2), eigenzeit::nan_policy());
  CHECK(std::isnan(eigenzeit::mean_decay_length(bad, T(1))));
  CHECK(std::isnan(eigenzeit::survival_probability(T(1), bad, T(1))));
  CHECK(std::isnan(eigenzeit::decay_probability(T(1), bad, T(1))));
}

TEST_CASE("bad input: every domain error, for each policy") {
  namespace ez = eigenzeit;
  const auto s = speed<double>::from_beta(0.5);
  const double inf = std::numeric_limits<double>::infinity();
  for (double bad : {-1.0, -1e-300, -std::numeric_limits<double>::denorm_min(), inf, -inf,
                     std::numeric_limits<double>::quiet_NaN()}) {
    ez_test::check_all_policies("mean_decay_length", bad,
                       [&s](double x, auto p) { return ez::mean_decay_length(s, x, p); });
    ez_test::check_all_policies("survival_probability", bad,
                       [&s](double x, auto p) { return ez::survival_probability(x, s, 1.0, p); });
    ez_test::check_all_policies("survival_probability", bad,
                       [&s](double x, auto p) { return ez::survival_probability(1.0, s, x, p); });
    ez_test::check_all_policies("decay_probability", bad,
                       [&s](double x, auto p) { return ez::decay_probability(x, s, 1.0, p); });
    ez_test::check_all_policies("decay_probability", bad,
                       [&s](double x, auto p) { return ez::decay_probability(1.0, s, x, p); });
  }
  // A mean decay length beyond the largest finite value.
  const auto fast = speed<double>::from_gamma(1e200);
  ez_test::check_all_policies("mean_decay_length", 1e200,
                     [&fast](double x, auto p) { return ez::mean_decay_length(fast, x, p); });
  // The probabilities need no finite L: u c tau beyond the range is an ordinary input there
  // (d / L = 1e300 / (u 1e200) ~ 1e-100).
  CHECK(ez::survival_probability(1e300, fast, 1e200) == 1);
  const long double ratio = 1e300L / (static_cast<long double>(fast.proper_speed()) * 1e200L);
  CHECK(std::fabs(ez::decay_probability(1e300, fast, 1e200) / ratio - 1) <= 4e-16L);
}
