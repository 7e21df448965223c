// Test support: every routine of speed.hpp addressed by name (a named constructor of speed<T>
// with one of its views, or a free function of beta), evaluated under any error policy; the
// MPFR reference for any input of float, double or long double, down to the smallest
// subnormal and up to the largest finite value; and the precision contract of each routine.
// Shared by tools/hunt_hard_cases.cpp (which searches for the worst inputs) and
// tests/test_hard_cases.cpp (which replays them).
#ifndef EIGENZEIT_TESTS_SUPPORT_ROUTINES_HPP
#define EIGENZEIT_TESTS_SUPPORT_ROUTINES_HPP

#include <mpfr.h>

#include <cmath>
#include <cstdlib>
#include <cstring>
#include <limits>
#include <string>

#include <eigenzeit/speed.hpp>

#include "reference.hpp"

namespace ez_test {

// ---- the free functions of beta ----------------------------------------------------------------

enum free_fn : int { f_lorentz_factor, f_lorentz_factor_m1, f_proper_speed, f_dilation_fraction,
                     f_rapidity, n_free_fns };

inline const char* free_fn_name(int f) {
  static const char* const names[n_free_fns] = {"lorentz_factor", "lorentz_factor_m1",
                                                "proper_speed", "dilation_fraction", "rapidity"};
  return names[f];
}

/// The view of speed<T> that a free function computes (its reference value).
inline int free_fn_view(int f) {
  static const int views[n_free_fns] = {v_gamma, v_gamma_m1, v_proper_speed, v_dilation, v_rapidity};
  return views[f];
}

/// Odd functions of beta keep its sign; the others are even.
inline bool free_fn_odd(int f) { return f == f_proper_speed || f == f_rapidity; }

template <class T, class Policy>
inline T free_value(int f, T beta, const Policy& pol) {
  switch (f) {
    case f_lorentz_factor: return eigenzeit::lorentz_factor(beta, pol);
    case f_lorentz_factor_m1: return eigenzeit::lorentz_factor_m1(beta, pol);
    case f_proper_speed: return eigenzeit::proper_speed(beta, pol);
    case f_dilation_fraction: return eigenzeit::dilation_fraction(beta, pol);
    default: return eigenzeit::rapidity(beta, pol);
  }
}

// ---- named constructors and views under any policy ---------------------------------------------

/// The speed built by constructor c from (x, y) (y: the mass of the energy constructors),
/// under policy pol; the return type is whatever the named constructors return for pol.
template <class T, class Policy>
inline auto construct_with(ctor c, T x, T y, const Policy& pol)
    -> decltype(eigenzeit::speed<T>::from_beta(x, pol)) {
  using S = eigenzeit::speed<T>;
  switch (c) {
    case ctor::beta: return S::from_beta(x, pol);
    case ctor::beta_deficit: return S::from_beta_deficit(x, pol);
    case ctor::gamma: return S::from_gamma(x, pol);
    case ctor::gamma_m1: return S::from_gamma_m1(x, pol);
    case ctor::rapidity: return S::from_rapidity(x, pol);
    case ctor::proper_speed: return S::from_proper_speed(x, pol);
    case ctor::kinetic_energy: return S::from_kinetic_energy(x, y, pol);
    case ctor::momentum: break;
  }
  return S::from_momentum(x, y, pol);
}

/// The eight views of any speed-like object, in the order of enum view.
template <class S, class T>
inline void read_views(const S& s, T out[n_views]) {
  out[v_beta] = s.beta();
  out[v_deficit] = s.beta_deficit();
  out[v_gamma] = s.gamma();
  out[v_gamma_m1] = s.gamma_m1();
  out[v_inv_gamma] = s.inv_gamma();
  out[v_dilation] = s.dilation_fraction();
  out[v_rapidity] = s.rapidity();
  out[v_proper_speed] = s.proper_speed();
}

inline const ctor all_ctor_tags[] = {ctor::beta,         ctor::beta_deficit,   ctor::gamma,
                                     ctor::gamma_m1,     ctor::rapidity,       ctor::proper_speed,
                                     ctor::kinetic_energy, ctor::momentum};
constexpr int n_ctor_tags = 8;

/// Constructor tag from its name ("from_beta", ...); false if there is none of that name.
inline bool ctor_from_name(const char* name, ctor& out) {
  for (ctor c : all_ctor_tags)
    if (std::strcmp(ctor_name(c), name) == 0) {
      out = c;
      return true;
    }
  return false;
}

inline int view_from_name(const char* name) {
  for (int v = 0; v < n_views; ++v)
    if (std::strcmp(view_name(v), name) == 0) return v;
  return -1;
}

inline int free_fn_from_name(const char* name) {
  for (int f = 0; f < n_free_fns; ++f)
    if (std::strcmp(free_fn_name(f), name) == 0) return f;
  return -1;
}

// ---- the precision contract (DESIGN.md) ----------------------------------------------------------

/// Largest allowed distance, in representable values, to the correctly rounded result, for
/// float, double and long double: 1 for the algebraic views and free functions, 2 for the
/// rapidity (view and free function) and every view of a speed built from a rapidity, where
/// one exp or log rounding enters.
inline int contract_ulps(bool is_free, ctor c, int view_or_fn) {
  if (is_free) return view_or_fn == f_rapidity ? 2 : 1;
  return (c == ctor::rapidity || view_or_fn == v_rapidity) ? 2 : 1;
}

// ---- the reference for the whole range of each type ----------------------------------------------

/// MPFR working precision for the input (x, y) of constructor c (y: the mass of the energy
/// constructors, otherwise unused).  Like precision_for in reference.hpp, but the binary
/// exponent comes from the input in its own type, so that long double inputs far outside
/// double's range (down to 2^-16445, up to 2^16384) get enough bits too, and there is no cap:
///   256 bits of margin + 2 x the digits of T
///   + 2 |e|, e the binary exponent of the input (or of x / y): the definition formulas lose
///     2|e| bits to cancellation (gamma - 1 ~ beta^2 / 2; 1 - beta ~ 1 / (2 gamma^2))
///   + 3 bits per unit of rapidity (1 - tanh(eta) ~ 2 exp(-2 eta) = 2^(-2.885 eta)).
template <class T>
inline mpfr_prec_t reference_precision(ctor c, T x, T y) {
  long e = 0;
  if (x != T(0) && std::isfinite(x)) {
    e = std::ilogb(x);
    if ((c == ctor::kinetic_energy || c == ctor::momentum) && y != T(0) && std::isfinite(y))
      e -= std::ilogb(y);
  }
  long p = 256 + 2L * std::numeric_limits<T>::digits + 2L * (std::labs(e) + 1);
  if (c == ctor::rapidity && std::isfinite(x))
    p += static_cast<long>(3 * std::fabs(static_cast<long double>(x))) + 8;
  return static_cast<mpfr_prec_t>(p);
}

/// All eight views of the speed that constructor c builds from the exact (x, y), into ref,
/// which must have been made with reference_precision(c, x, y) or more bits.
///
/// reference::compute derives every view from beta, so each is within 2^-prec (relative) of
/// the truth but not exact.  That decides every rounding except at an exact midpoint between
/// two values of T, and such midpoints do occur where a view is the input itself plus or
/// minus one: gamma - 1 = gamma - 1 for gamma >= 2^digits with an odd last bit, gamma =
/// 1 + (gamma - 1) for gamma - 1 = 2^-digits, and the same with kinetic energy / mass.  The
/// views that follow from the input by one exact operation are therefore set from the input
/// directly (every such operation is exact at this precision, which holds 2 |e| + 256 bits).
template <class T>
inline void compute_reference(reference& ref, ctor c, T x, T y) {
  mp mx(ref.prec), my(ref.prec);
  set_exact(mx.v, x);
  set_exact(my.v, y);
  ref.compute(c, mx.v, my.v);
  mpfr_ptr gamma = ref.val[v_gamma].v;
  mpfr_ptr gamma_m1 = ref.val[v_gamma_m1].v;
  switch (c) {
    case ctor::beta: mpfr_set(ref.val[v_beta].v, mx.v, MPFR_RNDN); break;
    case ctor::gamma:
      mpfr_set(gamma, mx.v, MPFR_RNDN);
      mpfr_sub_ui(gamma_m1, mx.v, 1, MPFR_RNDN);
      break;
    case ctor::gamma_m1:
      mpfr_set(gamma_m1, mx.v, MPFR_RNDN);
      mpfr_add_ui(gamma, mx.v, 1, MPFR_RNDN);
      break;
    case ctor::kinetic_energy:
      // K / m is a midpoint only if it is exact, and then it is exact at this precision.
      mpfr_div(gamma_m1, mx.v, my.v, MPFR_RNDN);
      mpfr_add_ui(gamma, gamma_m1, 1, MPFR_RNDN);
      break;
    case ctor::rapidity: mpfr_set(ref.val[v_rapidity].v, mx.v, MPFR_RNDN); break;
    case ctor::proper_speed: mpfr_set(ref.val[v_proper_speed].v, mx.v, MPFR_RNDN); break;
    case ctor::momentum: mpfr_div(ref.val[v_proper_speed].v, mx.v, my.v, MPFR_RNDN); break;
    case ctor::beta_deficit: break;  // beta = 1 - d and 1 - beta are exact already
  }
}

/// Whether the constructor's input lies in its documented domain: the views gamma and
/// proper speed of the exact speed round to finite values of T.  Inputs outside must be
/// refused; inputs inside must be accepted.
template <class T>
inline bool in_domain(const reference& ref) {
  return std::isfinite(round_to<T>(ref.val[v_gamma].v)) &&
         std::isfinite(round_to<T>(ref.val[v_proper_speed].v));
}

}  // namespace ez_test

#endif
