// eigenzeit: speed of the careful functions of a speed against the textbook formulas.
// Distributed under the Boost Software License, Version 1.0 (see LICENSE).
//
// Every benchmark maps a batch of kBatch inputs to kBatch outputs per iteration, so the
// report's items per second are elements per second.  Pairs share a name after the first
// component: "careful/<name>" is the library routine, "naive/<name>" the textbook formula on
// the same inputs, "rounded/<name>" the library routine in the correctly rounded mode,
// registered next to each other so they run under the same machine load.  "worst/<name>" is
// the correctly rounded mode on an input that needs the ladder's multiprecision rung, and
// "rung/<name>/<type>" the careful form on each rung of the widening ladder.
// tools/bench_ratios.py turns the JSON output into a table of ns per element and ratios.
//
// Input sets (double unless a suffix says otherwise), fixed seeds so every run sees the same:
//   (none)        signed beta uniform in (-1, 1)
//   /slow         signed beta with |beta| log-uniform in [1e-9, 1e-3] (walking pace up to
//                 fast spacecraft); the careful forms take their series branch here
//   view/...      speed<double> views; beta uniform in [0, 1), speeds built beforehand
//                 (rounded_speed<double> from the same betas for rounded/view/...)
//   from_gamma/...  views of speeds built from gamma = 1 / (1 - uniform): in the correctly
//                 rounded mode most of them take the ladder (long double) every time
//   /float, /long_double   lorentz_factor and lorentz_factor_m1 in other types, uniform set
//
// The loops are plain "out[i] = f(in[i])" so the compiler vectorizes whatever it can; at -O2
// std::sqrt's errno handling usually keeps both forms scalar.  Build with -mfma as well:
// without a fused multiply-add instruction every std::fma in the careful forms is a call.

#include <benchmark/benchmark.h>

#include <cmath>
#include <cstddef>
#include <cstdint>
#include <random>
#include <string>
#include <vector>

#include <eigenzeit/speed.hpp>

#include "batch.hpp"

namespace {

constexpr std::size_t kBatch = 4096;

// ---- input sets ----------------------------------------------------------------------------

/// Signed beta uniform in the open interval (-1, 1).
template <class T>
const std::vector<T>& uniform_signed() {
  static const std::vector<T> data = [] {
    std::mt19937_64 rng(20240601u);
    std::uniform_real_distribution<long double> dist(-1.0L, 1.0L);
    std::vector<T> v;
    v.reserve(kBatch);
    while (v.size() < kBatch) {
      const T b = static_cast<T>(dist(rng));
      if (b > T(-1) && b < T(1)) v.push_back(b);
    }
    return v;
  }();
  return data;
}

/// Signed beta with |beta| log-uniform in [1e-9, 1e-3], random sign.
const std::vector<double>& slow_signed() {
  static const std::vector<double> data = [] {
    std::mt19937_64 rng(20240602u);
    std::uniform_real_distribution<double> exponent(-9.0, -3.0);
    std::bernoulli_distribution negative(0.5);
    std::vector<double> v(kBatch);
    for (double& b : v) {
      const double m = std::pow(10.0, exponent(rng));
      b = negative(rng) ? -m : m;
    }
    return v;
  }();
  return data;
}

/// Beta uniform in [0, 1), the domain of speed<double>::from_beta.
const std::vector<double>& uniform_magnitude() {
  static const std::vector<double> data = [] {
    std::mt19937_64 rng(20240603u);
    std::uniform_real_distribution<double> dist(0.0, 1.0);
    std::vector<double> v;
    v.reserve(kBatch);
    while (v.size() < kBatch) {
      const double b = dist(rng);
      if (b >= 0.0 && b < 1.0) v.push_back(b);
    }
    return v;
  }();
  return data;
}

/// speed<double> built from uniform_magnitude(), element by element.
const std::vector<eigenzeit::speed<double>>& uniform_speeds() {
  static const std::vector<eigenzeit::speed<double>> data = [] {
    const std::vector<double>& beta = uniform_magnitude();
    std::vector<eigenzeit::speed<double>> v;
    v.reserve(beta.size());
    for (double b : beta) v.push_back(eigenzeit::speed<double>::from_beta(b));
    return v;
  }();
  return data;
}

/// rounded_speed<double> from the same betas.
const std::vector<eigenzeit::rounded_speed<double>>& uniform_rounded_speeds() {
  static const std::vector<eigenzeit::rounded_speed<double>> data = [] {
    std::vector<eigenzeit::rounded_speed<double>> v;
    for (double b : uniform_magnitude())
      v.push_back(eigenzeit::speed<double>::from_beta(b, eigenzeit::correctly_rounded));
    return v;
  }();
  return data;
}

/// gamma = 1 / (1 - x), x uniform in [0, 1): gamma from 1 to about 1e16.
const std::vector<double>& uniform_gamma() {
  static const std::vector<double> data = [] {
    std::vector<double> v;
    for (double b : uniform_magnitude()) v.push_back(1.0 / (1.0 - b));
    return v;
  }();
  return data;
}

const std::vector<eigenzeit::speed<double>>& gamma_speeds() {
  static const std::vector<eigenzeit::speed<double>> data = [] {
    std::vector<eigenzeit::speed<double>> v;
    for (double g : uniform_gamma()) v.push_back(eigenzeit::speed<double>::from_gamma(g));
    return v;
  }();
  return data;
}

const std::vector<eigenzeit::rounded_speed<double>>& gamma_rounded_speeds() {
  static const std::vector<eigenzeit::rounded_speed<double>> data = [] {
    std::vector<eigenzeit::rounded_speed<double>> v;
    for (double g : uniform_gamma())
      v.push_back(eigenzeit::speed<double>::from_gamma(g, eigenzeit::correctly_rounded));
    return v;
  }();
  return data;
}

/// The worst case found for lorentz_factor in the correctly rounded mode: beta = 1 - 2^-51,
/// whose gamma lies within 2^-104 (relative) of a rounding boundary; long double cannot
/// separate it, cpp_bin_float_50 can.  A whole batch of it.
const std::vector<double>& hard_beta() {
  static const std::vector<double> data(kBatch, 1.0 - std::ldexp(1.0, -51));
  return data;
}

// ---- the batch loop --------------------------------------------------------------------------

using ez_bench::add;
using ez_bench::run_batch;

// ---- registrations -----------------------------------------------------------------------------

/// The five free functions of a signed beta against their textbook forms, on one input set.
void add_free_functions(const std::string& suffix, const std::vector<double>& (*inputs)()) {
  namespace ez = eigenzeit;
  add<double>("careful/lorentz_factor" + suffix, inputs,
              [](double b) { return ez::lorentz_factor(b); });
  add<double>("rounded/lorentz_factor" + suffix, inputs,
              [](double b) { return ez::lorentz_factor(b, ez::correctly_rounded); });
  add<double>("naive/lorentz_factor" + suffix, inputs,
              [](double b) { return 1.0 / std::sqrt(1.0 - b * b); });

  add<double>("careful/lorentz_factor_m1" + suffix, inputs,
              [](double b) { return ez::lorentz_factor_m1(b); });
  add<double>("rounded/lorentz_factor_m1" + suffix, inputs,
              [](double b) { return ez::lorentz_factor_m1(b, ez::correctly_rounded); });
  add<double>("naive/lorentz_factor_m1" + suffix, inputs,
              [](double b) { return 1.0 / std::sqrt(1.0 - b * b) - 1.0; });

  add<double>("careful/proper_speed" + suffix, inputs,
              [](double b) { return ez::proper_speed(b); });
  add<double>("rounded/proper_speed" + suffix, inputs,
              [](double b) { return ez::proper_speed(b, ez::correctly_rounded); });
  add<double>("naive/proper_speed" + suffix, inputs,
              [](double b) { return b / std::sqrt(1.0 - b * b); });

  add<double>("careful/dilation_fraction" + suffix, inputs,
              [](double b) { return ez::dilation_fraction(b); });
  add<double>("rounded/dilation_fraction" + suffix, inputs,
              [](double b) { return ez::dilation_fraction(b, ez::correctly_rounded); });
  add<double>("naive/dilation_fraction" + suffix, inputs,
              [](double b) { return 1.0 - std::sqrt(1.0 - b * b); });

  add<double>("careful/rapidity" + suffix, inputs,
              [](double b) { return ez::rapidity(b); });
  add<double>("rounded/rapidity" + suffix, inputs,
              [](double b) { return ez::rapidity(b, ez::correctly_rounded); });
  add<double>("naive/rapidity" + suffix, inputs,
              [](double b) { return 0.5 * std::log((1.0 + b) / (1.0 - b)); });
}

/// The views of speed<double> (built beforehand) against the textbook formula on plain beta.
void add_views() {
  using S = eigenzeit::speed<double>;
  const auto speeds = &uniform_speeds;
  const auto betas = &uniform_magnitude;

  add<double>("careful/view/beta", speeds, [](const S& s) { return s.beta(); });
  add<double>("naive/view/beta", betas, [](double b) { return b; });

  add<double>("careful/view/beta_deficit", speeds, [](const S& s) { return s.beta_deficit(); });
  add<double>("naive/view/beta_deficit", betas, [](double b) { return 1.0 - b; });

  add<double>("careful/view/gamma", speeds, [](const S& s) { return s.gamma(); });
  add<double>("naive/view/gamma", betas, [](double b) { return 1.0 / std::sqrt(1.0 - b * b); });

  add<double>("careful/view/gamma_m1", speeds, [](const S& s) { return s.gamma_m1(); });
  add<double>("naive/view/gamma_m1", betas,
              [](double b) { return 1.0 / std::sqrt(1.0 - b * b) - 1.0; });

  add<double>("careful/view/inv_gamma", speeds, [](const S& s) { return s.inv_gamma(); });
  add<double>("naive/view/inv_gamma", betas, [](double b) { return std::sqrt(1.0 - b * b); });

  add<double>("careful/view/dilation_fraction", speeds,
              [](const S& s) { return s.dilation_fraction(); });
  add<double>("naive/view/dilation_fraction", betas,
              [](double b) { return 1.0 - std::sqrt(1.0 - b * b); });

  add<double>("careful/view/rapidity", speeds, [](const S& s) { return s.rapidity(); });
  add<double>("naive/view/rapidity", betas,
              [](double b) { return 0.5 * std::log((1.0 + b) / (1.0 - b)); });

  add<double>("careful/view/proper_speed", speeds, [](const S& s) { return s.proper_speed(); });
  add<double>("naive/view/proper_speed", betas,
              [](double b) { return b / std::sqrt(1.0 - b * b); });

  // The correctly rounded mode: rounded_speed<double> from the same betas, and views of speeds
  // built from gamma (careful and rounded; the naive twin is the textbook formula of gamma).
  using RS = eigenzeit::rounded_speed<double>;
  const auto rounded = &uniform_rounded_speeds;
  add<double>("rounded/view/beta", rounded, [](const RS& s) { return s.beta(); });
  add<double>("rounded/view/beta_deficit", rounded, [](const RS& s) { return s.beta_deficit(); });
  add<double>("rounded/view/gamma", rounded, [](const RS& s) { return s.gamma(); });
  add<double>("rounded/view/gamma_m1", rounded, [](const RS& s) { return s.gamma_m1(); });
  add<double>("rounded/view/inv_gamma", rounded, [](const RS& s) { return s.inv_gamma(); });
  add<double>("rounded/view/dilation_fraction", rounded, [](const RS& s) { return s.dilation_fraction(); });
  add<double>("rounded/view/rapidity", rounded, [](const RS& s) { return s.rapidity(); });
  add<double>("rounded/view/proper_speed", rounded, [](const RS& s) { return s.proper_speed(); });

  add<double>("careful/from_gamma/beta_deficit", &gamma_speeds, [](const S& s) { return s.beta_deficit(); });
  add<double>("rounded/from_gamma/beta_deficit", &gamma_rounded_speeds, [](const RS& s) { return s.beta_deficit(); });
  add<double>("naive/from_gamma/beta_deficit", &uniform_gamma,
              [](double g) { return 1.0 - std::sqrt(1.0 - 1.0 / (g * g)); });
  add<double>("careful/from_gamma/gamma_m1", &gamma_speeds, [](const S& s) { return s.gamma_m1(); });
  add<double>("rounded/from_gamma/gamma_m1", &gamma_rounded_speeds, [](const RS& s) { return s.gamma_m1(); });
  add<double>("naive/from_gamma/gamma_m1", &uniform_gamma, [](double g) { return g - 1.0; });
  add<double>("careful/from_gamma/proper_speed", &gamma_speeds, [](const S& s) { return s.proper_speed(); });
  add<double>("rounded/from_gamma/proper_speed", &gamma_rounded_speeds, [](const RS& s) { return s.proper_speed(); });
  add<double>("naive/from_gamma/proper_speed", &uniform_gamma,
              [](double g) { return std::sqrt(g * g - 1.0); });

  // The worst case of the correctly rounded mode: every element climbs to cpp_bin_float_50.
  add<double>("worst/lorentz_factor", &hard_beta,
              [](double b) { return eigenzeit::lorentz_factor(b, eigenzeit::correctly_rounded); });

  // Building the speed itself; no textbook counterpart stores anything comparable.
  add<S>("careful/from_beta", betas, [](double b) { return S::from_beta(b); });
  // Build and read gamma at once: what "compute gamma from beta via speed<T>" costs.
  add<double>("careful/from_beta+gamma", betas, [](double b) { return S::from_beta(b).gamma(); });
  add<double>("naive/from_beta+gamma", betas,
              [](double b) { return 1.0 / std::sqrt(1.0 - b * b); });
}

/// lorentz_factor and lorentz_factor_m1 in another real type, uniform signed inputs.
template <class T>
void add_other_type(const std::string& suffix) {
  namespace ez = eigenzeit;
  const auto inputs = &uniform_signed<T>;
  add<T>("careful/lorentz_factor" + suffix, inputs, [](T b) { return ez::lorentz_factor(b); });
  add<T>("naive/lorentz_factor" + suffix, inputs,
         [](T b) { return T(1) / std::sqrt(T(1) - b * b); });
  add<T>("careful/lorentz_factor_m1" + suffix, inputs,
         [](T b) { return ez::lorentz_factor_m1(b); });
  add<T>("naive/lorentz_factor_m1" + suffix, inputs,
         [](T b) { return T(1) / std::sqrt(T(1) - b * b) - T(1); });
}

/// One careful gamma - 1 on each rung of the widening ladder (what a fallback costs there):
/// "rung/lorentz_factor_m1/<type>", uniform signed inputs converted to the rung's type.
template <class W>
void add_rung(const std::string& type_name) {
  static const std::vector<W> inputs = [] {
    std::vector<W> v;
    for (double b : uniform_signed<double>()) v.push_back(W(b));
    return v;
  }();
  benchmark::RegisterBenchmark(("rung/lorentz_factor_m1/" + type_name).c_str(), [](benchmark::State& state) {
    run_batch<W>(state, inputs, [](const W& b) { return eigenzeit::lorentz_factor_m1(b); });
  });
}

int register_all() {
  add_rung<double>("double");
  add_rung<long double>("long_double");
  add_rung<eigenzeit::numeric::ladder_mp_rung>("cpp_bin_float_50");
  add_rung<eigenzeit::numeric::next_rung_t<eigenzeit::numeric::ladder_mp_rung>>("cpp_bin_float_100");
  add_free_functions("", &uniform_signed<double>);
  add_free_functions("/slow", &slow_signed);
  add_views();
  add_other_type<float>("/float");
  add_other_type<long double>("/long_double");
  return 0;
}

[[maybe_unused]] const int registered = register_all();

}  // namespace
