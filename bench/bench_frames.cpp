// eigenzeit: speed of the frames routines (frames/*.hpp) against the textbook forms.
// Distributed under the Boost Software License, Version 1.0 (see LICENSE).
//
// Pairs as in bench_speed.cpp: "careful/frames/<name>" is the library routine and
// "naive/frames/<name>" the textbook form on the same inputs, registered next to each other so
// they run under the same machine load.  Every benchmark sets the counter items_per_iteration
// (the batch size) and items processed, so the report's items per second are four-vectors,
// pairs, compositions or events per second; tools/bench_ratios.py prints one careful/naive line
// per pair in its "frames" section, with the time per item.
//
// The naive 4x4 matrix of a boost is built once from the rounded gamma, beta gamma and unit
// direction n (the high words of the boost's own double-word direction):
//     L00 = gamma,  L0i = Li0 = -beta gamma n_i,  Lij = delta_ij + (gamma - 1) n_i n_j.
// Three boost kernels, each along one fixed random direction:
//     slow     beta = 0.1              (the library's (gamma - 1), beta gamma form)
//     fast     beta = 0.9              (the light-cone form)
//     near_c   1 - beta = 1e-9         (the light-cone form, gamma ~ 2.2e4)
//
//   apply/<kernel>                 lorentz_boost::apply on an array of 1024 random four-vectors
//                                  (32 KiB, and 32 KiB of output: in cache), output to a second
//                                  array; naive: the matrix times each four-vector into the same
//                                  kind of output array.  Both sides are checked once, outside
//                                  the timing, to agree within 1e-6 of the largest output
//                                  component.
//   apply_in_place/<kernel>/<n>    apply_in_place(t, x, y, z, n) on a structure of arrays of
//                                  n = 4096 (128 KiB: in L2) and n = 2^20 (32 MiB: beyond L2,
//                                  about the size of a last-level cache) elements; naive: the matrix in a plain loop over the same
//                                  arrays in place (restrict-qualified pointers, so the compiler
//                                  may vectorise it).  An in-place transform has to be re-applied
//                                  to its own output every iteration: the iterations alternate
//                                  the boost and its inverse (the naive side: the matrix and the
//                                  matrix of the inverse boost), so the values stay bounded.
//                                  After the loop the arrays are brought back to the starting
//                                  frame and compared with the starting values; a result that
//                                  is not finite or has grown beyond 1e3 times the start is an
//                                  error, and the counter roundtrip_drift reports
//                                  max |final - start| / max |start| (information: a boost and
//                                  its inverse amplify rounding errors by up to
//                                  gamma^2 (1 + beta)^2 whichever form computes them).
//   apply_in_place_blocked/<kernel>/<n>   the same library call against the naive loop run in
//                                  blocks of 32 elements: GCC 12 leaves the plain naive loop
//                                  scalar at -O2 (its cheap cost model does not vectorise a loop
//                                  of unknown length), but vectorises the blocks, as it does
//                                  the library's own blocked loop.
//   invariant_mass/pair            invariant_mass(momentum a, momentum b); naive:
//                                  E_i = sqrt(m_i^2 + p_i.p_i), sqrt((Ea + Eb)^2 - |pa + pb|^2)
//                                  clamped at 0.  4096 random pairs: a quarter of the masses
//                                  zero, the others log-uniform in [1e-3, 10]; |p| log-uniform
//                                  in [1e-2, 1e2] along random directions.
//   invariant_mass/four_vector     invariant_mass(four_vector); naive sqrt(t^2 - x^2 - y^2 -
//                                  z^2) clamped at 0, over 4096 random timelike four-vectors.
//   compose                        compose(first, second) per composition (information only);
//                                  naive: the product of the two 4x4 matrices (64 multiply-adds).
//                                  4096 random pairs, beta uniform in [0, 1).
//   invariant_mass/range/<k>       invariant_mass(range of k momenta) with the default tolerance
//                                  (epsilon), per event, k = 2, 10, 100; naive: E = sum E_i,
//                                  P = sum p_i, sqrt(E^2 - |P|^2) clamped.  Random momenta as
//                                  for the pairs (no strong cancellation), max(16, 4096 / k)
//                                  events.  Checked once outside the timed loop: it is an error
//                                  if the guard leaves rung 0 for any of these events.
//   invariant_mass/range_collinear/10   64 events of 10 massless momenta within ~1e-9 rad of
//                                  one random axis, per event: the rung-0 bound does not meet
//                                  the tolerance and the guard falls back to the ladder
//                                  (information: the cost of the fallback; an error if any
//                                  event stays on rung 0; the counter max_rung tells how far
//                                  the guard climbed).
//   energy, kinetic_energy         momentum::energy() and kinetic_energy() (information);
//                                  naive sqrt(m^2 + p.p) and sqrt(m^2 + p.p) - m.
//
// Fixed seeds, so every run sees the same inputs.  Build with -mfma as well (bench_frames_fma):
// without a fused multiply-add instruction every std::fma of the careful forms is a call.

#include <benchmark/benchmark.h>

#include <algorithm>
#include <cmath>
#include <cstddef>
#include <cstdint>
#include <random>
#include <string>
#include <vector>

#include <eigenzeit/frames/compose.hpp>
#include <eigenzeit/frames/invariant_mass.hpp>
#include <eigenzeit/frames/lorentz_boost.hpp>
#include <eigenzeit/frames/momentum.hpp>
#include <eigenzeit/frames/vectors.hpp>
#include <eigenzeit/speed.hpp>

#include "batch.hpp"

namespace {

using vec = eigenzeit::vec3<double>;
using fvec = eigenzeit::four_vector<double>;
using mom = eigenzeit::momentum<double>;
using boost_d = eigenzeit::lorentz_boost<double>;
using speed_d = eigenzeit::speed<double>;

constexpr std::size_t kVectors = 1024;  // apply: array of four-vectors
constexpr std::size_t kBatch = 4096;    // pairs, four-vectors, compositions, momenta

// ---- the naive matrix --------------------------------------------------------------------------

struct mat4 {
  double m[4][4];
};

/// The textbook matrix of a boost from its rounded gamma, beta gamma and unit direction.
mat4 naive_matrix(const boost_d& b) {
  const double g = b.speed().gamma();
  const double bg = b.speed().proper_speed();
  const vec d = b.direction();
  const double n[3] = {d.x, d.y, d.z};
  mat4 l{};
  l.m[0][0] = g;
  for (int i = 0; i < 3; ++i) {
    l.m[0][i + 1] = -bg * n[i];
    l.m[i + 1][0] = -bg * n[i];
    for (int j = 0; j < 3; ++j) l.m[i + 1][j + 1] = (i == j ? 1.0 : 0.0) + (g - 1.0) * n[i] * n[j];
  }
  return l;
}

inline fvec naive_apply(const mat4& l, const fvec& v) {
  return {l.m[0][0] * v.t + l.m[0][1] * v.x + l.m[0][2] * v.y + l.m[0][3] * v.z,
          l.m[1][0] * v.t + l.m[1][1] * v.x + l.m[1][2] * v.y + l.m[1][3] * v.z,
          l.m[2][0] * v.t + l.m[2][1] * v.x + l.m[2][2] * v.y + l.m[2][3] * v.z,
          l.m[3][0] * v.t + l.m[3][1] * v.x + l.m[3][2] * v.y + l.m[3][3] * v.z};
}

/// The matrix in place over a structure of arrays; restrict-qualified so that the compiler
/// may vectorise the loop (GCC 12 does at -O3, not at -O2: see naive_in_place_blocked).
inline void naive_in_place(const mat4& l, double* __restrict t, double* __restrict x,
                           double* __restrict y, double* __restrict z, std::size_t n) {
  const double a00 = l.m[0][0], a01 = l.m[0][1], a02 = l.m[0][2], a03 = l.m[0][3];
  const double a10 = l.m[1][0], a11 = l.m[1][1], a12 = l.m[1][2], a13 = l.m[1][3];
  const double a20 = l.m[2][0], a21 = l.m[2][1], a22 = l.m[2][2], a23 = l.m[2][3];
  const double a30 = l.m[3][0], a31 = l.m[3][1], a32 = l.m[3][2], a33 = l.m[3][3];
  for (std::size_t i = 0; i < n; ++i) {
    const double t0 = t[i], x0 = x[i], y0 = y[i], z0 = z[i];
    t[i] = a00 * t0 + a01 * x0 + a02 * y0 + a03 * z0;
    x[i] = a10 * t0 + a11 * x0 + a12 * y0 + a13 * z0;
    y[i] = a20 * t0 + a21 * x0 + a22 * y0 + a23 * z0;
    z[i] = a30 * t0 + a31 * x0 + a32 * y0 + a33 * z0;
  }
}

/// The same loop in blocks of 32 elements: with a constant trip count GCC 12 vectorises it at
/// -O2 too (its "very cheap" cost model at -O2 leaves a loop of unknown length scalar, which is
/// what happens to naive_in_place there); the tail goes element by element.
inline void naive_in_place_blocked(const mat4& l, double* __restrict t, double* __restrict x,
                                   double* __restrict y, double* __restrict z, std::size_t n) {
  constexpr std::size_t block = 32;
  const std::size_t full = n - n % block;
  for (std::size_t i = 0; i < full; i += block) naive_in_place(l, t + i, x + i, y + i, z + i, block);
  naive_in_place(l, t + full, x + full, y + full, z + full, n - full);
}

/// second * first: the matrix of "first, then second" (64 multiply-adds).
inline mat4 naive_product(const mat4& second, const mat4& first) {
  mat4 c;
  for (int i = 0; i < 4; ++i)
    for (int j = 0; j < 4; ++j)
      c.m[i][j] = second.m[i][0] * first.m[0][j] + second.m[i][1] * first.m[1][j] +
                  second.m[i][2] * first.m[2][j] + second.m[i][3] * first.m[3][j];
  return c;
}

// ---- inputs ------------------------------------------------------------------------------------

vec random_unit(std::mt19937_64& rng) {
  std::normal_distribution<double> normal(0.0, 1.0);
  for (;;) {
    const vec v{normal(rng), normal(rng), normal(rng)};
    const double r = std::sqrt(v.x * v.x + v.y * v.y + v.z * v.z);
    if (r > 1e-3) return {v.x / r, v.y / r, v.z / r};
  }
}

double log_uniform(std::mt19937_64& rng, double lo, double hi) {
  std::uniform_real_distribution<double> e(std::log10(lo), std::log10(hi));
  return std::pow(10.0, e(rng));
}

/// A momentum: with probability 1/4 massless, else mass log-uniform in [1e-3, 10]; |p|
/// log-uniform in [1e-2, 1e2] along a random direction.
mom random_momentum(std::mt19937_64& rng) {
  std::bernoulli_distribution massless(0.25);
  const double m = massless(rng) ? 0.0 : log_uniform(rng, 1e-3, 10.0);
  const double p = log_uniform(rng, 1e-2, 1e2);
  return mom(m, random_unit(rng) * p);
}

enum class kernel { slow, fast, near_c };

const boost_d& boost_of(kernel k) {
  static const boost_d slow = [] {
    std::mt19937_64 rng(20240701u);
    return boost_d(random_unit(rng), speed_d::from_beta(0.1));
  }();
  static const boost_d fast = [] {
    std::mt19937_64 rng(20240702u);
    return boost_d(random_unit(rng), speed_d::from_beta(0.9));
  }();
  static const boost_d near_c = [] {
    std::mt19937_64 rng(20240703u);
    return boost_d(random_unit(rng), speed_d::from_beta_deficit(1e-9));
  }();
  return k == kernel::slow ? slow : k == kernel::fast ? fast : near_c;
}

/// 1024 four-vectors, components uniform in [-1, 1].
const std::vector<fvec>& random_four_vectors() {
  static const std::vector<fvec> data = [] {
    std::mt19937_64 rng(20240704u);
    std::uniform_real_distribution<double> u(-1.0, 1.0);
    std::vector<fvec> v(kVectors);
    for (fvec& f : v) f = {u(rng), u(rng), u(rng), u(rng)};
    return v;
  }();
  return data;
}

/// Structure of arrays of n four-vectors, components uniform in [-1, 1].
struct soa {
  std::vector<double> t, x, y, z;
};

template <std::size_t N>
const soa& soa_inputs() {
  static const soa data = [] {
    std::mt19937_64 rng(20240705u + N);
    std::uniform_real_distribution<double> u(-1.0, 1.0);
    soa s{std::vector<double>(N), std::vector<double>(N), std::vector<double>(N),
          std::vector<double>(N)};
    for (std::size_t i = 0; i < N; ++i) {
      s.t[i] = u(rng);
      s.x[i] = u(rng);
      s.y[i] = u(rng);
      s.z[i] = u(rng);
    }
    return s;
  }();
  return data;
}

struct mom_pair {
  mom a, b;
};

const std::vector<mom_pair>& random_pairs() {
  static const std::vector<mom_pair> data = [] {
    std::mt19937_64 rng(20240706u);
    std::vector<mom_pair> v;
    v.reserve(kBatch);
    while (v.size() < kBatch) {
      const mom a = random_momentum(rng);
      const mom b = random_momentum(rng);
      v.push_back({a, b});
    }
    return v;
  }();
  return data;
}

/// Timelike four-vectors: mass log-uniform in [1e-3, 10], |r| log-uniform in [1e-2, 1e2], t from
/// long double (m^2 / r^2 >= 1e-10 keeps them timelike after rounding).
const std::vector<fvec>& timelike_four_vectors() {
  static const std::vector<fvec> data = [] {
    std::mt19937_64 rng(20240707u);
    std::vector<fvec> v(kBatch);
    for (fvec& f : v) {
      const double m = log_uniform(rng, 1e-3, 10.0);
      const vec r = random_unit(rng) * log_uniform(rng, 1e-2, 1e2);
      const long double r2 = static_cast<long double>(r.x) * r.x +
                             static_cast<long double>(r.y) * r.y +
                             static_cast<long double>(r.z) * r.z;
      const long double t = std::sqrt(static_cast<long double>(m) * m + r2);
      f = {static_cast<double>(t), r.x, r.y, r.z};
    }
    return v;
  }();
  return data;
}

struct boost_pair {
  boost_d first, second;
};
struct matrix_pair {
  mat4 first, second;
};

const std::vector<boost_pair>& random_boost_pairs() {
  static const std::vector<boost_pair> data = [] {
    std::mt19937_64 rng(20240708u);
    std::uniform_real_distribution<double> beta(0.0, 1.0);
    std::vector<boost_pair> v;
    v.reserve(kBatch);
    while (v.size() < kBatch) {
      const double b1 = beta(rng), b2 = beta(rng);
      const vec n1 = random_unit(rng), n2 = random_unit(rng);
      v.push_back({boost_d(n1, speed_d::from_beta(b1)), boost_d(n2, speed_d::from_beta(b2))});
    }
    return v;
  }();
  return data;
}

const std::vector<matrix_pair>& random_matrix_pairs() {
  static const std::vector<matrix_pair> data = [] {
    std::vector<matrix_pair> v;
    for (const boost_pair& p : random_boost_pairs())
      v.push_back({naive_matrix(p.first), naive_matrix(p.second)});
    return v;
  }();
  return data;
}

const std::vector<mom>& random_momenta() {
  static const std::vector<mom> data = [] {
    std::mt19937_64 rng(20240709u);
    std::vector<mom> v;
    v.reserve(kBatch);
    while (v.size() < kBatch) v.push_back(random_momentum(rng));
    return v;
  }();
  return data;
}

/// One event: a range of momenta inside a flat array (what invariant_mass(range) iterates).
struct event {
  const mom* first;
  const mom* last;
  const mom* begin() const { return first; }
  const mom* end() const { return last; }
};

struct event_set {
  std::vector<mom> momenta;
  std::vector<event> events;
};

/// max(16, 4096 / k) events of k random momenta each.
template <std::size_t K>
const event_set& random_events() {
  static const event_set data = [] {
    std::mt19937_64 rng(20240710u + K);
    const std::size_t count = std::max<std::size_t>(16, kBatch / K);
    event_set s;
    s.momenta.reserve(count * K);
    for (std::size_t i = 0; i < count * K; ++i) s.momenta.push_back(random_momentum(rng));
    for (std::size_t i = 0; i < count; ++i)
      s.events.push_back({s.momenta.data() + i * K, s.momenta.data() + (i + 1) * K});
    return s;
  }();
  return data;
}

/// 64 events of 10 massless momenta, energies log-uniform in [1, 100], each within ~1e-9 rad
/// of the event's random axis.
const event_set& collinear_events() {
  static const event_set data = [] {
    constexpr std::size_t kEvents = 64, kPerEvent = 10;
    std::mt19937_64 rng(20240711u);
    std::normal_distribution<double> tilt(0.0, 1e-9);
    event_set s;
    s.momenta.reserve(kEvents * kPerEvent);
    for (std::size_t i = 0; i < kEvents; ++i) {
      const vec axis = random_unit(rng);
      // Two directions perpendicular to the axis.
      const vec helper = std::abs(axis.x) < 0.9 ? vec{1.0, 0.0, 0.0} : vec{0.0, 1.0, 0.0};
      const vec e1 = eigenzeit::unit(eigenzeit::cross(axis, helper));
      const vec e2 = eigenzeit::cross(axis, e1);
      for (std::size_t j = 0; j < kPerEvent; ++j) {
        const vec d = axis + e1 * tilt(rng) + e2 * tilt(rng);
        s.momenta.push_back(mom(0.0, d * log_uniform(rng, 1.0, 100.0)));
      }
    }
    for (std::size_t i = 0; i < kEvents; ++i)
      s.events.push_back({s.momenta.data() + i * kPerEvent, s.momenta.data() + (i + 1) * kPerEvent});
    return s;
  }();
  return data;
}

// ---- naive forms -------------------------------------------------------------------------------

inline double naive_energy(const mom& q) {
  const vec& p = q.p();
  return std::sqrt(q.mass() * q.mass() + (p.x * p.x + p.y * p.y + p.z * p.z));
}

inline double naive_pair_mass(const mom& a, const mom& b) {
  const double ea = naive_energy(a), eb = naive_energy(b);
  const double e = ea + eb;
  const double px = a.p().x + b.p().x, py = a.p().y + b.p().y, pz = a.p().z + b.p().z;
  const double m2 = e * e - (px * px + py * py + pz * pz);
  return m2 > 0 ? std::sqrt(m2) : 0.0;
}

inline double naive_event_mass(const event& ev) {
  double e = 0, px = 0, py = 0, pz = 0;
  for (const mom& q : ev) {
    e += naive_energy(q);
    px += q.p().x;
    py += q.p().y;
    pz += q.p().z;
  }
  const double m2 = e * e - (px * px + py * py + pz * pz);
  return m2 > 0 ? std::sqrt(m2) : 0.0;
}

// ---- registration helpers ----------------------------------------------------------------------

using ez_bench::run_batch;

/// run_batch over inputs(), and the counter items_per_iteration for the ratio script.
template <class Out, class In, class F>
void add(const std::string& name, const std::vector<In>& (*inputs)(), F f) {
  benchmark::RegisterBenchmark(name.c_str(), [inputs, f](benchmark::State& state) {
    const std::vector<In>& in = inputs();
    run_batch<Out>(state, in, f);
    state.counters["items_per_iteration"] = static_cast<double>(in.size());
  });
}

double max_abs_soa(const soa& s) {
  double m = 0;
  for (const std::vector<double>* a : {&s.t, &s.x, &s.y, &s.z})
    for (double v : *a) m = std::max(m, std::abs(v));
  return m;
}

/// The in-place loop: forward on even iterations, backward on odd ones (see the top).
template <class Forward, class Backward>
void run_in_place(benchmark::State& state, const soa& start, Forward forward, Backward backward) {
  soa w = start;
  const std::size_t n = w.t.size();
  double* t = w.t.data();
  double* x = w.x.data();
  double* y = w.y.data();
  double* z = w.z.data();
  bool back = false;
  for (auto _ : state) {
    benchmark::DoNotOptimize(t);
    benchmark::DoNotOptimize(x);
    benchmark::DoNotOptimize(y);
    benchmark::DoNotOptimize(z);
    if (back) {
      backward(t, x, y, z, n);
    } else {
      forward(t, x, y, z, n);
    }
    back = !back;
    benchmark::ClobberMemory();
  }
  if (back) backward(t, x, y, z, n);  // back to the starting frame (not timed)
  const double start_max = max_abs_soa(start);
  const double end_max = max_abs_soa(w);  // NaN-safe: std::max keeps the first on NaN, so check
  bool finite = true;
  double drift = 0;
  for (std::size_t i = 0; i < n; ++i) {
    finite = finite && std::isfinite(t[i]) && std::isfinite(x[i]) && std::isfinite(y[i]) &&
             std::isfinite(z[i]);
    drift = std::max({drift, std::abs(t[i] - start.t[i]), std::abs(x[i] - start.x[i]),
                      std::abs(y[i] - start.y[i]), std::abs(z[i] - start.z[i])});
  }
  if (!finite || !(end_max <= 1e3 * start_max)) {
    state.SkipWithError("in-place values did not stay bounded (boost and inverse alternated)");
    return;
  }
  state.SetItemsProcessed(static_cast<std::int64_t>(state.iterations()) *
                          static_cast<std::int64_t>(n));
  state.counters["items_per_iteration"] = static_cast<double>(n);
  state.counters["roundtrip_drift"] = drift / start_max;
}

const char* kernel_name(kernel k) {
  return k == kernel::slow ? "slow" : k == kernel::fast ? "fast" : "near_c";
}

// ---- registrations -----------------------------------------------------------------------------

void add_apply(kernel k) {
  const std::string suffix = kernel_name(k);
  const boost_d b = boost_of(k);
  const mat4 l = naive_matrix(b);
  // Check once that both sides compute the same transformation (not timed): the naive matrix
  // may lose digits near c, but not 1e-6 of the largest output component.
  double worst = 0;
  for (const fvec& v : random_four_vectors()) {
    const fvec c = b.apply(v), d = naive_apply(l, v);
    const double big = std::max({std::abs(c.t), std::abs(c.x), std::abs(c.y), std::abs(c.z)});
    worst = std::max({worst, std::abs(c.t - d.t) / big, std::abs(c.x - d.x) / big,
                      std::abs(c.y - d.y) / big, std::abs(c.z - d.z) / big});
  }
  if (!(worst < 1e-6)) {
    benchmark::RegisterBenchmark(("careful/frames/apply/" + suffix).c_str(),
                                 [](benchmark::State& state) {
                                   state.SkipWithError("naive matrix and apply() disagree");
                                 });
    return;
  }
  add<fvec>("careful/frames/apply/" + suffix, &random_four_vectors,
            [b](const fvec& v) { return b.apply(v); });
  add<fvec>("naive/frames/apply/" + suffix, &random_four_vectors,
            [l](const fvec& v) { return naive_apply(l, v); });
}

template <std::size_t N>
void add_apply_in_place(kernel k) {
  const std::string name = std::string("frames/apply_in_place/") + kernel_name(k) + "/" +
                           std::to_string(N);
  const boost_d b = boost_of(k);
  const boost_d inv = b.inverse();
  const mat4 l = naive_matrix(b), linv = naive_matrix(inv);
  benchmark::RegisterBenchmark(("careful/" + name).c_str(), [b, inv](benchmark::State& state) {
    run_in_place(
        state, soa_inputs<N>(),
        [&b](double* t, double* x, double* y, double* z, std::size_t n) { b.apply_in_place(t, x, y, z, n); },
        [&inv](double* t, double* x, double* y, double* z, std::size_t n) { inv.apply_in_place(t, x, y, z, n); });
  });
  benchmark::RegisterBenchmark(("naive/" + name).c_str(), [l, linv](benchmark::State& state) {
    run_in_place(
        state, soa_inputs<N>(),
        [&l](double* t, double* x, double* y, double* z, std::size_t n) { naive_in_place(l, t, x, y, z, n); },
        [&linv](double* t, double* x, double* y, double* z, std::size_t n) { naive_in_place(linv, t, x, y, z, n); });
  });
  // The same library call again under the blocked naive loop's name, so that the ratio script
  // pairs them.
  const std::string blocked = std::string("frames/apply_in_place_blocked/") + kernel_name(k) + "/" +
                              std::to_string(N);
  benchmark::RegisterBenchmark(("careful/" + blocked).c_str(), [b, inv](benchmark::State& state) {
    run_in_place(
        state, soa_inputs<N>(),
        [&b](double* t, double* x, double* y, double* z, std::size_t n) { b.apply_in_place(t, x, y, z, n); },
        [&inv](double* t, double* x, double* y, double* z, std::size_t n) { inv.apply_in_place(t, x, y, z, n); });
  });
  benchmark::RegisterBenchmark(("naive/" + blocked).c_str(), [l, linv](benchmark::State& state) {
    run_in_place(
        state, soa_inputs<N>(),
        [&l](double* t, double* x, double* y, double* z, std::size_t n) { naive_in_place_blocked(l, t, x, y, z, n); },
        [&linv](double* t, double* x, double* y, double* z, std::size_t n) { naive_in_place_blocked(linv, t, x, y, z, n); });
  });
}

/// invariant_mass(range) with the default tolerance over an event set, after checking the rungs
/// once (not timed): want_rung0 = true requires every event on rung 0, false requires every
/// event above it.  The counter max_rung reports the highest rung the guard used.
template <const event_set& (*Events)()>
void add_range(const std::string& name, bool want_rung0) {
  using result = eigenzeit::numeric::guarded_result<double>;
  benchmark::RegisterBenchmark(("careful/frames/" + name).c_str(),
                               [want_rung0](benchmark::State& state) {
    const std::vector<event>& events = Events().events;
    int max_rung = 0;
    bool all_rung0 = true, none_rung0 = true;
    for (const event& ev : events) {
      const result r = eigenzeit::invariant_mass(ev);
      max_rung = std::max(max_rung, r.rung);
      all_rung0 = all_rung0 && r.rung == 0;
      none_rung0 = none_rung0 && r.rung != 0;
    }
    if (want_rung0 && !all_rung0) {
      state.SkipWithError("an event left rung 0 of the guard");
      return;
    }
    if (!want_rung0 && !none_rung0) {
      state.SkipWithError("an event stayed on rung 0 (no fallback to measure)");
      return;
    }
    run_batch<result>(state, events,
                      [](const event& ev) { return eigenzeit::invariant_mass(ev); });
    state.counters["items_per_iteration"] = static_cast<double>(events.size());
    state.counters["max_rung"] = max_rung;
  });
  benchmark::RegisterBenchmark(("naive/frames/" + name).c_str(), [](benchmark::State& state) {
    const std::vector<event>& events = Events().events;
    run_batch<double>(state, events, [](const event& ev) { return naive_event_mass(ev); });
    state.counters["items_per_iteration"] = static_cast<double>(events.size());
  });
}

int register_all() {
  for (kernel k : {kernel::slow, kernel::fast, kernel::near_c}) add_apply(k);
  for (kernel k : {kernel::slow, kernel::fast, kernel::near_c}) {
    add_apply_in_place<4096>(k);
    add_apply_in_place<(std::size_t{1} << 20)>(k);
  }

  add<double>("careful/frames/invariant_mass/pair", &random_pairs,
              [](const mom_pair& p) { return eigenzeit::invariant_mass(p.a, p.b); });
  add<double>("naive/frames/invariant_mass/pair", &random_pairs,
              [](const mom_pair& p) { return naive_pair_mass(p.a, p.b); });

  add<double>("careful/frames/invariant_mass/four_vector", &timelike_four_vectors,
              [](const fvec& v) { return eigenzeit::invariant_mass(v); });
  add<double>("naive/frames/invariant_mass/four_vector", &timelike_four_vectors, [](const fvec& v) {
    const double m2 = v.t * v.t - v.x * v.x - v.y * v.y - v.z * v.z;
    return m2 > 0 ? std::sqrt(m2) : 0.0;
  });

  add<eigenzeit::boost_composition<double>>(
      "careful/frames/compose", &random_boost_pairs,
      [](const boost_pair& p) { return eigenzeit::compose(p.first, p.second); });
  add<mat4>("naive/frames/compose", &random_matrix_pairs,
            [](const matrix_pair& p) { return naive_product(p.second, p.first); });

  add_range<&random_events<2>>("invariant_mass/range/2", true);
  add_range<&random_events<10>>("invariant_mass/range/10", true);
  add_range<&random_events<100>>("invariant_mass/range/100", true);
  add_range<&collinear_events>("invariant_mass/range_collinear/10", false);

  add<double>("careful/frames/energy", &random_momenta, [](const mom& q) { return q.energy(); });
  add<double>("naive/frames/energy", &random_momenta, [](const mom& q) { return naive_energy(q); });
  add<double>("careful/frames/kinetic_energy", &random_momenta,
              [](const mom& q) { return q.kinetic_energy(); });
  add<double>("naive/frames/kinetic_energy", &random_momenta,
              [](const mom& q) { return naive_energy(q) - q.mass(); });
  return 0;
}

[[maybe_unused]] const int registered = register_all();

}  // namespace
