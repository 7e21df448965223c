// eigenzeit: speed of the clock-rate routines (timing/clock_rate.hpp, timing/trajectory.hpp).
// Distributed under the Boost Software License, Version 1.0 (see LICENSE).
//
// Pairs as in bench_speed.cpp: "careful/<name>" is the library, "naive/<name>" a textbook
// formula on the same inputs; each maps kBatch inputs to kBatch outputs per iteration, so
// items per second are elements per second (tools/bench_ratios.py makes the table).
//   careful/clock_rate_offset          eigenzeit::clock_rate_offset(v, U)
//   naive/clock_rate_offset            -(U + v^2/2) / c^2, the 1/c^2 formula typed directly
//                                      (fewer terms than the library keeps, no checks)
//   naive/clock_rate_offset_sqrt       sqrt(1 - 2U/c^2 - v^2/c^2) - 1, the metric's form,
//                                      which loses most digits at these sizes (its careful/
//                                      twin is the same library call, for the ratio table)
// The library call is scalar (its error path is a call); the naive forms vectorize where the
// compiler does so at -O2 (clang), so the direct form's ratio is a scalar-against-vector one.
// Inputs: v uniform in [0, 1e4] m/s and U uniform in [1e7, 7e7] m^2/s^2 (Earth orbits down to
// the ground), fixed seed.  The "/tiny" set takes v log-uniform in [1e-3, 1e2] m/s and U
// log-uniform in [1e-3, 1e3] m^2/s^2 (laboratory clocks): same code path, other operands.
//
// trajectory/...: trajectory_clock_offset over one day of a GPS-like Kepler orbit (e = 0.01)
// sampled every 30 s (2 881 samples), point-mass and J2 potentials; items per second are
// samples per second.

#include <benchmark/benchmark.h>

#include <array>
#include <cmath>
#include <cstddef>
#include <cstdint>
#include <random>
#include <string>
#include <vector>

#include <eigenzeit/timing/clock_rate.hpp>
#include <eigenzeit/timing/potential.hpp>
#include <eigenzeit/timing/trajectory.hpp>
#include <eigenzeit/timing/two_part_time.hpp>

#include "batch.hpp"

namespace {

constexpr std::size_t kBatch = 4096;

struct state {
  double v;  // m/s
  double U;  // m^2/s^2
};

const std::vector<state>& orbit_states() {
  static const std::vector<state> data = [] {
    std::mt19937_64 rng(20240611u);
    std::uniform_real_distribution<double> v(0.0, 1e4), U(1e7, 7e7);
    std::vector<state> out(kBatch);
    for (state& s : out) s = {v(rng), U(rng)};
    return out;
  }();
  return data;
}

const std::vector<state>& tiny_states() {
  static const std::vector<state> data = [] {
    std::mt19937_64 rng(20240612u);
    std::uniform_real_distribution<double> ev(-3.0, 2.0), eu(-3.0, 3.0);
    std::vector<state> out(kBatch);
    for (state& s : out) s = {std::pow(10.0, ev(rng)), std::pow(10.0, eu(rng))};
    return out;
  }();
  return data;
}

using ez_bench::add;
using ez_bench::run_batch;

void add_rates(const std::string& suffix, const std::vector<state>& (*inputs)()) {
  constexpr double c2 = 299792458.0 * 299792458.0;
  add("careful/clock_rate_offset" + suffix, inputs,
      [](const state& s) { return eigenzeit::clock_rate_offset(s.v, s.U); });
  add("naive/clock_rate_offset" + suffix, inputs,
      [](const state& s) { return -(s.U + 0.5 * s.v * s.v) / c2; });
  // The same library call again under the sqrt form's name, so that the ratio table pairs it.
  add("careful/clock_rate_offset_sqrt" + suffix, inputs,
      [](const state& s) { return eigenzeit::clock_rate_offset(s.v, s.U); });
  add("naive/clock_rate_offset_sqrt" + suffix, inputs,
      [](const state& s) { return std::sqrt(1.0 - 2.0 * s.U / c2 - s.v * s.v / c2) - 1.0; });
}

// ---- trajectory throughput -------------------------------------------------------------------

struct track {
  std::vector<eigenzeit::two_part_time<double>> t;
  std::vector<std::array<double, 3>> r, v;
};

/// One day of a GPS-like Kepler orbit (a = 26 561.75 km, e = 0.01, inclination 55 degrees)
/// every 30 s, from Kepler's equation solved by Newton's method.
const track& gps_day() {
  static const track data = [] {
    const double gm = 3.986004418e14, a = 26561750.0, e = 0.01;
    const double n = std::sqrt(gm / (a * a * a));
    const double ci = std::cos(0.96), si = std::sin(0.96);
    track out;
    const auto t0 = eigenzeit::two_part_time<double>::from_days(2460000.0, 0.5);
    for (int i = 0; i <= 2880; ++i) {
      const double M = n * 30.0 * i;
      double E = M;
      for (int k = 0; k < 30; ++k) E -= (E - e * std::sin(E) - M) / (1 - e * std::cos(E));
      const double den = 1 - e * std::cos(E), root = std::sqrt(1 - e * e);
      const double px = a * (std::cos(E) - e), py = a * root * std::sin(E);
      const double vx = -n * a * std::sin(E) / den, vy = n * a * root * std::cos(E) / den;
      out.t.push_back(eigenzeit::add_seconds(t0, 30.0 * i));
      out.r.push_back({px, py * ci, py * si});
      out.v.push_back({vx, vy * ci, vy * si});
    }
    return out;
  }();
  return data;
}

template <class Potential>
void trajectory_bench(benchmark::State& st, Potential potential) {
  const track& d = gps_day();
  for (auto _ : st) {
    auto res = eigenzeit::trajectory_clock_offset(d.t, d.r, d.v, potential);
    benchmark::DoNotOptimize(res);
  }
  st.SetItemsProcessed(static_cast<std::int64_t>(st.iterations()) *
                       static_cast<std::int64_t>(d.t.size()));
}

int register_all() {
  add_rates("", &orbit_states);
  add_rates("/tiny", &tiny_states);
  benchmark::RegisterBenchmark("trajectory/gps_day_30s/point_mass", [](benchmark::State& st) {
    trajectory_bench(st, eigenzeit::point_mass_potential<double>::earth());
  });
  benchmark::RegisterBenchmark("trajectory/gps_day_30s/j2", [](benchmark::State& st) {
    trajectory_bench(st, eigenzeit::j2_potential<double>::earth());
  });
  return 0;
}

[[maybe_unused]] const int registered = register_all();

}  // namespace
