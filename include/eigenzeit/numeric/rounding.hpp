// eigenzeit: the correctly rounded mode (Ziv's strategy over the widening ladder).
// Distributed under the Boost Software License, Version 1.0 (see LICENSE).
//
// A routine in this mode first computes its result in T as an unevaluated sum hi + lo with a
// bound on the error of that sum (its fast path).  If every value within the bound rounds to
// the same T, that value is the correctly rounded result.  Otherwise the routine is evaluated
// again on the next wider type of the ladder (numeric/ladder.hpp), whose result is trusted to
// a few of its own ulps, and so on up the ladder until the rounding is decided (Ziv, 1991).
// The result is then the same bit pattern on every machine that has IEEE 754 arithmetic.
#ifndef EIGENZEIT_NUMERIC_ROUNDING_HPP
#define EIGENZEIT_NUMERIC_ROUNDING_HPP

#include <cmath>
#include <limits>
#include <type_traits>

#include <eigenzeit/numeric/eft.hpp>
#include <eigenzeit/numeric/ladder.hpp>
#include <eigenzeit/numeric/policy.hpp>
#include <eigenzeit/numeric/traits.hpp>

namespace eigenzeit {
namespace numeric {

/// Policy that selects the correctly rounded mode.  Invalid input is still reported through
/// ErrorPolicy (a Boost.Math policy: throw_policy, nan_policy, errno_policy, ...).
template <class ErrorPolicy = throw_policy>
struct correctly_rounded_policy {
  using error_policy = ErrorPolicy;
};

template <class Policy>
struct is_correctly_rounded : std::false_type {};
template <class E>
struct is_correctly_rounded<correctly_rounded_policy<E>> : std::true_type {};
template <class Policy>
inline constexpr bool is_correctly_rounded_v = is_correctly_rounded<Policy>::value;

/// The error policy inside a policy argument (the argument itself when it is one).
template <class Policy>
inline typename Policy::error_policy error_policy_of(const Policy&, std::true_type) {
  return typename Policy::error_policy();
}
template <class Policy>
inline const Policy& error_policy_of(const Policy& pol, std::false_type) {
  return pol;
}
template <class Policy>
inline decltype(auto) error_policy_of(const Policy& pol) {
  return error_policy_of(pol, is_correctly_rounded<Policy>());
}

/// Ulps of W (of the routine's result) that a rung's evaluation is trusted to.  The built-in
/// types carry the library's contract: <= 1 ulp for the algebraic quantities and <= 2 ulp for
/// rapidity and what is built from it, measured max 1.4 (README); 3 leaves a margin.  The
/// Boost.Multiprecision types carry "a few epsilon" (measured <= 1.3 eps): 16 eps.
template <class W>
inline constexpr int rung_trust_ulps_v = std::is_floating_point<W>::value ? 3 : 16;

/// True when every value in [hi + lo - err, hi + lo + err] rounds to hi, given hi = RN(hi + lo)
/// (a normalised pair).  Two additions: RN(hi + (lo +- err)) == hi holds exactly when that
/// end of the interval lies within hi's rounding interval, ties included (a tie at either end
/// goes to hi for the end and for every exact value inside alike).  The result must be far
/// from the subnormal range, where err itself would round: callers pass |hi| above
/// rescale_threshold<T>() or take the ladder.
template <class T>
EIGENZEIT_HOST_DEVICE inline bool rounding_is_decided(T hi, T lo, T err) {
  return hi + (lo + err) == hi && hi + (lo - err) == hi;
}

/// Relative error bound c * u^2 of a fast path (u = 2^-digits), with c a power of two.
template <class T, int log2_c>
inline T relative_u2() {
  return pow2_const<T, log2_c - 2 * std::numeric_limits<T>::digits>();
}

/// The fast path's verdict: hi + lo approximates the exact result within err (absolute).
/// Returns true and sets `out` to the correctly rounded result when that decides it.
template <class T>
inline bool try_decide(dd<T> parts, T err, T& out) {
  using std::abs;
  const dd<T> n = fast_two_sum(parts.hi, parts.lo);  // |parts.lo| <= |parts.hi| by construction
  if (!(abs(n.hi) > rescale_threshold<T>())) return false;
  if (!rounding_is_decided(n.hi, n.lo, err)) return false;
  out = n.hi;
  return true;
}

namespace detail {

template <class T, class W, class Eval>
inline bool climb(const Eval& eval, T& out, int& rung) {
  if constexpr (std::is_void<W>::value) {
    (void)eval;
    (void)out;
    return false;
  } else {
    using std::isfinite;
    using std::ldexp;
    using std::ilogb;
    ++rung;
    const W w = eval(type_tag<W>());
    if (w == 0 || !isfinite(w)) {
      out = round_to<T>(w);  // zero is exact here (these routines vanish only at exact zero)
      return true;
    }
    const W step = ldexp(W(rung_trust_ulps_v<W>), ilogb(w) - std::numeric_limits<W>::digits + 1);
    const T below = round_to<T>(W(w - step));
    const T above = round_to<T>(W(w + step));
    if (below == above) {
      out = round_to<T>(w);
      return true;
    }
    if constexpr (!has_next_rung_v<W>) {
      // The top rung: if its value is exactly halfway between two values of T, take the
      // result to be that exact tie (rounded to even).  An exact result of this library
      // that is a tie (gamma = 1 + m with one bit beyond the precision, 1 - 1/gamma for
      // gamma = 2^(p+1)) is represented exactly on every rung and can be decided no other
      // way; an inexact one would have to agree with a midpoint to all of the top rung's
      // digits (over 1300 bits), far beyond how close these algebraic values of p-bit inputs
      // can come to one.
      using std::nextafter;
      if (nextafter(below, above) == above && w == (W(below) + W(above)) / 2) {
        out = round_to<T>(w);
        return true;
      }
    }
    return climb<T, next_rung_t<W>>(eval, out, rung);
  }
}

}  // namespace detail

/// Climbs the ladder above T until the rounding of eval's result is decided: eval(type_tag<W>)
/// returns the routine evaluated in W.  Returns the correctly rounded T; if even the top rung
/// cannot decide (not expected for any routine of this library: its results are never exact
/// midpoints), reports an evaluation error through the policy naming `function` and `input`.
template <class T, class Eval, class Policy>
inline T climb_ladder(const Eval& eval, const char* function, const T& input, const Policy& pol,
                      int* rungs_used = nullptr) {
  T out{};
  int rung = 0;
  const bool decided = detail::climb<T, next_rung_t<T>>(eval, out, rung);
  if (rungs_used) *rungs_used = rung;
  if (decided) return out;
  return evaluation_error<T>(
      function,
      "the correctly rounded result for the input %1% could not be decided on the widest type "
      "of the widening ladder",
      input, pol);
}

}  // namespace numeric

using numeric::correctly_rounded_policy;

/// Pass as the policy argument to select the correctly rounded mode:
/// lorentz_factor(beta, eigenzeit::correctly_rounded), speed<double>::from_beta(b, eigenzeit::correctly_rounded).
inline constexpr correctly_rounded_policy<> correctly_rounded{};

}  // namespace eigenzeit

#endif
