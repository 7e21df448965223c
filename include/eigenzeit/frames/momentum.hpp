// eigenzeit: momentum<T> -- an on-shell momentum, stored as mass and three-momentum.
// Distributed under the Boost Software License, Version 1.0 (see LICENSE).
//
// Units: mass as a rest energy m c^2 and momentum as p c, in one energy unit (MeV, GeV, J...).
// The object stores the mass and p and derives the energy, so a momentum whose mass and
// energy disagree cannot be made: it is on-shell by construction.  (A four_vector has no such
// guarantee; from_four_vector takes its invariant mass, see vectors.hpp.)
//
// Forms (u = unit roundoff):
//   energy()          sqrt(m^2 + |p|^2) from the exact sum of squares, scaled by a power of
//                     two: within 1 ulp, no overflow for any finite input;
//   kinetic_energy()  E - m = |p|^2 / (E + m), in double-word arithmetic: no cancellation for
//                     slow particles (E - m ~ p^2 / 2m), within 1 ulp;
//   speed()           speed<T> from the proper speed |p| / m held as a double-word number, so
//                     every view of it (1 - beta, gamma - 1...) is as accurate as from an
//                     exact proper speed.
#ifndef EIGENZEIT_FRAMES_MOMENTUM_HPP
#define EIGENZEIT_FRAMES_MOMENTUM_HPP

#include <algorithm>
#include <cmath>
#include <limits>

#include <eigenzeit/frames/lorentz_boost.hpp>
#include <eigenzeit/frames/vectors.hpp>
#include <eigenzeit/numeric/eft.hpp>
#include <eigenzeit/numeric/policy.hpp>
#include <eigenzeit/speed.hpp>

namespace eigenzeit {

template <class T>
class momentum {
 public:
  using value_type = T;

  /// Zero mass and momentum.
  momentum() : m_(T(0)), p_{T(0), T(0), T(0)} {}

  /// A particle of rest energy `mass` >= 0 (0 for a photon) and momentum p (p c).  A negative,
  /// infinite or NaN mass, or an infinite or NaN component of p, is a domain error through
  /// the policy naming the value; with a NaN policy every view of the result is NaN.
  template <class Policy = throw_policy>
  momentum(T mass, const vec3<T>& p, const Policy& pol = Policy()) : m_(mass), p_(p) {
    using std::isfinite;
    if (!(mass >= T(0)) || !isfinite(mass)) {
      invalidate(numeric::domain_error<T>("eigenzeit::momentum<%1%>::momentum(mass, p)",
                                          "mass = %1%, but it must be finite and >= 0", mass, pol));
    } else if (!detail::all_finite(p)) {
      using std::isnan;
      const T bad = isnan(p.x) ? p.x : isnan(p.y) ? p.y : isnan(p.z) ? p.z : detail::max_abs(p);
      invalidate(numeric::domain_error<T>("eigenzeit::momentum<%1%>::momentum(mass, p)",
                                          "momentum component = %1%, but every component must be finite",
                                          bad, pol));
    }
  }

  /// The momentum of a four-vector (E, p c): its mass is invariant_mass(v) (see
  /// vectors.hpp for the rule on inputs spacelike by rounding), its momentum v's
  /// spatial part.  energy() then returns sqrt(m^2 + p^2), which may differ from v.t by the
  /// rounding of v.  A negative energy v.t < 0 is a domain error through the policy.
  template <class Policy = throw_policy>
  static momentum from_four_vector(const four_vector<T>& v, const Policy& pol = Policy()) {
    if (!(v.t >= T(0))) {
      momentum r;
      r.invalidate(numeric::domain_error<T>(
          "eigenzeit::momentum<%1%>::from_four_vector(v)",
          "energy v.t = %1%, but a particle's energy must be >= 0 (and not NaN)", v.t, pol));
      return r;
    }
    const T mass = invariant_mass(v, pol);
    return momentum(mass, v.spatial(), pol);
  }

  // ---- views -------------------------------------------------------------------------------

  T mass() const { return m_; }
  const vec3<T>& p() const { return p_; }

  /// |p| (see norm in vectors.hpp).
  T p_norm() const { return norm(p_); }

  /// E = sqrt(m^2 + |p|^2), within 1 ulp, no overflow.
  T energy() const {
    using std::ldexp;
    int e = 0;
    const numeric::dd<T> w = energy_words(e);
    return e == 0 ? T(w.hi + w.lo) : T(ldexp(w.hi + w.lo, e));
  }

  /// E - m = |p|^2 / (E + m), within 1 ulp, no cancellation for slow particles.
  T kinetic_energy() const {
    using std::ilogb;
    using std::isfinite;
    using std::ldexp;
    const T pmax = detail::max_abs(p_);
    if (pmax == 0 || !isfinite(pmax) || !isfinite(m_)) return pmax == 0 ? T(0) * m_ : pmax + m_;
    int e = 0;
    const numeric::dd<T> w = energy_words(e);
    if (e == 0 && detail::in_square_range(pmax)) {
      const numeric::dd<T> p2 = detail::sum_of_squares_words(p_);
      const numeric::dd<T> k = numeric::dd_div(p2, numeric::dd_add(w, numeric::dd<T>{m_, T(0)}));
      return k.hi + k.lo;
    }
    // K = |p|^2 / (E + m) with |p| in units of 2^ep (its own exponent: |p|^2 may be far below
    // m^2, and K still normal) and E + m in units of 2^eb (the larger of m and |p_i|):
    // K = (|p|/2^ep)^2 / ((E + m)/2^eb) 2^(2 ep - eb).
    const int eb = e != 0 ? e : static_cast<int>(ilogb(std::max(m_, pmax)));
    const numeric::dd<T> wb = e != 0 ? w : numeric::dd_ldexp(w, -eb);
    int ep = 0;
    const vec3<T> ps = detail::scaled(p_, ep);
    const numeric::dd<T> p2 = detail::sum_of_squares_words(ps);
    const numeric::dd<T> den = numeric::dd_add(wb, numeric::dd<T>{T(ldexp(m_, -eb)), T(0)});
    const numeric::dd<T> k = numeric::dd_div(p2, den);
    return T(ldexp(k.hi + k.lo, 2 * ep - eb));
  }

  /// The speed (see the top).  A massless particle moves at c, which speed<T> does not hold:
  /// mass 0 is a domain error through the policy.
  template <class Policy = throw_policy>
  eigenzeit::speed<T> speed(const Policy& pol = Policy()) const {
    using std::ilogb;
    using std::ldexp;
    if (!(m_ > T(0))) {
      numeric::domain_error<T>("eigenzeit::momentum<%1%>::speed()",
                               "mass = %1%: a massless particle moves at c, which speed<T> does not "
                               "hold (it needs mass > 0)",
                               m_, pol);
      return eigenzeit::speed<T>::from_beta(std::numeric_limits<T>::quiet_NaN(), nan_policy());
    }
    if (detail::max_abs(p_) == 0) return eigenzeit::speed<T>();
    int e = 0;
    const numeric::dd<T> n = detail::norm_words(p_, e);
    // |p| / m = (n / m') 2^(e - em), m' = m 2^-em in [1, 2): the quotient cannot overflow
    // before the final scaling, which speed<T> checks.
    const int em = static_cast<int>(ilogb(m_));
    const numeric::dd<T> q = numeric::dd_div(n, numeric::dd<T>{T(ldexp(m_, -em)), T(0)});
    return eigenzeit::speed<T>::from_proper_speed_words(numeric::dd_ldexp(q, e - em), pol);
  }

  /// The velocity p / E (in units of c); zero for a zero momentum.
  vec3<T> velocity() const {
    const T en = energy();
    if (en == 0) return {T(0), T(0), T(0)};
    return p_ / en;
  }

  /// (E, p c).
  four_vector<T> to_four_vector() const { return make_four_vector(energy(), p_); }

  /// The same particle seen from the frame the boost leads to: the same mass, and the
  /// momentum from lorentz_boost::apply_on_shell, which never forms E - n.p by subtraction,
  /// so the result is as accurate as for an exactly on-shell input at every Lorentz factor.
  momentum boosted(const lorentz_boost<T>& b) const {
    momentum r;
    r.m_ = m_;
    r.p_ = b.apply_on_shell(m_, p_).spatial();
    return r;
  }

 private:
  T m_;
  vec3<T> p_;

  void invalidate(T nan) {
    m_ = nan;
    p_ = {nan, nan, nan};
  }

  // E 2^-e as a double-word number, e the exponent of the largest of m and |p_i|.
  numeric::dd<T> energy_words(int& e) const {
    using std::ilogb;
    using std::ldexp;
    using std::max;
    using std::isfinite;
    const T big = max(m_, detail::max_abs(p_));
    if (!(big > T(0)) || !isfinite(big)) {
      e = 0;
      return {big, T(0)};  // 0, or NaN for an invalid momentum
    }
    e = detail::in_square_range(big) ? 0 : static_cast<int>(ilogb(big));
    T ms;
    vec3<T> ps;
    scaled_parts(e, ms, ps);
    const numeric::dd<T> s = numeric::dd_add(detail::sum_of_squares_words(ps), numeric::two_prod(ms, ms));
    return numeric::dd_sqrt(s);
  }

  // m and p scaled by 2^-e (no library call when e = 0, the common case).
  void scaled_parts(int e, T& ms, vec3<T>& ps) const {
    using std::ldexp;
    if (e == 0) {
      ms = m_;
      ps = p_;
    } else {
      ms = T(ldexp(m_, -e));
      ps = {T(ldexp(p_.x, -e)), T(ldexp(p_.y, -e)), T(ldexp(p_.z, -e))};
    }
  }
};

}  // namespace eigenzeit

#endif
