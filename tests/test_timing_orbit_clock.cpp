// Tests of include/eigenzeit/timing/orbit_clock.hpp: the IS-GPS-200 figures (relativistic
// constant F, the satellite clock's frequency offset), every function against MPFR evaluating
// its formula exactly, the two forms of the periodic term against each other on exact Kepler
// states, the rate budget, and domain errors under the three policies.
#include <doctest/doctest.h>

#include <algorithm>
#include <array>
#include <cerrno>
#include <cmath>
#include <cstdio>
#include <limits>
#include <random>
#include <stdexcept>
#include <string>
#include <type_traits>
#include <utility>

#include <eigenzeit/constants.hpp>
#include <eigenzeit/timing/clock_rate.hpp>
#include <eigenzeit/timing/orbit_clock.hpp>

#include "support/reference.hpp"
#include "support/policy_checks.hpp"

using eigenzeit::kepler_orbit;
using ez_test::mp;
using ez_test::type_name;

namespace {

long sample_count(long full) { return ez_test::quick() ? std::max(500L, full / 20) : full; }

constexpr mpfr_prec_t kPrec = 1024;

/// Exact references of the orbit formulas on the exact inputs (L_G from its decimal string).
struct orbit_reference {
  mp rate{kPrec}, rate_tt{kPrec}, amplitude{kPrec}, periodic{kPrec}, velocity{kPrec}, potential{kPrec};

  template <class T>
  orbit_reference(const kepler_orbit<T>& o, const T& E) {
    mp a(kPrec), e(kPrec), gm(kPrec), c2(kPrec), x(kPrec), lg(kPrec), t(kPrec), ee(kPrec);
    ez_test::set_exact(a.v, o.semi_major_axis);
    ez_test::set_exact(e.v, o.eccentricity);
    ez_test::set_exact(gm.v, o.gm);
    ez_test::set_exact(ee.v, E);
    mpfr_set_ui(c2.v, 299792458UL, MPFR_RNDN);
    mpfr_sqr(c2.v, c2.v, MPFR_RNDN);
    mpfr_set_str(lg.v, "6.969290134e-10", 10, MPFR_RNDN);
    // x = GM / (a c^2)
    mpfr_div(x.v, gm.v, a.v, MPFR_RNDN);
    mpfr_div(x.v, x.v, c2.v, MPFR_RNDN);
    // rate = -3x/2
    mpfr_mul_ui(rate.v, x.v, 3, MPFR_RNDN);
    mpfr_div_ui(rate.v, rate.v, 2, MPFR_RNDN);
    mpfr_neg(rate.v, rate.v, MPFR_RNDN);
    // rate_tt = (L_G - 3x/2) / (1 - L_G)
    mpfr_add(rate_tt.v, lg.v, rate.v, MPFR_RNDN);
    mpfr_ui_sub(t.v, 1, lg.v, MPFR_RNDN);
    mpfr_div(rate_tt.v, rate_tt.v, t.v, MPFR_RNDN);
    // velocity = -x/2, potential = L_G - x
    mpfr_div_ui(velocity.v, x.v, 2, MPFR_RNDN);
    mpfr_neg(velocity.v, velocity.v, MPFR_RNDN);
    mpfr_sub(potential.v, lg.v, x.v, MPFR_RNDN);
    // amplitude = 2 sqrt(GM a) e / c^2, periodic = -amplitude sin E
    mpfr_mul(t.v, gm.v, a.v, MPFR_RNDN);
    mpfr_sqrt(t.v, t.v, MPFR_RNDN);
    mpfr_mul(t.v, t.v, e.v, MPFR_RNDN);
    mpfr_mul_ui(t.v, t.v, 2, MPFR_RNDN);
    mpfr_div(amplitude.v, t.v, c2.v, MPFR_RNDN);
    mpfr_sin(t.v, ee.v, MPFR_RNDN);
    mpfr_mul(periodic.v, amplitude.v, t.v, MPFR_RNDN);
    mpfr_neg(periodic.v, periodic.v, MPFR_RNDN);
  }
};

/// Orbits from low Earth orbit to beyond geostationary, every eccentricity, with either GM.
template <class T>
struct orbit_inputs {
  std::mt19937_64 rng;
  explicit orbit_inputs(unsigned long long seed) : rng(seed) {}
  long double uniform(long double a, long double b) {
    return std::uniform_real_distribution<long double>(a, b)(rng);
  }
  kepler_orbit<T> draw(long double a_lo, long double a_hi) {
    const T gm = (rng() & 1) ? eigenzeit::constants::GM_earth<T>() : eigenzeit::constants::GM_earth_gps<T>();
    const unsigned kind = static_cast<unsigned>(rng() % 4);
    T e = T(uniform(0, 0.95L));
    if (kind == 0) e = T(0);
    if (kind == 1) e = T(uniform(0, 0.02L));  // the navigation orbits
    return {T(uniform(a_lo, a_hi)), e, gm};
  }
};

template <class T>
void sweep(long samples, unsigned long long seed) {
  orbit_inputs<T> in(seed);
  ez_test::ulp_stats st[6];
  const char* names[6] = {"orbit_rate_offset", "orbit_rate_offset_tt", "budget.velocity",
                          "budget.potential", "orbit_periodic_amplitude", "orbit_periodic_offset"};
  for (long i = 0; i < samples; ++i) {
    // Away from a ~ 9545 km, where the rate against TT crosses zero (checked separately).
    const kepler_orbit<T> o = (i % 2) ? in.draw(6.6e6L, 8.8e6L) : in.draw(1.1e7L, 4.3e7L);
    const T E = T(in.uniform(-3.2L, 3.2L));
    const orbit_reference ref(o, E);
    const auto budget = eigenzeit::orbit_rate_terms(o);
    st[0].add(ez_test::measure<T>(eigenzeit::orbit_rate_offset(o), ref.rate.v), o.semi_major_axis);
    st[1].add(ez_test::measure<T>(eigenzeit::orbit_rate_offset_tt(o), ref.rate_tt.v), o.semi_major_axis);
    st[2].add(ez_test::measure<T>(budget.velocity, ref.velocity.v), o.semi_major_axis);
    st[3].add(ez_test::measure<T>(budget.potential, ref.potential.v), o.semi_major_axis);
    CHECK(budget.total == eigenzeit::orbit_rate_offset_tt(o));
    if (o.eccentricity > 0) {
      st[4].add(ez_test::measure<T>(eigenzeit::orbit_periodic_amplitude(o), ref.amplitude.v),
                o.semi_major_axis);
      if (std::fabs(E) > T(1e-3)) {
        // The formula with the exact sin(E); the library's sin adds its own rounding.
        st[5].add(ez_test::measure<T>(eigenzeit::orbit_periodic_offset(o, E), ref.periodic.v), E);
      }
    }
  }
  std::printf("orbit clock %s, %ld orbits:\n", type_name<T>(), samples);
  for (int k = 0; k < 6; ++k) {
    std::printf("  %-26s max %.3f ulp (dist %lld) mean %.4f cr %.5f\n", names[k], st[k].max_frac,
                static_cast<long long>(st[k].max_dist), st[k].mean(), st[k].share_exact());
    INFO(type_name<T>(), " ", names[k], " worst input ", static_cast<double>(st[k].worst_input));
    // The periodic term: sin one type wider for float and double; long double has the
    // library's sinl in it (<= 2 ulp).
    const bool own_sin = std::is_same<T, long double>::value && k == 5;
    CHECK(st[k].max_dist <= (own_sin ? 2 : 1));
    CHECK(st[k].n > samples / 2);
  }
}

}  // namespace

namespace {

/// Multiprecision types: relative error in units of their epsilon (sin in T itself).
template <class T>
void sweep_multiprecision(long samples, unsigned long long seed) {
  orbit_inputs<double> in(seed);
  double worst = 0;
  for (long i = 0; i < samples; ++i) {
    const kepler_orbit<double> od = (i % 2) ? in.draw(6.6e6L, 8.8e6L) : in.draw(1.1e7L, 4.3e7L);
    if (od.eccentricity == 0) continue;
    const double Ed = static_cast<double>(in.uniform(0.1L, 3.0L));
    const kepler_orbit<T> o{T(od.semi_major_axis), T(od.eccentricity), T(od.gm)};
    const orbit_reference ref(o, T(Ed));
    const double e[4] = {ez_test::measure_eps(eigenzeit::orbit_rate_offset(o), ref.rate.v),
                         ez_test::measure_eps(eigenzeit::orbit_rate_offset_tt(o), ref.rate_tt.v),
                         ez_test::measure_eps(eigenzeit::orbit_periodic_amplitude(o), ref.amplitude.v),
                         ez_test::measure_eps(eigenzeit::orbit_periodic_offset(o, T(Ed)), ref.periodic.v)};
    for (double x : e) {
      INFO(type_name<T>(), " a = ", od.semi_major_axis, " e = ", od.eccentricity, " E = ", Ed);
      CHECK(x <= 4.0);
      worst = std::max(worst, x);
    }
  }
  std::printf("orbit clock %s, %ld orbits: max relative error %.3f eps\n", type_name<T>(), samples, worst);
}

}  // namespace

TEST_CASE("orbit clock terms against MPFR") {
  sweep<double>(sample_count(50000), 301);
  sweep<long double>(sample_count(10000), 302);
  sweep<float>(sample_count(10000), 303);
  sweep_multiprecision<ez_test::cpp50>(sample_count(1000), 306);
  sweep_multiprecision<ez_test::mpfr100>(sample_count(1000), 307);
}

TEST_CASE("rate against TT near its zero crossing: absolute error below 8 u^2 L_G") {
  // 3GM/(2ac^2) = L_G at a = 3 GM / (2 W0) ~ 9 545 km: the relative accuracy cannot hold
  // there (the result passes through zero), the absolute one does.
  std::mt19937_64 rng(304);
  std::uniform_real_distribution<double> a(9.5e6, 9.6e6);
  const double u = std::ldexp(1.0, -53);
  double worst = 0;
  for (long i = 0; i < sample_count(5000); ++i) {
    const kepler_orbit<double> o{a(rng), 0.0, eigenzeit::constants::GM_earth<double>()};
    const orbit_reference ref(o, 0.0);
    mp d(kPrec);
    mpfr_set_d(d.v, eigenzeit::orbit_rate_offset_tt(o), MPFR_RNDN);
    mpfr_sub(d.v, d.v, ref.rate_tt.v, MPFR_RNDN);
    const double err = std::fabs(mpfr_get_d(d.v, MPFR_RNDN));
    const double allowed = std::max(8 * u * u * 6.97e-10,
                                    // or 1 ulp of the result when that is larger
                                    std::ldexp(1.0, std::ilogb(std::fabs(mpfr_get_d(ref.rate_tt.v, MPFR_RNDN))) - 52));
    CHECK(err <= allowed);
    worst = std::max(worst, err / allowed);
  }
  std::printf("rate against TT near a = 9545 km: worst error / max(8 u^2 L_G, 1 ulp) = %.3f\n", worst);
}

TEST_CASE("outside check: IS-GPS-200 relativistic constant F and the periodic term") {
  // IS-GPS-200, 20.3.3.3.3.1: Delta t_r = F e sqrt(A) sin E_k with F = -2 sqrt(mu) / c^2 =
  // -4.442807633e-10 s/m^(1/2), mu = 3.986005e14 m^3/s^2 (the values printed there).
  const double mu = eigenzeit::constants::GM_earth_gps<double>();
  const double F_spec = -4.442807633e-10;
  const double a = 26561750.0, e = 0.01;
  const kepler_orbit<double> o{a, e, mu};
  for (double E : {0.3, 1.5707963267948966, 2.5, -1.0}) {
    const double ours = eigenzeit::orbit_periodic_offset(o, E);
    const double spec = F_spec * e * std::sqrt(a) * std::sin(E);
    INFO("E = ", E);
    // F is printed to 10 digits: agreement to its last digit (half a unit: 1.2e-10 relative).
    CHECK(std::fabs(ours / spec - 1) < 1.2e-10);
  }
  // F itself from the amplitude of an orbit with a = 1 m and e = 1/2: amplitude = -F / 2.
  const double F_ours = -2 * eigenzeit::orbit_periodic_amplitude(kepler_orbit<double>{1.0, 0.5, mu});
  char printed[32];
  std::snprintf(printed, sizeof printed, "%.9e", F_ours);
  std::printf("F = %s s/m^(1/2) (IS-GPS-200: -4.442807633e-10)\n", printed);
  CHECK(std::string(printed) == "-4.442807633e-10");
  // Peak of the term for a GPS orbit with e = 0.01: 23 ns (common practice, no source).
  CHECK(std::fabs(eigenzeit::orbit_periodic_amplitude(o) / 22.9e-9 - 1) < 0.01);
}

TEST_CASE("outside check: IS-GPS-200 satellite clock frequency offset") {
  // IS-GPS-200, 3.3.1.1: the satellite's 10.23 MHz is offset by Delta f / f = -4.4647e-10 to
  // 10.22999999543 MHz, which compensates the orbiting clock running fast against a clock on
  // the ground (semi-major axis 26 561.75 km).  Our rate against TT for that circular orbit
  // with the GPS mu must round to 4.4647e-10, and the factory offset is its negative.
  const kepler_orbit<double> gps{26561750.0, 0.0, eigenzeit::constants::GM_earth_gps<double>()};
  const double rate = eigenzeit::orbit_rate_offset_tt(gps);
  std::printf("GPS clock rate against TT: %.10e (IS-GPS-200: +4.4647e-10)\n", rate);
  CHECK(std::fabs(rate - 4.4647e-10) <= 0.5e-14);
  // The two printed figures agree: 10.23 MHz x (1 - 4.4647e-10) = 10.22999999543 MHz to the
  // digits printed (5e-6 Hz), and so does our rate.
  CHECK(std::fabs(10.23e6 * (1 - 4.4647e-10) - 10229999.99543) <= 5e-6);
  CHECK(std::fabs(10.23e6 * (1 - rate) - 10229999.99543) <= 5e-6);
  // Per day the clock gains 38.6 us (common practice, no source: "38 microseconds a day").
  CHECK(std::fabs(rate * 86400 / 38.6e-6 - 1) < 0.005);
  // The budget: the velocity term -7.2 us/day and the potential term +45.8 us/day (common
  // practice, no source), adding up to the total.
  const auto b = eigenzeit::orbit_rate_terms(gps);
  CHECK(std::fabs(b.velocity * 86400 / -7.21e-6 - 1) < 0.005);
  CHECK(std::fabs(b.potential * 86400 / 45.8e-6 - 1) < 0.005);
  // velocity + potential = total (1 - L_G): 3e-19 apart.
  CHECK(std::fabs((b.velocity + b.potential) - b.total * (1 - 6.969290134e-10)) < 1e-24);
  CHECK(std::fabs((b.velocity + b.potential) - b.total) < 4e-19);
}

namespace {

/// A Kepler state at eccentric anomaly E, computed in MPFR and rounded to double:
/// position a (cos E - e, sqrt(1 - e^2) sin E), velocity n a (-sin E, sqrt(1 - e^2) cos E) /
/// (1 - e cos E), n = sqrt(GM / a^3); then turned by an arbitrary rotation (incl = 0.96,
/// node = 2.1 rad) so that every component is used.
void kepler_state(const kepler_orbit<double>& o, double E, std::array<double, 3>& r,
                  std::array<double, 3>& v) {
  const long double a = o.semi_major_axis, e = o.eccentricity, gm = o.gm;
  const long double root = std::sqrt(1 - e * e);
  const long double n = std::sqrt(gm / (a * a * a));
  const long double den = 1 - e * std::cos(static_cast<long double>(E));
  const long double px = a * (std::cos(static_cast<long double>(E)) - e);
  const long double py = a * root * std::sin(static_cast<long double>(E));
  const long double vx = -n * a * std::sin(static_cast<long double>(E)) / den;
  const long double vy = n * a * root * std::cos(static_cast<long double>(E)) / den;
  const long double ci = std::cos(0.96L), si = std::sin(0.96L), cn = std::cos(2.1L), sn = std::sin(2.1L);
  auto turn = [&](long double x, long double y, std::array<double, 3>& out) {
    const long double y1 = y * ci, z1 = y * si;
    out = {static_cast<double>(x * cn - y1 * sn), static_cast<double>(x * sn + y1 * cn),
           static_cast<double>(z1)};
  };
  turn(px, py, r);
  turn(vx, vy, v);
}

}  // namespace

TEST_CASE("the state-vector form -2 r.v / c^2 equals the Kepler form") {
  // Kepler motion has r . v = e sqrt(GM a) sin E (common practice, no source); the two forms
  // must agree to the rounding of the state (long double, then double components).
  std::mt19937_64 rng(305);
  std::uniform_real_distribution<double> ecc(0.001, 0.9), anomaly(-3.1, 3.1), axis(7e6, 4.3e7);
  double worst = 0;
  for (long i = 0; i < sample_count(5000); ++i) {
    const kepler_orbit<double> o{axis(rng), ecc(rng), eigenzeit::constants::GM_earth<double>()};
    const double E = anomaly(rng);
    if (std::fabs(std::sin(E)) < 0.05) continue;
    std::array<double, 3> r, v;
    kepler_state(o, E, r, v);
    const double from_state = eigenzeit::orbit_periodic_offset(r, v);
    const double from_orbit = eigenzeit::orbit_periodic_offset(o, E);
    // The state's components carry ~1e-16 relative each; r . v cancels by up to
    // |r| |v| / |r . v| < 1 / (e |sin E|) in relative terms.
    const double cond = 1 / (o.eccentricity * std::fabs(std::sin(E)));
    const double rel = std::fabs(from_state / from_orbit - 1);
    INFO("a = ", o.semi_major_axis, " e = ", o.eccentricity, " E = ", E);
    CHECK(rel < 8e-16 * cond + 1e-15);
    worst = std::max(worst, rel / cond);
  }
  std::printf("state-vector vs Kepler form: worst relative difference / condition %.3g\n", worst);
  // The state-vector form against MPFR on its own (rounded) inputs: dot product exact.
  std::array<double, 3> r{26561750.5, -1234567.25, 3.0e6}, v{-123.5, 3870.125, 0.0625};
  mp acc(kPrec), t(kPrec), c2(kPrec), x(kPrec), y(kPrec);
  mpfr_set_ui(acc.v, 0, MPFR_RNDN);
  for (std::size_t j = 0; j < 3; ++j) {
    ez_test::set_exact(x.v, r[j]);
    ez_test::set_exact(y.v, v[j]);
    mpfr_mul(t.v, x.v, y.v, MPFR_RNDN);
    mpfr_add(acc.v, acc.v, t.v, MPFR_RNDN);
  }
  mpfr_set_ui(c2.v, 299792458UL, MPFR_RNDN);
  mpfr_sqr(c2.v, c2.v, MPFR_RNDN);
  mpfr_mul_si(acc.v, acc.v, -2, MPFR_RNDN);
  mpfr_div(acc.v, acc.v, c2.v, MPFR_RNDN);
  CHECK(ez_test::measure<double>(eigenzeit::orbit_periodic_offset(r, v), acc.v).dist <= 1);
}

TEST_CASE("the periodic term is the integral of the rate's periodic part") {
  // d/dt of -2 sqrt(GM a) e sin(E) / c^2 along the orbit equals the rate minus its mean:
  // clock_rate_offset(v, GM/r) - orbit_rate_offset, up to the 1/c^4 terms (< 1e-19).
  // Central differences over +-1 s of coordinate time on an e = 0.3 orbit.
  const kepler_orbit<double> o{2.6e7, 0.3, eigenzeit::constants::GM_earth<double>()};
  const long double n = std::sqrt(static_cast<long double>(o.gm) / (2.6e7L * 2.6e7L * 2.6e7L));
  for (double E : {0.4, 1.3, 2.9, -2.0}) {
    // Times from E via Kepler's equation, the neighbours by Newton's method on M = E - e sin E.
    auto anomaly_at = [&](long double M) {
      long double x = M;
      for (int k = 0; k < 50; ++k) x -= (x - 0.3L * std::sin(x) - M) / (1 - 0.3L * std::cos(x));
      return x;
    };
    const long double M = E - 0.3L * std::sin(static_cast<long double>(E));
    const long double h = 1.0L;
    const double Ep = static_cast<double>(anomaly_at(M + n * h));
    const double Em = static_cast<double>(anomaly_at(M - n * h));
    const double derivative = (eigenzeit::orbit_periodic_offset(o, Ep) -
                               eigenzeit::orbit_periodic_offset(o, Em)) / 2.0;
    std::array<double, 3> r, v;
    kepler_state(o, E, r, v);
    const double rr = std::sqrt(r[0] * r[0] + r[1] * r[1] + r[2] * r[2]);
    const double vv = std::sqrt(v[0] * v[0] + v[1] * v[1] + v[2] * v[2]);
    const double periodic_rate =
        eigenzeit::clock_rate_offset(vv, o.gm / rr) - eigenzeit::orbit_rate_offset(o);
    INFO("E = ", E, " derivative ", derivative, " rate ", periodic_rate);
    // Central difference error ~ h^2 f''' / 6 ~ (n h)^2 f: 1e-7 relative; the difference of two
    // ~1e-8 s values over 2 s keeps ~1e-8 relative.
    CHECK(std::fabs(derivative - periodic_rate) <= 1e-6 * std::fabs(periodic_rate) + 1e-19);
  }
}


TEST_CASE("bad input: domain errors under every policy") {
  const double nan = std::numeric_limits<double>::quiet_NaN();
  const double inf = std::numeric_limits<double>::infinity();
  const double gm = eigenzeit::constants::GM_earth<double>();
  using O = kepler_orbit<double>;
  const std::pair<O, const char*> bad[] = {
      {O{0.0, 0.1, gm}, "semi-major axis = 0"},  {O{-2.6e7, 0.1, gm}, "semi-major axis = -26"},
      {O{nan, 0.1, gm}, "semi-major axis = nan"}, {O{inf, 0.1, gm}, "semi-major axis = inf"},
      {O{2.6e7, 1.0, gm}, "eccentricity = 1"},    {O{2.6e7, 1.5, gm}, "eccentricity = 1.5"},
      {O{2.6e7, -0.1, gm}, "eccentricity = -0.1"}, {O{2.6e7, nan, gm}, "eccentricity = nan"},
      {O{2.6e7, 0.1, 0.0}, "GM = 0"},              {O{2.6e7, 0.1, -gm}, "GM = -3"},
      {O{2.6e7, 0.1, nan}, "GM = nan"}};
  for (const auto& [o, text] : bad) {
    ez_test::check_all_policies("orbit_rate_offset", text, [o = o](auto p) { return eigenzeit::orbit_rate_offset(o, p); });
    ez_test::check_all_policies("orbit_rate_offset_tt", text, [o = o](auto p) { return eigenzeit::orbit_rate_offset_tt(o, p); });
    ez_test::check_all_policies("orbit_rate_terms", text, [o = o](auto p) { return eigenzeit::orbit_rate_terms(o, p).total; });
    ez_test::check_all_policies("orbit_periodic_amplitude", text, [o = o](auto p) { return eigenzeit::orbit_periodic_amplitude(o, p); });
    ez_test::check_all_policies("orbit_periodic_offset", text, [o = o](auto p) { return eigenzeit::orbit_periodic_offset(o, 1.0, p); });
  }
  const O good{2.6e7, 0.01, gm};
  for (double E : {nan, inf, -inf}) {
    ez_test::check_all_policies("orbit_periodic_offset", "eccentric anomaly",
                       [good, E](auto p) { return eigenzeit::orbit_periodic_offset(good, E, p); });
  }
  using P = std::array<double, 3>;
  ez_test::check_all_policies("orbit_periodic_offset", "position component = nan", [nan](auto p) {
    return eigenzeit::orbit_periodic_offset(P{nan, 0.0, 0.0}, P{1.0, 0.0, 0.0}, p);
  });
  ez_test::check_all_policies("orbit_periodic_offset", "velocity component = inf", [inf](auto p) {
    return eigenzeit::orbit_periodic_offset(P{1.0, 0.0, 0.0}, P{0.0, inf, 0.0}, p);
  });
  // Every member of the budget is NaN under the NaN policy.
  const auto b = eigenzeit::orbit_rate_terms(O{-1.0, 0.1, gm}, eigenzeit::nan_policy());
  CHECK(std::isnan(b.velocity));
  CHECK(std::isnan(b.potential));
  CHECK(std::isnan(b.total));
}
