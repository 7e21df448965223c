// Test support: MPFR reference for the frames layer -- the exact 4x4 boost matrix applied to an
// exact input, exact Minkowski norms, rotations, and ulp measures relative to a scale.
//
// Numbers are Boost.Multiprecision mpfr_float (variable precision) at ez_test::frames_bits
// (256 bits by default, more where a test asks): the inputs of the tests are binary64, binary32
// or x87 values, exact in MPFR, and the boost's defining quantities (the unit vector d / |d|,
// beta, gamma = 1 / sqrt(1 - beta^2)) are formed from the test's exact inputs in that
// precision.  256 bits leave > 180 bits after the worst cancellation the tests provoke
// (gamma^2 ~ 1e22 ~ 2^73).
#ifndef EIGENZEIT_TESTS_SUPPORT_FRAMES_REFERENCE_HPP
#define EIGENZEIT_TESTS_SUPPORT_FRAMES_REFERENCE_HPP

#include <cmath>
#include <cstdio>
#include <limits>
#include <string>
#include <type_traits>

#include <boost/multiprecision/mpfr.hpp>

#include <eigenzeit/frames/momentum.hpp>
#include <eigenzeit/frames/vectors.hpp>

#include "support/reference.hpp"

namespace ez_test {

using mpf = boost::multiprecision::mpfr_float;

/// Sets the working precision of every mpf created afterwards (in bits).
inline void set_frames_bits(unsigned bits) {
  mpf::default_precision(static_cast<unsigned>(std::ceil(bits * 0.30103)) + 1);
}

struct mp_vec3 {
  mpf x, y, z;
};

struct mp_four {
  mpf t, x, y, z;
};

template <class T>
inline mp_vec3 to_mp(const eigenzeit::vec3<T>& v) {
  return {mpf(v.x), mpf(v.y), mpf(v.z)};
}

template <class T>
inline mp_four to_mp(const eigenzeit::four_vector<T>& v) {
  return {mpf(v.t), mpf(v.x), mpf(v.y), mpf(v.z)};
}

inline mpf dot(const mp_vec3& a, const mp_vec3& b) { return a.x * b.x + a.y * b.y + a.z * b.z; }

inline mp_vec3 cross(const mp_vec3& a, const mp_vec3& b) {
  return {a.y * b.z - a.z * b.y, a.z * b.x - a.x * b.z, a.x * b.y - a.y * b.x};
}

inline mp_vec3 unit(const mp_vec3& a) {
  const mpf n = sqrt(dot(a, a));
  return {a.x / n, a.y / n, a.z / n};
}

/// The exact passive boost (lorentz_boost.hpp's convention) with unit direction n and speed
/// beta: t' = gamma (t - beta a), a' = gamma (a - beta t), x_perp unchanged, a = n . x.
struct mp_boost {
  mp_vec3 n;
  mpf beta, gamma;

  mp_boost(const mp_vec3& direction, const mpf& b) : n(unit(direction)), beta(b) {
    gamma = 1 / sqrt((1 - beta) * (1 + beta));
  }

  mp_four apply(const mp_four& v) const {
    const mpf a = n.x * v.x + n.y * v.y + n.z * v.z;
    const mpf t2 = gamma * (v.t - beta * a);
    const mpf a2 = gamma * (a - beta * v.t);
    const mpf k = a2 - a;
    return {t2, v.x + k * n.x, v.y + k * n.y, v.z + k * n.z};
  }

  mp_boost inverse() const {
    mp_boost r = *this;
    r.n = {-n.x, -n.y, -n.z};
    return r;
  }
};

/// The exact rotation by angle about a unit axis (right-handed, acting on components).
inline mp_four rotate(const mp_vec3& axis, const mpf& angle, const mp_four& v) {
  const mp_vec3 k = unit(axis);
  const mp_vec3 r{v.x, v.y, v.z};
  const mp_vec3 kv = cross(k, r);
  const mpf c = cos(angle), s = sin(angle), along = dot(k, r);
  return {v.t, r.x * c + kv.x * s + k.x * along * (1 - c), r.y * c + kv.y * s + k.y * along * (1 - c),
          r.z * c + kv.z * s + k.z * along * (1 - c)};
}

/// t^2 - |r|^2, exact at the working precision.
inline mpf minkowski_square(const mp_four& v) {
  return v.t * v.t - (v.x * v.x + v.y * v.y + v.z * v.z);
}

/// The largest |component| of an exact four-vector.
inline mpf max_abs(const mp_four& v) {
  mpf m = abs(v.t);
  for (const mpf* c : {&v.x, &v.y, &v.z})
    if (abs(*c) > m) m = abs(*c);
  return m;
}

/// |got - ref| in units of ulp(scale) of T: ulp(s) = 2^(exponent(s) - digits) for normal s.
/// A measure "relative to the largest component" passes that component as scale.
template <class T>
inline double ulps_of_scale(const T& got, const mpf& ref, const mpf& scale) {
  if (scale == 0) return got == 0 ? 0.0 : std::numeric_limits<double>::infinity();
  int e = 0;
  frexp(scale, &e);  // scale = f 2^e, f in [1/2, 1)
  const mpf ulp = ldexp(mpf(1), e - 1 - std::numeric_limits<T>::digits + 1);
  return static_cast<double>(abs(mpf(got) - ref) / ulp);
}

/// |got - ref| in ulps of ref itself (ulp of the correctly rounded value's binade).
template <class T>
inline double ulps_of(const T& got, const mpf& ref) {
  return ulps_of_scale<T>(got, ref, ref);
}


/// Sets the MPFR working precision for its lifetime.
struct precision_scope {
  unsigned saved;
  explicit precision_scope(unsigned bits) : saved(mpf::default_precision()) { set_frames_bits(bits); }
  ~precision_scope() { mpf::default_precision(saved); }
  precision_scope(const precision_scope&) = delete;
  precision_scope& operator=(const precision_scope&) = delete;
};

/// Correct rounding of an exact value to T (built-in types through MPFR's own getters).
template <class T>
inline T round_to(const mpf& x) {
  if constexpr (std::is_floating_point<T>::value) return round_to<T>(x.backend().data());
  else return x.template convert_to<T>();
}

// ---- printing and bookkeeping for the frames tests ------------------------------------------

/// A number as a hex float ("%a"; "%La" for long double): the exact input of a failing case.
template <class T>
inline std::string hex(const T& x) {
  char buf[96];
  if constexpr (std::is_same<T, long double>::value) std::snprintf(buf, sizeof buf, "%La", x);
  else std::snprintf(buf, sizeof buf, "%a", static_cast<double>(x));
  return buf;
}
// (Built by appending: g++ 12 reports a false -Wrestrict inside chains of string operator+.)
template <class T>
inline std::string hex(const eigenzeit::vec3<T>& v) {
  std::string s("{");
  s.append(hex(v.x)).append(", ").append(hex(v.y)).append(", ").append(hex(v.z)).append("}");
  return s;
}
template <class T>
inline std::string hex(const eigenzeit::four_vector<T>& v) {
  std::string s("{");
  s.append(hex(v.t)).append(", ").append(hex(v.x)).append(", ").append(hex(v.y)).append(", ");
  s.append(hex(v.z)).append("}");
  return s;
}
template <class T>
inline std::string hex(const eigenzeit::momentum<T>& q) {
  std::string s("mass ");
  s.append(hex(q.mass())).append(" p ").append(hex(q.p()));
  return s;
}

/// Max and mean of an error measure, and the input of the maximum.  add(e, where) records
/// where() (hex floats) for a new maximum; add(e) says whether e is one.  NaN counts as inf.
struct stats {
  long n = 0;
  double max = 0, sum = 0;
  std::string worst;
  bool add(double e) {
    if (std::isnan(e)) e = std::numeric_limits<double>::infinity();
    ++n;
    sum += e;
    if (n == 1 || e > max) {
      max = e;
      return true;
    }
    return false;
  }
  template <class F>
  void add(double e, F&& where) {
    if (add(e)) worst = where();
  }
  double mean() const { return n ? sum / static_cast<double>(n) : 0.0; }
};

}  // namespace ez_test

#endif
