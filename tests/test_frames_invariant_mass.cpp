// Tests of include/eigenzeit/frames/invariant_mass.hpp: the invariant mass of two momenta and of
// a range of momenta (with its error bound and the fallback up the widening ladder).
// Accuracy against MPFR (Boost.Multiprecision mpfr_float) on the exact binary inputs, with the
// textbook (Ea + Eb)^2 - |pa + pb|^2 in double printed beside; the range form's rung, bound and
// tolerance; the outside check against the mpmath table of two-body decays
// (tests/data/two_body_decay.hpp); bad input.
//
// Reference: sqrt((sum E_i)^2 - |sum p_i|^2) with E_i = sqrt(m_i^2 + |p_i|^2), all in MPFR at
// 320 bits or more: the precision is raised until the cancellation of the final difference
// leaves at least 128 bits of M^2 (mp_mass below).
#include <doctest/doctest.h>

#include <algorithm>
#include <array>
#include <cerrno>
#include <chrono>
#include <cmath>
#include <cstdio>
#include <cstdlib>
#include <cstring>
#include <limits>
#include <random>
#include <stdexcept>
#include <string>
#include <vector>

#include <eigenzeit/frames/invariant_mass.hpp>
#include <eigenzeit/frames/lorentz_boost.hpp>
#include <eigenzeit/frames/momentum.hpp>
#include <eigenzeit/frames/vectors.hpp>
#include <eigenzeit/speed.hpp>

#include "data/two_body_decay.hpp"
#include "support/frames_reference.hpp"
#include "support/policy_checks.hpp"
#include "support/reference.hpp"

using eigenzeit::four_vector;
using eigenzeit::invariant_mass;
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

long sample_count(long full) { return ez_test::quick() ? std::max(50L, full / 20) : full; }

constexpr double infinity = std::numeric_limits<double>::infinity();

// Masses in MeV.  CODATA 2018 recommended values (energy equivalents), typed from memory:
const double m_electron = 0.51099895000;  // CODATA 2018
const double m_muon = 105.6583755;        // CODATA 2018
const double m_proton = 938.27208816;     // CODATA 2018
// PDG, Review of Particle Physics 2020, typed from memory:
const double m_pion = 139.57039;  // pi+-, PDG 2020



/// |got - ref| in ulps of T at the binade of `scale` (subnormal spacing below the normal
/// range); infinite if got is not finite.
template <class T>
double ulps(const T& got, const mpf& ref, const mpf& scale) {
  using std::isfinite;
  if (!isfinite(got)) return infinity;
  if (scale == 0) return got == 0 ? 0.0 : infinity;
  int e = 0;
  frexp(scale, &e);
  e = std::max(e, std::numeric_limits<T>::min_exponent);
  const mpf ulp = ldexp(mpf(1), e - std::numeric_limits<T>::digits);
  return static_cast<double>(mpf(abs(mpf(got) - ref) / ulp));
}
template <class T>
double ulps(const T& got, const mpf& ref) {
  return ulps(got, ref, ref);
}

/// ulp(x) of a finite nonzero T, as a double.
template <class T>
double ulp_of(T x) {
  return static_cast<double>(std::ldexp(static_cast<long double>(1), std::ilogb(x) + 1 - std::numeric_limits<T>::digits));
}


/// The textbook formula's errors over its finite positive results, and the count of results
/// that are 0 (where the exact mass is not), negative (M^2 < 0) or NaN / infinite.
struct naive_stats {
  stats err;
  long zero = 0, negative = 0, nan = 0;
};

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
  int pick(int n) { return static_cast<int>(eng() % static_cast<unsigned long long>(n)); }
  std::array<long double, 3> unit() {
    std::normal_distribution<long double> g;
    for (;;) {
      const long double x = g(eng), y = g(eng), z = g(eng);
      const long double n = std::sqrt(x * x + y * y + z * z);
      if (n > 1e-3L) return {x / n, y / n, z / n};
    }
  }
  /// A unit vector perpendicular to n (|n| = 1).
  std::array<long double, 3> perpendicular(const std::array<long double, 3>& n) {
    for (;;) {
      const auto r = unit();
      const long double d = r[0] * n[0] + r[1] * n[1] + r[2] * n[2];
      const std::array<long double, 3> w{r[0] - d * n[0], r[1] - d * n[1], r[2] - d * n[2]};
      const long double l = std::sqrt(w[0] * w[0] + w[1] * w[1] + w[2] * w[2]);
      if (l > 1e-3L) return {w[0] / l, w[1] / l, w[2] / l};
    }
  }
};

using dir3 = std::array<long double, 3>;

/// The unit vector at angle theta from n, in the plane of n and the perpendicular w.
dir3 rotate_towards(const dir3& n, const dir3& w, long double theta) {
  const long double c = std::cos(theta), s = std::sin(theta);
  return {c * n[0] + s * w[0], c * n[1] + s * w[1], c * n[2] + s * w[2]};
}

/// A particle of mass m and momentum length pl along the unit vector d (components rounded
/// to T once).
template <class T>
momentum<T> particle(long double m, long double pl, const dir3& d) {
  return momentum<T>(static_cast<T>(m), {static_cast<T>(pl * d[0]), static_cast<T>(pl * d[1]), static_cast<T>(pl * d[2])});
}

// ---- MPFR references ----------------------------------------------------------------------

/// The exact invariant mass of momenta [first, last) (see the top of the file).
template <class It>
mpf mp_mass(It first, It last) {
  unsigned bits = 320;
  for (;;) {
    mpf result;
    bool done = false;
    {
      const precision_scope scope(bits);
      mpf e(0), px(0), py(0), pz(0);
      long n = 0;
      for (It it = first; it != last; ++it, ++n) {
        const mpf m(it->mass()), x(it->p().x), y(it->p().y), z(it->p().z);
        e += sqrt(m * m + x * x + y * y + z * z);
        px += x;
        py += y;
        pz += z;
      }
      const mpf m2 = e * e - (px * px + py * py + pz * pz);
      // Each operation errs by 2^-bits of its operands (<= e^2); 4n + 8 operations.  Done
      // when 128 bits of m2 survive that.
      const mpf noise = ldexp(e * e, 7 + static_cast<int>(std::log2(4.0 * static_cast<double>(n) + 8)) - static_cast<int>(bits));
      if (e == 0 || m2 > ldexp(noise, 128) || bits >= 8192) {
        result = m2 > 0 ? mpf(sqrt(m2)) : mpf(0);
        done = true;
      }
    }
    if (done) return result;
    bits *= 2;
  }
}

template <class T>
mpf mp_pair_mass(const momentum<T>& a, const momentum<T>& b) {
  const std::array<momentum<T>, 2> v{a, b};
  return mp_mass(v.begin(), v.end());
}

/// The textbook pair mass in T: sqrt((Ea + Eb)^2 - |pa + pb|^2), Ei = sqrt(mi^2 + pi.pi).
template <class T>
T naive_pair(const momentum<T>& a, const momentum<T>& b, T& m2) {
  using std::sqrt;
  const T ea = sqrt(a.mass() * a.mass() + eigenzeit::dot(a.p(), a.p()));
  const T eb = sqrt(b.mass() * b.mass() + eigenzeit::dot(b.p(), b.p()));
  const T e = ea + eb;
  const vec3<T> p = a.p() + b.p();
  m2 = e * e - eigenzeit::dot(p, p);
  return sqrt(m2);
}

template <class T>
void add_naive(naive_stats& s, T value, T m2, const mpf& want) {
  using std::isfinite;
  if (!isfinite(m2)) ++s.nan;
  else if (m2 < 0) ++s.negative;
  else if (value == 0 && want != 0) ++s.zero;
  else s.err.add(ulps(value, want));
}

/// One pair-mass sweep: `make(a, b)` draws the pair.  Prints the library's and the textbook
/// formula's errors; asserts the 4-ulp contract.
template <class T, class Make>
void pair_sweep(const char* name, long samples, unsigned long long seed, Make make) {
  draw rng(seed);
  stats lib;
  naive_stats naive;
  for (long i = 0; i < samples; ++i) {
    momentum<T> a, b;
    make(rng, a, b);
    const T got = invariant_mass(a, b);
    const mpf want = mp_pair_mass(a, b);
    if (lib.add(ulps(got, want))) lib.worst = hex(a) + " " + hex(b);
    T m2 = T(0);
    const T nv = naive_pair(a, b, m2);
    add_naive(naive, nv, m2, want);
  }
  std::printf("  %-52s max %.3f mean %.4f | naive max %.3g mean %.3g, 0 / negative / NaN: %ld / %ld / "
              "%ld of %ld\n",
              name, lib.max, lib.mean(), naive.err.max, naive.err.mean(), naive.zero, naive.negative,
              naive.nan, samples);
  INFO(type_name<T>(), " ", name, " worst input ", lib.worst);
  CHECK(lib.max <= 4.0);
}

/// A photon pair at opening angle theta (up to the rounding of the components), random
/// orientation, energies log-uniform in [1e-3, 1e6].
template <class T>
void photon_pair(draw& rng, long double theta, momentum<T>& a, momentum<T>& b) {
  const dir3 n = rng.unit(), w = rng.perpendicular(n);
  a = particle<T>(0, rng.log_uniform(1e-3L, 1e6L), n);
  b = particle<T>(0, rng.log_uniform(1e-3L, 1e6L), rotate_towards(n, w, theta));
}

/// Two particles of mass m with Lorentz factors drawn from [g_lo, g_hi], at an opening angle
/// log-uniform in [1e-14, 1] (three quarters) or uniform in [1, pi].
template <class T>
void fast_pair(draw& rng, long double m, long double g_lo, long double g_hi, momentum<T>& a, momentum<T>& b) {
  const dir3 n = rng.unit(), w = rng.perpendicular(n);
  const long double theta = rng.coin(0.75) ? rng.log_uniform(1e-14L, 1) : rng.uniform(1, 3.14159265358979323846L);
  const long double ga = rng.log_uniform(g_lo, g_hi), gb = rng.log_uniform(g_lo, g_hi);
  a = particle<T>(m, m * std::sqrt((ga - 1) * (ga + 1)), n);
  b = particle<T>(m, m * std::sqrt((gb - 1) * (gb + 1)), rotate_towards(n, w, theta));
}

/// Random pairs over wide ranges: masses 0 (15%) or log-uniform in [m_lo, m_hi], momenta
/// log-uniform in [p_lo, p_hi], independent directions or (30%) nearly collinear ones.
template <class T>
void wide_pair(draw& rng, long double m_lo, long double m_hi, long double p_lo, long double p_hi, momentum<T>& a,
               momentum<T>& b) {
  const dir3 n = rng.unit();
  const dir3 d = rng.coin(0.3) ? rotate_towards(n, rng.perpendicular(n), rng.log_uniform(1e-12L, 1e-3L)) : rng.unit();
  const long double ma = rng.coin(0.15) ? 0 : rng.log_uniform(m_lo, m_hi);
  const long double mb = rng.coin(0.15) ? 0 : rng.log_uniform(m_lo, m_hi);
  a = particle<T>(ma, rng.log_uniform(p_lo, p_hi), n);
  b = particle<T>(mb, rng.log_uniform(p_lo, p_hi), d);
}

}  // namespace

// =============================================================================================
// invariant_mass(a, b)
// =============================================================================================

TEST_CASE("invariant_mass(a, b): photon pairs, from the issue's 1e-8 rad to nearly back-to-back") {
  ez_test::set_frames_bits(320);
  const long n = sample_count(50000);
  std::printf("\ninvariant_mass(a, b), double, %ld samples per case (ulps of the exact mass; naive = "
              "(Ea + Eb)^2 - |pa + pb|^2 in double)\n",
              n);
  // The case: opening angle 1e-8 rad (m^2 / E^2 ~ 1e-17, below double's resolution).
  pair_sweep<double>("photons, opening angle 1e-8 rad", n, 11, [](draw& rng, momentum<double>& a, momentum<double>& b) {
    photon_pair(rng, 1e-8L, a, b);
  });
  // Log-spaced opening angles from 1e-12 to pi - 1e-12.
  const long double pi = 3.14159265358979323846L;
  struct band {
    const char* name;
    long double lo, hi;
    bool from_pi;
  };
  const band bands[4] = {{"photons, angle in [1e-12, 1e-8]", 1e-12L, 1e-8L, false},
                         {"photons, angle in [1e-8, 1e-4]", 1e-8L, 1e-4L, false},
                         {"photons, angle in [1e-4, pi/2]", 1e-4L, pi / 2, false},
                         {"photons, angle in [pi/2, pi - 1e-12]", 1e-12L, pi / 2, true}};
  unsigned long long seed = 12;
  for (const band& bd : bands) {
    pair_sweep<double>(bd.name, n, seed++, [&bd, pi](draw& rng, momentum<double>& a, momentum<double>& b) {
      const long double t = rng.log_uniform(bd.lo, bd.hi);
      photon_pair(rng, bd.from_pi ? pi - t : t, a, b);
    });
  }
}

TEST_CASE("invariant_mass(a, b): light fast pairs, heavy slow pairs, random pairs, extreme scales") {
  ez_test::set_frames_bits(320);
  const long n = sample_count(50000);
  std::printf("\ninvariant_mass(a, b), double, %ld samples per case:\n", n);
  // Electrons (CODATA 2018 mass, above) with gamma 1e3 .. 1e11, |p| up to 5e10 MeV.
  pair_sweep<double>("electron pairs, gamma in [1e3, 1e11]", n, 21, [](draw& rng, momentum<double>& a, momentum<double>& b) {
    fast_pair(rng, m_electron, 1e3L, 1e11L, a, b);
  });
  pair_sweep<double>("muon pairs, gamma in [1, 1e8]", n, 22, [](draw& rng, momentum<double>& a, momentum<double>& b) {
    fast_pair(rng, m_muon, 1.0L + 1e-12L, 1e8L, a, b);
  });
  // Protons, |p| from 1e-9 m to m, independent directions.
  pair_sweep<double>("proton pairs, |p| in [1e-9 m, m]", n, 23, [](draw& rng, momentum<double>& a, momentum<double>& b) {
    a = particle<double>(m_proton, m_proton * rng.log_uniform(1e-9L, 1), rng.unit());
    b = particle<double>(m_proton, m_proton * rng.log_uniform(1e-9L, 1), rng.unit());
  });
  pair_sweep<double>("random pairs, m in [1e-6, 1e6], |p| in [1e-9, 1e9]", n, 24,
                     [](draw& rng, momentum<double>& a, momentum<double>& b) {
                       wide_pair(rng, 1e-6L, 1e6L, 1e-9L, 1e9L, a, b);
                     });
  // The same kind of pairs scaled by 2^-997 ~ 7.5e-301 and 2^997 ~ 1.3e300: the textbook
  // squares underflow or overflow; M is homogeneous, the library scales by powers of two.
  for (int k : {-997, 997}) {
    char name[64];
    std::snprintf(name, sizeof name, "random pairs scaled by 2^%d", k);
    pair_sweep<double>(name, n / 2, 25 + static_cast<unsigned long long>(k > 0),
                       [k](draw& rng, momentum<double>& a, momentum<double>& b) {
                         momentum<double> a1, b1;
                         wide_pair(rng, 1e-3L, 1e3L, 1e-3L, 1e6L, a1, b1);
                         auto scale = [k](const momentum<double>& q) {
                           return momentum<double>(std::ldexp(q.mass(), k), {std::ldexp(q.p().x, k), std::ldexp(q.p().y, k),
                                                                             std::ldexp(q.p().z, k)});
                         };
                         a = scale(a1);
                         b = scale(b1);
                       });
  }
}

TEST_CASE("invariant_mass(a, b): zero momenta, at rest, symmetry, float and long double") {
  ez_test::set_frames_bits(320);
  draw rng(31);
  const momentum<double> zero;
  for (int i = 0; i < 200; ++i) {
    momentum<double> a, b;
    wide_pair(rng, 1e-6L, 1e6L, 1e-9L, 1e9L, a, b);
    // A zero four-momentum adds nothing: the other's mass, exactly.
    CHECK(invariant_mass(zero, b) == b.mass());
    CHECK(invariant_mass(a, zero) == a.mass());
    // Symmetric in its arguments (common practice, no source: M is symmetric); each order is
    // within the 4-ulp contract, so the two agree within 8 ulp.
    const double ab = invariant_mass(a, b), ba = invariant_mass(b, a);
    CHECK(std::fabs(ab - ba) <= 8 * ulp_of(ab));
    // Never below the sum of the masses (M >= ma + mb; common practice, no source), up to the
    // 4-ulp contract.
    CHECK(ab >= (a.mass() + b.mass()) * (1 - 8 * std::numeric_limits<double>::epsilon()));
  }
  CHECK(invariant_mass(zero, zero) == 0.0);
  // Two particles at rest: M = ma + mb (within the contract).
  const momentum<double> p1(m_proton, {0.0, 0.0, 0.0}), e1(m_electron, {0.0, 0.0, 0.0});
  CHECK(std::fabs(invariant_mass(p1, e1) - (m_proton + m_electron)) <= 4 * ulp_of(m_proton + m_electron));
  // Back-to-back photons of energy E: M = 2E exactly (sum of exact terms).
  const momentum<double> g1(0.0, {0.0, 3.0, 0.0}), g2(0.0, {0.0, -3.0, 0.0});
  CHECK(invariant_mass(g1, g2) == 6.0);
  // Same-direction photons: M = 0 exactly.
  const momentum<double> g3(0.0, {1.0, 2.0, 2.0}), g4(0.0, {2.0, 4.0, 4.0});
  CHECK(invariant_mass(g3, g4) == 0.0);

  const long n = sample_count(10000);
  std::printf("\ninvariant_mass(a, b), float and long double, %ld samples per case:\n", n);
  pair_sweep<float>("float, random pairs, m in [1e-3, 1e3], |p| in [1e-3, 1e6]", n, 32,
                    [](draw& r, momentum<float>& a, momentum<float>& b) { wide_pair(r, 1e-3L, 1e3L, 1e-3L, 1e6L, a, b); });
  pair_sweep<float>("float, photons, angle in [1e-12, 1e-2]", n, 33, [](draw& r, momentum<float>& a, momentum<float>& b) {
    photon_pair(r, r.log_uniform(1e-12L, 1e-2L), a, b);
  });
  pair_sweep<long double>("long double, random pairs, m in [1e-6, 1e6], |p| in [1e-9, 1e9]", n, 34,
                          [](draw& r, momentum<long double>& a, momentum<long double>& b) {
                            wide_pair(r, 1e-6L, 1e6L, 1e-9L, 1e9L, a, b);
                          });
  pair_sweep<long double>("long double, electron pairs, gamma in [1e3, 1e11]", n, 35,
                          [](draw& r, momentum<long double>& a, momentum<long double>& b) {
                            fast_pair(r, m_electron, 1e3L, 1e11L, a, b);
                          });
}

TEST_CASE("invariant_mass(four_vector sum) agrees with invariant_mass(a, b) where the cancellation is mild") {
  ez_test::set_frames_bits(320);
  // Masses 1 .. 1e3, |p| <= 10 m, independent directions: E / M stays modest.  The four-vector
  // sum rounds each energy (1 ulp) and each sum (0.5 ulp): t, x, y, z each within ~3u of
  // their exact values, so |dM^2| <= 2 t 3u t + 2 u |r|^2 <= 8 u t^2 and |dM| <= 4 u t^2 / M;
  // plus 1 ulp (vectors.hpp's contract) and 4 ulp (the pair form's).
  draw rng(41);
  const long n = sample_count(40000);
  const double u = std::numeric_limits<double>::epsilon() / 2;
  stats rel;
  double worst_t_over_m = 0;
  for (long i = 0; i < n; ++i) {
    const long double ma = rng.log_uniform(1, 1e3L), mb = rng.log_uniform(1, 1e3L);
    const momentum<double> a = particle<double>(ma, ma * rng.log_uniform(1e-3L, 10), rng.unit());
    const momentum<double> b = particle<double>(mb, mb * rng.log_uniform(1e-3L, 10), rng.unit());
    const four_vector<double> s = a.to_four_vector() + b.to_four_vector();
    const double m4 = invariant_mass(s);
    const double m2 = invariant_mass(a, b);
    const double allowed = 4 * u * s.t * s.t / m2 + 5 * ulp_of(m2);
    if (rel.add(std::fabs(m4 - m2) / allowed)) rel.worst = hex(a) + " " + hex(b);
    worst_t_over_m = std::max(worst_t_over_m, s.t / m2);
  }
  std::printf("\ninvariant_mass(a.to_four_vector() + b.to_four_vector()) vs invariant_mass(a, b), %ld "
              "samples (largest E / M %.3g): |difference| / allowance max %.3f mean %.4f\n",
              n, worst_t_over_m, rel.max, rel.mean());
  INFO("worst input ", rel.worst);
  CHECK(rel.max <= 1.0);
}

// =============================================================================================
// invariant_mass(range, tolerance)
// =============================================================================================

namespace {

/// A typical event: 2 .. 50 particles (photons, electrons, muons, charged pions, protons) with
/// isotropic momenta of 0.1 MeV .. 10 GeV (invented data, for the sweep).
template <class T>
std::vector<momentum<T>> typical_event(draw& rng) {
  const double masses[5] = {0.0, m_electron, m_muon, m_pion, m_proton};
  const int n = 2 + rng.pick(49);
  std::vector<momentum<T>> v;
  v.reserve(static_cast<std::size_t>(n));
  for (int i = 0; i < n; ++i) v.push_back(particle<T>(masses[rng.pick(5)], rng.log_uniform(1e-1L, 1e4L), rng.unit()));
  return v;
}

/// The textbook range mass in T: sum the four-vectors, then sqrt(E^2 - |P|^2).
template <class T>
T naive_range(const std::vector<momentum<T>>& v, T& m2) {
  using std::sqrt;
  T e = T(0);
  vec3<T> p{T(0), T(0), T(0)};
  for (const momentum<T>& q : v) {
    e += sqrt(q.mass() * q.mass() + eigenzeit::dot(q.p(), q.p()));
    p += q.p();
  }
  m2 = e * e - eigenzeit::dot(p, p);
  return sqrt(m2);
}

/// Checks one range result: the value within 2 ulp of MPFR where the tolerance was met, and
/// the bound a true bound.  Returns the error in ulps.
template <class T>
double check_range_result(const eigenzeit::numeric::guarded_result<T>& r, const mpf& want, long& bound_violations,
                          long& unmet) {
  if (!(abs(mpf(r.value) - want) <= mpf(r.error_bound))) ++bound_violations;
  if (!r.tolerance_met) ++unmet;
  return ulps(r.value, want);
}

}  // namespace

TEST_CASE("invariant_mass(range): typical events answer on rung 0, within 2 ulp, with a true bound") {
  ez_test::set_frames_bits(320);
  draw rng(51);
  const long n = sample_count(10000);
  stats lib;
  naive_stats naive;
  long rung0 = 0, bound_violations = 0, unmet = 0, rung_count[8] = {};
  double worst_bound_ratio = 0;
  std::string worst_rung;
  for (long i = 0; i < n; ++i) {
    const std::vector<momentum<double>> v = typical_event<double>(rng);
    const auto r = invariant_mass(v);
    const mpf want = mp_mass(v.begin(), v.end());
    if (r.rung == 0) ++rung0;
    else if (worst_rung.empty()) worst_rung = "first event off rung 0 (" + std::to_string(v.size()) + " particles): " + hex(v[0]) + " " + hex(v[1]) + " ...";
    ++rung_count[std::min(r.rung, 7)];
    if (lib.add(check_range_result(r, want, bound_violations, unmet))) lib.worst = std::to_string(v.size()) + " particles, first " + hex(v[0]);
    worst_bound_ratio = std::max(worst_bound_ratio, r.error_bound / ulp_of(r.value));
    double m2 = 0;
    const double nv = naive_range(v, m2);
    add_naive(naive, nv, m2, want);
  }
  std::printf("\ninvariant_mass(range) of typical events (2..50 particles), double, %ld events:\n", n);
  std::printf("  value vs MPFR max %.3f mean %.4f ulp | naive (four-vector sum) max %.3g mean %.3g ulp, 0 / "
              "negative / NaN: %ld / %ld / %ld\n",
              lib.max, lib.mean(), naive.err.max, naive.err.mean(), naive.zero, naive.negative, naive.nan);
  std::printf("  rung 0: %ld of %ld (rung 1: %ld, rung 2: %ld, higher: %ld); tolerance met: %ld of %ld; "
              "largest error_bound %.3g ulp of the value; bound violated: %ld\n",
              rung0, n, rung_count[1], rung_count[2], n - rung_count[0] - rung_count[1] - rung_count[2], n - unmet,
              n, worst_bound_ratio, bound_violations);
  INFO("worst input ", lib.worst);
  CHECK(lib.max <= 2.0);
  CHECK(bound_violations == 0);
  CHECK(unmet == 0);
  INFO(worst_rung);
  CHECK(rung0 == n);  // the issue: typical events answer on rung 0
}

namespace {

/// 1001 photons along directions within `cone` rad of a common axis, energies 1 GeV .. 1 TeV
/// (invented data): M / E ~ cone, M^2 / E^2 ~ 1e-20 for cone = 1e-10.
std::vector<momentum<double>> collinear_photons(draw& rng, long double cone) {
  const dir3 n = rng.unit(), w1 = rng.perpendicular(n);
  const dir3 w2{n[1] * w1[2] - n[2] * w1[1], n[2] * w1[0] - n[0] * w1[2], n[0] * w1[1] - n[1] * w1[0]};
  std::vector<momentum<double>> v;
  for (int i = 0; i < 1001; ++i) {
    const long double t = cone * std::sqrt(rng.uniform(0, 1)), phi = rng.uniform(0, 6.283185307179586477L);
    const long double c = std::cos(t), s = std::sin(t);
    const dir3 d{c * n[0] + s * (std::cos(phi) * w1[0] + std::sin(phi) * w2[0]),
                 c * n[1] + s * (std::cos(phi) * w1[1] + std::sin(phi) * w2[1]),
                 c * n[2] + s * (std::cos(phi) * w1[2] + std::sin(phi) * w2[2])};
    v.push_back(particle<double>(0, rng.log_uniform(1e3L, 1e6L), d));
  }
  return v;
}

/// 1001 electrons all along one axis with gamma 1e9 .. 1e11 (invented data): M / E ~ 1e-10.
std::vector<momentum<double>> parallel_electrons(draw& rng) {
  const dir3 n = rng.unit();
  std::vector<momentum<double>> v;
  for (int i = 0; i < 1001; ++i) {
    const long double g = rng.log_uniform(1e9L, 1e11L);
    v.push_back(particle<double>(m_electron, m_electron * std::sqrt((g - 1) * (g + 1)), n));
  }
  return v;
}

}  // namespace

TEST_CASE("invariant_mass(range): the fallback for 1001 nearly collinear particles triggers and is within 2 ulp") {
  ez_test::set_frames_bits(320);
  const long n = ez_test::quick() ? 2 : 20;
  for (int kind = 0; kind < 2; ++kind) {
    draw rng(61 + static_cast<unsigned long long>(kind));
    stats lib;
    naive_stats naive;
    long on_rung0 = 0, bound_violations = 0, unmet = 0;
    int rung_lo = 99, rung_hi = -1;
    double ratio_lo = infinity, ratio_hi = 0, seconds = 0;
    for (long i = 0; i < n; ++i) {
      const std::vector<momentum<double>> v = kind == 0 ? collinear_photons(rng, 1e-10L) : parallel_electrons(rng);
      const auto t0 = std::chrono::steady_clock::now();
      const auto r = invariant_mass(v);
      seconds += std::chrono::duration<double>(std::chrono::steady_clock::now() - t0).count();
      const mpf want = mp_mass(v.begin(), v.end());
      mpf e(0);
      for (const auto& q : v) e += sqrt(mpf(q.mass()) * q.mass() + mpf(q.p().x) * q.p().x + mpf(q.p().y) * q.p().y + mpf(q.p().z) * q.p().z);
      const double ratio = static_cast<double>(mpf(want / e));
      ratio_lo = std::min(ratio_lo, ratio);
      ratio_hi = std::max(ratio_hi, ratio);
      if (r.rung == 0) ++on_rung0;
      rung_lo = std::min(rung_lo, r.rung);
      rung_hi = std::max(rung_hi, r.rung);
      if (lib.add(check_range_result(r, want, bound_violations, unmet))) lib.worst = "event " + std::to_string(i) + ", first " + hex(v[0]);
      double m2 = 0;
      const double nv = naive_range(v, m2);
      add_naive(naive, nv, m2, want);
    }
    std::printf("\ninvariant_mass(range) of 1001 %s, %ld events (M / E in [%.3g, %.3g]):\n",
                kind == 0 ? "photons within 1e-10 rad of an axis" : "parallel electrons, gamma 1e9..1e11", n,
                ratio_lo, ratio_hi);
    std::printf("  value vs MPFR max %.3f mean %.4f ulp | naive max %.3g mean %.3g ulp, 0 / negative / NaN: %ld / "
                "%ld / %ld\n",
                lib.max, lib.mean(), naive.err.max, naive.err.mean(), naive.zero, naive.negative, naive.nan);
    std::printf("  rung reached %d..%d (0: double, 1: long double, 2: cpp_bin_float_50, ...); on rung 0: %ld; "
                "tolerance met: %ld of %ld; bound violated: %ld; %.3g s per event\n",
                rung_lo, rung_hi, on_rung0, n - unmet, n, bound_violations, seconds / static_cast<double>(n));
    const char* kind_name = kind == 0 ? "photons" : "electrons";
    INFO(kind_name, " worst ", lib.worst);
    CHECK(on_rung0 == 0);  // the guard triggers
    CHECK(unmet == 0);
    CHECK(lib.max <= 2.0);
    CHECK(bound_violations == 0);
  }
}

TEST_CASE("invariant_mass(range): two particles agree with invariant_mass(a, b) within their contracts") {
  ez_test::set_frames_bits(320);
  draw rng(71);
  const long n = sample_count(30000);
  stats range_err, pair_err, diff;
  long bound_violations = 0, unmet = 0, rung0 = 0;
  for (long i = 0; i < n; ++i) {
    momentum<double> a, b;
    if (rng.coin(0.5)) wide_pair(rng, 1e-6L, 1e6L, 1e-9L, 1e9L, a, b);
    else photon_pair(rng, rng.log_uniform(1e-12L, 1e-2L), a, b);
    const std::vector<momentum<double>> v{a, b};
    const auto r = invariant_mass(v);
    const double p = invariant_mass(a, b);
    const mpf want = mp_pair_mass(a, b);
    if (r.rung == 0) ++rung0;
    if (range_err.add(check_range_result(r, want, bound_violations, unmet))) range_err.worst = hex(a) + " " + hex(b);
    pair_err.add(ulps(p, want));
    // 2 ulp (range, tolerance met) + 4 ulp (pair) of the exact value.
    if (diff.add(ulps(r.value, mpf(p), want) / 6)) diff.worst = hex(a) + " " + hex(b);
  }
  std::printf("\ntwo-particle ranges vs invariant_mass(a, b), %ld pairs: range max %.3f mean %.4f ulp (rung 0: %ld), "
              "pair max %.3f ulp, |range - pair| / 6 ulp max %.3f\n",
              n, range_err.max, range_err.mean(), rung0, pair_err.max, diff.max);
  INFO("worst ", range_err.worst, " / ", diff.worst);
  CHECK(range_err.max <= 2.0);
  CHECK(unmet == 0);
  CHECK(bound_violations == 0);
  CHECK(diff.max <= 1.0);
}

TEST_CASE("invariant_mass(range): empty ranges, other containers and types, bad tolerances, invalid momenta") {
  ez_test::set_frames_bits(320);
  // (d) An empty range has mass 0.
  const std::vector<momentum<double>> none;
  const auto r0 = invariant_mass(none);
  CHECK(r0.value == 0.0);
  CHECK(r0.error_bound == 0.0);
  CHECK(r0.tolerance_met);
  const std::array<momentum<double>, 0> none_array{};
  CHECK(invariant_mass(none_array).value == 0.0);

  // std::array, vector<momentum<float>>, long double: within 2 ulp of MPFR, true bounds.
  draw rng(81);
  long bound_violations = 0, unmet = 0;
  stats arr, flt, ldb;
  for (int i = 0; i < 200; ++i) {
    const std::vector<momentum<double>> v = typical_event<double>(rng);
    const std::array<momentum<double>, 3> a3{v[0], v[1], v.back()};
    arr.add(check_range_result(invariant_mass(a3), mp_mass(a3.begin(), a3.end()), bound_violations, unmet));
    const std::vector<momentum<float>> vf = typical_event<float>(rng);
    flt.add(check_range_result(invariant_mass(vf), mp_mass(vf.begin(), vf.end()), bound_violations, unmet));
    const std::vector<momentum<long double>> vl = typical_event<long double>(rng);
    ldb.add(check_range_result(invariant_mass(vl), mp_mass(vl.begin(), vl.end()), bound_violations, unmet));
  }
  // long double near the fallback: 1001 collinear photons rounded to long double.
  const std::vector<momentum<double>> photons = collinear_photons(rng, 1e-10L);
  std::vector<momentum<long double>> photons_ld;
  for (const auto& q : photons)
    photons_ld.emplace_back(static_cast<long double>(q.mass()),
                            vec3<long double>{q.p().x, q.p().y, q.p().z});
  const auto rl = invariant_mass(photons_ld);
  const double ld_fallback = check_range_result(rl, mp_mass(photons_ld.begin(), photons_ld.end()), bound_violations, unmet);
  std::printf("\nrange forms: std::array<momentum<double>, 3> max %.3f ulp; vector<momentum<float>> max %.3f ulp; "
              "vector<momentum<long double>> max %.3f ulp; long double, 1001 collinear photons: %.3f ulp on rung "
              "%d\n",
              arr.max, flt.max, ldb.max, ld_fallback, rl.rung);
  CHECK(arr.max <= 2.0);
  CHECK(flt.max <= 2.0);
  CHECK(ldb.max <= 2.0);
  CHECK(ld_fallback <= 2.0);
  CHECK(rl.rung > 0);
  CHECK(bound_violations == 0);
  CHECK(unmet == 0);

  // A looser tolerance is honoured: 1e-6 relative.
  const std::vector<momentum<double>> ev = collinear_photons(rng, 1e-10L);
  const auto loose = invariant_mass(ev, 1e-6);
  CHECK(loose.tolerance_met);
  CHECK(loose.error_bound <= 1e-6 * loose.value);
  const bool loose_bound_holds = abs(mpf(loose.value) - mp_mass(ev.begin(), ev.end())) <= mpf(loose.error_bound);
  CHECK(loose_bound_holds);

  // (e) A tolerance below eps / 2, or NaN: a domain error of numeric::guarded, naming it and
  // the tolerance.
  const std::vector<momentum<double>> two{momentum<double>(1.0, {1.0, 0.0, 0.0}), momentum<double>(1.0, {0.0, 1.0, 0.0})};
  const double eps = std::numeric_limits<double>::epsilon();
  for (double bad : {eps / 4, 0.0, -1.0, std::numeric_limits<double>::quiet_NaN()}) {
    ez_test::check_all_policies("eigenzeit::numeric::guarded<double>", bad,
                                [&two](double tol, auto pol) { return invariant_mass(two, tol, pol).value; });
  }
  CHECK_NOTHROW(invariant_mass(two, eps / 2));
  // float: the same rule with float's epsilon.
  const std::vector<momentum<float>> twof{momentum<float>(1.0f, {1.0f, 0.0f, 0.0f})};
  CHECK_THROWS_AS(invariant_mass(twof, std::numeric_limits<float>::epsilon() / 4), std::domain_error);

  // A range holding an invalid momentum (NaN-filled, made with the NaN policy) must not give
  // a number.  The header states a domain error ("every momentum must be valid (finite)").
  const momentum<double> bad(-1.0, {1.0, 0.0, 0.0}, eigenzeit::nan_policy());
  const std::vector<momentum<double>> with_bad{momentum<double>(1.0, {0.0, 0.0, 1.0}), bad};
  const auto rb = invariant_mass(with_bad, eps, eigenzeit::nan_policy());
  CHECK(std::isnan(rb.value));
  CHECK_FALSE(rb.tolerance_met);
  CHECK_THROWS_AS(invariant_mass(with_bad), std::domain_error);
  const std::vector<momentum<double>> bad_first{bad, momentum<double>(1.0, {0.0, 0.0, 1.0})};
  CHECK_THROWS_AS(invariant_mass(bad_first), std::domain_error);
}

// =============================================================================================
// Outside check: two-body decays (mpmath table)
// =============================================================================================

namespace {

double read_double(const char* s) {
  char* end = nullptr;
  const double x = std::strtod(s, &end);  // correctly rounded (exact for the table's inputs)
  REQUIRE(end != s);
  return x;
}

/// The rest-frame quantities of both daughters from the lab momenta and the boost inputs:
/// in[0..2] = p1, in[3..5] = p2, in[6..8] = the parent velocity (route 0) or direction
/// (route 1), in[9] = the parent gamma (route 1).  Outputs: p1*, E1*, |p1*|, p2*, E2*, |p2*|,
/// p1* + p2* (13 numbers).  Evaluated with mp_boost at the current precision.
std::array<mpf, 13> rest_frame(const mpf* in, int route, const mpf& m1, const mpf& m2) {
  const mp_four a{sqrt(m1 * m1 + in[0] * in[0] + in[1] * in[1] + in[2] * in[2]), in[0], in[1], in[2]};
  const mp_four b{sqrt(m2 * m2 + in[3] * in[3] + in[4] * in[4] + in[5] * in[5]), in[3], in[4], in[5]};
  const mp_vec3 d{in[6], in[7], in[8]};
  const mpf dd = ez_test::dot(d, d);
  mp_four ra = a, rb = b;
  if (dd != 0) {
    const mpf beta = route == 0 ? mpf(sqrt(dd)) : mpf(sqrt((in[9] - 1) * (in[9] + 1)) / in[9]);
    const ez_test::mp_boost boost(d, beta);
    ra = boost.apply(a);
    rb = boost.apply(b);
  }
  const mpf na = sqrt(ra.x * ra.x + ra.y * ra.y + ra.z * ra.z), nb = sqrt(rb.x * rb.x + rb.y * rb.y + rb.z * rb.z);
  return {ra.x, ra.y, ra.z, mpf(sqrt(m1 * m1 + na * na)), na, rb.x, rb.y, rb.z, mpf(sqrt(m2 * m2 + nb * nb)), nb,
          mpf(ra.x + rb.x), mpf(ra.y + rb.y), mpf(ra.z + rb.z)};
}

struct decay_summary {
  std::string name;
  long rows = 0;
  stats mass_ulps, mass_table, mass_dev;  // contract (ulps); |M_lib - M| / tolerance; / (u M)
  double mass_cond = 0;         // largest conditioning bound / (u M)
  long mass_vacuous = 0;
  stats rest_ulps[2], rest_table[2], rest_dev[2];
  double rest_cond[2] = {0, 0};
  long rest_rows[2] = {0, 0}, rest_vacuous[2] = {0, 0}, refused = 0;
  double gamma_max = 0;
};

}  // namespace

TEST_CASE("outside check: two-body decays from the mpmath table (tests/data/two_body_decay.hpp)") {
  // The table (tools/gen_two_body_decay.py, mpmath at 60 digits, printed to 50): a parent of
  // mass M decays at rest into daughters of masses m1, m2 with |p*|, E1*, E2* from standard
  // two-body kinematics (common practice, no source), boosted to the lab with the parent's
  // velocity (passive convention, as lorentz_boost).  Masses: CODATA 2018 and PDG 2020, typed
  // from memory (see the table's header).  Inputs M, m1, m2 (and P, angles) are exact doubles,
  // read exactly; the lab momenta and the parent's velocity and gamma are 50-digit values,
  // rounded to double once when read -- the only perturbation of the test's inputs, and the
  // one the tolerances below are scaled by.
  ez_test::set_frames_bits(512);
  const double u = std::numeric_limits<double>::epsilon() / 2;
  std::vector<decay_summary> out;
  for (std::size_t k = 0; k < eigenzeit_testdata::two_body_row_count; ++k) {
    const auto& row = eigenzeit_testdata::two_body_rows[k];
    auto it = std::find_if(out.begin(), out.end(), [&row](const decay_summary& d) { return d.name == row.name; });
    if (it == out.end()) {
      out.push_back(decay_summary());
      out.back().name = row.name;
      it = out.end() - 1;
    }
    decay_summary& sum = *it;
    ++sum.rows;
    const double M = read_double(row.M), m1 = read_double(row.m1), m2 = read_double(row.m2);
    const vec3<double> p1{read_double(row.p1x), read_double(row.p1y), read_double(row.p1z)};
    const vec3<double> p2{read_double(row.p2x), read_double(row.p2y), read_double(row.p2z)};
    const momentum<double> d1(m1, p1), d2(m2, p2);
    const double gamma_table = read_double(row.gamma);
    sum.gamma_max = std::max(sum.gamma_max, gamma_table);
    std::string where = std::string(row.name) + ", " + row.note + " (row " + std::to_string(k) + ")";
    INFO(where);

    // (i) The pair mass: within 4 ulp of MPFR's mass of the same rounded daughters (the
    // contract), and within the conditioning of the rounding of the lab momenta of the
    // table's M.  Conditioning (differentiate M^2 = E^2 - |P|^2, E = E1 + E2, P = p1 + p2,
    // with E_i = sqrt(m_i^2 + |p_i|^2); common practice, no source):
    //   dM / dp_1j = (E p_1j / E_1 - P_j) / M = E_2 (v_1j - v_2j) / M   (v_i = p_i / E_i),
    //   |dM| <= sum_ij |dM/dp_ij| u |p_ij|.
    // The crude estimate |dM/dp| <~ gamma, |p_ij| <~ gamma M gives u gamma^2 M; but the two
    // daughters' lab velocities differ by only ~1/gamma and E_2 <~ gamma M, so |dM/dp| <~ 1
    // and the bound is of order u gamma M (measured and printed below), less where the
    // components are exact zeros.  (The gamma^2 is what the textbook E^2 - |P|^2 loses to
    // cancellation, not what rounding the inputs costs.)  Tolerance: twice that first-order
    // bound (margin for the second order) plus 4 ulp.
    const double m_lib = invariant_mass(d1, d2);
    const mpf m_exact = mp_pair_mass(d1, d2);
    if (sum.mass_ulps.add(ulps(m_lib, m_exact))) sum.mass_ulps.worst = where;
    CHECK(ulps(m_lib, m_exact) <= 4.0);
    {
      const mpf e1 = sqrt(mpf(m1) * m1 + mpf(p1.x) * p1.x + mpf(p1.y) * p1.y + mpf(p1.z) * p1.z);
      const mpf e2 = sqrt(mpf(m2) * m2 + mpf(p2.x) * p2.x + mpf(p2.y) * p2.y + mpf(p2.z) * p2.z);
      const mpf e = e1 + e2;
      const double c1[3] = {p1.x, p1.y, p1.z}, c2[3] = {p2.x, p2.y, p2.z};
      mpf cond(0);
      for (int j = 0; j < 3; ++j) {
        const mpf pj = mpf(c1[j]) + c2[j];
        cond += abs(e * c1[j] / e1 - pj) * std::fabs(c1[j]) + abs(e * c2[j] / e2 - pj) * std::fabs(c2[j]);
      }
      cond = cond * u / m_exact;
      const double cond_d = static_cast<double>(cond);
      const double tol = 2 * cond_d + 4 * ulp_of(M);
      const double dev = std::fabs(m_lib - M);
      if (sum.mass_table.add(dev / tol)) sum.mass_table.worst = where;
      sum.mass_dev.add(dev / (u * M));
      sum.mass_cond = std::max(sum.mass_cond, cond_d / (u * M));
      if (tol > 1e-3 * M) ++sum.mass_vacuous;
      CHECK(dev <= tol);
      // The exact mass of the rounded daughters is itself within the first-order bound
      // (a check of the conditioning argument, not of the library).
      const bool explained = abs(m_exact - mpf(M)) <= 2 * cond + ulp_of(M);
      CHECK(explained);
    }

    // (ii) Back to the parent's rest frame: route 0 with lorentz_boost::from_velocity(beta
    // rounded), route 1 with lorentz_boost(beta rounded as a direction,
    // speed::from_gamma(gamma rounded)).  Rounding beta costs ~u / (1 - beta) relative in
    // gamma (1 - beta), so route 0 carries ~u gamma^2 E* and has no digits left at gamma
    // ~ 1e8 (where beta even rounds to 1 and from_velocity refuses it); route 1 loses only
    // ~u gamma E* there (the rounded direction), but is the ill-conditioned one for slow
    // parents: beta ~ sqrt(2 (gamma - 1)), and gamma = 1 + 5e-19 (P = 1e-9 M) rounds to 1.
    // The tolerances come from the first-order
    // sensitivity of the exact rest-frame values to every rounded input (finite differences
    // in MPFR at 512 bits), doubled, plus 8 ulp of the larger rest energy for the library's
    // rounding (4 ulp per component of each daughter, see momentum::boosted).
    const vec3<double> beta{read_double(row.beta_x), read_double(row.beta_y), read_double(row.beta_z)};
    const mpf table[13] = {mpf(row.p1x_star), mpf(row.p1y_star), mpf(row.p1z_star), mpf(row.E1_star), mpf(row.p_star),
                           -mpf(row.p1x_star), -mpf(row.p1y_star), -mpf(row.p1z_star), mpf(row.E2_star), mpf(row.p_star),
                           mpf(0), mpf(0), mpf(0)};
    const double e_star = std::max(read_double(row.E1_star), read_double(row.E2_star));
    for (int route = 0; route < 2; ++route) {
      lorentz_boost<double> b;
      if (route == 0) {
        b = lorentz_boost<double>::from_velocity(beta, eigenzeit::nan_policy());
        if (std::isnan(b.speed().beta())) {
          // Refused: |beta| rounds to 1 or more.  It must be a domain error with the default
          // policy, and the exact |beta| of the rounded components must be within an ulp of 1.
          ++sum.refused;
          CHECK_THROWS_AS(lorentz_boost<double>::from_velocity(beta), std::domain_error);
          const bool near_one = mpf(beta.x) * beta.x + mpf(beta.y) * beta.y + mpf(beta.z) * beta.z >= 1 - 4 * mpf(u);
          CHECK(near_one);
          continue;
        }
      } else {
        if (beta.x == 0 && beta.y == 0 && beta.z == 0) continue;  // parent at rest: route 0 covers it
        b = lorentz_boost<double>(beta, speed<double>::from_gamma(gamma_table));
      }
      ++sum.rest_rows[route];
      const momentum<double> q1 = d1.boosted(b), q2 = d2.boosted(b);
      CHECK(q1.mass() == m1);
      CHECK(q2.mass() == m2);
      // The library against the exact boost of the same rounded inputs (4 ulp of the largest
      // component of each daughter's exact output four-vector).
      mpf in[10] = {mpf(p1.x), mpf(p1.y), mpf(p1.z), mpf(p2.x), mpf(p2.y), mpf(p2.z), mpf(beta.x), mpf(beta.y), mpf(beta.z),
                    mpf(gamma_table)};
      const int n_in = route == 0 ? 9 : 10;
      const std::array<mpf, 13> exact = rest_frame(in, route, mpf(m1), mpf(m2));
      const mpf& s1 = exact[3];  // E1*: the largest component of a timelike four-vector
      const mpf& s2 = exact[8];
      const double got[13] = {q1.p().x, q1.p().y, q1.p().z, q1.energy(), q1.p_norm(), q2.p().x, q2.p().y, q2.p().z,
                              q2.energy(), q2.p_norm(), q1.p().x + q2.p().x, q1.p().y + q2.p().y, q1.p().z + q2.p().z};
      double worst = 0;
      for (int j = 0; j < 3; ++j) {
        worst = std::max(worst, ulps(got[j], exact[static_cast<std::size_t>(j)], s1));
        worst = std::max(worst, ulps(got[5 + j], exact[static_cast<std::size_t>(5 + j)], s2));
      }
      if (sum.rest_ulps[route].add(worst)) sum.rest_ulps[route].worst = where;
      CHECK(worst <= 4.0);
      // Sensitivities: exact[j] for inputs perturbed by h_k = 2^-100 |in_k| one at a time.
      std::array<mpf, 13> cond;
      cond.fill(mpf(0));
      for (int kk = 0; kk < n_in; ++kk) {
        if (in[kk] == 0) continue;  // exact zeros are read exactly
        const mpf h = ldexp(abs(in[kk]), -100);
        mpf moved[10];
        for (int j = 0; j < 10; ++j) moved[j] = in[j];
        moved[kk] += h;
        const std::array<mpf, 13> f = rest_frame(moved, route, mpf(m1), mpf(m2));
        for (std::size_t j = 0; j < 13; ++j) cond[j] += abs(f[j] - exact[j]) / h * abs(in[kk]) * u;
      }
      double worst_ratio = 0, worst_cond = 0, worst_dev = 0;
      bool vacuous = false;
      for (std::size_t j = 0; j < 13; ++j) {
        const double c = static_cast<double>(cond[j]);
        const double tol = 2 * c + 8 * ulp_of(e_star);
        const double dev = static_cast<double>(mpf(abs(mpf(got[j]) - table[j])));
        worst_ratio = std::max(worst_ratio, dev / tol);
        worst_dev = std::max(worst_dev, dev / (u * e_star));
        worst_cond = std::max(worst_cond, c / (u * e_star));
        if (tol > 1e-3 * e_star) vacuous = true;
        INFO("route ", route, " output ", j, ": library ", got[j], ", table ", static_cast<double>(table[j]),
             ", tolerance ", tol);
        CHECK(dev <= tol);
        // The exact rest frame of the rounded inputs is itself within the first-order bound.
        const bool explained = abs(exact[j] - table[j]) <= 2 * cond[j] + mpf(1e-40) * e_star;
        CHECK(explained);
      }
      if (sum.rest_table[route].add(worst_ratio)) sum.rest_table[route].worst = where;
      sum.rest_dev[route].add(worst_dev);
      sum.rest_cond[route] = std::max(sum.rest_cond[route], worst_cond);
      if (vacuous) ++sum.rest_vacuous[route];
    }
  }
  std::printf("\ntwo-body decays (%zu rows): (i) pair mass; (ii) rest frame by route 0 = from_velocity(beta), "
              "route 1 = (direction, from_gamma(gamma))\n",
              static_cast<std::size_t>(eigenzeit_testdata::two_body_row_count));
  for (const decay_summary& d : out) {
    std::printf("  %-20s %2ld rows, gamma up to %.3g\n", d.name.c_str(), d.rows, d.gamma_max);
    std::printf("    (i)  M vs MPFR max %.3f mean %.4f ulp | |M - M_table| max %.3g u M, / tolerance max %.3g; "
                "conditioning up to %.3g u M (no digits expected in %ld rows)\n",
                d.mass_ulps.max, d.mass_ulps.mean(), d.mass_dev.max, d.mass_table.max, d.mass_cond, d.mass_vacuous);
    for (int route = 0; route < 2; ++route)
      std::printf("    (ii) route %d, %2ld rows: p* vs MPFR max %.3f mean %.4f ulp | vs table max %.3g u E*, / "
                  "tolerance max %.3g; conditioning up to %.3g u E* (no digits expected in %ld rows)%s\n",
                  route, d.rest_rows[route], d.rest_ulps[route].max, d.rest_ulps[route].mean(), d.rest_dev[route].max,
                  d.rest_table[route].max,
                  d.rest_cond[route], d.rest_vacuous[route],
                  route == 0 && d.refused ? (" [from_velocity refused |beta| = 1 in " + std::to_string(d.refused) + " rows]").c_str()
                                          : "");
  }
}
