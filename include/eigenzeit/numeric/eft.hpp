// eigenzeit: error-free transforms and double-word ("dd") arithmetic over any binary real type.
// Distributed under the Boost Software License, Version 1.0 (see LICENSE).
//
// A double-word number is an unevaluated sum hi + lo with |lo| <= ulp(hi) / 2.  It carries
// about twice the precision of T and is what the speed core uses to hold beta and gamma.
// References for the algorithms (published methods): T. J. Dekker, "A floating-point
// technique for extending the available precision", Numer. Math. 18 (1971); D. E. Knuth,
// TAOCP vol. 2, 4.2.2 (two_sum); J.-M. Muller et al., Handbook of Floating-Point Arithmetic,
// 2nd ed. (2018), chapters 4 and 14 (fma-based products, double-word operations).
#ifndef EIGENZEIT_NUMERIC_EFT_HPP
#define EIGENZEIT_NUMERIC_EFT_HPP

#include <cmath>
#include <limits>
#include <type_traits>

#include <eigenzeit/config.hpp>
#include <eigenzeit/numeric/traits.hpp>

namespace eigenzeit {
namespace numeric {

/// Blocks template deduction from an argument, so that mixed arguments such as (T, -x)
/// with expression-template types deduce T from the first one only.
template <class T>
struct identity {
  using type = T;
};
template <class T>
using identity_t = typename identity<T>::type;

template <class T>
struct dd {
  T hi;
  T lo;
};

/// s + e = a + b exactly, s = RN(a + b).  Valid for any a, b (Knuth).
template <class T>
EIGENZEIT_HOST_DEVICE inline dd<T> two_sum(T a, identity_t<T> b) {
  // One named T per operation: expression-template types (Boost.Multiprecision with
  // et_on) would otherwise regroup the expression and break exactness.
  T s = a + b;
  T bb = s - a;
  T sb = s - bb;
  T ea = a - sb;
  T eb = b - bb;
  T e = ea + eb;
  return {s, e};
}

/// s + e = a + b exactly, s = RN(a + b), provided |a| >= |b| or a == 0 (Dekker).
template <class T>
EIGENZEIT_HOST_DEVICE inline dd<T> fast_two_sum(T a, identity_t<T> b) {
  T s = a + b;
  T z = s - a;
  T e = b - z;
  return {s, e};
}

namespace detail {
/// Veltkamp splitting a = h + l with h holding the top ceil(digits/2) bits.
template <class T>
inline dd<T> split(T a) {
  const T factor = pow2_const<T, (digits_v<T> + 1) / 2>() + T(1);
  T c = factor * a;
  T ca = c - a;
  T h = c - ca;
  T l = a - h;
  return {h, l};
}
}  // namespace detail

/// a * b - c, exact whenever the exact result is representable, which is the case for every
/// residual this library forms (product errors, sqrt and division remainders).  Otherwise the
/// result is rounded: once for double (a true fma), possibly twice for the other types.
/// double: std::fma (one instruction where the target has it).  float: the product of two
/// floats is exact in double, and so is the subtraction for the residuals formed here.
/// long double and multiprecision types: Dekker's product (on x86-64 std::fma of long double
/// is a software routine, measured 450 ns per call against ~10 ns for Dekker's form).
template <class T>
EIGENZEIT_HOST_DEVICE inline T fms(T a, identity_t<T> b, identity_t<T> c) {
  if constexpr (std::is_same<T, double>::value) {
    return std::fma(a, b, -c);
  } else if constexpr (std::is_same<T, float>::value) {
    return static_cast<float>(static_cast<double>(a) * static_cast<double>(b) -
                              static_cast<double>(c));
  } else {
    // Dekker's split overflows for |a| or |b| above max / 2^(digits/2 + 1): scale the whole
    // expression by a power of two there (exact; c is of the order of a * b in every use).
    using std::abs;
    using std::ldexp;
    constexpr int sh = (digits_v<T> + 1) / 2 + 2;
    const T limit = std::numeric_limits<T>::max() / pow2_const<T, sh>();
    const T top = std::numeric_limits<T>::max();
    if (abs(a) > limit && abs(a) <= top) return T(ldexp(fms(T(ldexp(a, -sh)), b, T(ldexp(c, -sh))), sh));
    if (abs(b) > limit && abs(b) <= top) return T(ldexp(fms(T(ldexp(b, -sh)), a, T(ldexp(c, -sh))), sh));
    T p = a * b;
    dd<T> as = detail::split(a);
    dd<T> bs = detail::split(b);
    T hh = as.hi * bs.hi;
    T hl = as.hi * bs.lo;
    T lh = as.lo * bs.hi;
    T ll = as.lo * bs.lo;
    T e = hh - p;
    e = e + hl;
    e = e + lh;
    e = e + ll;
    T pc = p - c;
    return pc + e;
  }
}

/// p + e = a * b exactly (barring underflow), p = RN(a * b).
template <class T>
EIGENZEIT_HOST_DEVICE inline dd<T> two_prod(T a, identity_t<T> b) {
  T p = a * b;
  return {p, fms(a, b, p)};
}

// ---- double-word arithmetic; each result has relative error below ~4 eps^2 ----------------
// (Bailey-style "sloppy" forms: accurate because every use here adds terms of one sign.)

template <class T>
EIGENZEIT_HOST_DEVICE inline dd<T> dd_add(dd<T> a, dd<T> b) {
  dd<T> s = two_sum(a.hi, b.hi);
  return fast_two_sum(s.hi, s.lo + (a.lo + b.lo));
}

template <class T>
EIGENZEIT_HOST_DEVICE inline dd<T> dd_mul(dd<T> a, dd<T> b) {
  dd<T> p = two_prod(a.hi, b.hi);
  return fast_two_sum(p.hi, p.lo + (a.hi * b.lo + a.lo * b.hi));
}

template <class T>
EIGENZEIT_HOST_DEVICE inline dd<T> dd_div(dd<T> a, dd<T> b) {
  T q = a.hi / b.hi;
  // Remainder a - q*b: the first part is exact (division residual).
  T r = -fms(q, b.hi, a.hi) + (a.lo - q * b.lo);
  return fast_two_sum(q, r / b.hi);
}

template <class T>
EIGENZEIT_HOST_DEVICE inline dd<T> dd_sqrt(dd<T> a) {
  using std::isinf;
  using std::sqrt;
  if (!(a.hi > T(0)) || isinf(a.hi)) return {sqrt(a.hi), T(0)};
  T s = sqrt(a.hi);
  T r = -fms(s, s, a.hi) + a.lo;  // a - s^2; the fms part is exact (sqrt residual)
  return fast_two_sum(s, r / (s + s));
}

/// -a, exact.
template <class T>
EIGENZEIT_HOST_DEVICE inline dd<T> dd_neg(dd<T> a) {
  return {-a.hi, -a.lo};
}

/// a - b as dd_add(a, -b): where the two cancel, the error is O(u^2 (|a| + |b|)) absolute.
template <class T>
EIGENZEIT_HOST_DEVICE inline dd<T> dd_sub(dd<T> a, dd<T> b) {
  return dd_add(a, dd_neg(b));
}

/// Exact scaling by 2^e of both words.
template <class T>
inline dd<T> dd_ldexp(dd<T> a, int e) {
  using std::ldexp;
  return {ldexp(a.hi, e), ldexp(a.lo, e)};
}

}  // namespace numeric
}  // namespace eigenzeit

#endif
