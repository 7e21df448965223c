// Test support: MPFR reference for the speed quantities, and ulp bookkeeping.
//
// The reference evaluates the *definition* formulas (gamma = 1/sqrt(1 - beta^2), gamma - 1 =
// gamma minus one, and so on) on the exact input, in MPFR with a working precision chosen
// per input so that the cancellation of those formulas is absorbed: 256 bits of margin plus
// twice the binary exponent of the input (gamma - 1 ~ beta^2 / 2 needs 2|log2 beta| extra
// bits; 1 - beta ~ 1 / (2 gamma^2) needs 2 log2 gamma) plus 3 bits per unit of rapidity.
#ifndef EIGENZEIT_TESTS_SUPPORT_REFERENCE_HPP
#define EIGENZEIT_TESTS_SUPPORT_REFERENCE_HPP

#include <mpfr.h>

#include <algorithm>
#include <cmath>
#include <cstdint>
#include <cstdio>
#include <cstdlib>
#include <limits>
#include <string>
#include <type_traits>

#include <boost/multiprecision/cpp_bin_float.hpp>
#include <boost/multiprecision/mpfr.hpp>

#include <eigenzeit/numeric/ulp.hpp>

namespace ez_test {

/// RAII holder of one mpfr_t.
struct mp {
  mpfr_t v;
  explicit mp(mpfr_prec_t prec) { mpfr_init2(v, prec); }
  mp(const mp&) = delete;
  mp& operator=(const mp&) = delete;
  ~mp() { mpfr_clear(v); }
  operator mpfr_srcptr() const { return v; }
};

using cpp50 = boost::multiprecision::cpp_bin_float_50;
using mpfr100 = boost::multiprecision::number<boost::multiprecision::mpfr_float_backend<100>>;

// ---- exact conversions between test types and MPFR ------------------------------------------

inline void set_exact(mpfr_t r, float x) { mpfr_set_flt(r, x, MPFR_RNDN); }
inline void set_exact(mpfr_t r, double x) { mpfr_set_d(r, x, MPFR_RNDN); }
inline void set_exact(mpfr_t r, long double x) { mpfr_set_ld(r, x, MPFR_RNDN); }
inline void set_exact(mpfr_t r, const mpfr100& x) { mpfr_set(r, x.backend().data(), MPFR_RNDN); }


/// Whether T is a Boost.Multiprecision number on an MPFR backend (any precision, either
/// expression-template setting): its value is then read directly.
template <class T>
struct is_mpfr_number : std::false_type {};
template <unsigned D, boost::multiprecision::mpfr_allocation_type A,
          boost::multiprecision::expression_template_option ET>
struct is_mpfr_number<boost::multiprecision::number<boost::multiprecision::mpfr_float_backend<D, A>, ET>>
    : std::true_type {
  static constexpr unsigned digits10 = D;
  static constexpr bool expression_templates = ET == boost::multiprecision::et_on;
};

/// A readable name of each tested real type, for test output.
template <class T>
inline const char* type_name() {
  if constexpr (std::is_same<T, float>::value) return "float";
  else if constexpr (std::is_same<T, double>::value) return "double";
  else if constexpr (std::is_same<T, long double>::value) return "long double";
  else if constexpr (std::is_same<T, cpp50>::value) return "cpp_bin_float_50";
  else if constexpr (is_mpfr_number<T>::value) {
    static const std::string name = "mpfr_float_" + std::to_string(is_mpfr_number<T>::digits10) +
                                    (is_mpfr_number<T>::expression_templates ? "" : " (et_off)");
    return name.c_str();
  } else {
    return "float128";
  }
}

/// Exact value of x in r, for any tested type; returns false if r's precision cannot hold it.
/// Built-in types through MPFR's own setters, MPFR-backed numbers directly, other types
/// (cpp_bin_float, float128) through their significand, 32 bits at a time with frexp / ldexp /
/// floor (all exact).
template <class T>
inline bool set_exact_checked(mpfr_t r, const T& x) {
  if constexpr (std::is_same<T, float>::value) {
    return mpfr_set_flt(r, x, MPFR_RNDN) == 0;
  } else if constexpr (std::is_same<T, double>::value) {
    return mpfr_set_d(r, x, MPFR_RNDN) == 0;
  } else if constexpr (std::is_same<T, long double>::value) {
    return mpfr_set_ld(r, x, MPFR_RNDN) == 0;
  } else if constexpr (is_mpfr_number<T>::value) {
    return mpfr_set(r, x.backend().data(), MPFR_RNDN) == 0;
  } else {
    using std::abs;
    using std::floor;
    using std::frexp;
    using std::ldexp;
    if (x == 0) {
      mpfr_set_zero(r, x < 0 ? -1 : 1);
      return true;
    }
    int e = 0;
    T f = frexp(abs(x), &e);
    int inexact = 0;
    long shift = 0;
    mpfr_set_ui(r, 0, MPFR_RNDN);
    while (f != 0) {
      f = ldexp(f, 32);
      shift += 32;
      T chunk = floor(f);
      f -= chunk;
      inexact |= mpfr_mul_2ui(r, r, 32, MPFR_RNDN);
      inexact |= mpfr_add_ui(r, r, chunk.template convert_to<unsigned long>(), MPFR_RNDN);
    }
    inexact |= mpfr_mul_2si(r, r, e - shift, MPFR_RNDN);
    if (x < 0) mpfr_neg(r, r, MPFR_RNDN);
    return inexact == 0;
  }
}

template <class T>
inline std::enable_if_t<!std::is_floating_point<T>::value && !std::is_same<T, mpfr100>::value>
set_exact(mpfr_t r, const T& x) {
  set_exact_checked(r, x);  // the caller's precision holds every tested type
}

/// Correct rounding of an MPFR value to a built-in type.
template <class T>
inline T round_to(const mpfr_t r) {
  if constexpr (std::is_same<T, float>::value) return mpfr_get_flt(r, MPFR_RNDN);
  else if constexpr (std::is_same<T, double>::value) return mpfr_get_d(r, MPFR_RNDN);
  else return mpfr_get_ld(r, MPFR_RNDN);
}

// ---- the quantities -----------------------------------------------------------------------

enum class ctor { beta, beta_deficit, gamma, gamma_m1, rapidity, proper_speed, kinetic_energy, momentum };
inline const char* ctor_name(ctor c) {
  switch (c) {
    case ctor::beta: return "from_beta";
    case ctor::beta_deficit: return "from_beta_deficit";
    case ctor::gamma: return "from_gamma";
    case ctor::gamma_m1: return "from_gamma_m1";
    case ctor::rapidity: return "from_rapidity";
    case ctor::proper_speed: return "from_proper_speed";
    case ctor::kinetic_energy: return "from_kinetic_energy";
    case ctor::momentum: return "from_momentum";
  }
  return "?";
}

enum view : int { v_beta, v_deficit, v_gamma, v_gamma_m1, v_inv_gamma, v_dilation, v_rapidity, v_proper_speed, n_views };
inline const char* view_name(int v) {
  static const char* names[] = {"beta", "beta_deficit", "gamma", "gamma_m1", "inv_gamma",
                                "dilation_fraction", "rapidity", "proper_speed"};
  return names[v];
}

/// Working precision for one input (see the top of this file).  `x` is the magnitude that
/// drives the cancellation (the input, or the ratio of the two energy inputs); `extra` adds
/// bits for the type under test (2 x its digits for wide types).
inline mpfr_prec_t precision_for(double x, ctor c, int type_digits) {
  int e = 0;
  if (x != 0 && std::isfinite(x)) e = std::ilogb(x);
  if (x != 0 && !std::isnormal(x)) e = -1075;
  long p = 256 + 2L * type_digits + 2L * std::abs(e);
  if (c == ctor::rapidity) p += static_cast<long>(3 * std::fabs(x)) + 8;
  return static_cast<mpfr_prec_t>(std::min(p, 8000L));
}

/// The magnitude that drives the reference precision (see precision_for): the input, or the
/// ratio of the two inputs of the energy constructors.
inline double magnitude(ctor c, long double x, long double y) {
  if (c == ctor::kinetic_energy || c == ctor::momentum) return static_cast<double>(x / y);
  if (x != 0 && std::fabs(x) < 1e-4900L) return 0.0;
  return static_cast<double>(x);
}

/// All eight views, exact to the working precision, from one construction.
struct reference {
  mpfr_prec_t prec;
  mp val[n_views];
  explicit reference(mpfr_prec_t p)
      : prec(p), val{mp(p), mp(p), mp(p), mp(p), mp(p), mp(p), mp(p), mp(p)} {}

  /// The views for constructor c on the exact inputs x (and y, the mass of the energy
  /// constructors; 1 otherwise), at the precision precision_for chooses for a type of
  /// `type_digits` bits.  Every tested input (float, double, long double) is exact in long double.
  reference(ctor c, long double x, long double y, int type_digits)
      : reference(precision_for(magnitude(c, x, y), c, type_digits)) {
    mp mx(prec), my(prec);
    mpfr_set_ld(mx.v, x, MPFR_RNDN);
    mpfr_set_ld(my.v, y, MPFR_RNDN);
    compute(c, mx.v, my.v);
  }

  /// x (and y, the mass, for the energy constructors) are exact MPFR inputs.
  void compute(ctor c, const mpfr_t x, const mpfr_t y) {
    mp b(prec), t(prec), one(prec);
    mpfr_set_ui(one.v, 1, MPFR_RNDN);
    switch (c) {
      case ctor::beta: mpfr_set(b.v, x, MPFR_RNDN); break;
      case ctor::beta_deficit: mpfr_ui_sub(b.v, 1, x, MPFR_RNDN); break;
      case ctor::gamma:  // beta = sqrt(1 - 1/gamma^2)
        mpfr_sqr(t.v, x, MPFR_RNDN);
        mpfr_ui_div(t.v, 1, t.v, MPFR_RNDN);
        mpfr_ui_sub(t.v, 1, t.v, MPFR_RNDN);
        mpfr_sqrt(b.v, t.v, MPFR_RNDN);
        break;
      case ctor::gamma_m1:
      case ctor::kinetic_energy:  // gamma = 1 + x (or 1 + K/m)
        if (c == ctor::gamma_m1) mpfr_add_ui(t.v, x, 1, MPFR_RNDN);
        else { mpfr_div(t.v, x, y, MPFR_RNDN); mpfr_add_ui(t.v, t.v, 1, MPFR_RNDN); }
        mpfr_sqr(t.v, t.v, MPFR_RNDN);
        mpfr_ui_div(t.v, 1, t.v, MPFR_RNDN);
        mpfr_ui_sub(t.v, 1, t.v, MPFR_RNDN);
        mpfr_sqrt(b.v, t.v, MPFR_RNDN);
        break;
      case ctor::rapidity: mpfr_tanh(b.v, x, MPFR_RNDN); break;
      case ctor::proper_speed:
      case ctor::momentum: {  // beta = u / sqrt(1 + u^2)
        mp u(prec);
        if (c == ctor::proper_speed) mpfr_set(u.v, x, MPFR_RNDN);
        else mpfr_div(u.v, x, y, MPFR_RNDN);
        mpfr_sqr(t.v, u.v, MPFR_RNDN);
        mpfr_add_ui(t.v, t.v, 1, MPFR_RNDN);
        mpfr_sqrt(t.v, t.v, MPFR_RNDN);
        mpfr_div(b.v, u.v, t.v, MPFR_RNDN);
        break;
      }
    }
    // Views by their definitions.
    mpfr_set(val[v_beta].v, b.v, MPFR_RNDN);
    mpfr_ui_sub(val[v_deficit].v, 1, b.v, MPFR_RNDN);
    mpfr_sqr(t.v, b.v, MPFR_RNDN);
    mpfr_ui_sub(t.v, 1, t.v, MPFR_RNDN);
    mpfr_sqrt(val[v_inv_gamma].v, t.v, MPFR_RNDN);
    mpfr_ui_div(val[v_gamma].v, 1, val[v_inv_gamma].v, MPFR_RNDN);
    mpfr_sub_ui(val[v_gamma_m1].v, val[v_gamma].v, 1, MPFR_RNDN);
    mpfr_ui_sub(val[v_dilation].v, 1, val[v_inv_gamma].v, MPFR_RNDN);
    mpfr_atanh(val[v_rapidity].v, b.v, MPFR_RNDN);
    mpfr_mul(val[v_proper_speed].v, b.v, val[v_gamma].v, MPFR_RNDN);
    // Where a view is an exact function of the input, take it exactly: gamma and gamma - 1 of
    // the gamma constructors can be exact midpoints between two representable values (1 + x
    // with one bit beyond the precision), which the route through beta would tip either way.
    if (c == ctor::gamma) {
      mpfr_set(val[v_gamma].v, x, MPFR_RNDN);
      mpfr_sub_ui(val[v_gamma_m1].v, x, 1, MPFR_RNDN);
    } else if (c == ctor::gamma_m1) {
      mpfr_set(val[v_gamma_m1].v, x, MPFR_RNDN);
      mpfr_add_ui(val[v_gamma].v, x, 1, MPFR_RNDN);
    } else if (c == ctor::kinetic_energy) {  // K / m may be representable, 1 + K / m a tie
      mpfr_div(val[v_gamma_m1].v, x, y, MPFR_RNDN);
      mpfr_add_ui(val[v_gamma].v, val[v_gamma_m1].v, 1, MPFR_RNDN);
    }
  }
};

// ---- error measurement ---------------------------------------------------------------------

/// Error of `got` against the exact `ref`, for built-in T: fractional ulps of the correctly
/// rounded value, and the integer ulp distance to it.  `normal` tells whether the correctly
/// rounded value is a normal number (the precision contract covers only those).
struct ulp_error {
  double frac;
  std::int64_t dist;
  bool normal;
  bool exact;  // got equals the correctly rounded value
};

template <class T>
inline ulp_error measure(T got, const mpfr_t ref) {
  T cr = round_to<T>(ref);
  ulp_error e{0, 0, false, false};
  e.dist = eigenzeit::numeric::ulp_distance(got, cr);
  e.exact = (e.dist == 0);
  e.normal = std::isnormal(cr);
  if (std::isnan(got) || std::isinf(got) || std::isinf(cr)) {
    e.frac = (e.dist == 0) ? 0.0 : std::numeric_limits<double>::infinity();
    return e;
  }
  // ulp(cr): spacing above |cr| for normal numbers, denorm_min below.
  int ex = (cr == 0) ? std::numeric_limits<T>::min_exponent : std::ilogb(cr);
  if (ex < std::numeric_limits<T>::min_exponent - 1) ex = std::numeric_limits<T>::min_exponent - 1;
  mp diff(mpfr_get_prec(ref) + 128), g(128);
  set_exact(g.v, got);
  mpfr_sub(diff.v, g.v, ref, MPFR_RNDN);
  mpfr_abs(diff.v, diff.v, MPFR_RNDN);
  mpfr_mul_2si(diff.v, diff.v, -(ex - std::numeric_limits<T>::digits + 1), MPFR_RNDN);
  e.frac = mpfr_get_d(diff.v, MPFR_RNDN);
  return e;
}

/// Relative error in units of epsilon of T, for multiprecision T.
template <class T>
inline double measure_eps(const T& got, const mpfr_t ref) {
  mp g(mpfr_get_prec(ref) + 64), d(mpfr_get_prec(ref) + 64);
  set_exact(g.v, got);
  if (mpfr_zero_p(ref)) return mpfr_zero_p(g.v) ? 0.0 : std::numeric_limits<double>::infinity();
  mpfr_sub(d.v, g.v, ref, MPFR_RNDN);
  mpfr_div(d.v, d.v, ref, MPFR_RNDN);
  mpfr_abs(d.v, d.v, MPFR_RNDN);
  mp eps(64);
  set_exact(eps.v, T(std::numeric_limits<T>::epsilon()));
  mpfr_div(d.v, d.v, eps.v, MPFR_RNDN);
  return mpfr_get_d(d.v, MPFR_RNDN);
}

/// Running statistics of one (constructor, view) pair.
struct ulp_stats {
  long n = 0, n_exact = 0, n_subnormal = 0;
  double max_frac = 0, sum_frac = 0;
  std::int64_t max_dist = 0;
  long double worst_input = 0, worst_input2 = 0;

  void add(const ulp_error& e, long double input, long double input2 = 0) {
    if (!e.normal) {
      // Outside the contract (result subnormal or zero): counted, and still required to be
      // close, but kept out of the max/mean that the contract speaks about.
      ++n_subnormal;
      if (e.dist != 0 && e.dist > max_dist_subnormal) max_dist_subnormal = e.dist;
      return;
    }
    ++n;
    if (e.exact) ++n_exact;
    sum_frac += e.frac;
    if (e.frac > max_frac) max_frac = e.frac;
    if (e.dist > max_dist) {
      max_dist = e.dist;
      worst_input = input;
      worst_input2 = input2;
    }
  }
  std::int64_t max_dist_subnormal = 0;
  double mean() const { return n ? sum_frac / static_cast<double>(n) : 0.0; }
  double share_exact() const { return n ? static_cast<double>(n_exact) / static_cast<double>(n) : 1.0; }
};

/// Whether the suite runs its short form (sanitizer builds set EIGENZEIT_QUICK=1).
inline bool quick() {
  const char* q = std::getenv("EIGENZEIT_QUICK");
  return q && *q && *q != '0';
}

}  // namespace ez_test

#endif
