// Tests of include/eigenzeit/frames/momentum.hpp: the on-shell momentum (mass and p c).
// Accuracy sweeps of energy(), kinetic_energy(), every view of speed(), velocity() and boosted()
// against MPFR (Boost.Multiprecision mpfr_float, tests/support/frames_reference.hpp), with the
// textbook formulas' errors printed beside the library's; the round trip through a four-vector;
// outside checks with CODATA 2018 masses; bad input through the three error policies.
//
// Error measure: |got - exact| in ulps of T at the binade of the exact value (or of the
// largest component of the exact output four-vector, for boosts), the exact value computed
// in MPFR at 320 bits from the test's exact binary inputs.
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

#include <eigenzeit/frames/lorentz_boost.hpp>
#include <eigenzeit/frames/momentum.hpp>
#include <eigenzeit/frames/vectors.hpp>
#include <eigenzeit/speed.hpp>

#include "support/frames_reference.hpp"
#include "support/policy_checks.hpp"
#include "support/reference.hpp"
#include "support/sampler.hpp"

using eigenzeit::four_vector;
using eigenzeit::lorentz_boost;
using eigenzeit::momentum;
using eigenzeit::speed;
using eigenzeit::vec3;
using ez_test::mp_four;
using ez_test::mp_vec3;
using ez_test::hex;
using ez_test::mpf;
using ez_test::precision_scope;
using ez_test::stats;
using ez_test::type_name;

namespace {

long sample_count(long full) { return ez_test::quick() ? std::max(100L, full / 20) : full; }

constexpr double infinity = std::numeric_limits<double>::infinity();
constexpr unsigned reference_bits = 320;



/// |got - ref| in ulps of T at the binade of `scale` (below the normal range, in units of the
/// subnormal spacing); infinite if got is not finite.
template <class T>
double ulps(const T& got, const mpf& ref, const mpf& scale) {
  using std::isfinite;
  if (!isfinite(got)) return infinity;
  if (scale == 0) return got == 0 ? 0.0 : infinity;
  int e = 0;
  frexp(scale, &e);  // scale = f 2^e, f in [1/2, 1)
  e = std::max(e, std::numeric_limits<T>::min_exponent);
  const mpf ulp = ldexp(mpf(1), e - std::numeric_limits<T>::digits);
  return static_cast<double>(mpf(abs(mpf(got) - ref) / ulp));
}
template <class T>
double ulps(const T& got, const mpf& ref) {
  return ulps(got, ref, ref);
}


/// The textbook formula's errors: finite nonzero results in `err`, the others (0 where the
/// exact value is not, inf, NaN, negative) counted in `lost`.
struct naive_stats {
  stats err;
  long lost = 0;
};

/// Random inputs: log-uniform magnitudes and isotropic directions (fixed seeds).
struct draw {
  std::mt19937_64 eng;
  explicit draw(unsigned long long seed) : eng(seed) {}
  long double uniform(long double a, long double b) {
    return std::uniform_real_distribution<long double>(a, b)(eng);
  }
  long double log_uniform(long double lo, long double hi) {
    volatile long double a = lo, b = hi;  // run-time logl, see tests/support/sampler.hpp
    return std::exp(uniform(std::log(a), std::log(b)));
  }
  bool coin(double p) { return uniform(0, 1) < p; }
  long double sign() { return (eng() & 1) != 0 ? 1.0L : -1.0L; }
  int pick(int n) { return static_cast<int>(eng() % static_cast<unsigned long long>(n)); }
  std::array<long double, 3> unit() {
    std::normal_distribution<long double> g;
    for (;;) {
      const long double x = g(eng), y = g(eng), z = g(eng);
      const long double n = std::sqrt(x * x + y * y + z * z);
      if (n > 1e-3L) return {x / n, y / n, z / n};
    }
  }
  /// An isotropic vector of the given length, each component rounded to T once.
  template <class T>
  vec3<T> vector(long double length) {
    const auto u = unit();
    return {static_cast<T>(u[0] * length), static_cast<T>(u[1] * length), static_cast<T>(u[2] * length)};
  }
};

// ---- MPFR references ----------------------------------------------------------------------

template <class T>
mp_vec3 mp_of(const vec3<T>& v) {
  return {mpf(v.x), mpf(v.y), mpf(v.z)};
}

template <class T>
mpf mp_norm2(const vec3<T>& v) {
  const mp_vec3 w = mp_of(v);
  return ez_test::dot(w, w);
}

/// sqrt(m^2 + |p|^2) of the exact inputs.
template <class T>
mpf mp_energy(const T& m, const vec3<T>& p) {
  const mpf mm(m);
  return sqrt(mm * mm + mp_norm2(p));
}

/// E - m = |p|^2 / (sqrt(m^2 + |p|^2) + m) of the exact inputs (the identity avoids the
/// cancellation that would need 2 log2(m / |p|) more bits for slow particles).
template <class T>
mpf mp_kinetic(const T& m, const vec3<T>& p) {
  const mpf mm(m), p2 = mp_norm2(p);
  return p2 / (sqrt(mm * mm + p2) + mm);
}

/// (E, p) with E = sqrt(m^2 + |p|^2) exact: the exactly on-shell four-momentum of q.
template <class T>
mp_four mp_on_shell(const momentum<T>& q) {
  return {mp_energy(q.mass(), q.p()), mpf(q.p().x), mpf(q.p().y), mpf(q.p().z)};
}

/// The eight views of a speed from the exact proper speed u = |p| / m, each in a form without
/// cancellation (common practice, no source):
///   gamma = sqrt(1 + u^2), beta = u / gamma, 1 - beta = 1 / (gamma (gamma + u)),
///   gamma - 1 = u^2 / (1 + gamma), 1/gamma, 1 - 1/gamma = (gamma - 1) / gamma,
///   rapidity = asinh(u), proper speed = u.
void mp_views_from_proper_speed(const mpf& u, mpf out[ez_test::n_views]) {
  const mpf g = sqrt(1 + u * u);
  const mpf gm1 = u * u / (1 + g);
  out[ez_test::v_beta] = u / g;
  out[ez_test::v_deficit] = 1 / (g * (g + u));
  out[ez_test::v_gamma] = g;
  out[ez_test::v_gamma_m1] = gm1;
  out[ez_test::v_inv_gamma] = 1 / g;
  out[ez_test::v_dilation] = gm1 / g;
  out[ez_test::v_rapidity] = asinh(u);
  out[ez_test::v_proper_speed] = u;
}

/// Per-type ranges of the sweeps.
template <class T>
struct ranges {
  static long double lo() { return ez_test::sampler<T>::tiny(); }
  static long double hi() { return ez_test::sampler<T>::huge(); }
  // proper speeds of the speed() sweep: every view stays a normal number
  static long double u_max() { return std::is_same<T, float>::value ? 1e17L : 1e150L; }
  // masses of the speed() sweep
  static long double m_span() { return std::is_same<T, float>::value ? 1e9L : 1e100L; }
  // largest Lorentz factor of the boosts (float: e^rapidity must stay well inside its range)
  static long double g_max() { return std::is_same<T, float>::value ? 1e6L : 1e10L; }
};

// =============================================================================================
// energy()
// =============================================================================================

template <class T>
void energy_sweep(long samples, unsigned long long seed) {
  const long double lo = ranges<T>::lo(), hi = ranges<T>::hi();
  const long double top = static_cast<long double>(std::numeric_limits<T>::max()) / 8;
  const long double bottom = static_cast<long double>(std::numeric_limits<T>::min()) * 4;
  const char* names[5] = {"independent magnitudes, full range", "comparable magnitudes, full range",
                          "comparable, near the overflow limit", "comparable, near the underflow limit",
                          "massless (m = 0) or at rest (p = 0)"};
  std::printf("\n%s energy() = sqrt(m^2 + |p|^2), %ld samples per case (ulps; naive = "
              "sqrt(m*m + p.p) in %s)\n",
              type_name<T>(), samples, type_name<T>());
  draw rng(seed);
  for (int region = 0; region < 5; ++region) {
    stats lib;
    naive_stats naive;
    for (long i = 0; i < samples; ++i) {
      T m = T(0);
      vec3<T> p{T(0), T(0), T(0)};
      if (region == 0) {
        auto mag = [&]() { return rng.coin(0.1) ? T(0) : static_cast<T>(rng.sign() * rng.log_uniform(lo, hi)); };
        m = std::abs(mag());
        p = {mag(), mag(), mag()};
      } else {
        long double s = 0;
        if (region == 1 || region == 4) s = rng.log_uniform(lo * 1e8L, hi);
        if (region == 2) s = rng.log_uniform(hi, top);
        if (region == 3) s = rng.log_uniform(bottom, bottom * 1e12L);
        const long double spread = region == 1 || region == 4 ? 1e-8L : 1e-4L;
        auto comp = [&]() { return static_cast<T>(rng.sign() * s * rng.log_uniform(spread, 1)); };
        m = std::abs(comp());
        p = {comp(), comp(), comp()};
        if (region == 4) {
          if (rng.coin(0.5)) m = T(0);
          else p = {T(0), T(0), T(0)};
        }
      }
      const momentum<T> q(m, p);
      const T got = q.energy();
      const mpf want = mp_energy(m, p);
      if (lib.add(ulps(got, want))) lib.worst = hex(q);
      if (region == 4 && m != 0) CHECK(got == m);  // at rest: E = m exactly
      using std::sqrt;
      const T nv = sqrt(m * m + (p.x * p.x + p.y * p.y + p.z * p.z));
      using std::isfinite;
      if (!isfinite(nv) || (nv == 0 && want != 0)) ++naive.lost;
      else naive.err.add(ulps(nv, want));
    }
    std::printf("  %-40s max %.3f mean %.4f | naive max %.3g mean %.3g, %ld of %ld overflow or "
                "underflow (inf or 0)\n",
                names[region], lib.max, lib.mean(), naive.err.max, naive.err.mean(), naive.lost, samples);
    INFO(type_name<T>(), " energy ", names[region], " worst input ", lib.worst);
    CHECK(lib.max <= 1.0);
  }
}

TEST_CASE("energy(): within 1 ulp of MPFR over the whole range, no overflow or underflow (double)") {
  ez_test::set_frames_bits(reference_bits);
  energy_sweep<double>(sample_count(50000), 101);
}

TEST_CASE("energy(): exact cases at the ends of the range") {
  // Pythagorean quadruple 3^2 + 4^2 + 12^2 = 13^2 (arithmetic, common practice, no source),
  // scaled by powers of two up to the overflow and down to the subnormal range, where
  // m*m + p.p overflows or underflows.
  for (int k : {-1070, -1060, -600, -1, 0, 1, 600, 1019}) {
    const double s = std::ldexp(1.0, k);
    const momentum<double> q(12 * s, {3 * s, -4 * s, 0.0});
    INFO("scale 2^", k);
    CHECK(q.energy() == 13 * s);
    CHECK(q.p_norm() == 5 * s);
    CHECK(q.kinetic_energy() == s);  // E - m = 13 s - 12 s
  }
  // All four inputs max/2: E = 2 (max/2) = max exactly, while m*m overflows.
  const double h = std::numeric_limits<double>::max() / 2;
  const momentum<double> big(h, {h, -h, h});
  CHECK(big.energy() == std::numeric_limits<double>::max());
  CHECK(std::isinf(std::sqrt(h * h + 3 * h * h)));
  // All four the smallest subnormal: E = 2 denorm_min exactly, while every square underflows.
  const double d = std::numeric_limits<double>::denorm_min();
  const momentum<double> tiny(d, {d, d, -d});
  CHECK(tiny.energy() == 2 * d);
  CHECK(std::sqrt(d * d + 3 * d * d) == 0.0);
}

// =============================================================================================
// kinetic_energy()
// =============================================================================================

template <class T>
void kinetic_sweep(long samples, unsigned long long seed) {
  // Masses such that E - m stays a normal number for |p| / m down to 1e-12 and E finite for
  // |p| / m up to 1e12.
  const long double m_lo = std::max(1e-280L, static_cast<long double>(std::numeric_limits<T>::min()) * 1e26L);
  const long double m_hi = std::min(1e280L, static_cast<long double>(std::numeric_limits<T>::max()) * 1e-14L);
  // Very slow particles: |p| / m down to 1e-60 (1e-15 for float), masses chosen so that
  // E - m ~ |p|^2 / (2m) stays a normal number -- while |p|^2 itself may not be.
  const long double r_lo = std::is_same<T, float>::value ? 1e-15L : 1e-60L;
  const long double t_min = static_cast<long double>(std::numeric_limits<T>::min());
  const char* names[4] = {"slow, |p|/m in [1e-12, 1]", "fast, |p|/m in [1, 1e12]",
                          "massless, |p| over the mass range", "very slow, |p|/m in [r_lo, 1e-12]"};
  std::printf("\n%s kinetic_energy() = E - m, %ld samples per case (ulps; naive = sqrt(m*m + p.p) "
              "- m)\n",
              type_name<T>(), samples);
  draw rng(seed);
  for (int region = 0; region < 4; ++region) {
    stats lib;
    naive_stats naive;
    long naive_zero = 0;
    for (long i = 0; i < samples; ++i) {
      long double ml = rng.log_uniform(m_lo, m_hi);
      long double r = region == 0 ? rng.log_uniform(1e-12L, 1) : rng.log_uniform(1, 1e12L);
      if (region == 3) {
        r = rng.log_uniform(r_lo, 1e-12L);
        ml = rng.log_uniform(std::max(m_lo, 64 * t_min / (r * r)), m_hi);
      }
      const T m = region == 2 ? T(0) : static_cast<T>(ml);
      const vec3<T> p = rng.vector<T>(ml * (region == 2 ? 1 : r));
      const momentum<T> q(m, p);
      const T got = q.kinetic_energy();
      const mpf want = mp_kinetic(m, p);
      if (lib.add(ulps(got, want))) lib.worst = hex(q);
      using std::sqrt;
      const T nv = sqrt(m * m + (p.x * p.x + p.y * p.y + p.z * p.z)) - m;
      if (nv == 0) ++naive_zero;
      using std::isfinite;
      if (!isfinite(nv) || nv <= 0) ++naive.lost;
      else naive.err.add(ulps(nv, want));
    }
    std::printf("  %-38s max %.3f mean %.4f | naive max %.3g mean %.3g, %ld of %ld zero, negative "
                "or not finite (%ld exactly 0)\n",
                names[region], lib.max, lib.mean(), naive.err.max, naive.err.mean(), naive.lost,
                samples, naive_zero);
    INFO(type_name<T>(), " kinetic_energy ", names[region], " worst input ", lib.worst);
    CHECK(lib.max <= 1.0);
  }
  // At rest: exactly 0.
  CHECK(momentum<T>(T(3), {T(0), T(0), T(0)}).kinetic_energy() == T(0));
  // A very slow particle at a small scale: m = 2^(min_exponent/3), |p| = m 2^(min_exponent/3):
  // E - m = |p|^2 / (E + m) = m 2^(2 min_exponent/3 - 1) (1 - ...), a normal number whose
  // |p|^2 = m^2 2^(2 min_exponent/3) is far below the normal range.
  {
    using std::ldexp;
    const int k = std::numeric_limits<T>::min_exponent / 3;
    const T m = T(ldexp(T(1), k)), pl = T(ldexp(T(1), 2 * k));
    const momentum<T> q(m, {pl, T(0), T(0)});
    const mpf want = mp_kinetic(m, q.p());
    INFO(type_name<T>(), " very slow particle: mass ", hex(m), " p ", hex(q.p()), " kinetic_energy ",
         hex(q.kinetic_energy()));
    CHECK(ulps(q.kinetic_energy(), want) <= 1.0);
  }
  CHECK(momentum<T>().kinetic_energy() == T(0));
}

TEST_CASE("kinetic_energy(): within 1 ulp of MPFR for slow and fast particles (double)") {
  ez_test::set_frames_bits(reference_bits);
  kinetic_sweep<double>(sample_count(40000), 201);
}

// =============================================================================================
// speed()
// =============================================================================================

template <class T>
void speed_sweep(long samples, unsigned long long seed) {
  const long double u_max = ranges<T>::u_max(), span = ranges<T>::m_span();
  std::printf("\n%s speed() views against the exact proper speed |p| / m, %ld samples (ulps)\n",
              type_name<T>(), samples);
  draw rng(seed);
  stats st[ez_test::n_views];
  for (long i = 0; i < samples; ++i) {
    // A third near u = 1, a third slow or fast over the whole range, a third with one
    // momentum component only (the norm is then exact).
    const int region = rng.pick(3);
    const long double u = region == 0 ? rng.log_uniform(1e-2L, 1e2L) : rng.log_uniform(1 / u_max, u_max);
    const long double ml = rng.log_uniform(1 / span, span);
    const T m = static_cast<T>(ml);
    vec3<T> p = rng.vector<T>(u * ml);
    if (region == 2) p = {T(0), static_cast<T>(rng.sign() * u * ml), T(0)};
    const momentum<T> q(m, p);
    const speed<T> s = q.speed();
    T got[ez_test::n_views];
    ez_test::views_of(s, got);
    mpf want[ez_test::n_views];
    mp_views_from_proper_speed(sqrt(mp_norm2(p)) / mpf(m), want);
    for (int v = 0; v < ez_test::n_views; ++v)
      if (st[v].add(ulps(got[v], want[v]))) st[v].worst = hex(q);
  }
  for (int v = 0; v < ez_test::n_views; ++v) {
    std::printf("  %-18s max %.3f mean %.4f  worst input %s\n", ez_test::view_name(v), st[v].max,
                st[v].mean(), st[v].worst.c_str());
    INFO(type_name<T>(), " speed().", ez_test::view_name(v), " worst input ", st[v].worst);
    CHECK(st[v].max <= 2.0);
  }
  // At rest: beta = 0, gamma = 1 exactly.
  const speed<T> rest = momentum<T>(T(2), {T(0), T(0), T(0)}).speed();
  CHECK(rest.beta() == T(0));
  CHECK(rest.gamma() == T(1));
  CHECK(rest.gamma_m1() == T(0));
}

TEST_CASE("speed(): every view within 2 ulp of MPFR from the exact proper speed (double)") {
  ez_test::set_frames_bits(reference_bits);
  speed_sweep<double>(sample_count(40000), 301);
}

TEST_CASE("speed() of a massless particle is a domain error through the policy") {
  const momentum<double> photon(0.0, {1.0, 2.0, 3.0});
  // momentum::speed() names itself and the mass 0.
  ez_test::check_all_policies("momentum<double>::speed", "mass = 0",
                              [&](auto pol) { return photon.speed(pol).beta(); });
  ez_test::check_all_policies("momentum<double>::speed", "mass = 0",
                              [&](auto pol) { return photon.speed(pol).gamma(); });
}

// =============================================================================================
// velocity(), to_four_vector(), from_four_vector()
// =============================================================================================

template <class T>
void four_vector_sweep(long samples, unsigned long long seed) {
  const long double lo = ranges<T>::lo(), hi = ranges<T>::hi();
  draw rng(seed);
  stats vel, back, ratio, onshell;
  long massless = 0;
  long double worst_gamma2 = 0;
  for (long i = 0; i < samples; ++i) {
    // Components within 1e-20 of one another (so every velocity component is a normal
    // number), masses from 0 to 1e6 times the momentum or 1e-6 of it.
    const long double s = rng.log_uniform(lo * 1e30L, hi / 1e8L);
    auto comp = [&]() { return static_cast<T>(rng.sign() * s * rng.log_uniform(1e-6L, 1)); };
    const vec3<T> p{comp(), comp(), comp()};
    T m = rng.coin(0.1) ? T(0) : static_cast<T>(s * rng.log_uniform(1e-6L, 1e6L));
    if (static_cast<long double>(m) > hi) m = static_cast<T>(hi);
    if (m == 0) ++massless;
    const momentum<T> q(m, p);
    const mpf e_exact = mp_energy(m, p);
    // velocity = p / E: each component from the 1-ulp energy and one division.
    const vec3<T> v = q.velocity();
    const T vc[3] = {v.x, v.y, v.z}, pc[3] = {p.x, p.y, p.z};
    for (int k = 0; k < 3; ++k)
      if (vel.add(ulps(vc[k], mpf(pc[k]) / e_exact))) vel.worst = hex(q);
    // to_four_vector: (energy(), p) exactly.
    const four_vector<T> f = q.to_four_vector();
    CHECK(f.t == q.energy());
    CHECK(f.spatial() == p);
    // from_four_vector: the same p exactly, and the mass of the rounded (E, p).  E is rounded
    // (energy() within 1 ulp: |dE| <= ulp(E)), so the exact mass of the four-vector is
    // m_r = sqrt(m^2 + (E_r^2 - E^2)): |m_r^2 - m^2| <= (2E + dE) dE, a relative change of
    // about gamma^2 dE / E in m -- the conditioning of taking a mass back from an energy.
    // The library must give m_r within 1 ulp (vectors.hpp's contract; 0 where E_r < |p| by
    // rounding); the check below bounds |m'^2 - m^2| by the conditioning plus that ulp.
    const momentum<T> r = momentum<T>::from_four_vector(f);
    CHECK(r.p() == p);
    const mpf e_r(f.t);
    const mpf m_r2 = e_r * e_r - mp_norm2(p);
    const mpf m_r = m_r2 > 0 ? mpf(sqrt(m_r2)) : mpf(0);
    const T mb = r.mass();
    const double e1 = ulps(mb, m_r, m_r > 0 ? m_r : mpf(1));
    if (back.add(m_r > 0 ? e1 : (mb == 0 ? 0.0 : infinity))) back.worst = hex(q);
    const mpf de = ldexp(mpf(1), static_cast<int>(std::ilogb(f.t)) + 1 - std::numeric_limits<T>::digits);
    const mpf mm(m), mr(mb);
    const mpf ulp_m = mb > 0 ? ldexp(mpf(1), static_cast<int>(std::ilogb(mb)) + 1 - std::numeric_limits<T>::digits) : mpf(0);
    // The library's m' is within 1 ulp of m_r, which may be 2 ulp(m') when m_r lies in the
    // binade above: |m'^2 - m_r^2| <= (2 m' + 2 ulp) 2 ulp.
    const mpf budget = (2 * e_exact + de) * de + 4 * mr * ulp_m + 4 * ulp_m * ulp_m;
    const mpf dev = abs(mr * mr - mm * mm);
    if (ratio.add(static_cast<double>(mpf(dev / budget)))) ratio.worst = hex(q);
    if (m > 0) worst_gamma2 = std::max(worst_gamma2, static_cast<long double>(mpf(e_exact * e_exact / (mm * mm))));
    // On shell by construction: energy()^2 - |p|^2 = m^2 up to the rounding of energy()
    // (|E_r^2 - E^2| <= (2E + ulp(E)) ulp(E)).  A momentum whose mass and energy disagree
    // cannot be constructed at all: the object stores the mass and p, never an energy.
    const mpf eg(q.energy());
    const mpf de_q = ldexp(mpf(1), static_cast<int>(std::ilogb(q.energy())) + 1 - std::numeric_limits<T>::digits);
    if (onshell.add(static_cast<double>(mpf(abs(eg * eg - mp_norm2(p) - mm * mm) / ((2 * e_exact + de_q) * de_q)))))
      onshell.worst = hex(q);
  }
  std::printf("\n%s velocity, to/from_four_vector, %ld samples (%ld massless):\n", type_name<T>(),
              samples, massless);
  std::printf("  velocity() components vs p_i / E            max %.3f mean %.4f ulp\n", vel.max, vel.mean());
  std::printf("  from_four_vector mass vs exact mass of (E_r, p) max %.3f mean %.4f ulp\n", back.max,
              back.mean());
  std::printf("  |m'^2 - m^2| / conditioning budget          max %.3f mean %.4f (largest gamma^2 "
              "%.3Lg)\n",
              ratio.max, ratio.mean(), worst_gamma2);
  std::printf("  |E^2 - p^2 - m^2| / ((2E + ulp) ulp)       max %.3f mean %.4f\n", onshell.max, onshell.mean());
  INFO(type_name<T>(), " velocity worst input ", vel.worst);
  CHECK(vel.max <= 3.0);
  INFO(type_name<T>(), " from_four_vector worst input ", back.worst);
  CHECK(back.max <= 1.0);
  INFO(type_name<T>(), " round-trip mass worst input ", ratio.worst);
  CHECK(ratio.max <= 1.0);
  INFO(type_name<T>(), " on-shell worst input ", onshell.worst);
  CHECK(onshell.max <= 1.0);
  // A zero momentum: velocity zero, four-vector zero.
  const momentum<T> zero;
  CHECK(zero.velocity() == vec3<T>{T(0), T(0), T(0)});
  CHECK(zero.to_four_vector() == four_vector<T>{T(0), T(0), T(0), T(0)});
}

TEST_CASE("velocity(), to_four_vector() and the round trip through from_four_vector (double)") {
  ez_test::set_frames_bits(reference_bits);
  four_vector_sweep<double>(sample_count(40000), 401);
}

TEST_CASE("from_four_vector: bad four-vectors are domain errors") {
  using V = four_vector<double>;
  // A negative or NaN energy.
  ez_test::check_all_policies("eigenzeit::momentum<double>::from_four_vector(v)", -2.0,
                              [](double t, auto pol) {
                                return momentum<double>::from_four_vector(V{t, 1.0, 0.0, 0.0}, pol).mass();
                              });
  ez_test::check_all_policies("eigenzeit::momentum<double>::from_four_vector(v)",
                              std::numeric_limits<double>::quiet_NaN(), [](double t, auto pol) {
                                return momentum<double>::from_four_vector(V{t, 1.0, 0.0, 0.0}, pol).mass();
                              });
  // Spacelike by more than rounding: the domain error of invariant_mass (vectors.hpp), naming
  // t^2 - |r|^2 = 1 - 4 = -3.
  ez_test::check_all_policies("eigenzeit::invariant_mass(four_vector<double>)", "t^2 - |r|^2 = ", [](auto pol) {
    return momentum<double>::from_four_vector(V{1.0, 2.0, 0.0, 0.0}, pol).mass();
  });
  // The value printed must be in the unit the message states: where it says "in units of the
  // largest component squared", (1 - 4) / 2^2 = -0.75; otherwise -3 itself.
  try {
    (void)momentum<double>::from_four_vector(V{1.0, 2.0, 0.0, 0.0});
    FAIL_CHECK("no exception");
  } catch (const std::domain_error& e) {
    const std::string what = e.what();
    const bool scaled_unit = what.find("in units of the largest component squared") != std::string::npos;
    INFO(what);
    CHECK(what.find(scaled_unit ? "= -0.75 " : "= -3:") != std::string::npos);
  }
  // An infinite component: the domain error of invariant_mass.
  ez_test::check_all_policies("eigenzeit::invariant_mass(four_vector<double>)", "inf", [](auto pol) {
    return momentum<double>::from_four_vector(V{1.0, std::numeric_limits<double>::infinity(), 0.0, 0.0}, pol)
        .mass();
  });
  // |r| = (1 + 8 eps) t is beyond the rounding allowance (1 + 4 eps): an error;
  // |r| = (1 + 2 eps) t is a null vector off by rounding: mass 0, p kept exactly.
  const double eps = std::numeric_limits<double>::epsilon();
  CHECK_THROWS_AS(momentum<double>::from_four_vector(V{1.0, 1.0 + 8 * eps, 0.0, 0.0}), std::domain_error);
  const momentum<double> photon = momentum<double>::from_four_vector(V{1.0, 0.0, 0.0, 1.0 + 2 * eps});
  CHECK(photon.mass() == 0.0);
  CHECK(photon.p() == vec3<double>{0.0, 0.0, 1.0 + 2 * eps});
}

// =============================================================================================
// Outside checks: CODATA 2018 masses
// =============================================================================================

TEST_CASE("outside checks: muon, electron and proton with CODATA 2018 masses") {
  ez_test::set_frames_bits(reference_bits);
  // CODATA 2018 recommended values (energy equivalents, MeV), typed from memory.
  const double m_e = 0.51099895000;   // electron, CODATA 2018
  const double m_mu = 105.6583755;    // muon, CODATA 2018
  const double m_p = 938.27208816;    // proton, CODATA 2018
  struct particle_case {
    const char* what;
    double mass;
    vec3<double> p;
  };
  // Momenta are illustrative (invented) inputs; every check is against MPFR on the same inputs.
  // Muon: |p| = 100 MeV exactly, as (60, 0, 80).
  // Electron: the momentum of 1 keV kinetic energy, p = sqrt(K (K + 2m)) (rounded once).
  // Proton: an LHC-like 6.5 TeV along z.
  const double k_e = 1e-3;
  const double p_e = static_cast<double>(mpf(sqrt(mpf(k_e) * (mpf(k_e) + 2 * mpf(m_e)))));
  const particle_case cases[3] = {{"muon, |p| = 100 MeV", m_mu, {60.0, 0.0, 80.0}},
                                  {"electron, 1 keV kinetic", m_e, {0.0, p_e, 0.0}},
                                  {"proton, |p| = 6.5 TeV", m_p, {0.0, 0.0, 6.5e6}}};
  for (const particle_case& c : cases) {
    const momentum<double> q(c.mass, c.p);
    const mpf m(c.mass), pn = sqrt(mp_norm2(c.p));
    const mpf e = sqrt(m * m + pn * pn);
    mpf views[ez_test::n_views];
    mp_views_from_proper_speed(pn / m, views);
    const speed<double> s = q.speed();
    const double err[6] = {ulps(q.energy(), e),
                           ulps(q.kinetic_energy(), mpf(e - m)),
                           ulps(s.gamma(), views[ez_test::v_gamma]),
                           ulps(s.beta(), views[ez_test::v_beta]),
                           ulps(s.beta_deficit(), views[ez_test::v_deficit]),
                           ulps(s.gamma_m1(), views[ez_test::v_gamma_m1])};
    const double naive_k = std::sqrt(c.mass * c.mass + (c.p.x * c.p.x + c.p.y * c.p.y + c.p.z * c.p.z)) - c.mass;
    std::printf("  %-26s E %.17g MeV (%.2f ulp)  K %.17g MeV (%.2f ulp; naive E - m %.3g ulp)  gamma "
                "%.17g (%.2f)  beta %.17g (%.2f)  1 - beta %.6g (%.2f)  gamma - 1 (%.2f)\n",
                c.what, q.energy(), err[0], q.kinetic_energy(), err[1], ulps(naive_k, mpf(e - m)),
                s.gamma(), err[2], s.beta(), err[3], s.beta_deficit(), err[4], err[5]);
    INFO(c.what);
    for (double x : err) CHECK(x <= 1.0);
    // The four-vector (E, p) with E the exact energy rounded once: from_four_vector returns
    // the mass within 1 ulp of the exact mass of that four-vector (vectors.hpp), and within
    // the conditioning of the rounding of E of the CODATA mass: |dm| <= E ulp(E) / (2m)
    // (about gamma^2 / 2 ulp of m: ~1 for the muon and the electron, ~2.4e7 for the proton
    // at gamma ~ 6900, where E carries 53 bits but E^2 - p^2 cancels 2 log2(gamma) of them).
    const double e_r = static_cast<double>(e);
    const momentum<double> back = momentum<double>::from_four_vector(eigenzeit::make_four_vector(e_r, c.p));
    const mpf mr2 = mpf(e_r) * mpf(e_r) - pn * pn;
    CHECK(ulps(back.mass(), mpf(sqrt(mr2))) <= 1.0);
    const double half_ulp_e = std::ldexp(1.0, std::ilogb(e_r) - 53);
    // + 2 ulp of m: the library's 1 ulp, and the second-order part of the conditioning.
    const double bound = e_r * half_ulp_e / c.mass + 2 * std::ldexp(1.0, std::ilogb(c.mass) - 52);
    const double dev = std::fabs(back.mass() - c.mass);
    std::printf("  %-26s from_four_vector mass %.17g MeV: %.3g ulp of m off (conditioning bound "
                "%.3g ulp)\n",
                c.what, back.mass(), dev / std::ldexp(1.0, std::ilogb(c.mass) - 52),
                bound / std::ldexp(1.0, std::ilogb(c.mass) - 52));
    CHECK(dev <= bound);
    CHECK(back.p() == c.p);
  }
  // Facts of the trade (common practice, no source): a 6.5 TeV proton has gamma ~ 6.93e3 and
  // 1 - beta ~ 1 / (2 gamma^2) ~ 1.04e-8; a 100 MeV/c muon has beta ~ 0.69.
  const speed<double> lhc = momentum<double>(m_p, {0.0, 0.0, 6.5e6}).speed();
  CHECK(std::fabs(lhc.gamma() / 6.93e3 - 1) < 1e-3);
  CHECK(std::fabs(lhc.beta_deficit() / 1.04e-8 - 1) < 1e-2);
  CHECK(std::fabs(momentum<double>(m_mu, {60.0, 0.0, 80.0}).speed().beta() - 0.69) < 0.01);
  // The electron's kinetic energy comes back as 1 keV within the rounding of p (dK / K =
  // (p / E)(p / K) dp / p ~ 2 dp / p for a slow particle: a few ulp).
  const double k_back = momentum<double>(m_e, {0.0, p_e, 0.0}).kinetic_energy();
  CHECK(std::fabs(k_back - k_e) <= 4 * std::ldexp(1.0, std::ilogb(k_e) - 52));
}

// =============================================================================================
// boosted()
// =============================================================================================

enum class boost_speed { slow, medium, near_c, ultra };

/// Where the near-c sweeps are split (the contract is the same on both sides).  The library
/// holds the light-cone difference t - n.x of an input on or near the light cone to O(u^2)
/// of t (double-word arithmetic), and the boost multiplies it by 2 gamma: an error of about
/// 4 gamma^2 u^2 relative in the output, below 0.04 u for gamma below 0.1 / sqrt(u), and
/// beyond the 4-ulp contract from gamma ~ 1 / sqrt(u) on (measured in the upper part).
template <class T>
long double gamma_split() {
  return 0.1L / std::sqrt(static_cast<long double>(std::numeric_limits<T>::epsilon()) / 2);
}

const char* boost_speed_name(boost_speed k) {
  switch (k) {
    case boost_speed::slow: return "slow, beta in [1e-12, 0.25]";
    case boost_speed::medium: return "beta in [0.25, 0.999]";
    case boost_speed::near_c: return "near c, gamma in [10, 0.1/sqrt(u)]";
    case boost_speed::ultra: return "near c, gamma in [0.1/sqrt(u), g_max]";
  }
  return "?";
}

template <class T>
void boost_sweep(long samples, unsigned long long seed) {
  std::printf("\n%s boosted(): p' against the exact boost of the exact on-shell (E, p), %ld "
              "samples per case (ulps of the largest exact output component)\n",
              type_name<T>(), samples);
  for (boost_speed kind : {boost_speed::slow, boost_speed::medium, boost_speed::near_c, boost_speed::ultra}) {
    draw rng(seed + static_cast<unsigned long long>(kind));
    stats comp, energy;
    for (long i = 0; i < samples; ++i) {
      const T m = rng.coin(0.1) ? T(0) : static_cast<T>(rng.log_uniform(1e-3L, 1e3L));
      const long double pl = m > 0 ? static_cast<long double>(m) * rng.log_uniform(1e-6L, 1e6L)
                                   : rng.log_uniform(1e-3L, 1e3L);
      const vec3<T> p = rng.vector<T>(pl);
      const momentum<T> q(m, p);
      // Direction: random, or along +-p (the light-cone case of the largest cancellation).
      vec3<T> dir = rng.vector<T>(1);
      const int aim = rng.pick(3);
      if (aim == 1) dir = p;
      if (aim == 2) dir = -p;
      speed<T> s;
      mpf beta;
      if (kind == boost_speed::near_c || kind == boost_speed::ultra) {
        const T g = static_cast<T>(kind == boost_speed::near_c ? rng.log_uniform(10, gamma_split<T>())
                                                               : rng.log_uniform(gamma_split<T>(), ranges<T>::g_max()));
        s = speed<T>::from_gamma(g);
        const mpf gm(g);
        beta = sqrt((gm - 1) * (gm + 1)) / gm;
      } else {
        const T b = static_cast<T>(kind == boost_speed::slow ? rng.log_uniform(1e-12L, 0.25L)
                                                             : rng.uniform(0.25L, 0.999L));
        s = speed<T>::from_beta(b);
        beta = mpf(b);
      }
      const lorentz_boost<T> bst(dir, s);
      const momentum<T> r = q.boosted(bst);
      CHECK(r.mass() == m);
      const ez_test::mp_boost exact(mp_of(dir), beta);
      const mp_four want = exact.apply(mp_on_shell(q));
      const mpf scale = ez_test::max_abs(want);
      const double e3 = std::max(ulps(r.p().x, want.x, scale),
                                 std::max(ulps(r.p().y, want.y, scale), ulps(r.p().z, want.z, scale)));
      if (comp.add(e3)) comp.worst = hex(q) + " direction " + hex(dir) + " speed: beta " + hex(s.beta()) +
                                    " gamma " + hex(s.gamma());
      if (energy.add(ulps(r.energy(), want.t, scale))) energy.worst = hex(q);
    }
    std::printf("  %-40s p' max %.3f mean %.4f | energy() of the result vs t' max %.3f mean %.4f\n",
                boost_speed_name(kind), comp.max, comp.mean(), energy.max, energy.mean());
    INFO(type_name<T>(), " boosted ", boost_speed_name(kind), " worst input ", comp.worst);
    CHECK(comp.max <= 4.0);
    // energy() of the boosted momentum is sqrt(m^2 + |p'|^2): off from t' by at most |p' error|
    // (the norm is 1-Lipschitz) <= sqrt(3) 4 ulp, plus its own rounding (1 ulp).
    INFO(type_name<T>(), " boosted energy worst input ", energy.worst);
    CHECK(energy.max <= 4 * std::sqrt(3.0) + 1);
  }
}

TEST_CASE("boosted(): p' within 4 ulp of the exact boost, slow and near-c boosts (double)") {
  ez_test::set_frames_bits(reference_bits);
  boost_sweep<double>(sample_count(20000), 501);
}

TEST_CASE("boosted(): a photon along the boost direction, gamma 1e6 .. 1e10") {
  // The light-cone case in its plainest form: a photon p = (1, 2, 3) boosted along p.  Exactly,
  // p' = p gamma (1 - beta) = p / (gamma + sqrt(gamma^2 - 1)) (common practice, no source:
  // the Doppler factor of a photon moving with the frame).  The direction (1, 2, 3) / sqrt(14)
  // is not a double, so n . p and E carry O(u^2) relative errors, which the boost multiplies
  // by 2 gamma in t - n.p: ~4 gamma^2 u^2 relative in p', above the contract from gamma ~ 1e8.
  ez_test::set_frames_bits(reference_bits);
  const vec3<double> p{1.0, 2.0, 3.0};
  const momentum<double> photon(0.0, p);
  for (double g : {1e6, 1e7, 1e8, 1e9, 1e10}) {
    const momentum<double> r = photon.boosted(lorentz_boost<double>(p, speed<double>::from_gamma(g)));
    const mpf gm(g);
    const mpf doppler = 1 / (gm + sqrt((gm - 1) * (gm + 1)));
    const double err = ulps(r.p().z, mpf(3 * doppler));
    std::printf("  photon (1, 2, 3) along the boost, gamma %.0e: p'_z %a, exact %a: %.3g ulp\n", g, r.p().z,
                static_cast<double>(mpf(3 * doppler)), err);
    INFO("gamma ", g, ": p'_z ", hex(r.p().z), " exact ", hex(static_cast<double>(mpf(3 * doppler))));
    CHECK(err <= 4.0);
    CHECK(r.mass() == 0.0);
  }
}

/// Boosting a particle to its own rest frame.
template <class T>
void rest_frame_sweep(long samples, unsigned long long seed) {
  const T u = std::numeric_limits<T>::epsilon() / 2;
  std::printf("\n%s boosting a particle to its rest frame, %ld samples per case (p' in ulps of the "
              "largest exact output component; |p'| / m and |E' - m| / m against the allowances "
              "derived below)\n",
              type_name<T>(), samples);
  // (a) b = lorentz_boost::from_velocity(velocity()): the velocity is rounded (each component
  // within ~3 u of p_i / E), so the boost misses the rest frame by a velocity error of ~3 u:
  // the exact residual is |p'| ~ 3 u gamma^2 m (along the motion) + 3 u gamma beta m
  // (across it).  The library's p' is compared with the exact boost of the same (rounded)
  // velocity, and |p'| with that conditioning.  (Near gamma ~ 1 / sqrt(eps) the rounded
  // velocity reaches |beta| = 1, which from_velocity refuses.)
  // (b) b = lorentz_boost(p, speed()): the speed carries the proper speed |p| / m to O(u^2),
  // so the exact boost with the exact u = |p| / m is the rest frame exactly (p' = 0, E' = m)
  // and the library's p' must be within 4 ulp of m, up to gamma = g_max.
  // Route (a) stops at gamma = min(1e6, 0.25 / sqrt(eps)), where 1 - |velocity| is still
  // 8 eps or more; route (b) runs to g_max, in two parts split at gamma_split (see above).
  const long double eps = std::numeric_limits<T>::epsilon();
  const long double a_top = std::min(1e6L, 0.25L / std::sqrt(eps));
  for (int route = 0; route < 3; ++route) {
    draw rng(seed + static_cast<unsigned long long>(route));
    stats comp, residual, e_dev;
    const long double g_lo = route == 2 ? gamma_split<T>() : 1.0L + 1e-9L;
    const long double g_top = route == 0 ? a_top : route == 1 ? gamma_split<T>() : ranges<T>::g_max();
    for (long i = 0; i < samples; ++i) {
      const T m = static_cast<T>(rng.log_uniform(1e-3L, 1e3L));
      const long double gp = rng.log_uniform(g_lo, g_top);
      const vec3<T> p = rng.vector<T>(static_cast<long double>(m) * std::sqrt((gp - 1) * (gp + 1)));
      const momentum<T> q(m, p);
      const mp_four in = mp_on_shell(q);
      const mpf mm(m);
      lorentz_boost<T> b;
      mp_four want;
      if (route == 0) {
        const vec3<T> v = q.velocity();
        b = lorentz_boost<T>::from_velocity(v);
        const mp_vec3 vm = mp_of(v);
        want = ez_test::mp_boost(vm, sqrt(ez_test::dot(vm, vm))).apply(in);
      } else {
        b = lorentz_boost<T>(p, q.speed());
        const mpf pn = sqrt(mp_norm2(p));
        const mpf uu = pn / mm;
        want = ez_test::mp_boost(mp_of(p), uu / sqrt(1 + uu * uu)).apply(in);
      }
      const momentum<T> r = q.boosted(b);
      CHECK(r.mass() == m);
      const mpf scale = ez_test::max_abs(want);
      const double e3 = std::max(ulps(r.p().x, want.x, scale),
                                 std::max(ulps(r.p().y, want.y, scale), ulps(r.p().z, want.z, scale)));
      if (comp.add(e3)) comp.worst = hex(q);
      // |p'| against the conditioning: (a) 3 u (gamma^2 + gamma) beta m from the rounded
      // velocity (see above), stated as 4 u (gamma^2 + gamma) m; both routes add the rounding
      // of the library's p' (4 ulp of the largest output component, ~m, per component:
      // 4 sqrt(3) ulp(m), with 1% for the output's largest component exceeding m).
      const mpf g2 = in.t * in.t / (mm * mm);
      const double pn_rel = static_cast<double>(mpf(sqrt(mp_norm2(r.p())) / mm));
      const double ulp_m_rel =
          static_cast<double>(mpf(ldexp(mpf(1), std::ilogb(m) + 1 - std::numeric_limits<T>::digits) / mm));
      const double rounding = 4 * std::sqrt(3.0) * 1.01 * ulp_m_rel;
      const double allowed =
          route == 0 ? static_cast<double>(mpf(4 * (g2 + sqrt(g2)) * u)) + rounding : rounding;
      if (residual.add(pn_rel / allowed)) residual.worst = hex(q);
      // energy() close to m: E' = sqrt(m^2 + |p'|^2) = m (1 + |p'|^2 / (2 m^2) + ...), plus its
      // rounding (<= 1 ulp of m, i.e. 2u relative).
      const double e_rel = std::fabs(static_cast<double>(mpf((mpf(r.energy()) - mm) / mm)));
      const double e_allowed = pn_rel * pn_rel / 2 * 1.01 + 2 * static_cast<double>(u);
      if (e_dev.add(e_rel / e_allowed)) e_dev.worst = hex(q);
    }
    char name[96];
    std::snprintf(name, sizeof name, "%s gamma in [%.3Lg, %.3Lg]",
                  route == 0 ? "(a) from_velocity(velocity())," : "(b) lorentz_boost(p, speed()),",
                  route == 2 ? g_lo : 1.0L, g_top);
    std::printf("  %-52s p' vs exact boost max %.3f mean %.4f ulp | |p'| / allowance max %.3g | "
                "|E' - m| / allowance max %.3g\n",
                name, comp.max, comp.mean(), residual.max, e_dev.max);
    INFO(type_name<T>(), " rest frame ", name, " worst input ", comp.worst, " / ", residual.worst, " / ",
         e_dev.worst);
    CHECK(comp.max <= 4.0);
    CHECK(residual.max <= 1.0);
    CHECK(e_dev.max <= 1.0);
  }
}

TEST_CASE("boosted(): a particle boosted to its own rest frame (double)") {
  ez_test::set_frames_bits(reference_bits);
  rest_frame_sweep<double>(sample_count(15000), 601);
}

// =============================================================================================
// Bad input
// =============================================================================================

TEST_CASE("bad input: negative, NaN or infinite mass, NaN or infinite momentum component") {
  const char* ctor_name = "eigenzeit::momentum<double>::momentum(mass, p)";
  const double nan = std::numeric_limits<double>::quiet_NaN();
  const double inf = std::numeric_limits<double>::infinity();
  const vec3<double> p{1.0, -2.0, 0.5};
  for (double bad : {-1.5, -std::numeric_limits<double>::denorm_min(), nan, inf}) {
    ez_test::check_all_policies(ctor_name, bad,
                                [&p](double m, auto pol) { return momentum<double>(m, p, pol).energy(); });
  }
  for (double bad : {nan, inf, -inf}) {
    for (int k = 0; k < 3; ++k) {
      vec3<double> q = p;
      (k == 0 ? q.x : k == 1 ? q.y : q.z) = bad;
      // The message names the component: "nan", or "inf" for either infinity (it names |p_i|).
      ez_test::check_all_policies(ctor_name, std::isnan(bad) ? "nan" : "inf",
                                  [&q](auto pol) { return momentum<double>(1.0, q, pol).energy(); });
    }
  }
  // With the NaN policy every view of the result is NaN.
  const momentum<double> q(-1.0, p, eigenzeit::nan_policy());
  CHECK(std::isnan(q.mass()));
  CHECK(std::isnan(q.p().x));
  CHECK(std::isnan(q.p().y));
  CHECK(std::isnan(q.p().z));
  CHECK(std::isnan(q.p_norm()));
  CHECK(std::isnan(q.energy()));
  CHECK(std::isnan(q.kinetic_energy()));
  CHECK(std::isnan(q.velocity().x));
  CHECK(std::isnan(q.to_four_vector().t));
  CHECK(std::isnan(q.speed(eigenzeit::nan_policy()).beta()));
  CHECK(std::isnan(q.speed(eigenzeit::nan_policy()).gamma()));
  const momentum<double> r(1.0, {nan, 0.0, 0.0}, eigenzeit::nan_policy());
  CHECK(std::isnan(r.mass()));
  CHECK(std::isnan(r.energy()));
  // The errno policy sets EDOM (also covered by check_all_policies above).
  errno = 0;
  const momentum<double> s(nan, p, eigenzeit::errno_policy());
  CHECK(errno == EDOM);
  CHECK(std::isnan(s.energy()));
  // Valid edge inputs are accepted: mass 0, -0 (compares equal to 0), and the largest finite
  // values.
  CHECK_NOTHROW(momentum<double>(0.0, p));
  CHECK_NOTHROW(momentum<double>(-0.0, p));
  CHECK_NOTHROW(momentum<double>(std::numeric_limits<double>::max(), {-std::numeric_limits<double>::max(), 0.0, 0.0}));
}

// =============================================================================================
// float and long double
// =============================================================================================

TEST_CASE("float and long double: energy, kinetic energy, speed, four-vector and boost sweeps") {
  ez_test::set_frames_bits(reference_bits);
  energy_sweep<float>(sample_count(8000), 111);
  energy_sweep<long double>(sample_count(8000), 112);
  kinetic_sweep<float>(sample_count(6000), 211);
  kinetic_sweep<long double>(sample_count(6000), 212);
  speed_sweep<float>(sample_count(8000), 311);
  speed_sweep<long double>(sample_count(8000), 312);
  four_vector_sweep<float>(sample_count(8000), 411);
  four_vector_sweep<long double>(sample_count(8000), 412);
  boost_sweep<float>(sample_count(5000), 511);
  boost_sweep<long double>(sample_count(5000), 512);
  rest_frame_sweep<float>(sample_count(4000), 611);
  rest_frame_sweep<long double>(sample_count(4000), 612);
}

TEST_CASE("cpp_bin_float_50: energy and kinetic energy, relative error in units of its epsilon") {
  using T = ez_test::cpp50;
  ez_test::set_frames_bits(reference_bits);
  draw rng(701);
  double worst_e = 0, worst_k = 0;
  const long n = sample_count(200);
  for (long i = 0; i < n; ++i) {
    const double md = static_cast<double>(rng.log_uniform(1e-100L, 1e100L));
    const double r = static_cast<double>(rng.log_uniform(1e-12L, 1e12L));
    const vec3<double> pd = rng.vector<double>(md * r);
    const momentum<T> q(T(md), {T(pd.x), T(pd.y), T(pd.z)});
    const mpf e = mp_energy(md, pd);
    const mpf k = e - mpf(md);
    // cpp_bin_float_50's values are read into MPFR exactly (tests/support/reference.hpp).
    worst_e = std::max(worst_e, ez_test::measure_eps(q.energy(), e.backend().data()));
    worst_k = std::max(worst_k, ez_test::measure_eps(q.kinetic_energy(), k.backend().data()));
  }
  std::printf("\ncpp_bin_float_50, %ld samples: energy max %.3f eps, kinetic_energy max %.3f eps\n", n,
              worst_e, worst_k);
  // 1 ulp is at most 2 eps relative.
  CHECK(worst_e <= 2.0);
  CHECK(worst_k <= 2.0);
}

}  // namespace
