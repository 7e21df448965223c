// Tests of include/eigenzeit/timing/potential.hpp: point_mass_potential and j2_potential
// against MPFR (their formulas evaluated exactly), outside checks (the geoid potential W0 of
// the IERS Conventions, the oblate Earth's equator-pole difference), symmetries, special
// values and domain errors under the three policies.
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
#include <utility>

#include <eigenzeit/constants.hpp>
#include <eigenzeit/timing/potential.hpp>

#include "support/reference.hpp"
#include "support/policy_checks.hpp"

using ez_test::mp;
using ez_test::type_name;

namespace {

long sample_count(long full) { return ez_test::quick() ? std::max(500L, full / 20) : full; }

constexpr mpfr_prec_t kPrec = 1024;

/// Exact references: U = GM / r and U = GM / r [1 - J2 (R/r)^2 (3 z^2 / r^2 - 1) / 2] on the
/// exact inputs (GM, R, J2 are the model's own T values).
template <class T>
void reference(mpfr_t out, const std::array<T, 3>& p, const T& gm, const T* radius, const T* j2) {
  mp x(kPrec), y(kPrec), z(kPrec), r2(kPrec), r(kPrec), g(kPrec), t(kPrec);
  ez_test::set_exact(x.v, p[0]);
  ez_test::set_exact(y.v, p[1]);
  ez_test::set_exact(z.v, p[2]);
  ez_test::set_exact(g.v, gm);
  mpfr_sqr(r2.v, x.v, MPFR_RNDN);
  mpfr_sqr(t.v, y.v, MPFR_RNDN);
  mpfr_add(r2.v, r2.v, t.v, MPFR_RNDN);
  mpfr_sqr(t.v, z.v, MPFR_RNDN);
  mpfr_add(r2.v, r2.v, t.v, MPFR_RNDN);
  mpfr_sqrt(r.v, r2.v, MPFR_RNDN);
  mpfr_div(out, g.v, r.v, MPFR_RNDN);
  if (radius == nullptr) return;
  mp R(kPrec), J(kPrec), k(kPrec);
  ez_test::set_exact(R.v, *radius);
  ez_test::set_exact(J.v, *j2);
  // k = 1 - J2 (R^2 / r^2) (3 z^2 / r^2 - 1) / 2
  mpfr_sqr(t.v, z.v, MPFR_RNDN);
  mpfr_div(t.v, t.v, r2.v, MPFR_RNDN);
  mpfr_mul_ui(t.v, t.v, 3, MPFR_RNDN);
  mpfr_sub_ui(t.v, t.v, 1, MPFR_RNDN);
  mpfr_div_ui(t.v, t.v, 2, MPFR_RNDN);
  mpfr_sqr(k.v, R.v, MPFR_RNDN);
  mpfr_div(k.v, k.v, r2.v, MPFR_RNDN);
  mpfr_mul(k.v, k.v, t.v, MPFR_RNDN);
  mpfr_mul(k.v, k.v, J.v, MPFR_RNDN);
  mpfr_ui_sub(k.v, 1, k.v, MPFR_RNDN);
  mpfr_mul(out, out, k.v, MPFR_RNDN);
}

/// A random position: direction uniform on the sphere, radius log-uniform in [r_lo, r_hi].
template <class T>
std::array<T, 3> draw_position(std::mt19937_64& rng, long double r_lo, long double r_hi) {
  std::normal_distribution<long double> n(0, 1);
  long double d[3];
  long double norm = 0;
  do {
    for (long double& c : d) c = n(rng);
    norm = std::sqrt(d[0] * d[0] + d[1] * d[1] + d[2] * d[2]);
  } while (norm < 1e-6L);
  volatile long double lo = r_lo, hi = r_hi;
  const long double r =
      std::exp(std::uniform_real_distribution<long double>(std::log(lo), std::log(hi))(rng));
  return {T(d[0] / norm * r), T(d[1] / norm * r), T(d[2] / norm * r)};
}

template <class T>
void sweep(long samples, unsigned long long seed) {
  std::mt19937_64 rng(seed);
  const auto pm = eigenzeit::point_mass_potential<T>::earth();
  const auto j2 = eigenzeit::j2_potential<T>::earth();
  ez_test::ulp_stats st_pm, st_j2;
  for (long i = 0; i < samples; ++i) {
    // From the surface (R) out past the Moon's distance.
    const std::array<T, 3> p = draw_position<T>(rng, 6378136.6L, 4e8L);
    mp ref(kPrec);
    reference(ref.v, p, pm.gm, static_cast<const T*>(nullptr), static_cast<const T*>(nullptr));
    st_pm.add(ez_test::measure<T>(pm(p), ref.v), p[0], p[2]);
    reference(ref.v, p, j2.gm, &j2.radius, &j2.j2);
    st_j2.add(ez_test::measure<T>(j2(p), ref.v), p[0], p[2]);
  }
  std::printf("potential %s, %ld positions (r from a_E to 4e8 m): point mass max %.3f ulp (dist "
              "%lld) mean %.4f cr %.5f; J2 max %.3f ulp (dist %lld) mean %.4f cr %.5f\n",
              type_name<T>(), samples, st_pm.max_frac, static_cast<long long>(st_pm.max_dist),
              st_pm.mean(), st_pm.share_exact(), st_j2.max_frac,
              static_cast<long long>(st_j2.max_dist), st_j2.mean(), st_j2.share_exact());
  CHECK(st_pm.max_dist <= 1);
  CHECK(st_j2.max_dist <= 1);
  CHECK(st_pm.share_exact() >= 0.999);
  CHECK(st_j2.share_exact() >= 0.99);
  CHECK(st_pm.n == samples);
}

template <class T>
void sweep_multiprecision(long samples, unsigned long long seed) {
  std::mt19937_64 rng(seed);
  const auto pm = eigenzeit::point_mass_potential<T>::earth();
  const auto j2 = eigenzeit::j2_potential<T>::earth();
  double worst = 0;
  for (long i = 0; i < samples; ++i) {
    const std::array<double, 3> pd = draw_position<double>(rng, 6378136.6L, 4e8L);
    const std::array<T, 3> p = {T(pd[0]), T(pd[1]), T(pd[2])};
    mp ref(kPrec);
    reference(ref.v, p, pm.gm, static_cast<const T*>(nullptr), static_cast<const T*>(nullptr));
    const double e1 = ez_test::measure_eps(pm(p), ref.v);
    reference(ref.v, p, j2.gm, &j2.radius, &j2.j2);
    const double e2 = ez_test::measure_eps(j2(p), ref.v);
    CHECK(e1 <= 2.0);
    CHECK(e2 <= 2.0);
    worst = std::max({worst, e1, e2});
  }
  std::printf("potential %s, %ld positions: max relative error %.3f eps\n", type_name<T>(), samples,
              worst);
}

}  // namespace

TEST_CASE("potential models against MPFR: 1 ulp") {
  sweep<double>(sample_count(100000), 201);
  sweep<long double>(sample_count(20000), 202);
  sweep<float>(sample_count(20000), 203);
  sweep_multiprecision<ez_test::cpp50>(sample_count(1000), 204);
  sweep_multiprecision<ez_test::mpfr100>(sample_count(1000), 205);
}

TEST_CASE("outside check: the J2 model and the rotation reproduce the geoid potential W0") {
  // IERS Conventions (2010) table 1.1: W0 = 62 636 856.0 m^2/s^2 is the potential (gravity plus
  // centrifugal) on the geoid; GM, a_E, J2 and omega from the same table (constants.hpp);
  // 1/f = 298.25642 from memory of the same table.  On the equator (r = a_E) the J2 model plus
  // omega^2 a_E^2 / 2 must give W0, and on the pole (r = a_E (1 - f), no centrifugal term) too,
  // to the size of the neglected zonal terms: J4 is ~ -1.6e-6 (from memory), so the
  // tolerance is 5e-6 relative.
  using namespace eigenzeit::constants;
  const auto model = eigenzeit::j2_potential<double>::earth();
  const double a = earth_equatorial_radius<double>();
  const double w = earth_rotation_rate<double>();
  const double W_eq = model({a, 0.0, 0.0}) + 0.5 * w * w * a * a;
  const double W_eq2 = model({0.0, -a, 0.0}) + 0.5 * w * w * a * a;
  const double W_pole = model({0.0, 0.0, a * (1.0 - 1.0 / 298.25642)});
  const double W0 = geoid_potential<double>();
  std::printf("geoid potential: equator %.3f, pole %.3f, W0 %.1f m^2/s^2\n", W_eq, W_pole, W0);
  CHECK(std::fabs(W_eq / W0 - 1) < 5e-6);
  CHECK(std::fabs(W_pole / W0 - 1) < 5e-6);
  CHECK(W_eq == W_eq2);  // symmetric about the axis
  // The point mass alone misses W0 by ~1e-3 (the oblateness): the J2 term matters.
  const auto pm = eigenzeit::point_mass_potential<double>::earth();
  CHECK(std::fabs((pm({a, 0.0, 0.0}) + 0.5 * w * w * a * a) / W0 - 1) > 1e-4);
}

TEST_CASE("outside check: U = GM / r at the surface and at a GPS orbit") {
  // Common practice, no source: GM/a_E = 6.2494e7 m^2/s^2 (the reason L_G ~ 7e-10), and
  // GM/a = 1.5006e7 m^2/s^2 at the GPS semi-major axis 26 561.75 km (IS-GPS-200, 3.3.1.1).
  const auto pm = eigenzeit::point_mass_potential<double>::earth();
  CHECK(std::fabs(pm({6378136.6, 0.0, 0.0}) / 6.2494e7 - 1) < 1e-4);
  CHECK(std::fabs(pm({0.0, 26561750.0, 0.0}) / 1.5006e7 - 1) < 1e-4);
}

TEST_CASE_TEMPLATE("symmetries and limits", T, float, double, long double) {
  const auto pm = eigenzeit::point_mass_potential<T>::earth();
  auto j2 = eigenzeit::j2_potential<T>::earth();
  const T r = T(26561750);
  // The point mass depends on |r| only: the same value on each axis, either sign.
  const T u = pm({r, T(0), T(0)});
  CHECK(pm({T(0), -r, T(0)}) == u);
  CHECK(pm({T(0), T(0), r}) == u);
  // The J2 model: larger over the equator than over the pole; the equatorial and polar values
  // bracket the point mass as (1 + J2 (R/r)^2 / 2) and (1 - J2 (R/r)^2).
  const T eq = j2({r, T(0), T(0)});
  const T pole = j2({T(0), T(0), -r});
  CHECK(eq > u);
  CHECK(pole < u);
  const long double q = static_cast<long double>(j2.j2) * (static_cast<long double>(j2.radius) / r) *
                        (static_cast<long double>(j2.radius) / r);
  const long double tol = 4 * static_cast<long double>(std::numeric_limits<T>::epsilon());
  CHECK(std::fabs(static_cast<long double>(eq) / (static_cast<long double>(u) * (1 + q / 2)) - 1) <= tol);
  CHECK(std::fabs(static_cast<long double>(pole) / (static_cast<long double>(u) * (1 - q)) - 1) <= tol);
  // At the "magic" latitude where P2 vanishes (3 z^2 = r^2) the J2 term is zero.
  const T zc = r / std::sqrt(T(3));
  const T xc = r * std::sqrt(T(2) / T(3));
  const T mid = j2({xc, T(0), zc});
  const T mid_pm = pm({xc, T(0), zc});
  CHECK(std::fabs(static_cast<long double>(mid) / static_cast<long double>(mid_pm) - 1) <= tol);
  // J2 = 0 is exactly the point mass.
  j2.j2 = T(0);
  CHECK(j2({r, T(1), T(2)}) == pm({r, T(1), T(2)}));
  // Subnormal and tiny offsets from an axis are ordinary inputs.
  const T sub = std::numeric_limits<T>::denorm_min();
  CHECK(pm({r, sub, -sub}) == u);
}


TEST_CASE("bad input: domain errors under every policy") {
  const double nan = std::numeric_limits<double>::quiet_NaN();
  const double inf = std::numeric_limits<double>::infinity();
  const auto pm = eigenzeit::point_mass_potential<double>::earth();
  const auto j2 = eigenzeit::j2_potential<double>::earth();
  using P = std::array<double, 3>;
  // The centre, NaN and infinite components, a position whose r^2 overflows or underflows.
  const std::pair<P, const char*> bad_positions[] = {
      {P{0.0, 0.0, 0.0}, "squared distance"}, {P{nan, 1.0, 1.0}, "nan"},
      {P{1.0, -inf, 1.0}, "-inf"},            {P{1e200, 0.0, 0.0}, "squared distance"},
      {P{1e-200, 0.0, 0.0}, "squared distance"}};
  for (const auto& [p, text] : bad_positions) {
    ez_test::check_all_policies("point_mass_potential", text, [&pm, p = p](auto pol) { return pm(p, pol); });
    ez_test::check_all_policies("j2_potential", text, [&j2, p = p](auto pol) { return j2(p, pol); });
  }
  // Bad model parameters.
  const P here{7e6, 0.0, 0.0};
  for (double gm : {0.0, -3.986004418e14, nan, inf}) {
    const eigenzeit::point_mass_potential<double> m{gm};
    ez_test::check_all_policies("point_mass_potential", "GM", [m, here](auto pol) { return m(here, pol); });
    const eigenzeit::j2_potential<double> m2{gm, 6378136.6, 1e-3};
    ez_test::check_all_policies("j2_potential", "GM", [m2, here](auto pol) { return m2(here, pol); });
  }
  for (double radius : {-1.0, nan, inf}) {
    const eigenzeit::j2_potential<double> m{3.986004418e14, radius, 1e-3};
    ez_test::check_all_policies("j2_potential", "radius", [m, here](auto pol) { return m(here, pol); });
  }
  for (double jj : {nan, inf}) {
    const eigenzeit::j2_potential<double> m{3.986004418e14, 6378136.6, jj};
    ez_test::check_all_policies("j2_potential", "J2", [m, here](auto pol) { return m(here, pol); });
  }
}
