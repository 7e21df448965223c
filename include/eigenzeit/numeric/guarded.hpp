// eigenzeit: guarded evaluation -- a result with its error bound, re-evaluated one rung wider
// on the ladder while the bound exceeds the caller's tolerance.
// Distributed under the Boost Software License, Version 1.0 (see LICENSE).
//
// A guarded routine is written once, generically: given type_tag<W>, it computes its result
// in W together with a bound on the absolute error of that result (rigorous, or justified by
// an error analysis in a comment beside it), and returns both as bounded<W>.  guarded() runs
// it in T first; where the bound exceeds tolerance * |value| it runs it again on the next
// rung of the ladder (numeric/ladder.hpp), rounds back, and so on.  Sums with cancellation
// (invariant masses of many particles, compositions of many boosts, long trajectory sums)
// call it.
#ifndef EIGENZEIT_NUMERIC_GUARDED_HPP
#define EIGENZEIT_NUMERIC_GUARDED_HPP

#include <cmath>
#include <limits>
#include <type_traits>

#include <eigenzeit/numeric/eft.hpp>
#include <eigenzeit/numeric/ladder.hpp>
#include <eigenzeit/numeric/policy.hpp>

namespace eigenzeit {
namespace numeric {

/// A value with a bound on its absolute error: |value - exact| <= error.
template <class T>
struct bounded {
  T value;
  T error;
};

/// What guarded() returns.
template <class T>
struct guarded_result {
  T value;             ///< the result, rounded to T
  T error_bound;       ///< |value - exact| <= error_bound (absolute; includes the rounding to T)
  int rung;            ///< 0: evaluated in T; k: on the k-th wider type of the ladder
  bool tolerance_met;  ///< false: no rung reached the tolerance; error_bound says how close it got

  /// The bound relative to |value| (infinite for a zero value with a nonzero bound).
  T relative_error_bound() const {
    using std::abs;
    if (error_bound == 0) return T(0);
    return value == 0 ? std::numeric_limits<T>::infinity() : error_bound / abs(value);
  }
};

namespace detail {

/// Rounds an error bound of W up to T, with a relative margin of 2^-(digits(T) - 4).
template <class T, class W>
inline T round_bound_up(const W& err) {
  const T e = round_to<T>(err);
  return e + e * pow2_const<T, 4 - std::numeric_limits<T>::digits>() +
         std::numeric_limits<T>::denorm_min();
}

template <class T, class W, class F>
inline guarded_result<T> guard_from(const F& f, const T& tolerance, int rung) {
  using std::abs;
  const bounded<W> r = f(type_tag<W>());
  const T value = round_to<T>(r.value);
  // |value - exact| <= |value - r.value| + r.error; the first term is exact in W for the
  // built-in T (W holds T's values exactly), bounded by one ulp of T for the others.
  T error;
  if constexpr (std::is_same<T, W>::value) {
    error = r.error;
  } else {
    const W rounding = abs(W(value) - r.value);
    error = round_bound_up<T>(W(rounding + r.error));
  }
  using std::isfinite;
  const bool met = isfinite(value) && isfinite(error) && error <= tolerance * abs(value);
  if (met || !isfinite(value)) return {value, error, rung, met};
  if constexpr (has_next_rung_v<W>) {
    return guard_from<T, next_rung_t<W>>(f, tolerance, rung + 1);
  } else {
    return {value, error, rung, false};  // the top of the ladder (or a type without one)
  }
}

}  // namespace detail

/// Evaluates f (see the top of this file) in T and, while its error bound exceeds
/// relative_tolerance * |value|, on the wider rungs of the ladder, and returns the first
/// result that meets the tolerance.  If none does -- the top of the ladder is reached, or T
/// has no wider rung (a user type without a next_rung specialisation) -- the last result is
/// returned with tolerance_met = false and its bound; it is never passed off as meeting it.
///
/// Domain: relative_tolerance >= epsilon(T) / 2 (half an ulp: no result rounded to T can be
/// promised closer than that); below it, or NaN, a domain error through the policy, because
/// no rung could ever meet it and the climb would be useless.
template <class T, class F, class Policy = throw_policy>
inline guarded_result<T> guarded(const F& f, numeric::identity_t<T> relative_tolerance,
                                 const Policy& pol = Policy()) {
  if (!(relative_tolerance >= std::numeric_limits<T>::epsilon() / 2)) {
    const T nan = domain_error<T>(
        "eigenzeit::numeric::guarded<%1%>",
        "relative tolerance = %1%, but a result rounded to this type cannot be promised "
        "closer than half an ulp (epsilon / 2); ask for at least that",
        relative_tolerance, pol);
    return {nan, nan, 0, false};
  }
  return detail::guard_from<T, T>(f, relative_tolerance, 0);
}

}  // namespace numeric
}  // namespace eigenzeit

#endif
