// eigenzeit: the linear relations between the time scales TT, TCG, TCB and TDB.
// Distributed under the Boost Software License, Version 1.0 (see LICENSE).
//
// Source: IERS Conventions (2010), IERS Technical Note 36, chapter 10, section 10.1 (the
// defining relations of IAU 2000 Resolution B1.9 and IAU 2006 Resolution B3):
//
//   TT  = TCG - L_G (JD_TCG - T0) 86400 s
//   TCG - TT = L_G / (1 - L_G) (JD_TT - T0) 86400 s                (the same, solved for TCG)
//   TDB = TCB - L_B (JD_TCB - T0) 86400 s + TDB0
//   TCB - TDB = (L_B (JD_TDB - T0) 86400 s - TDB0) / (1 - L_B)    (the same, solved for TCB)
//
// with L_G = 6.969290134e-10, L_B = 1.550519768e-8, TDB0 = -6.55e-5 s and T0 = 2443144.5003725
// (1977 January 1, 00:00:32.184 TT), all from <eigenzeit/constants.hpp>.  Dates are Julian dates
// held as two_part_time<T>, each in the scale its function names.
//
// What TCB <-> TDB here is NOT: it is only the linear defining relation above.  TDB - TT, made
// of periodic terms from the Earth's orbit (the largest about 1.7 ms, annual; amplitude from
// memory) that come from a time ephemeris or a series, is NOT included, so nothing here
// connects TDB or TCB with TT.  Only TT <-> TCG and TCB <-> TDB are provided.
//
// Not certified for safety-of-life use: navigation and timing software must follow the
// governing interface specifications and its own validation.
//
// Error analysis.  Each relation is t' = t + delta with delta = k y (+ TDB0), y = (JD - T0) 86400
// the seconds since T0 in the argument's scale, and k = L_G/(1 - L_G), -L_G, -L_B or
// L_B/(1 - L_B).  y comes from seconds_between (relative error <= u + O(u^2)), k carries at most
// three roundings (its constants' and 1 - L, /), the product one more: |delta| is right to
// about 6u relative.  Over +-200 years around J2000 |y| <= 7.1e9 s, so |delta| <= 4.9 s (TT/TCG)
// and <= 110 s (TCB/TDB): in double the error is below 4e-15 s and 1e-13 s, and adding delta to
// t costs below 1e-21 s (two_part_time.hpp).  The rounding of the decimal T0 to T moves delta
// by L |T0 - T0_T| 86400 < 1e-22 s in double.  Round trips agree to the same order.
#ifndef EIGENZEIT_TIMING_TIME_SCALES_HPP
#define EIGENZEIT_TIMING_TIME_SCALES_HPP

#include <eigenzeit/config.hpp>
#include <eigenzeit/constants.hpp>
#include <eigenzeit/numeric/eft.hpp>
#include <eigenzeit/numeric/policy.hpp>
#include <eigenzeit/timing/two_part_time.hpp>

namespace eigenzeit {

/// T0 = JD 2443144.5003725 (1977 January 1, 00:00:32.184 TT), where TT, TCG and TCB agree
/// [IERS Conventions (2010), ch. 10]; the fraction 0.0003725 is rounded once to T.
template <class T>
inline two_part_time<T> time_scale_epoch() {
  return two_part_time<T>::from_days(constants::T0_day<T>(), constants::T0_fraction<T>());
}

namespace detail {

/// Seconds since T0, y = (JD - T0) 86400, for a checked date.
template <class T>
inline T seconds_since_epoch(const two_part_time<T>& t) {
  return seconds_between(time_scale_epoch<T>(), t);
}

}  // namespace detail

/// TCG - TT in seconds at the TT date `tt` (Julian date in TT):
/// L_G / (1 - L_G) (JD_TT - T0) 86400 s.  Zero at T0, about +22 ms per year after it.
/// Domain: finite words within 2^(digits-2) days.  Accuracy: ~6 u relative (file comment).
template <class T, class Policy = throw_policy>
inline T tcg_minus_tt(const two_part_time<T>& tt, const Policy& pol = Policy()) {
  T nan = T(0);
  if (!detail::check_time("eigenzeit::tcg_minus_tt<%1%>", tt, nan, pol)) return nan;
  const T lg = constants::L_G<T>();
  const T k = lg / (T(1) - lg);
  return k * detail::seconds_since_epoch(tt);
}

/// TDB - TCB in seconds at the TCB date `tcb` (Julian date in TCB):
/// -L_B (JD_TCB - T0) 86400 s + TDB0.  The linear defining relation only (file comment).
/// Domain: finite words within 2^(digits-2) days.  Accuracy: ~6 u relative plus u |TDB0|.
template <class T, class Policy = throw_policy>
inline T tdb_minus_tcb(const two_part_time<T>& tcb, const Policy& pol = Policy()) {
  T nan = T(0);
  if (!detail::check_time("eigenzeit::tdb_minus_tcb<%1%>", tcb, nan, pol)) return nan;
  const T lb = constants::L_B<T>();
  const T y = detail::seconds_since_epoch(tcb);
  const T drift = lb * y;
  return constants::TDB0<T>() - drift;
}

/// TCG from TT: TCG = TT + L_G / (1 - L_G) (JD_TT - T0) 86400 s [IERS Conventions (2010) 10.1].
/// Argument and result are Julian dates in their scales.
/// Accuracy (against MPFR, double, +-200 years around J2000): max 1.1e-15 s; the round trip
/// through tt_from_tcg within 9e-16 s.  TCB <-> TDB: max 2.8e-14 s, round trips likewise.
/// Long double: 6e-19 s and 1.5e-17 s (tests/test_timing_time_scales.cpp).
template <class T, class Policy = throw_policy>
inline two_part_time<T> tcg_from_tt(const two_part_time<T>& tt, const Policy& pol = Policy()) {
  const char* fn = "eigenzeit::tcg_from_tt<%1%>";
  T nan = T(0);
  if (!detail::check_time(fn, tt, nan, pol)) return detail::invalid_time(nan);
  const T lg = constants::L_G<T>();
  const T k = lg / (T(1) - lg);
  const T delta = k * detail::seconds_since_epoch(tt);
  return detail::shifted_by_seconds(fn, tt, delta, pol);
}

/// TT from TCG: TT = TCG - L_G (JD_TCG - T0) 86400 s [IERS Conventions (2010) 10.1].
template <class T, class Policy = throw_policy>
inline two_part_time<T> tt_from_tcg(const two_part_time<T>& tcg, const Policy& pol = Policy()) {
  const char* fn = "eigenzeit::tt_from_tcg<%1%>";
  T nan = T(0);
  if (!detail::check_time(fn, tcg, nan, pol)) return detail::invalid_time(nan);
  const T lg = constants::L_G<T>();
  const T delta = -(lg * detail::seconds_since_epoch(tcg));
  return detail::shifted_by_seconds(fn, tcg, delta, pol);
}

/// TDB from TCB: TDB = TCB - L_B (JD_TCB - T0) 86400 s + TDB0 [IERS Conventions (2010) 10.1].
/// The linear defining relation only: no TDB - TT periodic terms (file comment).
template <class T, class Policy = throw_policy>
inline two_part_time<T> tdb_from_tcb(const two_part_time<T>& tcb, const Policy& pol = Policy()) {
  const char* fn = "eigenzeit::tdb_from_tcb<%1%>";
  T nan = T(0);
  if (!detail::check_time(fn, tcb, nan, pol)) return detail::invalid_time(nan);
  const T lb = constants::L_B<T>();
  const T drift = lb * detail::seconds_since_epoch(tcb);
  const T delta = constants::TDB0<T>() - drift;
  return detail::shifted_by_seconds(fn, tcb, delta, pol);
}

/// TCB from TDB: TCB = TDB + (L_B (JD_TDB - T0) 86400 s - TDB0) / (1 - L_B), the relation
/// above solved for TCB.  The linear defining relation only (file comment).
template <class T, class Policy = throw_policy>
inline two_part_time<T> tcb_from_tdb(const two_part_time<T>& tdb, const Policy& pol = Policy()) {
  const char* fn = "eigenzeit::tcb_from_tdb<%1%>";
  T nan = T(0);
  if (!detail::check_time(fn, tdb, nan, pol)) return detail::invalid_time(nan);
  const T lb = constants::L_B<T>();
  const T drift = lb * detail::seconds_since_epoch(tdb);
  const T numerator = drift - constants::TDB0<T>();
  const T delta = numerator / (T(1) - lb);
  return detail::shifted_by_seconds(fn, tdb, delta, pol);
}

}  // namespace eigenzeit

#endif
