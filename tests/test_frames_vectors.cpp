// Tests of include/eigenzeit/frames/vectors.hpp: the aggregate arithmetic on exact cases, and
// norm, cross, opening_angle, unit and invariant_mass against MPFR (Boost.Multiprecision
// mpfr_float at 256 bits, tests/support/frames_reference.hpp) on the exact inputs, each sweep
// printed beside the textbook formula evaluated in the same type.
#include <doctest/doctest.h>

#include <algorithm>
#include <cerrno>
#include <cmath>
#include <cstdio>
#include <limits>
#include <random>
#include <stdexcept>
#include <string>
#include <type_traits>

#include <eigenzeit/frames/vectors.hpp>

#include "support/frames_reference.hpp"
#include "support/naive.hpp"
#include "support/policy_checks.hpp"
#include "support/reference.hpp"
#include "support/sampler.hpp"

using eigenzeit::four_vector;
using eigenzeit::vec3;
using ez_test::hex;
using ez_test::mpf;
using ez_test::round_to;
using ez_test::stats;
using ez_test::type_name;

namespace {

long sample_count(long full) { return ez_test::quick() ? std::max(200L, full / 20) : full; }

/// Every test case works at 256 bits (frames_reference.hpp): exact products of any two inputs
/// of the tested types, and > 100 bits left after the worst cancellation provoked here.
void reference_precision() { ez_test::set_frames_bits(256); }

constexpr double inf = std::numeric_limits<double>::infinity();

// ---- printing -------------------------------------------------------------------------------


// ---- reference helpers ----------------------------------------------------------------------

/// Fractional ulps of `got` against the exact `ref` (ulps of the correctly rounded value; the
/// ulp of a subnormal is denorm_min), for built-in T.
template <class T>
double ulps(T got, const mpf& ref) {
  return ez_test::measure<T>(got, ref.backend().data()).frac;
}


/// |got - ref| / (|ref| eps of T): relative error in units of epsilon (multiprecision T).
template <class T>
double rel_eps(const T& got, const mpf& ref) {
  if (ref == 0) return got == 0 ? 0.0 : inf;
  const mpf e = abs(mpf(got) - ref) / (abs(ref) * mpf(std::numeric_limits<T>::epsilon()));
  return e.template convert_to<double>();
}

mpf mp_norm(const ez_test::mp_vec3& v) { return sqrt(ez_test::dot(v, v)); }

template <class T>
long double lowest_magnitude() {
  return static_cast<long double>(std::numeric_limits<T>::denorm_min());
}
template <class T>
long double largest_magnitude() {  // |v| stays finite for three components of this size
  return static_cast<long double>(std::numeric_limits<T>::max()) / 8;
}

template <class T>
T with_random_sign(std::mt19937_64& rng, long double m) {
  return (rng() & 1) ? T(-m) : T(m);
}

}  // namespace

// =============================================================================================
// Aggregate arithmetic on exact small-integer cases (every result exact in binary floating
// point; common practice, no source)
// =============================================================================================

TEST_CASE_TEMPLATE("vec3 and four_vector arithmetic is the component-wise one", T, float, double,
                   long double) {
  const vec3<T> a{T(1), T(2), T(3)}, b{T(4), T(-5), T(6)};
  CHECK(a + b == vec3<T>{T(5), T(-3), T(9)});
  CHECK(a - b == vec3<T>{T(-3), T(7), T(-3)});
  CHECK(-a == vec3<T>{T(-1), T(-2), T(-3)});
  CHECK(a * T(2) == vec3<T>{T(2), T(4), T(6)});
  CHECK(T(2) * a == vec3<T>{T(2), T(4), T(6)});
  CHECK(a * 3 == vec3<T>{T(3), T(6), T(9)});  // an integer scalar converts to T
  CHECK(a / T(2) == vec3<T>{T(0.5), T(1), T(1.5)});
  CHECK(a != b);
  CHECK_FALSE(a != a);
  CHECK_FALSE(a == vec3<T>{T(1), T(2), T(4)});
  CHECK_FALSE(a == vec3<T>{T(1), T(5), T(3)});
  CHECK_FALSE(a == vec3<T>{T(0), T(2), T(3)});
  vec3<T> c = a;
  c += b;
  CHECK(c == vec3<T>{T(5), T(-3), T(9)});
  c -= a;
  CHECK(c == b);
  c *= T(-2);
  CHECK(c == vec3<T>{T(-8), T(10), T(-12)});
  c /= T(4);
  CHECK(c == vec3<T>{T(-2), T(2.5), T(-3)});
  CHECK(eigenzeit::dot(a, b) == T(12));  // 4 - 10 + 18
  CHECK(eigenzeit::norm_squared(a) == T(14));

  const four_vector<T> p{T(5), T(1), T(-2), T(3)}, q{T(2), T(0.5), T(4), T(-1)};
  CHECK(p + q == four_vector<T>{T(7), T(1.5), T(2), T(2)});
  CHECK(p - q == four_vector<T>{T(3), T(0.5), T(-6), T(4)});
  CHECK(-p == four_vector<T>{T(-5), T(-1), T(2), T(-3)});
  CHECK(p * T(2) == four_vector<T>{T(10), T(2), T(-4), T(6)});
  CHECK(T(2) * p == four_vector<T>{T(10), T(2), T(-4), T(6)});
  CHECK(p / T(4) == four_vector<T>{T(1.25), T(0.25), T(-0.5), T(0.75)});
  CHECK(p != q);
  CHECK_FALSE(p == four_vector<T>{T(5), T(1), T(-2), T(4)});
  CHECK_FALSE(p == four_vector<T>{T(6), T(1), T(-2), T(3)});
  four_vector<T> r = p;
  r += q;
  r -= p;
  CHECK(r == q);
  r *= T(4);
  CHECK(r == four_vector<T>{T(8), T(2), T(16), T(-4)});
  r /= T(8);
  CHECK(r == four_vector<T>{T(1), T(0.25), T(2), T(-0.5)});
  CHECK(p.spatial() == vec3<T>{T(1), T(-2), T(3)});
  CHECK(eigenzeit::make_four_vector(T(5), vec3<T>{T(1), T(-2), T(3)}) == p);
  // Signature (+, -, -, -) as the header states: 10 - (0.5 - 8 - 3) = 20.5.
  CHECK(eigenzeit::minkowski_dot(p, q) == T(20.5));
  CHECK(eigenzeit::minkowski_dot(p, p) == T(25 - 14));
  CHECK(eigenzeit::spatial_norm(four_vector<T>{T(9), T(2), T(3), T(6)}) == T(7));  // 4 + 9 + 36

  // Right-handed cross product: x cross y = z (common practice, no source).
  const vec3<T> ex{T(1), T(0), T(0)}, ey{T(0), T(1), T(0)}, ez{T(0), T(0), T(1)};
  CHECK(eigenzeit::cross(ex, ey) == ez);
  CHECK(eigenzeit::cross(ey, ez) == ex);
  CHECK(eigenzeit::cross(ez, ex) == ey);
  CHECK(eigenzeit::cross(ey, ex) == -ez);
  CHECK(eigenzeit::cross(vec3<T>{T(1), T(2), T(3)}, vec3<T>{T(4), T(5), T(6)}) ==
        vec3<T>{T(-3), T(6), T(-3)});
  CHECK(eigenzeit::cross(a, a) == vec3<T>{T(0), T(0), T(0)});
  // Pythagorean quadruples and triples (common practice, no source): exact norms.
  CHECK(eigenzeit::norm(vec3<T>{T(2), T(3), T(6)}) == T(7));
  CHECK(eigenzeit::norm(vec3<T>{T(-1), T(4), T(-8)}) == T(9));
  CHECK(eigenzeit::norm(vec3<T>{T(0), T(-3), T(4)}) == T(5));
  CHECK(eigenzeit::unit(vec3<T>{T(0), T(0), T(-7)}) == vec3<T>{T(0), T(0), T(-1)});
  CHECK(eigenzeit::unit(vec3<T>{T(0), T(0.375), T(0)}) == vec3<T>{T(0), T(1), T(0)});
  // Right angle, and parallel / antiparallel vectors (pi rounded to T).
  const T pi = T(3.14159265358979323846264338327950288L);
  CHECK(eigenzeit::opening_angle(ex, ey) == pi / 2);
  CHECK(eigenzeit::opening_angle(a, a * T(3)) == T(0));
  CHECK(eigenzeit::opening_angle(a, -a) == pi);
  CHECK(eigenzeit::opening_angle(a, vec3<T>{T(0), T(0), T(0)}) == T(0));
  // Invariant masses of Pythagorean cases: 25 - 4 - 4 - 1 = 16, 100 - 36 = 64, 169 - 144 = 25.
  CHECK(eigenzeit::invariant_mass(four_vector<T>{T(5), T(2), T(2), T(1)}) == T(4));
  CHECK(eigenzeit::invariant_mass(four_vector<T>{T(10), T(0), T(-6), T(0)}) == T(8));
  CHECK(eigenzeit::invariant_mass(four_vector<T>{T(13), T(0), T(0), T(12)}) == T(5));
  CHECK(eigenzeit::invariant_mass(four_vector<T>{T(-5), T(2), T(2), T(1)}) == T(4));  // past-pointing
  CHECK(eigenzeit::invariant_mass(four_vector<T>{T(9), T(4), T(4), T(7)}) == T(0));   // null: 81 = 16+16+49
  CHECK(eigenzeit::invariant_mass(four_vector<T>{T(0), T(0), T(0), T(0)}) == T(0));
}

// =============================================================================================
// norm
// =============================================================================================

namespace {

enum class spread { independent, one_dominates, all_equal, near_equal, huge, subnormal };
const char* spread_name(spread s) {
  switch (s) {
    case spread::independent: return "independent, whole range";
    case spread::one_dominates: return "one dominates";
    case spread::all_equal: return "all equal magnitude";
    case spread::near_equal: return "within 4x of each other";
    case spread::huge: return "huge (max/8 .. max/1e8)";
    case spread::subnormal: return "subnormal components";
  }
  return "?";
}
const spread all_spreads[] = {spread::independent, spread::all_equal, spread::near_equal,
                              spread::one_dominates, spread::huge, spread::subnormal};

/// A vector with components over the whole exponent range of T, spread as asked, random signs.
template <class T>
vec3<T> draw_vector(ez_test::sampler<T>& gen, spread s) {
  const long double lo = lowest_magnitude<T>(), hi = largest_magnitude<T>();
  const long double eps = std::numeric_limits<T>::epsilon();
  std::mt19937_64& rng = gen.rng;
  switch (s) {
    case spread::independent:
      return {with_random_sign<T>(rng, gen.log_uniform(lo, hi)), with_random_sign<T>(rng, gen.log_uniform(lo, hi)),
              with_random_sign<T>(rng, gen.log_uniform(lo, hi))};
    case spread::one_dominates: {
      const long double big = gen.log_uniform(lo / (eps * eps), hi);
      vec3<T> v{with_random_sign<T>(rng, big), with_random_sign<T>(rng, big * gen.log_uniform(eps * eps, 1e-2L)),
                with_random_sign<T>(rng, big * gen.log_uniform(eps * eps, 1e-2L))};
      switch (rng() % 3) {  // the dominating component in any position
        case 0: return v;
        case 1: return {v.y, v.x, v.z};
        default: return {v.y, v.z, v.x};
      }
    }
    case spread::all_equal: {
      const long double m = gen.log_uniform(lo, hi);
      return {with_random_sign<T>(rng, m), with_random_sign<T>(rng, m), with_random_sign<T>(rng, m)};
    }
    case spread::near_equal: {
      const long double m = gen.log_uniform(lo * 4, hi / 2);
      return {with_random_sign<T>(rng, m * gen.uniform(0.5L, 2)),
              with_random_sign<T>(rng, m * gen.uniform(0.5L, 2)),
              with_random_sign<T>(rng, m * gen.uniform(0.5L, 2))};
    }
    case spread::huge:
      return {with_random_sign<T>(rng, gen.log_uniform(hi / 1e8L, hi)),
              with_random_sign<T>(rng, gen.log_uniform(hi / 1e8L, hi)),
              with_random_sign<T>(rng, gen.log_uniform(hi / 1e8L, hi))};
    case spread::subnormal: {
      const long double mn = static_cast<long double>(std::numeric_limits<T>::min());
      return {with_random_sign<T>(rng, gen.log_uniform(lo * 2, mn)),
              with_random_sign<T>(rng, gen.log_uniform(lo * 2, mn)),
              with_random_sign<T>(rng, gen.log_uniform(lo * 2, mn))};
    }
  }
  return {T(1), T(1), T(1)};
}

/// sqrt(x x + y y + z z) in T as written (products not fused, naive.hpp).
template <class T>
T naive_norm(const vec3<T>& v) {
  using ez_test::naive::product;
  using std::sqrt;
  return sqrt(product(v.x, v.x) + product(v.y, v.y) + product(v.z, v.z));
}

template <class T>
void norm_sweep(long samples, unsigned long long seed) {
  reference_precision();
  std::printf("\nnorm(vec3<%s>), %ld samples per spread: ulps of the correctly rounded |v| "
              "(contract <= 1); naive sqrt(x*x + y*y + z*z) beside\n",
              type_name<T>(), samples);
  for (spread s : all_spreads) {
    std::mt19937_64 engine(seed + static_cast<unsigned long long>(s));
    ez_test::sampler<T> gen(engine);
    stats lib, naive;
    long naive_inf = 0, naive_zero = 0, naive_wrong = 0;
    for (long i = 0; i < samples; ++i) {
      const vec3<T> v = draw_vector(gen, s);
      const mpf ref = mp_norm(ez_test::to_mp(v));
      const T got = eigenzeit::norm(v);
      lib.add(ulps(got, ref), [&] { return hex(v); });
      const T nv = naive_norm(v);
      if (std::isinf(nv)) ++naive_inf;
      else if (nv == 0) ++naive_zero;
      else {
        const double e = ulps(nv, ref);
        if (e > 1) ++naive_wrong;
        naive.add(e, [&] { return hex(v); });
      }
    }
    std::printf("  %-26s max %.3f mean %.4f | naive: inf %ld, 0 %ld, > 1 ulp %ld of %ld, finite "
                "nonzero max %.3g mean %.3g\n",
                spread_name(s), lib.max, lib.mean(), naive_inf, naive_zero, naive_wrong, samples,
                naive.max, naive.mean());
    INFO(std::string(type_name<T>()), " norm, ", std::string(spread_name(s)), ": worst input ", lib.worst);
    CHECK(lib.max <= 1.0);
  }
}

}  // namespace

TEST_CASE("norm: within 1 ulp of MPFR over the whole exponent range (double)") {
  norm_sweep<double>(sample_count(40000), 101);
}

TEST_CASE("norm: within 1 ulp of MPFR over the whole exponent range (float, long double)") {
  norm_sweep<float>(sample_count(10000), 111);
  norm_sweep<long double>(sample_count(10000), 121);
}

TEST_CASE("norm: no overflow at 1e300, no underflow at 1e-310; inf, NaN and zero") {
  reference_precision();
  for (double c : {1e300, 1.5e307, 1e-310, 4.9e-324}) {
    const vec3<double> v{c, -c, c};
    const double got = eigenzeit::norm(v);
    const mpf ref = mp_norm(ez_test::to_mp(v));
    INFO("component ", c, " got ", got);
    CHECK(std::isfinite(got));
    CHECK(got > 0);
    CHECK(ulps(got, ref) <= 1.0);
    const double nv = naive_norm(v);
    std::printf("norm{%g, -%g, %g} = %.17g (%.3f ulp); naive %.17g\n", c, c, c, got, ulps(got, ref), nv);
    CHECK((c > 1 ? std::isinf(nv) : (nv == 0 || ulps(nv, ref) > 1)));  // why norm() exists
  }
  // hypot's special values (IEEE 754-2019, 9.2.1; ISO C11 Annex F.10.4.3; both cited from
  // memory): an infinite component gives +inf even beside a NaN; a NaN component gives NaN
  // otherwise.  The header promises the same ("inf if a component is infinite, NaN if one is
  // NaN (and none infinite)").
  const double nan = std::numeric_limits<double>::quiet_NaN();
  for (const vec3<double>& v : {vec3<double>{inf, 1, 0}, vec3<double>{0, -inf, 2},
                                vec3<double>{1, 2, inf}, vec3<double>{inf, -inf, 0},
                                vec3<double>{inf, nan, 0}}) {
    const double got = eigenzeit::norm(v);
    INFO("norm of ", hex(v), " = ", got);
    CHECK(std::isinf(got));
    CHECK(got > 0);
  }
  for (const vec3<double>& v : {vec3<double>{nan, 1, 0}, vec3<double>{0, nan, 2}, vec3<double>{1e300, 1, nan}}) {
    INFO("norm of ", hex(v));
    CHECK(std::isnan(eigenzeit::norm(v)));
  }
  CHECK(eigenzeit::norm(vec3<double>{0, 0, 0}) == 0);
  CHECK(eigenzeit::norm(vec3<double>{-0.0, 0, -0.0}) == 0);
  CHECK(eigenzeit::norm(vec3<float>{0, 0, 0}) == 0);
  CHECK(eigenzeit::norm(vec3<long double>{0, 0, 0}) == 0);
  // One component alone: |v| is that component's magnitude, exactly, at every scale.
  for (double c : {4.9e-324, 2.2e-308, 1.0, 3.0, 1.7e308}) {
    CHECK(eigenzeit::norm(vec3<double>{0, -c, 0}) == c);
    CHECK(eigenzeit::norm(vec3<double>{c, 0, 0}) == c);
  }
}

// =============================================================================================
// cross
// =============================================================================================

namespace {

enum class pair_kind { generic, rotated, perturbed, multiple };
const char* pair_name(pair_kind k) {
  switch (k) {
    case pair_kind::generic: return "independent vectors";
    case pair_kind::rotated: return "b = a rotated by 1e-14..1e-8";
    case pair_kind::perturbed: return "b = a (1 + 1e-16..1e-10 each)";
    case pair_kind::multiple: return "b = k a rounded";
  }
  return "?";
}

/// A double component: magnitude in [1e-3, 1e3] times a common scale, random sign.
double draw_component(ez_test::sampler<double>& gen, long double scale) {
  return with_random_sign<double>(gen.rng, scale * gen.log_uniform(1e-3L, 1e3L));
}

/// A random unit axis, exact in MPFR.
ez_test::mp_vec3 random_axis(ez_test::sampler<double>& gen) {
  for (;;) {
    const ez_test::mp_vec3 v{mpf(double(gen.uniform(-1, 1))), mpf(double(gen.uniform(-1, 1))),
                             mpf(double(gen.uniform(-1, 1)))};
    const mpf n2 = ez_test::dot(v, v);
    if (n2 > 0.01 && n2 <= 1) return ez_test::unit(v);
  }
}

vec3<double> round_vec(const ez_test::mp_vec3& v) {
  return {round_to<double>(v.x), round_to<double>(v.y), round_to<double>(v.z)};
}

/// a rotated by angle about a unit axis, rounded to double.
vec3<double> rotated(const vec3<double>& a, const ez_test::mp_vec3& axis, const mpf& angle) {
  const ez_test::mp_four r = ez_test::rotate(axis, angle, ez_test::mp_four{mpf(0), mpf(a.x), mpf(a.y), mpf(a.z)});
  return round_vec({r.x, r.y, r.z});
}

}  // namespace

TEST_CASE("cross: each component within 2 ulp of MPFR, nearly parallel vectors included") {
  reference_precision();
  const long samples = sample_count(30000);
  std::printf("\ncross(vec3<double>), %ld samples per kind: ulps of each exact component "
              "(contract <= 2, Jeannerod, Louvet and Muller, Math. Comp. 82 (2013)); naive "
              "a_i b_j - a_j b_i beside\n",
              samples);
  const pair_kind kinds[] = {pair_kind::generic, pair_kind::rotated, pair_kind::perturbed, pair_kind::multiple};
  for (pair_kind k : kinds) {
    std::mt19937_64 engine(201 + static_cast<unsigned long long>(k));
    ez_test::sampler<double> gen(engine);
    stats lib, naive;
    long exact_zero = 0, zero_wrong = 0;
    for (long i = 0; i < samples; ++i) {
      const long double scale = gen.log_uniform(1e-90L, 1e90L);
      const vec3<double> a{draw_component(gen, scale), draw_component(gen, scale), draw_component(gen, scale)};
      vec3<double> b{};
      switch (k) {
        case pair_kind::generic:
          b = {draw_component(gen, scale), draw_component(gen, scale), draw_component(gen, scale)};
          break;
        case pair_kind::rotated:
          b = rotated(a, random_axis(gen), mpf(static_cast<double>(gen.log_uniform(1e-14L, 1e-8L))));
          break;
        case pair_kind::perturbed: {
          auto bump = [&gen](double x) {
            const double d = with_random_sign<double>(gen.rng, gen.log_uniform(1e-16L, 1e-10L));
            return round_to<double>(mpf(x) * (1 + mpf(d)));
          };
          b = {bump(a.x), bump(a.y), bump(a.z)};
          break;
        }
        case pair_kind::multiple: {
          const double f = static_cast<double>(gen.log_uniform(1e-3L, 1e3L));
          b = {a.x * f, a.y * f, a.z * f};
          break;
        }
      }
      const ez_test::mp_vec3 ref = ez_test::cross(ez_test::to_mp(a), ez_test::to_mp(b));
      const vec3<double> got = eigenzeit::cross(a, b);
      using ez_test::naive::product;
      const vec3<double> nv{product(a.y, b.z) - product(a.z, b.y), product(a.z, b.x) - product(a.x, b.z),
                            product(a.x, b.y) - product(a.y, b.x)};
      const mpf* r[3] = {&ref.x, &ref.y, &ref.z};
      const double g[3] = {got.x, got.y, got.z}, n[3] = {nv.x, nv.y, nv.z};
      for (int c = 0; c < 3; ++c) {
        if (*r[c] == 0) {  // exact zero: the fma form returns it exactly
          ++exact_zero;
          if (g[c] != 0) ++zero_wrong;
          continue;
        }
        lib.add(ulps(g[c], *r[c]), [&] { return hex(a) + " x " + hex(b); });
        naive.add(ulps(n[c], *r[c]), [&] { return hex(a) + " x " + hex(b); });
      }
    }
    std::printf("  %-32s max %.3f mean %.4f | naive max %.3g mean %.3g  [exact zero components %ld]\n",
                pair_name(k), lib.max, lib.mean(), naive.max, naive.mean(), exact_zero);
    INFO("cross, ", std::string(pair_name(k)), ": worst input ", lib.worst);
    CHECK(lib.max <= 2.0);
    CHECK(zero_wrong == 0);
    if (k == pair_kind::rotated || k == pair_kind::perturbed) CHECK(naive.max > 1e3);  // what Kahan's form wins
  }
}

// =============================================================================================
// opening_angle
// =============================================================================================

TEST_CASE("opening_angle: within 4 ulp of MPFR from 1e-12 to pi - 1e-12") {
  reference_precision();
  const long samples = sample_count(25000);
  const mpf pi = 4 * atan(mpf(1));
  std::printf("\nopening_angle(vec3<double>), %ld samples per range: ulps of the exact angle "
              "between the rounded vectors (<= 4); naive acos(a.b / (|a| |b|)) beside\n",
              samples);
  const char* names[] = {"angle 1e-12 .. 1 (log)", "angle 1 .. pi - 1", "pi - angle 1e-12 .. 1 (log)"};
  for (int range = 0; range < 3; ++range) {
    std::mt19937_64 engine(301 + static_cast<unsigned long long>(range));
    ez_test::sampler<double> gen(engine);
    stats lib, naive;
    for (long i = 0; i < samples; ++i) {
      const long double scale = gen.log_uniform(1e-150L, 1e150L);
      const vec3<double> a{draw_component(gen, scale), draw_component(gen, scale), draw_component(gen, scale)};
      mpf angle;
      if (range == 0) angle = mpf(static_cast<double>(gen.log_uniform(1e-12L, 1)));
      else if (range == 1) angle = mpf(static_cast<double>(gen.uniform(1, 3.14159265358979L - 1)));
      else angle = pi - mpf(static_cast<double>(gen.log_uniform(1e-12L, 1)));
      // Rotation about an axis perpendicular to a, then a random length for b.
      const ez_test::mp_vec3 ma = ez_test::to_mp(a);
      const ez_test::mp_vec3 axis = ez_test::unit(ez_test::cross(ma, random_axis(gen)));
      const ez_test::mp_four r = ez_test::rotate(axis, angle, ez_test::mp_four{mpf(0), ma.x, ma.y, ma.z});
      const mpf k = mpf(static_cast<double>(gen.log_uniform(1e-20L, 1e20L)));
      const vec3<double> b = round_vec({r.x * k, r.y * k, r.z * k});
      const ez_test::mp_vec3 mb = ez_test::to_mp(b);
      const mpf ref = atan2(mp_norm(ez_test::cross(ma, mb)), ez_test::dot(ma, mb));
      const double got = eigenzeit::opening_angle(a, b);
      lib.add(ulps(got, ref), [&] { return hex(a) + ", " + hex(b); });
      // acos(a.b / (|a| |b|)), plainly; the quotient is clamped to [-1, 1] as code must.
      using ez_test::naive::product;
      const double cosine = (product(a.x, b.x) + product(a.y, b.y) + product(a.z, b.z)) /
                            (naive_norm(a) * naive_norm(b));
      naive.add(ulps(std::acos(std::max(-1.0, std::min(1.0, cosine))), ref), [] { return std::string(); });
    }
    std::printf("  %-28s max %.3f mean %.4f | naive max %.3g mean %.3g\n", names[range], lib.max,
                lib.mean(), naive.max, naive.mean());
    INFO("opening_angle, ", std::string(names[range]), ": worst input ", lib.worst);
    CHECK(lib.max <= 4.0);
  }
  // NaN and infinite components give NaN (header).
  const double nan = std::numeric_limits<double>::quiet_NaN();
  CHECK(std::isnan(eigenzeit::opening_angle(vec3<double>{nan, 0, 1}, vec3<double>{1, 0, 0})));
  CHECK(std::isnan(eigenzeit::opening_angle(vec3<double>{1, 0, 0}, vec3<double>{0, inf, 0})));
}

// =============================================================================================
// unit
// =============================================================================================

TEST_CASE("unit: components within 1 ulp of MPFR; zero, NaN and infinite vectors are domain errors") {
  reference_precision();
  const long samples = sample_count(20000);
  std::printf("\nunit(vec3<double>), %ld samples per spread: ulps of each exact component of "
              "v / |v| (<= 1)\n",
              samples);
  for (spread s : all_spreads) {
    std::mt19937_64 engine(401 + static_cast<unsigned long long>(s));
    ez_test::sampler<double> gen(engine);
    stats lib, subnormal;
    long zeros = 0, zero_wrong = 0;
    for (long i = 0; i < samples; ++i) {
      const vec3<double> v = draw_vector(gen, s);
      const ez_test::mp_vec3 m = ez_test::to_mp(v);
      const mpf n = mp_norm(m);
      const vec3<double> got = eigenzeit::unit(v);
      const mpf ref[3] = {m.x / n, m.y / n, m.z / n};
      const double g[3] = {got.x, got.y, got.z};
      for (int c = 0; c < 3; ++c) {
        const double e = ulps(g[c], ref[c]);
        if (ref[c] == 0) {
          ++zeros;
          if (g[c] != 0) ++zero_wrong;
        } else if (abs(ref[c]) < mpf(std::numeric_limits<double>::min())) {
          subnormal.add(e, [&] { return hex(v); });
        } else {
          lib.add(e, [&] { return hex(v); });
        }
      }
    }
    std::printf("  %-26s max %.3f mean %.4f  [subnormal components %ld: max %.3f ulp of "
                "denorm_min; zero %ld]\n",
                spread_name(s), lib.max, lib.mean(), subnormal.n, subnormal.max, zeros);
    INFO("unit, ", std::string(spread_name(s)), ": worst input ", lib.worst, " / subnormal ", subnormal.worst);
    CHECK(lib.max <= 1.0);
    CHECK(subnormal.max <= 1.0);
    CHECK(zero_wrong == 0);
  }

  const double nan = std::numeric_limits<double>::quiet_NaN();
  auto unit_x = [](const vec3<double>& v) {
    return [v](auto pol) { return eigenzeit::unit(v, pol).x; };
  };
  ez_test::check_all_policies("eigenzeit::unit", "= 0,", unit_x({0, 0, 0}));
  ez_test::check_all_policies("eigenzeit::unit", "= 0,", unit_x({-0.0, 0, -0.0}));
  ez_test::check_all_policies("eigenzeit::unit", "nan", unit_x({1, nan, 2}));
  ez_test::check_all_policies("eigenzeit::unit", "nan", unit_x({nan, 0, 0}));
  ez_test::check_all_policies("eigenzeit::unit", "inf", unit_x({1, 2, -inf}));
  ez_test::check_all_policies("eigenzeit::unit", "inf", unit_x({inf, inf, inf}));
  // Every component of the NaN policy's result is NaN.
  const vec3<double> u = eigenzeit::unit(vec3<double>{0, 0, 0}, eigenzeit::nan_policy());
  CHECK((std::isnan(u.x) && std::isnan(u.y) && std::isnan(u.z)));
  // The smallest and largest nonzero vectors normalise without underflow or overflow.
  const double den = std::numeric_limits<double>::denorm_min(), big = std::numeric_limits<double>::max();
  CHECK(eigenzeit::unit(vec3<double>{den, 0, 0}) == vec3<double>{1, 0, 0});
  CHECK(eigenzeit::unit(vec3<double>{0, -big, 0}) == vec3<double>{0, -1, 0});
  const vec3<double> e = eigenzeit::unit(vec3<double>{big, big, big});
  CHECK(ulps(e.x, 1 / sqrt(mpf(3))) <= 1.0);
}

// =============================================================================================
// invariant_mass
// =============================================================================================

namespace {

enum class mass_kind { massive, timelike, scale_low, scale_high };
const char* mass_name(mass_kind k) {
  switch (k) {
    case mass_kind::massive: return "(m gamma, m beta gamma n), gamma 1..1e11";
    case mass_kind::timelike: return "random timelike";
    case mass_kind::scale_low: return "massive, t ~ 1e8 min";
    case mass_kind::scale_high: return "massive, t ~ max / 1e8";
  }
  return "?";
}

/// A random unit vector, exact in MPFR.
template <class T>
ez_test::mp_vec3 random_unit(ez_test::sampler<T>& gen) {
  for (;;) {
    const ez_test::mp_vec3 v{mpf(double(gen.uniform(-1, 1))), mpf(double(gen.uniform(-1, 1))),
                             mpf(double(gen.uniform(-1, 1)))};
    const mpf n2 = ez_test::dot(v, v);
    if (n2 > 0.01 && n2 <= 1) return ez_test::unit(v);
  }
}

/// The four-momentum (m gamma, m beta gamma n) of mass m at gamma = 1 + gm1, each component
/// rounded once to T (so that the mass of the rounded vector differs from m).
template <class T>
four_vector<T> massive(const mpf& m, const mpf& gm1, const ez_test::mp_vec3& n) {
  const mpf e = m * (1 + gm1), p = m * sqrt(gm1 * (gm1 + 2));
  return {round_to<T>(e), round_to<T>(p * n.x), round_to<T>(p * n.y), round_to<T>(p * n.z)};
}

template <class T>
four_vector<T> draw_four(ez_test::sampler<T>& gen, mass_kind k) {
  const long double lo = static_cast<long double>(std::numeric_limits<T>::min()) * 1e8L;
  const long double hi = static_cast<long double>(std::numeric_limits<T>::max()) / 1e8L;
  const mpf gm1 = mpf(gen.log_uniform(1e-12L, 1e11L));
  switch (k) {
    case mass_kind::massive:
      return massive<T>(mpf(gen.log_uniform(1e-3L, 1e3L)), gm1, random_unit(gen));
    case mass_kind::timelike: {
      // |r| = f t with 1 - f log-uniform in [eps / 4, 1]: down to the rounding level.
      const long double t = gen.log_uniform(1e-20L, 1e20L);
      const long double f = 1 - gen.log_uniform(std::numeric_limits<T>::epsilon() / 4, 1);
      const ez_test::mp_vec3 n = random_unit(gen);
      const mpf r = mpf(t) * mpf(f);
      return {with_random_sign<T>(gen.rng, 1) * T(t), round_to<T>(r * n.x), round_to<T>(r * n.y),
              round_to<T>(r * n.z)};
    }
    case mass_kind::scale_low:
      return massive<T>(mpf(lo) * mpf(gen.log_uniform(1, 10)), gm1, random_unit(gen));
    case mass_kind::scale_high:
      return massive<T>(mpf(hi) * mpf(gen.log_uniform(0.1L, 1)) / (1 + gm1), gm1, random_unit(gen));
  }
  return {T(1), T(0), T(0), T(0)};
}

template <class T>
T naive_mass(const four_vector<T>& v) {
  using ez_test::naive::product;
  using std::sqrt;
  return sqrt(product(v.t, v.t) - product(v.x, v.x) - product(v.y, v.y) - product(v.z, v.z));
}

template <class T>
void mass_sweep(long samples, unsigned long long seed) {
  reference_precision();
  std::printf("\ninvariant_mass(four_vector<%s>), %ld samples per kind: ulps of sqrt(t^2 - r^2) of "
              "the exact input (contract <= 1); naive sqrt(t*t - x*x - y*y - z*z) beside\n",
              type_name<T>(), samples);
  const mass_kind kinds[] = {mass_kind::massive, mass_kind::timelike, mass_kind::scale_low, mass_kind::scale_high};
  const mpf eps = mpf(std::numeric_limits<T>::epsilon());
  for (mass_kind k : kinds) {
    std::mt19937_64 engine(seed + static_cast<unsigned long long>(k));
    ez_test::sampler<T> gen(engine);
    stats lib, naive;
    long null_or_spacelike = 0, not_zero = 0, naive_nan = 0, naive_zero = 0, past_differs = 0;
    for (long i = 0; i < samples; ++i) {
      const four_vector<T> v = draw_four(gen, k);
      const ez_test::mp_four m = ez_test::to_mp(v);
      const mpf sq = ez_test::minkowski_square(m);
      const T got = eigenzeit::invariant_mass(v, eigenzeit::nan_policy());
      const four_vector<T> past{-v.t, v.x, v.y, v.z};
      const T got_past = eigenzeit::invariant_mass(past, eigenzeit::nan_policy());
      if (!(got_past == got)) ++past_differs;  // same Minkowski square
      const T nv = naive_mass(v);
      if (sq <= 0) {
        // Null or spacelike after rounding; within the (1 + 4 eps) rule, the answer is 0.
        ++null_or_spacelike;
        const mpf r2 = m.x * m.x + m.y * m.y + m.z * m.z;
        REQUIRE(r2 <= m.t * m.t * (1 + 4 * eps) * (1 + 4 * eps));
        if (got != 0) ++not_zero;
        continue;
      }
      const mpf ref = sqrt(sq);
      lib.add(ulps(got, ref), [&] { return hex(v); });
      if (std::isnan(nv)) ++naive_nan;
      else if (nv == 0) ++naive_zero;
      else naive.add(ulps(nv, ref), [] { return std::string(); });
    }
    std::printf("  %-42s max %.3f mean %.4f | naive: NaN %ld, 0 %ld, others max %.3g mean %.3g  "
                "[null/spacelike after rounding %ld]\n",
                mass_name(k), lib.max, lib.mean(), naive_nan, naive_zero, naive.max, naive.mean(),
                null_or_spacelike);
    INFO(std::string(type_name<T>()), " invariant_mass, ", std::string(mass_name(k)), ": worst input ", lib.worst);
    CHECK(lib.max <= 1.0);
    CHECK(not_zero == 0);
    CHECK(past_differs == 0);
  }
}

}  // namespace

TEST_CASE("invariant_mass: within 1 ulp of MPFR for massive and random timelike vectors (double)") {
  mass_sweep<double>(sample_count(40000), 501);
}

TEST_CASE("invariant_mass: within 1 ulp of MPFR (float, long double)") {
  mass_sweep<float>(sample_count(10000), 511);
  mass_sweep<long double>(sample_count(10000), 521);
}

TEST_CASE_TEMPLATE("invariant_mass: at rest, null vectors and the spacelike rule", T, float, double,
                   long double) {
  reference_precision();
  const T eps = std::numeric_limits<T>::epsilon();
  // At rest: the mass is t, exactly, from the subnormals to the largest value.
  for (T m : {std::numeric_limits<T>::denorm_min() * 3, std::numeric_limits<T>::min(), T(1), T(0.1),
              std::numeric_limits<T>::max()}) {
    CHECK(eigenzeit::invariant_mass(four_vector<T>{m, T(0), T(0), T(0)}) == m);
    CHECK(eigenzeit::invariant_mass(four_vector<T>{-m, T(0), T(0), T(0)}) == m);
  }
  // Photons (|p|, p): |p| rounded down leaves a spacelike vector within the rule (0); rounded
  // up, a timelike one whose tiny mass the routine must still get right.
  std::mt19937_64 engine(531);
  ez_test::sampler<T> gen(engine);
  long down_zero = 0, up_checked = 0, exact_null = 0;
  for (int i = 0; i < 200; ++i) {
    const T scale = T(gen.log_uniform(1e-30L, 1e30L));
    const vec3<T> p{T(scale * T(gen.uniform(-1, 1))), T(scale * T(gen.uniform(-1, 1))),
                    T(scale * T(gen.uniform(-1, 1)))};
    const mpf np = mp_norm(ez_test::to_mp(p));
    mpf down = np, up = np;
    mpfr_prec_round(down.backend().data(), std::numeric_limits<T>::digits, MPFR_RNDD);
    mpfr_prec_round(up.backend().data(), std::numeric_limits<T>::digits, MPFR_RNDU);
    const T td = round_to<T>(down), tu = round_to<T>(up);
    INFO(std::string(type_name<T>()), " photon ", hex(p));
    if (td == tu) {  // |p| representable: a null vector, mass exactly 0
      ++exact_null;
      CHECK(eigenzeit::invariant_mass(eigenzeit::make_four_vector(td, p)) == 0);
      continue;
    }
    CHECK(eigenzeit::invariant_mass(eigenzeit::make_four_vector(td, p)) == 0);
    CHECK(eigenzeit::invariant_mass(eigenzeit::make_four_vector(T(-td), p)) == 0);
    ++down_zero;
    const four_vector<T> v = eigenzeit::make_four_vector(tu, p);
    CHECK(ulps(eigenzeit::invariant_mass(v), sqrt(ez_test::minkowski_square(ez_test::to_mp(v)))) <= 1.0);
    ++up_checked;
  }
  std::printf("%s photons: %ld rounded-down (0), %ld rounded-up (tiny mass within 1 ulp), %ld exact null\n",
              type_name<T>(), down_zero, up_checked, exact_null);
  CHECK(down_zero > 100);
  // |r| = (1 + 2 eps) t and (1 + 4 eps) t are within the rule (header: |r| <= (1 + 4 eps)|t|
  // gives 0); (1 + 8 eps) t and (1, 2, 0, 0) are beyond it.
  for (T t : {T(1), T(0.75), T(std::ldexp(T(1), -70)), T(std::ldexp(T(0.75), 80))}) {  // (1 + k eps) t exact
    CHECK(eigenzeit::invariant_mass(four_vector<T>{t, t * (1 + 2 * eps), T(0), T(0)}) == 0);
    CHECK(eigenzeit::invariant_mass(four_vector<T>{t, T(0), T(0), -t * (1 + 2 * eps)}) == 0);
    CHECK(eigenzeit::invariant_mass(four_vector<T>{-t, T(0), t * (1 + 2 * eps), T(0)}) == 0);
    {
      INFO(std::string(type_name<T>()), " |r| = (1 + 4 eps) t, t = ", hex(t));
      CHECK(eigenzeit::invariant_mass(four_vector<T>{t, t * (1 + 4 * eps), T(0), T(0)}, eigenzeit::nan_policy()) == 0);
    }
    CHECK(std::isnan(eigenzeit::invariant_mass(four_vector<T>{t, t * (1 + 8 * eps), T(0), T(0)}, eigenzeit::nan_policy())));
  }
  // |r| = (1 + 2 eps) t spread over three components (rounded; the exact ratio is checked).
  for (int i = 0; i < 50; ++i) {
    const ez_test::mp_vec3 n = random_unit(gen);
    const T t = T(gen.log_uniform(1e-20L, 1e20L));
    const mpf r = mpf(t) * (1 + 2 * mpf(eps));
    const four_vector<T> v{t, round_to<T>(r * n.x), round_to<T>(r * n.y), round_to<T>(r * n.z)};
    const mpf ratio = mp_norm(ez_test::to_mp(v.spatial())) / mpf(t);
    REQUIRE(ratio > 1);
    REQUIRE(ratio <= 1 + 4 * mpf(eps));
    CHECK(eigenzeit::invariant_mass(v) == 0);
  }
}

TEST_CASE("invariant_mass: bad input through each policy") {
  const double nan = std::numeric_limits<double>::quiet_NaN();
  auto mass_of = [](const four_vector<double>& v) {
    return [v](auto pol) { return eigenzeit::invariant_mass(v, pol); };
  };
  // The message reports "t^2 - |r|^2 = <value>": for (1, 2, 0, 0) that is 1 - 4 = -3, exact.
  // (Far from 1 the routine reports the value scaled by a power of two; there only the
  // function and the word "spacelike" are checked.)
  ez_test::check_all_policies("invariant_mass", "t^2 - |r|^2 = -3:", mass_of({1, 2, 0, 0}));
  ez_test::check_all_policies("invariant_mass", "spacelike", mass_of({1, 2, 0, 0}));
  ez_test::check_all_policies("invariant_mass", "spacelike", mass_of({0, 0, 1e-300, 0}));
  ez_test::check_all_policies("invariant_mass", "spacelike", mass_of({1e300, 0, -1.5e300, 0}));
  ez_test::check_all_policies("invariant_mass", "spacelike", mass_of({-1, 1 + 8 * 0x1p-52, 0, 0}));
  ez_test::check_all_policies("invariant_mass", "nan", mass_of({nan, 1, 0, 0}));
  ez_test::check_all_policies("invariant_mass", "nan", mass_of({1, 0, 0, nan}));
  ez_test::check_all_policies("invariant_mass", "inf", mass_of({inf, 1, 0, 0}));
  ez_test::check_all_policies("invariant_mass", "inf", mass_of({1, 0, -inf, 0}));
  ez_test::check_all_policies("invariant_mass", "inf", mass_of({inf, inf, 0, 0}));
}

// =============================================================================================
// A Boost.Multiprecision type
// =============================================================================================

TEST_CASE("cpp_bin_float_50: norm and invariant_mass within 4 eps of MPFR") {
  reference_precision();
  using T = ez_test::cpp50;
  std::mt19937_64 engine(601);
  ez_test::sampler<double> gen(engine);
  double worst_norm = 0, worst_mass = 0;
  const int cases = ez_test::quick() ? 20 : 100;
  for (int i = 0; i < cases; ++i) {
    const long double scale = gen.log_uniform(1e-200L, 1e200L);
    const vec3<T> v{T(draw_component(gen, scale)) / 3, T(draw_component(gen, scale)) / 7,
                    T(draw_component(gen, scale))};  // non-binary-short components
    const mpf nref = mp_norm(ez_test::to_mp(v));
    const double en = rel_eps(eigenzeit::norm(v), nref);
    worst_norm = std::max(worst_norm, en);
    const ez_test::mp_vec3 n = random_unit(gen);
    const mpf gm1 = mpf(gen.log_uniform(1e-12L, 1e11L));
    const four_vector<T> p = massive<T>(mpf(scale), gm1, n);
    const mpf sq = ez_test::minkowski_square(ez_test::to_mp(p));
    REQUIRE(sq > 0);
    const double em = rel_eps(eigenzeit::invariant_mass(p), sqrt(sq));
    worst_mass = std::max(worst_mass, em);
    INFO("case ", i, ": norm ", en, " eps, mass ", em, " eps");
    CHECK(en <= 4);
    CHECK(em <= 4);
  }
  CHECK(eigenzeit::norm(vec3<T>{T(2), T(-3), T(6)}) == T(7));
  CHECK(eigenzeit::invariant_mass(four_vector<T>{T(5), T(2), T(2), T(1)}) == T(4));
  std::printf("\ncpp_bin_float_50, %d cases: norm max %.3f eps, invariant_mass max %.3f eps\n", cases,
              worst_norm, worst_mass);
}
