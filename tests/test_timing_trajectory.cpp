// Tests of include/eigenzeit/timing/trajectory.hpp: proper time along sampled Kepler orbits
// against the closed-form result (mean rate times span plus the change of the periodic
// eccentricity term), the fourth-order convergence of the rule and the honesty of its error
// estimate, invariance under a change of epoch, static clocks, other types, and domain errors
// under the three policies.
//
// The truth comes from Kepler's equation solved by Newton's method in long double (64-bit
// significand on x86-64): M = E - e sin E, to |dE| below 1e-18, and the closed form of
// orbit_clock.hpp evaluated in long double:
//     tau - t = -3GM/(2ac^2) (t1 - t0) - 2 sqrt(GM a) e (sin E1 - sin E0) / c^2
// (derivation: the top of include/eigenzeit/timing/orbit_clock.hpp).  The integrator also
// carries the 1/c^4 terms of clock_rate_offset; their mean along a Kepler orbit is
//     (GM/a)^2 (15/8 - 3 / sqrt(1 - e^2)) / c^4
// (from U = GM/r, v^2 = GM (2/r - 1/a) and the time means <1/r> = 1/a,
// <1/r^2> = 1 / (a^2 sqrt(1 - e^2)); common practice, no source), ~ -3e-20, which the tight
// checks add to the truth (2.7e-15 s per day for GPS: far below the 1 ps requirement).
#include <doctest/doctest.h>

#include <algorithm>
#include <array>
#include <cerrno>
#include <cmath>
#include <cstdio>
#include <limits>
#include <stdexcept>
#include <string>
#include <type_traits>
#include <utility>
#include <vector>

#include <eigenzeit/constants.hpp>
#include <eigenzeit/timing/clock_rate.hpp>
#include <eigenzeit/timing/orbit_clock.hpp>
#include <eigenzeit/timing/potential.hpp>
#include <eigenzeit/timing/trajectory.hpp>
#include <eigenzeit/timing/two_part_time.hpp>

#include "support/reference.hpp"

using eigenzeit::two_part_time;
using ez_test::type_name;

namespace {

constexpr long double kC = 299792458.0L;

/// A Kepler orbit with its orientation, and its state at any time, in long double.
struct kepler_track {
  long double a, e, gm;
  long double incl = 0.959931L;   // 55 degrees
  long double node = 1.2L;        // right ascension of the node, rad
  long double perigee = 0.7L;     // argument of perigee, rad
  long double M0 = 0.3L;          // mean anomaly at t = 0, rad

  long double mean_motion() const { return std::sqrt(gm / (a * a * a)); }

  long double eccentric_anomaly(long double t) const {
    const long double M = M0 + mean_motion() * t;
    long double E = e < 0.8L ? M : 3.14159265358979323846L;
    for (int k = 0; k < 100; ++k) {
      const long double dE = (E - e * std::sin(E) - M) / (1 - e * std::cos(E));
      E -= dE;
      if (std::fabs(dE) < 1e-18L) break;
    }
    return E;
  }

  /// Position (m) and velocity (m/s) at t seconds, rounded once to T.
  template <class T>
  void state(long double t, std::array<T, 3>& r, std::array<T, 3>& v) const {
    const long double E = eccentric_anomaly(t);
    const long double n = mean_motion();
    const long double root = std::sqrt(1 - e * e);
    const long double den = 1 - e * std::cos(E);
    const long double px = a * (std::cos(E) - e), py = a * root * std::sin(E);
    const long double vx = -n * a * std::sin(E) / den, vy = n * a * root * std::cos(E) / den;
    // Rotation: perigee in the plane, then inclination about x, then node about z.
    const long double cw = std::cos(perigee), sw = std::sin(perigee);
    const long double ci = std::cos(incl), si = std::sin(incl);
    const long double cn = std::cos(node), sn = std::sin(node);
    auto turn = [&](long double x, long double y, std::array<T, 3>& out) {
      const long double x1 = x * cw - y * sw, y1 = x * sw + y * cw;
      const long double y2 = y1 * ci, z2 = y1 * si;
      out = {T(x1 * cn - y2 * sn), T(x1 * sn + y2 * cn), T(z2)};
    };
    turn(px, py, r);
    turn(vx, vy, v);
  }

  /// Closed-form tau - t over [0, t1] at 1/c^2, plus the mean 1/c^4 term when asked.
  long double closed_form(long double t1, bool with_c4) const {
    const long double c2 = kC * kC;
    const long double k = gm / a;
    long double x = -1.5L * k / c2 * t1 -
                    2 * std::sqrt(gm * a) * e *
                        (std::sin(eccentric_anomaly(t1)) - std::sin(eccentric_anomaly(0))) / c2;
    if (with_c4) x += k * k * (15.0L / 8 - 3 / std::sqrt(1 - e * e)) / (c2 * c2) * t1;
    return x;
  }

  /// The same at 1/c^2 when the rate is taken in the potential of another mass, GM' / r, along
  /// this (Kepler, GM) track: -(GM'/r + v^2/2)/c^2 with v^2 = GM (2/r - 1/a), and
  /// the integral of dt / r is (E1 - E0) / (a n) (dt = r dE / (a n)).
  long double closed_form_other_mass(long double t1, long double gm_model) const {
    const long double c2 = kC * kC;
    const long double dE = eccentric_anomaly(t1) - eccentric_anomaly(0);
    return -(gm_model + gm) / c2 * dE / (a * mean_motion()) + gm / (2 * a * c2) * t1;
  }
};

template <class T>
struct samples {
  std::vector<two_part_time<T>> t;
  std::vector<std::array<T, 3>> r, v;
};

/// n samples every `step` seconds from the epoch (whole days + fraction).
template <class T>
samples<T> sample_track(const kepler_track& k, T epoch_day, T epoch_fraction, long n, T step) {
  samples<T> s;
  const two_part_time<T> t0 = two_part_time<T>::from_days(epoch_day, epoch_fraction);
  for (long i = 0; i < n; ++i) {
    std::array<T, 3> r, v;
    k.state<T>(static_cast<long double>(step) * i, r, v);
    s.t.push_back(eigenzeit::add_seconds(t0, step * T(i)));
    s.r.push_back(r);
    s.v.push_back(v);
  }
  return s;
}

const kepler_track gps_like{26561750.0L, 0.01L, 3.986004418e14L};

}  // namespace

TEST_CASE("a GPS-like day sampled every 30 s reproduces the closed Kepler form to < 1 ps") {
  // The requirement: one day of samples every 30 s of a Kepler orbit with e = 0.01.
  const auto s = sample_track<double>(gps_like, 2460000.0, 0.25, 2881, 30.0);
  const auto model = eigenzeit::point_mass_potential<double>{3.986004418e14};
  const auto res = eigenzeit::trajectory_clock_offset(s.t, s.r, s.v, model);
  const long double truth = gps_like.closed_form(86400.0L, false);
  const long double truth4 = gps_like.closed_form(86400.0L, true);
  const long double err = static_cast<long double>(res.value) - truth;
  const long double err4 = static_cast<long double>(res.value) - truth4;
  std::printf("GPS-like day, 30 s: tau - t = %.15e s, closed form %.15Le s; difference %.3Le ps "
              "(%.3Le ps with the 1/c^4 mean); estimate %.3e ps; %zu samples\n",
              res.value, truth, err * 1e12L, err4 * 1e12L, res.error_estimate * 1e12,
              res.samples_used);
  CHECK(std::fabs(err) < 1e-12L);
  CHECK(std::fabs(err4) < 0.02e-12L);
  CHECK(res.samples_used == 2881);
  // The estimate is small and not far below the true error of the rule.
  CHECK(res.error_estimate < 0.1e-12);
  // The truth leaves out the periodic 1/c^4 terms (amplitude ~ e (GM/(ac^2))^2 / n, ~2e-18 s).
  CHECK(std::fabs(err4) <= 4 * res.error_estimate + 1e-17L);
  // Size check (common practice, no source): about -21.6 us per day against TCG.
  CHECK(std::fabs(res.value / -21.64e-6 - 1) < 0.001);
  // The same through the library's closed form (orbit_clock.hpp).
  const eigenzeit::kepler_orbit<double> o{26561750.0, 0.01, 3.986004418e14};
  const double E0 = static_cast<double>(gps_like.eccentric_anomaly(0));
  const double E1 = static_cast<double>(gps_like.eccentric_anomaly(86400.0L));
  const double lib = eigenzeit::orbit_rate_offset(o) * 86400.0 +
                     (eigenzeit::orbit_periodic_offset(o, E1) - eigenzeit::orbit_periodic_offset(o, E0));
  CHECK(std::fabs(res.value - lib) < 1e-12);
}

TEST_CASE("convergence order and an honest error estimate") {
  // Steps 960, 480, 240 s over 12 h of an eccentric orbit (e = 0.7, perigee 7 980 km).
  // (a) The rate in the same potential as the motion: the O(h^4) terms cancel (see the
  //     header), the error falls by 2^5 or more per halving, and the estimate (which assumes
  //     h^4) is on the safe side.
  // (b) The rate in the potential of 1.5 times the mass along the same track: plain fourth
  //     order, error ratio ~16, and the estimate close to the error.
  const kepler_track molniya_like{26600000.0L, 0.7L, 3.986004418e14L};
  const long double span = 43200.0L;
  for (int variant = 0; variant < 2; ++variant) {
    const long double gm_model = variant == 0 ? molniya_like.gm : 1.5L * molniya_like.gm;
    const auto model = eigenzeit::point_mass_potential<double>{static_cast<double>(gm_model)};
    double prev_err = 0;
    for (double step : {960.0, 480.0, 240.0}) {
      const long n = static_cast<long>(span / step) + 1;
      const auto s = sample_track<double>(molniya_like, 2455197.0, 0.5, n, step);
      const auto res = eigenzeit::trajectory_clock_offset(s.t, s.r, s.v, model);
      // The 1/c^4 terms (~1e-15 s here, below 1e-3 of every error measured) are left out.
      const long double truth = molniya_like.closed_form_other_mass(span, gm_model);
      const double err = static_cast<double>(std::fabs(static_cast<long double>(res.value) - truth));
      std::printf("e = 0.7, %s, step %4.0f s: error %.3e ps, estimate %.3e ps", variant == 0 ? "same mass " : "1.5 x mass",
                  step, err * 1e12, res.error_estimate * 1e12);
      if (prev_err > 0) std::printf(", error ratio %.2f", prev_err / err);
      std::printf("\n");
      INFO("variant ", variant, " step ", step);
      CHECK(err > 1e-3 * 1e-12);  // far above the truth's own neglect
      CHECK(err <= 2 * res.error_estimate);  // the estimate does not hide the error
      if (variant == 1) CHECK(res.error_estimate <= 3 * err);  // nor overstates a plain h^4
      if (prev_err > 0) {
        CHECK(prev_err / err > (variant == 0 ? 24 : 12));
        if (variant == 1) CHECK(prev_err / err < 20);
      }
      prev_err = err;
    }
  }
}

TEST_CASE("changing the epoch by whole days changes nothing") {
  // The interval lengths come from two-part times: the same seconds at JD 2451545.0 and
  // JD 2488069.5 (a century later) give bit-identical results.
  const auto model = eigenzeit::j2_potential<double>::earth();
  const auto a = sample_track<double>(gps_like, 2451545.0, 0.0, 721, 30.0);
  const auto b = sample_track<double>(gps_like, 2488069.0, 0.5, 721, 30.0);
  const auto ra = eigenzeit::trajectory_clock_offset(a.t, a.r, a.v, model);
  const auto rb = eigenzeit::trajectory_clock_offset(b.t, b.r, b.v, model);
  CHECK(ra.value == rb.value);
  CHECK(ra.error_estimate == rb.error_estimate);
}

TEST_CASE("the J2 model: the 30 s result agrees with a 3 s one") {
  // No closed form with J2 along this track (the track is Keplerian, the potential is not:
  // the integrator only needs a smooth trajectory); a ten times denser sampling is the check.
  const auto model = eigenzeit::j2_potential<double>::earth();
  const auto coarse = sample_track<double>(gps_like, 2460000.0, 0.0, 2881, 30.0);
  const auto dense = sample_track<double>(gps_like, 2460000.0, 0.0, 28801, 3.0);
  const auto rc = eigenzeit::trajectory_clock_offset(coarse.t, coarse.r, coarse.v, model);
  const auto rd = eigenzeit::trajectory_clock_offset(dense.t, dense.r, dense.v, model);
  std::printf("J2 day: 30 s %.15e s, 3 s %.15e s, difference %.3e ps, estimate %.3e ps\n",
              rc.value, rd.value, (rc.value - rd.value) * 1e12, rc.error_estimate * 1e12);
  CHECK(std::fabs(rc.value - rd.value) < 0.05e-12);
  CHECK(std::fabs(rc.value - rd.value) <= 4 * rc.error_estimate + 1e-15);
  // J2 changes the day's total by a few ps (measured 3.5 ps): far from nothing.
  const auto pm = eigenzeit::point_mass_potential<double>::earth();
  const auto rp = eigenzeit::trajectory_clock_offset(coarse.t, coarse.r, coarse.v, pm);
  std::printf("J2 minus point mass over the day: %.3e ps\n", (rc.value - rp.value) * 1e12);
  CHECK(std::fabs(rc.value - rp.value) > 1e-12);
}

TEST_CASE("static clocks: exact constant rates") {
  // A clock at rest far from all masses accumulates exactly nothing.
  std::vector<two_part_time<double>> t;
  std::vector<std::array<double, 3>> r, v;
  for (int i = 0; i < 5; ++i) {
    t.push_back(two_part_time<double>::from_seconds(100.0 * i));
    r.push_back({1e9, 0.0, 0.0});
    v.push_back({0.0, 0.0, 0.0});
  }
  auto zero = [](const std::array<double, 3>&) { return 0.0; };
  const auto res0 = eigenzeit::trajectory_clock_offset(t, r, v, zero);
  CHECK(res0.value == 0);
  CHECK(res0.error_estimate == 0);
  // A clock at rest in a constant potential: rate times span, to rounding.
  const auto pm = eigenzeit::point_mass_potential<double>::earth();
  const auto res = eigenzeit::trajectory_clock_offset(t, r, v, pm);
  const double expected = eigenzeit::clock_rate_offset(0.0, pm(r[0])) * 400.0;
  CHECK(std::fabs(res.value / expected - 1) < 4e-16);
  CHECK(res.error_estimate < 1e-15 * std::fabs(expected));
}

TEST_CASE("sample counts: two, three and an odd number of intervals") {
  const auto model = eigenzeit::point_mass_potential<double>{3.986004418e14};
  for (long n : {2L, 3L, 4L, 10L, 11L}) {
    const auto s = sample_track<double>(gps_like, 2460000.0, 0.0, n, 30.0);
    const auto res = eigenzeit::trajectory_clock_offset(s.t, s.r, s.v, model);
    const long double truth = gps_like.closed_form(30.0L * static_cast<long double>(n - 1), true);
    const long double err = std::fabs(static_cast<long double>(res.value) - truth);
    INFO("n = ", n, " error ", static_cast<double>(err), " estimate ", res.error_estimate);
    CHECK(res.samples_used == static_cast<std::size_t>(n));
    CHECK(err < 1e-17L + 1e-9L * std::fabs(truth));
    CHECK(static_cast<double>(err) <= 4 * res.error_estimate + 1e-18);
  }
}

TEST_CASE_TEMPLATE("other types", T, float, long double) {
  // long double: the same day as the double case, same requirement.  float: 24 bits of a
  // -21.6 us total are ~1e-12 s, so the float result is checked at its own precision.
  const auto s = sample_track<T>(gps_like, T(2460000), T(0.25), 2881, T(30));
  const auto model = eigenzeit::point_mass_potential<T>{T(3.986004418e14L)};
  const auto res = eigenzeit::trajectory_clock_offset(s.t, s.r, s.v, model);
  const long double truth = gps_like.closed_form(86400.0L, true);
  const long double err = std::fabs(static_cast<long double>(res.value) - truth);
  std::printf("%s GPS-like day: difference %.3Le ps, estimate %.3Le ps\n", type_name<T>(),
              err * 1e12L, static_cast<long double>(res.error_estimate) * 1e12L);
  if (std::is_same<T, float>::value) {
    // Positions and velocities in float carry relative roundings up to 6e-8 (~1.6 m), and so
    // does each rate evaluated from them; allow 8 float epsilons of the total (measured: less
    // than one), and the estimate must see that size.
    CHECK(err < 8 * std::numeric_limits<float>::epsilon() * std::fabs(truth));
    CHECK(static_cast<long double>(res.error_estimate) >= err);
  } else {
    CHECK(err < 0.02e-12L);
  }
}

TEST_CASE("a multiprecision type: cpp_bin_float_50 on a short arc") {
  // Ten minutes of the GPS-like orbit every 30 s in cpp_bin_float_50 (states rounded from
  // long double, so only ~64 bits are meaningful): the result agrees with the long double
  // truth to the truth's own precision and with the double result.
  using T = ez_test::cpp50;
  const auto s = sample_track<T>(gps_like, T(2460000), T(0.25), 21, T(30));
  const auto model = eigenzeit::point_mass_potential<T>{T(3.986004418e14L)};
  const auto res = eigenzeit::trajectory_clock_offset(s.t, s.r, s.v, model);
  const long double truth = gps_like.closed_form(600.0L, true);
  const long double got = res.value.convert_to<long double>();
  std::printf("cpp_bin_float_50, 10 min: difference %.3Le ps, estimate %.3Le ps\n",
              (got - truth) * 1e12L, res.error_estimate.convert_to<long double>() * 1e12L);
  CHECK(std::fabs(got - truth) < 1e-18L);
  CHECK(res.samples_used == 21);
}

namespace {

template <class F>
void check_all_policies(const std::string& text, F call) {
  INFO("expected in the message: ", text);
  try {
    (void)call(eigenzeit::throw_policy());
    FAIL_CHECK("no exception");
  } catch (const std::domain_error& e) {
    const std::string what = e.what();
    CHECK(what.find("trajectory_clock_offset") != std::string::npos);
    CHECK(what.find(text) != std::string::npos);
  }
  const auto r = call(eigenzeit::nan_policy());
  CHECK(std::isnan(r.value));
  CHECK(std::isnan(r.error_estimate));
  CHECK(r.samples_used == 0);
  errno = 0;
  const auto r2 = call(eigenzeit::errno_policy());
  CHECK(std::isnan(r2.value));
  CHECK(errno == EDOM);
}

}  // namespace

TEST_CASE("bad input: domain errors under every policy, naming the sample") {
  const double nan = std::numeric_limits<double>::quiet_NaN();
  const double inf = std::numeric_limits<double>::infinity();
  const auto model = eigenzeit::point_mass_potential<double>::earth();
  const auto good = sample_track<double>(gps_like, 2460000.0, 0.0, 6, 30.0);
  auto run = [&model](samples<double> s) {
    return [s, &model](auto pol) { return eigenzeit::trajectory_clock_offset(s.t, s.r, s.v, model, pol); };
  };
  // Too few samples.
  {
    samples<double> s = good;
    s.t.resize(1);
    s.r.resize(1);
    s.v.resize(1);
    check_all_policies("sample count = 1", run(s));
    s.t.clear();
    s.r.clear();
    s.v.clear();
    check_all_policies("sample count = 0", run(s));
  }
  // Mismatched lengths.
  {
    samples<double> s = good;
    s.r.pop_back();
    check_all_policies("positions hold 5 samples, but times hold 6", run(s));
    s = good;
    s.v.push_back(s.v.back());
    check_all_policies("velocities hold 7 samples, but times hold 6", run(s));
  }
  // Times out of order or repeated, at sample 3.
  {
    samples<double> s = good;
    s.t[3] = s.t[2];
    check_all_policies("times must be strictly increasing (sample 3)", run(s));
    s = good;
    std::swap(s.t[3], s.t[4]);
    check_all_policies("strictly increasing (sample 4)", run(s));
  }
  // Non-finite words and components, at sample 4.
  {
    samples<double> s = good;
    s.t[4].fraction = nan;
    check_all_policies("time word = nan", run(s));
    s = good;
    s.r[4][1] = inf;
    check_all_policies("position component = inf m, but it must be finite (sample 4)", run(s));
    s = good;
    s.v[4][2] = nan;
    check_all_policies("velocity component = nan m/s, but it must be finite (sample 4)", run(s));
  }
  // A state outside the model: a velocity beyond c at sample 2.
  {
    samples<double> s = good;
    s.v[2] = {3e8, 0.0, 0.0};
    check_all_policies("the speed must be below c, outside the weak-field model otherwise (sample 2)", run(s));
  }
  // A potential of the wrong sign (a model returning -GM/r) is refused, not integrated.
  {
    auto wrong_sign = [&model](const std::array<double, 3>& p) { return -model(p); };
    check_all_policies("outside the weak-field model", [&](auto pol) {
      return eigenzeit::trajectory_clock_offset(good.t, good.r, good.v, wrong_sign, pol);
    });
  }
}
