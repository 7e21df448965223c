// eigenzeit: build configuration (fast-math guard, host/device marker, optional types).
// Distributed under the Boost Software License, Version 1.0 (see LICENSE).
#ifndef EIGENZEIT_CONFIG_HPP
#define EIGENZEIT_CONFIG_HPP

#include <cmath>

#include <eigenzeit/version.hpp>

// The routines rely on IEEE round-to-nearest arithmetic performed exactly as written:
// error-free transforms such as (a + b) - a recover rounding errors only if the compiler
// does not reassociate them, and NaN/inf checks must not be optimised away.  -ffast-math
// (and -ffinite-math-only, which it implies) silently turns those into wrong results, so
// the build stops here.  Define EIGENZEIT_ALLOW_FAST_MATH to build anyway and accept that
// the accuracy figures in the documentation no longer hold.
#if (defined(__FAST_MATH__) || (defined(__FINITE_MATH_ONLY__) && __FINITE_MATH_ONLY__ > 0)) && \
    !defined(EIGENZEIT_ALLOW_FAST_MATH)
#error "eigenzeit: -ffast-math (or -ffinite-math-only) breaks the compensated arithmetic this library relies on; build without it (add -fno-fast-math for files that include eigenzeit), or define EIGENZEIT_ALLOW_FAST_MATH to accept inaccurate results"
#endif

// Marks the scalar kernels for host and device compilation in CUDA/HIP translation units.
#if defined(__CUDACC__) || defined(__HIPCC__)
#define EIGENZEIT_HOST_DEVICE __host__ __device__
#else
#define EIGENZEIT_HOST_DEVICE
#endif

// Forces inlining of the per-element kernels of the batch forms, so that the vectoriser sees
// their whole body (GCC at -O2 otherwise keeps the larger kernels as calls).
#if defined(__GNUC__) || defined(__clang__)
#define EIGENZEIT_FORCE_INLINE inline __attribute__((always_inline))
#else
#define EIGENZEIT_FORCE_INLINE inline
#endif

// Whether the compiler turns std::fma into one instruction.  Without it every fused
// multiply-add is a library call: still exact, but the careful forms then cost about
// 2.5x the naive formula instead of about 1.1x (see README, "Speed").
#if defined(FP_FAST_FMA) || defined(__FMA__) || defined(__aarch64__)
#define EIGENZEIT_HAS_FAST_FMA 1
#else
#define EIGENZEIT_HAS_FAST_FMA 0
#endif

#endif
