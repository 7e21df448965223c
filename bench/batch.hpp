// eigenzeit benchmarks: the batch loop every benchmark program shares.
// Distributed under the Boost Software License, Version 1.0 (see LICENSE).
#ifndef EIGENZEIT_BENCH_BATCH_HPP
#define EIGENZEIT_BENCH_BATCH_HPP

#include <benchmark/benchmark.h>

#include <cstddef>
#include <cstdint>
#include <string>
#include <vector>

namespace ez_bench {

/// out[i] = f(in[i]) for the whole batch, once per iteration.  The input is "escaped" before
/// each pass so the compiler cannot assume it unchanged between iterations, and the output is
/// escaped and memory clobbered afterwards so no store is dropped.  Items per second in the
/// report are elements per second.
template <class Out, class In, class F>
void run_batch(benchmark::State& state, const std::vector<In>& in, F f) {
  std::vector<Out> out(in.size());
  const In* src = in.data();
  Out* dst = out.data();
  const std::size_t n = in.size();
  for (auto _ : state) {
    benchmark::DoNotOptimize(src);
    for (std::size_t i = 0; i < n; ++i) dst[i] = f(src[i]);
    benchmark::DoNotOptimize(dst);
    benchmark::ClobberMemory();
  }
  state.SetItemsProcessed(static_cast<std::int64_t>(state.iterations()) *
                          static_cast<std::int64_t>(n));
}

/// Registers `name`: run_batch over inputs() (a function returning a static input set).
template <class Out = double, class In, class F>
void add(const std::string& name, const std::vector<In>& (*inputs)(), F f) {
  benchmark::RegisterBenchmark(name.c_str(), [inputs, f](benchmark::State& state) {
    run_batch<Out>(state, inputs(), f);
  });
}

}  // namespace ez_bench

#endif
