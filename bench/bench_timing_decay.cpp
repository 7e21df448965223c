// eigenzeit: speed of proper_time, dilation_offset and the decay functions against the
// textbook formulas.
// Distributed under the Boost Software License, Version 1.0 (see LICENSE).
//
// Same conventions as bench_speed.cpp: every benchmark maps a batch of kBatch inputs to kBatch
// outputs per iteration (items per second = elements per second), "careful/<name>" is the
// library routine and "naive/<name>" the textbook formula on the same inputs, registered next
// to each other; tools/bench_ratios.py turns the JSON output into ratios.
//
// The careful forms take a speed<double> built beforehand (what a caller holding a speed
// pays); the naive forms take the plain beta.  "careful/<name>/from_beta" builds the speed
// from beta inside the loop as well, for callers that start from a plain beta.
//
// Input sets (fixed seeds): beta uniform in [0, 1), or log-uniform in [1e-9, 1e-3] ("/slow":
// the series branches); dt log-uniform in [1e-3, 1e7] s; c tau log-uniform in [1e-3, 1e3] m;
// the path d = r L with r log-uniform in [1e-6, 30].

#include <benchmark/benchmark.h>

#include <cmath>
#include <cstddef>
#include <cstdint>
#include <random>
#include <string>
#include <vector>

#include <eigenzeit/timing/decay.hpp>
#include <eigenzeit/timing/proper_time.hpp>

#include "batch.hpp"

namespace {

constexpr std::size_t kBatch = 4096;

struct sample {
  eigenzeit::speed<double> s;
  double beta;
  double dt;
  double c_tau;
  double d;
};

double log_uniform(std::mt19937_64& rng, double lo, double hi) {
  std::uniform_real_distribution<double> u(std::log(lo), std::log(hi));
  return std::exp(u(rng));
}

std::vector<sample> make_samples(bool slow, unsigned seed) {
  std::mt19937_64 rng(seed);
  std::uniform_real_distribution<double> uniform(0.0, 1.0);
  std::vector<sample> v;
  v.reserve(kBatch);
  while (v.size() < kBatch) {
    const double b = slow ? log_uniform(rng, 1e-9, 1e-3) : uniform(rng);
    if (!(b >= 0 && b < 1)) continue;
    sample x{eigenzeit::speed<double>::from_beta(b), b, log_uniform(rng, 1e-3, 1e7),
             log_uniform(rng, 1e-3, 1e3), 0.0};
    x.d = log_uniform(rng, 1e-6, 30.0) * x.s.proper_speed() * x.c_tau;
    v.push_back(x);
  }
  return v;
}

const std::vector<sample>& uniform_set() {
  static const std::vector<sample> data = make_samples(false, 20240701u);
  return data;
}

const std::vector<sample>& slow_set() {
  static const std::vector<sample> data = make_samples(true, 20240702u);
  return data;
}

using ez_bench::add;
using ez_bench::run_batch;

double naive_gamma(double b) { return 1.0 / std::sqrt(1.0 - b * b); }

void add_set(const std::string& suffix, const std::vector<sample>& (*inputs)()) {
  namespace ez = eigenzeit;
  using S = ez::speed<double>;

  add("careful/proper_time" + suffix, inputs,
      [](const sample& x) { return ez::proper_time(x.s, x.dt); });
  add("naive/proper_time" + suffix, inputs,
      [](const sample& x) { return x.dt * std::sqrt(1.0 - x.beta * x.beta); });

  add("careful/dilation_offset" + suffix, inputs,
      [](const sample& x) { return ez::dilation_offset(x.s, x.dt); });
  add("naive/dilation_offset" + suffix, inputs,
      [](const sample& x) { return x.dt * (1.0 - std::sqrt(1.0 - x.beta * x.beta)); });

  add("careful/mean_decay_length" + suffix, inputs,
      [](const sample& x) { return ez::mean_decay_length(x.s, x.c_tau); });
  add("naive/mean_decay_length" + suffix, inputs,
      [](const sample& x) { return x.beta * naive_gamma(x.beta) * x.c_tau; });

  add("careful/survival_probability" + suffix, inputs,
      [](const sample& x) { return ez::survival_probability(x.d, x.s, x.c_tau); });
  add("naive/survival_probability" + suffix, inputs, [](const sample& x) {
    return std::exp(-x.d / (x.beta * naive_gamma(x.beta) * x.c_tau));
  });

  add("careful/decay_probability" + suffix, inputs,
      [](const sample& x) { return ez::decay_probability(x.d, x.s, x.c_tau); });
  add("naive/decay_probability" + suffix, inputs, [](const sample& x) {
    return 1.0 - std::exp(-x.d / (x.beta * naive_gamma(x.beta) * x.c_tau));
  });

  // The same with -expm1 in the textbook form too: the cost of the careful ratio alone.
  add("careful/decay_probability/vs_expm1" + suffix, inputs,
      [](const sample& x) { return ez::decay_probability(x.d, x.s, x.c_tau); });
  add("naive/decay_probability/vs_expm1" + suffix, inputs, [](const sample& x) {
    return -std::expm1(-x.d / (x.beta * naive_gamma(x.beta) * x.c_tau));
  });

  // Starting from a plain beta: the speed is built in the loop too.
  add("careful/proper_time/from_beta" + suffix, inputs,
      [](const sample& x) { return ez::proper_time(S::from_beta(x.beta), x.dt); });
  add("naive/proper_time/from_beta" + suffix, inputs,
      [](const sample& x) { return x.dt * std::sqrt(1.0 - x.beta * x.beta); });
  add("careful/survival_probability/from_beta" + suffix, inputs, [](const sample& x) {
    return ez::survival_probability(x.d, S::from_beta(x.beta), x.c_tau);
  });
  add("naive/survival_probability/from_beta" + suffix, inputs, [](const sample& x) {
    return std::exp(-x.d / (x.beta * naive_gamma(x.beta) * x.c_tau));
  });
}

int register_all() {
  add_set("", &uniform_set);
  add_set("/slow", &slow_set);
  return 0;
}

[[maybe_unused]] const int registered = register_all();

}  // namespace
