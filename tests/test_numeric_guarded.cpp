// Tests of include/eigenzeit/numeric/guarded.hpp: a routine with its own error bound falls
// back to the wider rungs of the ladder exactly when its bound exceeds the tolerance.
//
// The guarded routine here is the invariant mass of a set of four-momenta (E, px, py, pz),
// M = sqrt((E - P)(E + P)) with E and P = |p| the summed energy and momentum, with the
// standard bound for recursive summation, |sum - exact| <= (n - 1) u sum |x_i| (Higham,
// Accuracy and Stability of Numerical Algorithms, 2nd ed., eq. 4.4), propagated through the
// product and the square root.  The adversarial input is many collinear massless particles
// plus one soft particle going the other way: the mass is 1e-20 of the total energy, which no
// summation in double or long double can see.  The reference is MPFR at 2000 bits, where
// every sum is exact.
#include <doctest/doctest.h>

#include <cmath>
#include <cstdio>
#include <limits>
#include <random>
#include <stdexcept>
#include <vector>

#include <eigenzeit/numeric/guarded.hpp>

#include "support/reference.hpp"

namespace ez = eigenzeit;
namespace ezn = eigenzeit::numeric;
using ez_test::mp;

namespace {

struct particle {
  double e, px, py, pz;
};

// The guarded evaluation in W.
struct mass_of {
  const std::vector<particle>* parts;

  template <class W>
  ezn::bounded<W> operator()(ezn::type_tag<W>) const {
    using std::abs;
    using std::sqrt;
    const W u = std::numeric_limits<W>::epsilon() / 2;
    W e = 0, px = 0, py = 0, pz = 0, abs_e = 0, abs_p = 0;
    for (const particle& q : *parts) {
      e += W(q.e);
      px += W(q.px);
      py += W(q.py);
      pz += W(q.pz);
      abs_e += abs(W(q.e));
      abs_p += abs(W(q.px)) + abs(W(q.py)) + abs(W(q.pz));
    }
    const W n = W(static_cast<double>(parts->size()));
    const W err_e = n * u * abs_e;
    // |p| from the summed components: each component within n u sum|p_i|, so |p| within that
    // sum again (the norm is 1-Lipschitz per component), plus the norm's own 3 roundings.
    const W p = sqrt(px * px + py * py + pz * pz);
    const W err_p = n * u * abs_p + 3 * u * p;
    const W minus = e - p, plus = e + p;
    const W err_minus = err_e + err_p + u * abs(minus);
    const W err_plus = err_e + err_p + u * abs(plus);
    W m2 = minus * plus;
    const W err_m2 = err_minus * abs(plus) + err_plus * abs(minus) + err_minus * err_plus + u * abs(m2);
    if (m2 <= err_m2) {
      // Not even the sign of M^2 is known: M lies in [0, sqrt(max(m2, 0) + err)].
      const W top = sqrt((m2 > 0 ? m2 : W(0)) + err_m2);
      return {top / 2, top / 2};
    }
    const W m = sqrt(m2);
    // sqrt(m2 +- d) = m sqrt(1 +- d/m2), within m d / m2 / (1 + sqrt(1 - d/m2)) <= d / m.
    return {m, err_m2 / m + u * m};
  }
};

// Exact mass in MPFR (sums exact at 2000 bits for these inputs), rounded to double.
double exact_mass(const std::vector<particle>& parts) {
  mp e(2000), px(2000), py(2000), pz(2000), t(2000), m(2000);
  mpfr_set_zero(e.v, 1);
  mpfr_set_zero(px.v, 1);
  mpfr_set_zero(py.v, 1);
  mpfr_set_zero(pz.v, 1);
  for (const particle& q : parts) {
    mpfr_add_d(e.v, e.v, q.e, MPFR_RNDN);
    mpfr_add_d(px.v, px.v, q.px, MPFR_RNDN);
    mpfr_add_d(py.v, py.v, q.py, MPFR_RNDN);
    mpfr_add_d(pz.v, pz.v, q.pz, MPFR_RNDN);
  }
  mpfr_sqr(m.v, e.v, MPFR_RNDN);
  mpfr_sqr(t.v, px.v, MPFR_RNDN);
  mpfr_sub(m.v, m.v, t.v, MPFR_RNDN);
  mpfr_sqr(t.v, py.v, MPFR_RNDN);
  mpfr_sub(m.v, m.v, t.v, MPFR_RNDN);
  mpfr_sqr(t.v, pz.v, MPFR_RNDN);
  mpfr_sub(m.v, m.v, t.v, MPFR_RNDN);
  mpfr_sqrt(m.v, m.v, MPFR_RNDN);
  return mpfr_get_d(m.v, MPFR_RNDN);
}

}  // namespace

TEST_CASE("collinear massless particles and one soft one: the fallback climbs and lands within 2 ulp") {
  std::mt19937_64 rng(21);
  const int events = ez_test::quick() ? 3 : 20;
  for (int ev = 0; ev < events; ++ev) {
    std::vector<particle> parts;
    double total = 0;
    for (int i = 0; i < 1000; ++i) {
      const double en = std::ldexp(std::uniform_real_distribution<double>(1, 2)(rng), static_cast<int>(rng() % 12));
      parts.push_back({en, en, 0, 0});  // massless, along +x
      total += en;
    }
    // One soft massless particle along -x with energy 2.5e-41 of the total: M = 1e-20 E.
    const double soft = total * 2.5e-41;
    parts.push_back({soft, -soft, 0, 0});
    const double tol = 2 * std::numeric_limits<double>::epsilon();
    const auto r = ezn::guarded<double>(mass_of{&parts}, tol);
    const double want = exact_mass(parts);
    const double ulps = std::abs(r.value - want) / (std::nextafter(want, 1e300) - want);
    if (ev < 3)
      std::printf("event %d: M / E = %.3g, rung %d, bound %.3g relative, error %.3g ulp\n", ev,
                  want / total, r.rung, static_cast<double>(r.relative_error_bound()), ulps);
    CHECK(r.rung >= 2);  // double and long double cannot resolve it
    CHECK(r.tolerance_met);
    CHECK(ulps <= 2);
    CHECK(std::abs(r.value - want) <= r.error_bound);
    // What the first rung alone says: its bound admits no digit of the mass.
    const auto plain = mass_of{&parts}(ezn::type_tag<double>());
    CHECK(plain.error > 1e6 * want);
  }
}

TEST_CASE("events without strong cancellation take no fallback (counted)") {
  std::mt19937_64 rng(22);
  const int events = ez_test::quick() ? 100 : 2000;
  int fallbacks = 0, worse_than_bound = 0;
  double worst_rel = 0;
  const double tol = 64 * std::numeric_limits<double>::epsilon();
  for (int ev = 0; ev < events; ++ev) {
    std::vector<particle> parts;
    std::uniform_real_distribution<double> d(-1, 1);
    for (int i = 0; i < 3; ++i) {
      // Masses 0.25 to 0.75, momenta up to 0.2 per component: M is most of E, so the bound in
      // double (about 10 u relative) is far inside the tolerance.
      const double px = d(rng) / 5, py = d(rng) / 5, pz = d(rng) / 5, mass = 0.5 + d(rng) / 4;
      parts.push_back({std::sqrt(px * px + py * py + pz * pz + mass * mass), px, py, pz});
    }
    const auto r = ezn::guarded<double>(mass_of{&parts}, tol);
    if (r.rung != 0) ++fallbacks;
    const double want = exact_mass(parts);
    if (std::abs(r.value - want) > r.error_bound) ++worse_than_bound;
    worst_rel = std::max(worst_rel, std::abs(r.value - want) / want);
  }
  std::printf("%d well-conditioned events: %d fallbacks, largest relative error %.3g (tolerance %.3g)\n",
              events, fallbacks, worst_rel, tol);
  CHECK(fallbacks == 0);
  CHECK(worse_than_bound == 0);
  CHECK(worst_rel <= tol);
}

TEST_CASE("a type without a wider rung: the result comes back with its bound, marked as not met") {
  using T = ez_test::mpfr100;  // the ladder has no rung above MPFR-backed numbers
  const auto loose = [](auto tag) {
    using W = typename decltype(tag)::type;
    return ezn::bounded<W>{W(3), W(1) / 1000};
  };
  const auto r = ezn::guarded<T>(loose, T(1e-10));
  CHECK(r.value == 3);
  CHECK_FALSE(r.tolerance_met);
  CHECK(r.rung == 0);
  CHECK(r.error_bound == T(1) / 1000);
}

TEST_CASE("the top of the ladder: a bound that never shrinks ends the climb, marked as not met") {
  const auto hopeless = [](auto tag) {
    using W = typename decltype(tag)::type;
    return ezn::bounded<W>{W(1), W(1) / 2};  // no precision helps
  };
  const auto r = ezn::guarded<double>(hopeless, 1e-6);
  CHECK_FALSE(r.tolerance_met);
  CHECK(r.rung == ezn::rungs_above<double>());
  CHECK(r.error_bound >= 0.5);
}

TEST_CASE("tolerance below half an ulp, or NaN: a domain error, before any evaluation") {
  int calls = 0;
  const auto counted = [&calls](auto tag) {
    using W = typename decltype(tag)::type;
    ++calls;
    return ezn::bounded<W>{W(1), W(0)};
  };
  CHECK_THROWS_AS(ezn::guarded<double>(counted, 1e-17), std::domain_error);
  CHECK_THROWS_AS(ezn::guarded<double>(counted, std::nan("")), std::domain_error);
  CHECK_THROWS_AS(ezn::guarded<float>(counted, 1e-8f), std::domain_error);
  CHECK(calls == 0);
  try {
    ezn::guarded<double>(counted, 1e-20);
  } catch (const std::domain_error& e) {
    const std::string what = e.what();
    CHECK(what.find("guarded") != std::string::npos);
    CHECK(what.find("9.9999999999999995e-21") != std::string::npos);  // 1e-20 to 17 digits
  }
  const auto r = ezn::guarded<double>(counted, 1e-20, ez::nan_policy());
  CHECK(std::isnan(r.value));
  CHECK_FALSE(r.tolerance_met);
  // At half an ulp exactly it is accepted, and an exact evaluation meets it on the first rung.
  const auto ok = ezn::guarded<double>(counted, std::numeric_limits<double>::epsilon() / 2);
  CHECK(ok.tolerance_met);
  CHECK(ok.rung == 0);
  CHECK(calls == 1);
}
