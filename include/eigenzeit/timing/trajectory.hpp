// eigenzeit: proper time along a sampled trajectory in a weak static field.
// Distributed under the Boost Software License, Version 1.0 (see LICENSE).
//
// Input: samples (t_i, r_i, v_i), i = 0 .. n-1, of a clock's motion in an Earth-centred
// inertial frame: coordinate times as two_part_time<T> (days; TCG for that frame), positions
// in m and velocities in m/s as std::array<T, 3>, and a potential model U(r) >= 0 (any
// callable taking std::array<T, 3> and returning T, e.g. point_mass_potential or j2_potential).
// Output: the accumulated proper time minus coordinate time over [t_0, t_{n-1}],
//     integral of (d(tau)/dt - 1) dt,  d(tau)/dt - 1 = clock_rate_offset(|v|, U(r)),
// in seconds, with an error estimate and the number of samples used.
//
// The rule.  On each interval [t_i, t_{i+1}] of length h the trajectory is the cubic Hermite
// interpolant of the two end positions and velocities (position error h^4 |r''''| / 384, its
// derivative gives the velocity with error O(h^3 |r''''|)); the rate along it is integrated by
// 3-point Gauss-Legendre, exact for polynomials of degree 5, whose own error O(h^6) is far
// below the interpolation's.  The interpolation error e(t) of the position enters the rate
// as -(grad U . e + v . e')/c^2, each term O(h^4) after integration (the velocity term by
// parts, since e vanishes at both ends of the interval: the integral of v . e' is minus that
// of a . e).  When the samples follow the motion in the same potential (a = grad U) the two
// O(h^4) terms cancel and the rule converges faster (measured: about h^5); in general it is
// fourth order.  For a GPS-like orbit sampled every 30 s (n h = 0.0044 rad) the position
// error is ~2e-5 m and the rate error below ~4e-19, i.e. below ~0.04 ps per day even without
// that cancellation.
//
// The error estimate (Richardson).  The same rule over every other sample (step 2h, and the
// last single interval when their count is odd) gives I_2h; with error ~ C h^4,
// I_h - I_2h ~ 15 C h^4, so |I_h - I_2h| / 15 estimates the error of I_h (the value returned,
// not the extrapolation); where the rule converges faster than h^4 this overstates the error,
// which is the safe side.  Added to it is a bound on the rounding: 4u times the sum of the
// interval contributions' magnitudes.  With only two samples no halving exists: the estimate
// is then |I_h - I_trap| with I_trap the trapezoid rule on the two end rates, which is
// pessimistic (it measures the O(h^2) trapezoid error).  On strongly non-uniform sampling the
// factor 15 is only approximate.
//
// Summation.  Interval contributions (each rounded once) are added with two_sum into a
// double-word accumulator, so the sum adds no error beyond ~u of the result however many
// samples there are.  Interval lengths come from seconds_between, exact in days before one
// rounding to seconds.
//
// Errors (through the policy, naming the function and the sample index): fewer than 2
// samples, sequences of unequal length, a non-finite word, component or potential, times not
// strictly increasing, a speed >= c or a potential outside [0, c^2) at a sample.  A potential
// model's own domain errors come from the model (with its default policy).
#ifndef EIGENZEIT_TIMING_TRAJECTORY_HPP
#define EIGENZEIT_TIMING_TRAJECTORY_HPP

#include <array>
#include <cmath>
#include <cstddef>
#include <limits>
#include <string>
#include <vector>

#include <eigenzeit/config.hpp>
#include <eigenzeit/numeric/eft.hpp>
#include <eigenzeit/numeric/policy.hpp>
#include <eigenzeit/timing/clock_rate.hpp>
#include <eigenzeit/timing/two_part_time.hpp>

namespace eigenzeit {

/// Result of trajectory_clock_offset: proper time minus coordinate time (s), an estimate of
/// its error (s, >= 0), and the number of samples the value was computed from.
template <class T>
struct trajectory_offset {
  T value;
  T error_estimate;
  std::size_t samples_used;
};

namespace detail {

/// Gauss-Legendre nodes on [0, 1] (1/2 -+ sqrt(15)/10, 1/2) and weights (5/18, 8/18, 5/18).
template <class T>
struct gauss3 {
  T node[3];
  T weight[3];
};

template <class T>
inline gauss3<T> make_gauss3() {
  using std::sqrt;
  const T d = T(sqrt(T(15))) / T(10);
  return {{T(0.5) - d, T(0.5), T(0.5) + d}, {T(5) / T(18), T(8) / T(18), T(5) / T(18)}};
}

template <class T>
inline gauss3<T> gauss3_of() {
  if constexpr (std::is_floating_point<T>::value) {
    return make_gauss3<T>();
  } else {
    static const gauss3<T> value = make_gauss3<T>();
    return value;
  }
}

/// Reports a trajectory error through the policy; `what` names the problem (with %1% for
/// the value) and, when `with_index`, the sample index is appended to the message.
template <class T, class Policy>
inline T trajectory_error(const char* what, bool with_index, std::size_t index, const T& value,
                          const Policy& pol) {
  std::string message(what);
  if (with_index) message += " (sample " + std::to_string(index) + ")";
  return numeric::domain_error<T>("eigenzeit::trajectory_clock_offset<%1%>", message.c_str(),
                                  value, pol);
}

/// Rate offset at one state, for the integrator: v^2 from the components in double-word
/// arithmetic, U from the model.  Returns false (rate untouched) outside the model's domain.
template <class T, class Potential>
inline bool rate_at(const std::array<T, 3>& r, const std::array<T, 3>& v,
                    const Potential& potential, const light_powers<T>& k, T& rate, T& bad) {
  using std::isfinite;
  numeric::dd<T> vv = numeric::two_prod(v[0], v[0]);
  vv = numeric::dd_add(vv, numeric::two_prod(v[1], v[1]));
  vv = numeric::dd_add(vv, numeric::two_prod(v[2], v[2]));
  const T U = T(potential(r));
  if (!(U >= T(0)) || !less_than_words(U, k.c2) || !isfinite(U)) {
    bad = U;
    return false;
  }
  if (!less_than_words(vv.hi, k.c2)) {
    bad = vv.hi;
    return false;
  }
  rate = weak_field_offset(vv, U, k);
  if (!(rate > T(-1))) {
    bad = rate;
    return false;
  }
  return true;
}

/// Integral of the rate over [t_a, t_b] (length h seconds) along the cubic Hermite
/// interpolant of (r_a, v_a) and (r_b, v_b), by 3-point Gauss-Legendre.  In s = (t - t_a)/h:
///   r(s) = r_a + h10(s) h v_a + h01(s) (r_b - r_a) + h11(s) h v_b,
///   v(s) = h10'(s) v_a + h01'(s) (r_b - r_a) / h + h11'(s) v_b,
/// with h10 = s^3 - 2s^2 + s, h01 = 3s^2 - 2s^3, h11 = s^3 - s^2 (the Hermite basis written
/// with h00 = 1 - h01, which keeps the large r_a out of every product: the rounding is then
/// relative to the step |r_b - r_a|, not to |r_a|).
template <class T, class Potential>
inline bool interval_integral(const std::array<T, 3>& ra, const std::array<T, 3>& va,
                              const std::array<T, 3>& rb, const std::array<T, 3>& vb, T h,
                              const Potential& potential, const light_powers<T>& k,
                              const gauss3<T>& g, T& out, T& bad) {
  std::array<T, 3> d;
  for (std::size_t j = 0; j < 3; ++j) d[j] = rb[j] - ra[j];
  T sum = T(0);
  for (int q = 0; q < 3; ++q) {
    const T s = g.node[q];
    const T s2 = s * s;
    const T s3 = s2 * s;
    const T h10 = s3 - 2 * s2 + s;
    const T h01 = 3 * s2 - 2 * s3;
    const T h11 = s3 - s2;
    const T d10 = 3 * s2 - 4 * s + 1;
    const T d01 = 6 * s - 6 * s2;
    const T d11 = 3 * s2 - 2 * s;
    std::array<T, 3> r, v;
    for (std::size_t j = 0; j < 3; ++j) {
      r[j] = ra[j] + ((h10 * h) * va[j] + h01 * d[j] + (h11 * h) * vb[j]);
      v[j] = d10 * va[j] + (d01 / h) * d[j] + d11 * vb[j];
    }
    T rate = T(0);
    if (!rate_at(r, v, potential, k, rate, bad)) return false;
    sum = sum + g.weight[q] * rate;
  }
  out = h * sum;
  return true;
}

/// Compensated accumulator: value hi + lo, and the sum of magnitudes for the rounding bound.
template <class T>
struct compensated_sum {
  T hi = T(0);
  T lo = T(0);
  T magnitude = T(0);
  void add(T x) {
    using std::abs;
    const numeric::dd<T> s = numeric::two_sum(hi, x);
    hi = s.hi;
    lo = lo + s.lo;
    magnitude = magnitude + abs(x);
  }
  T value() const { return hi + lo; }
};

template <class T, class Potential, class Policy>
inline trajectory_offset<T> integrate_trajectory(const two_part_time<T>* times,
                                                 const std::array<T, 3>* positions,
                                                 const std::array<T, 3>* velocities,
                                                 std::size_t n, const Potential& potential,
                                                 const Policy& pol) {
  using std::abs;
  using std::isfinite;
  const T nan_value = std::numeric_limits<T>::quiet_NaN();
  auto fail = [&](const char* what, std::size_t index, const T& value) {
    T r = trajectory_error<T>(what, true, index, value, pol);
    (void)r;
    return trajectory_offset<T>{nan_value, nan_value, 0};
  };
  if (n < 2) {
    trajectory_error<T>("sample count = %1%, but at least 2 samples are needed", false, 0, T(n), pol);
    return trajectory_offset<T>{nan_value, nan_value, 0};
  }

  const light_powers<T> k = light_powers_of<T>();

  // Every word finite, speeds below c, times strictly increasing; interval lengths in seconds.
  std::vector<T> h(n - 1);
  for (std::size_t i = 0; i < n; ++i) {
    const two_part_time<T>& t = times[i];
    if (!word_ok(t.day) || !word_ok(t.fraction) || !word_ok(t.tail)) {
      const T w = !word_ok(t.day) ? t.day : (!word_ok(t.fraction) ? t.fraction : t.tail);
      return fail("time word = %1%, but it must be finite with magnitude <= 2^(digits-2) days", i, w);
    }
    for (std::size_t j = 0; j < 3; ++j) {
      if (!isfinite(positions[i][j]))
        return fail("position component = %1% m, but it must be finite", i, positions[i][j]);
      if (!isfinite(velocities[i][j]))
        return fail("velocity component = %1% m/s, but it must be finite", i, velocities[i][j]);
    }
    // The speed at the sample itself (the potential is checked at every evaluation node).
    numeric::dd<T> vv = numeric::two_prod(velocities[i][0], velocities[i][0]);
    vv = numeric::dd_add(vv, numeric::two_prod(velocities[i][1], velocities[i][1]));
    vv = numeric::dd_add(vv, numeric::two_prod(velocities[i][2], velocities[i][2]));
    if (!less_than_words(vv.hi, k.c2))
      return fail("speed squared = %1% m^2/s^2, but the speed must be below c, outside the "
                  "weak-field model otherwise", i, vv.hi);
    if (i > 0) {
      const T dt = seconds_between(times[i - 1], t, pol);
      if (!(dt > T(0)) || !isfinite(dt))
        return fail("time step = %1% s to this sample, but times must be strictly increasing", i, dt);
      h[i - 1] = dt;
    }
  }

  const gauss3<T> g = gauss3_of<T>();
  const T u = numeric::pow2_const<T, -numeric::digits_v<T>>();
  T bad = T(0);

  // Fine pass: every interval.
  compensated_sum<T> fine;
  for (std::size_t i = 0; i + 1 < n; ++i) {
    T part = T(0);
    if (!interval_integral(positions[i], velocities[i], positions[i + 1], velocities[i + 1], h[i],
                           potential, k, g, part, bad))
      return fail("the state near this sample gives U or v^2 = %1%, outside the weak-field model "
                  "(U in [0, c^2), v < c)", i, bad);
    fine.add(part);
  }

  // Coarse pass: every other sample (and the last lone interval as it is).
  compensated_sum<T> coarse;
  T estimate = T(0);
  if (n == 2) {
    T r0 = T(0), r1 = T(0);
    if (!rate_at(positions[0], velocities[0], potential, k, r0, bad))
      return fail("U or v^2 = %1% here, outside the weak-field model (U in [0, c^2), v < c)", 0, bad);
    if (!rate_at(positions[1], velocities[1], potential, k, r1, bad))
      return fail("U or v^2 = %1% here, outside the weak-field model (U in [0, c^2), v < c)", 1, bad);
    estimate = abs(fine.value() - h[0] * (r0 + r1) / 2);
  } else {
    std::size_t i = 0;
    for (; i + 2 < n; i += 2) {
      // h[i] + h[i+1] rounds once; its relative error u is far below the rule's own.
      T part = T(0);
      if (!interval_integral(positions[i], velocities[i], positions[i + 2], velocities[i + 2],
                             h[i] + h[i + 1], potential, k, g, part, bad))
        return fail("the state near this sample gives U or v^2 = %1%, outside the weak-field "
                    "model (U in [0, c^2), v < c)", i, bad);
      coarse.add(part);
    }
    if (i + 1 < n) {
      T part = T(0);
      if (!interval_integral(positions[i], velocities[i], positions[i + 1], velocities[i + 1],
                             h[i], potential, k, g, part, bad))
        return fail("the state near this sample gives U or v^2 = %1%, outside the weak-field "
                    "model (U in [0, c^2), v < c)", i, bad);
      coarse.add(part);
    }
    // Richardson: the rule's error is O(h^4), so I_h - I_2h ~ (2^4 - 1) (error of I_h).
    const numeric::dd<T> diff = numeric::dd_add(numeric::dd<T>{fine.hi, fine.lo},
                                                numeric::dd<T>{-coarse.hi, -coarse.lo});
    estimate = abs(diff.hi + diff.lo) / T(15);
  }
  estimate = estimate + 4 * u * fine.magnitude;
  return trajectory_offset<T>{fine.value(), estimate, n};
}

}  // namespace detail

/// Proper time minus coordinate time (seconds) accumulated along a sampled trajectory in an
/// Earth-centred inertial frame: the integral of clock_rate_offset(|v|, U(r)) dt over
/// [times.front(), times.back()] (file comment: Hermite interpolation, Gauss-Legendre,
/// compensated summation, Richardson error estimate from every other sample).
/// times: coordinate times (TCG for a geocentric frame), strictly increasing; positions (m),
/// velocities (m/s): std::array<T, 3> each, same length as times; potential: callable
/// std::array<T, 3> -> T with U >= 0 (point_mass_potential, j2_potential, or the user's own).
/// Domain: at least 2 samples, equal lengths, finite words and components, strictly increasing
/// times, states inside the weak-field model; otherwise a domain error through the policy
/// naming the sample index and value (a NaN-returning policy gives NaN value and estimate and
/// samples_used = 0).
/// Accuracy (measured, tests/test_timing_trajectory.cpp): a GPS-like orbit (e = 0.01) sampled
/// every 30 s for a day agrees with the closed-form Kepler result to 3e-7 ps once that form
/// includes the mean 1/c^4 term (2.7e-3 ps without it; the requirement is 1 ps); on an
/// e = 0.7 orbit the error falls as h^4 (h^5 and faster when the potential is the one that
/// drives the motion) and the estimate stays within a factor 2 to 6 of it, on the safe side.
template <class T, class Potential, class Policy = throw_policy>
inline trajectory_offset<T> trajectory_clock_offset(const std::vector<two_part_time<T>>& times,
                                                    const std::vector<std::array<T, 3>>& positions,
                                                    const std::vector<std::array<T, 3>>& velocities,
                                                    const Potential& potential,
                                                    const Policy& pol = Policy()) {
  const T nan_value = std::numeric_limits<T>::quiet_NaN();
  if (positions.size() != times.size() || velocities.size() != times.size()) {
    const bool pos_bad = positions.size() != times.size();
    const T culprit = T(pos_bad ? positions.size() : velocities.size());
    const std::string what =
        std::string(pos_bad ? "positions" : "velocities") + " hold %1% samples, but times hold " +
        std::to_string(times.size()) + " (the three sequences must have equal length)";
    detail::trajectory_error<T>(what.c_str(), false, 0, culprit, pol);
    return {nan_value, nan_value, 0};
  }
  return detail::integrate_trajectory(times.data(), positions.data(), velocities.data(),
                                      times.size(), potential, pol);
}

}  // namespace eigenzeit

#endif
