// eigenzeit_accuracy: the accuracy report of every public routine of speed.hpp, in float,
// double and long double, measured against MPFR, with the textbook formulas beside it.
//
// Usage:
//   eigenzeit_accuracy [--samples N] [--samples-float NF] [--samples-long-double NL]
//                      [--quick] [--check] [--types LIST] [--threads K]
//                      [--seed S] [--bins-per-region B] [--bins-type T] [--verify-every V]
//                      [--text FILE] [--markdown FILE] [--csv FILE] [--bins FILE]
//
//   --samples N    inputs per region for double (default 1000000).
//   --samples-float NF, --samples-long-double NL  inputs per region for float and long
//                  double (default N/10, at least 200): their sweeps confirm what double
//                  shows; the correctly rounded mode of long double climbs to float128 and
//                  costs ~100 us per input, so full runs give long double fewer.
//   --quick        a short run for continuous integration: N = 20000, or N = 2000 when the
//                  environment variable EIGENZEIT_QUICK is set (sanitizer builds); the
//                  reference is cross-checked on every 16th input.  A later --samples wins.
//   --check        exit with status 3 if any library result breaks the precision contract
//                  (see "Contract" below).
//   --types LIST   comma-separated subset of float, double, long double (also long_double,
//                  ld).  Default: all three.
//   --threads K    worker threads (default: std::thread::hardware_concurrency()).  Inputs
//                  come in blocks, each drawn from its own std::mt19937_64 seeded from
//                  (S, type, routine, region, block), so the inputs do not depend on K.
//   --seed S       base seed (default 1).
//   --bins-per-region B  log-spaced bins of the input per region for --bins (default 200).
//   --bins-type T  the type whose bins --bins writes (default double).
//   --verify-every V  recompute every V-th input with the test suite's reference
//                  (tests/support/reference.hpp) and stop if the two disagree (default 1024).
//   --text FILE    the full plain-text table (stdout gets a summary).
//   --markdown FILE  the report docs/accuracy.md.
//   --csv FILE     one row per type, routine, view, region (and "all"), flavour.
//   --bins FILE    max ulp per input bin, the data of the plots (tools/plot_accuracy.py).
//
// Example:
//   eigenzeit_accuracy --samples 100000 --types double --csv acc.csv --bins bins.csv
//
// Build by hand (CMake builds it as eigenzeit_accuracy from tools/accuracy.cpp):
//   g++ -std=gnu++17 -O2 -I include -I tests tools/accuracy.cpp -lmpfr -lgmp -lquadmath -lpthread
// scripts/accuracy builds it, runs the full report into docs/ and draws the plots.
//
// What is measured.  Each named constructor of speed<T> has its input domain split into 2-4
// regions where the behaviour changes (a series branch, a rounding of beta to 1, an
// underflowing square, ...; see regions_of()).  Inputs are drawn log-uniformly over each
// region, exact in T (long double drawing, one rounding to T); all eight views are
// evaluated and compared with the MPFR value of the view's definition formula on the exact
// input.  The five free functions of beta run on the
// inputs of from_beta with a random sign.  Three flavours are measured on the same inputs:
//   eigenzeit          the library's default routines
//   correctly_rounded  the library's correctly rounded mode (eigenzeit::correctly_rounded)
//   naive              the textbook formula of that quantity from that input, evaluated in T
//                      (tests/support/naive.hpp)
// Per (type, routine, view, region, flavour):
//   count     results whose correctly rounded value is a normal number (the contract region)
//   max ulp   largest |result - exact| in ulps of the correctly rounded value (fractional)
//   mean ulp  mean of the same over the finite results
//   max dist  largest integer distance, in representable values, to the correctly rounded
//             value (saturates at INT64_MAX, shown as >9.2e+18)
//   cr        share of the count equal to the correctly rounded value
//   failed    inf or NaN where the exact value is finite and normal (max ulp is then inf);
//             a library call that throws on a valid input gives NaN, and is also counted
//             as "threw" with its first message
//   outside   results whose correctly rounded value is subnormal, zero or not finite: outside
//             the precision contract, only counted (with their max dist)
//   worst     the input with the largest integer distance, and among those the largest
//             fractional error
//
// Contract (DESIGN.md): every algebraic view and free function at most 1 ulp (integer
// distance) from the correctly rounded value; rapidity, and every view of from_rapidity,
// at most 2; the correctly rounded flavour always the correctly rounded value; no library
// result inf or NaN for a finite exact value, no exception on a valid input.  An exact value
// that is a midpoint of T counts with its even neighbour as the correctly rounded value;
// results next to a midpoint are decided by a second reference at twice the precision (see
// meter::prepare and meter::settle).
//
// The reference.  The test suite's reference (ez_test::reference) evaluates the definition
// formulas at a precision that absorbs their cancellation; its transcendental steps at that
// precision (tanh and atanh at up to 2500 bits) cost most of its time.  The reference here
// keeps the same algebraic chain at the same precision and replaces only those two steps by
// well-conditioned forms at 256 bits (see fast_reference); every --verify-every'th input is
// recomputed with ez_test::reference, and any disagreement beyond 2^-(2 digits + 64)
// relative stops the run.
//
// Exit status: 0 after a complete run, 1 on an error, 2 on a usage error, 3 when --check
// finds a contract violation.
#include <mpfr.h>

#include <algorithm>
#include <atomic>
#include <cerrno>
#include <chrono>
#include <cmath>
#include <cstdarg>
#include <cstdint>
#include <cstdio>
#include <cstdlib>
#include <cstring>
#include <ctime>
#include <exception>
#include <initializer_list>
#include <limits>
#include <mutex>
#include <random>
#include <stdexcept>
#include <string>
#include <thread>
#include <type_traits>
#include <vector>

#include <eigenzeit/speed.hpp>
#include <eigenzeit/version.hpp>

#include "../tests/support/naive.hpp"
#include "../tests/support/reference.hpp"
#include "../tests/support/sampler.hpp"

namespace {

using ez_test::ctor;

constexpr int n_ctors = 8;
constexpr int n_views = ez_test::n_views;
constexpr int n_free = 5;
constexpr int max_regions = 4;

const ctor all_ctors[n_ctors] = {ctor::beta,         ctor::beta_deficit,   ctor::gamma,
                                 ctor::gamma_m1,     ctor::rapidity,       ctor::proper_speed,
                                 ctor::kinetic_energy, ctor::momentum};

const char* const free_names[n_free] = {"lorentz_factor", "lorentz_factor_m1", "proper_speed",
                                        "dilation_fraction", "rapidity"};
const int free_view[n_free] = {ez_test::v_gamma, ez_test::v_gamma_m1, ez_test::v_proper_speed,
                               ez_test::v_dilation, ez_test::v_rapidity};
const bool free_odd[n_free] = {false, false, true, false, true};
const char* const free_formulas[n_free] = {"1/sqrt(1 - b*b)", "1/sqrt(1 - b*b) - 1",
                                           "b/sqrt(1 - b*b)", "1 - sqrt(1 - b*b)",
                                           "0.5*log((1 + b)/(1 - b))"};

// ---- flavours ---------------------------------------------------------------------------------

enum flavour : int { f_lib, f_cr, f_naive, n_flavours };
const char* const flavour_names[n_flavours] = {"eigenzeit", "correctly_rounded", "naive"};

// ---- the real types ---------------------------------------------------------------------------

enum type_id : int { t_float, t_double, t_long_double, n_types };
const char* const type_names[n_types] = {"float", "double", "long double"};
const char* const type_names_csv[n_types] = {"float", "double", "long_double"};

int max_digits10_of(int t) {
  return t == t_float    ? std::numeric_limits<float>::max_digits10
         : t == t_double ? std::numeric_limits<double>::max_digits10
                         : std::numeric_limits<long double>::max_digits10;
}

/// Contract bound in representable values: 2 where exp or log enters, 1 otherwise.
int contract_bound(ctor c, int view) {
  return (c == ctor::rapidity || view == ez_test::v_rapidity) ? 2 : 1;
}
int contract_bound_free(int k) { return free_view[k] == ez_test::v_rapidity ? 2 : 1; }

// ---- regions ----------------------------------------------------------------------------------

/// The sampled variable of a region; inputs are drawn log-uniformly in it.
enum variable : int {
  var_beta,          // beta itself (from_beta, small beta of from_beta_deficit)
  var_deficit,       // 1 - beta
  var_gamma_m1,      // gamma - 1 (from_gamma, from_gamma_m1)
  var_rapidity,      // eta
  var_proper_speed,  // u = beta gamma
  var_kinetic,       // K / m
  var_momentum,      // p / m
};
const char* const variable_names[] = {"beta",         "deficit",          "gamma_m1", "rapidity",
                                      "proper_speed", "kinetic_over_mass", "momentum_over_mass"};
const char* const variable_text[] = {"beta", "1 - beta", "gamma - 1", "eta", "u", "K/m", "p/m"};

struct region_def {
  const char* name = "";
  const char* what = "";  // why the behaviour changes there
  variable var = var_beta;
  long double lo = 0, hi = 0;
  bool used() const { return lo < hi; }
};

struct region_set {
  int n = 0;
  region_def r[max_regions];
  void add(const char* name, const char* what, variable var, long double lo, long double hi) {
    region_def& d = r[n++];
    d.name = name;
    d.what = what;
    d.var = var;
    d.lo = lo;
    d.hi = hi;
  }
};

/// Bounds every region derives from std::numeric_limits<T> and the library's thresholds.
template <class T>
struct type_bounds {
  long double eps, lowest, tiny, huge, sthr, rescale, root, eta_one, max_eta;
  type_bounds() {
    using S = ez_test::sampler<T>;
    eps = std::numeric_limits<T>::epsilon();
    lowest = S::lowest();  // smallest magnitude of the test sweeps (subnormals of float/double)
    tiny = S::tiny();
    huge = S::huge();
    max_eta = S::max_rapidity();
    // |beta| below sqrt(small_square_threshold): beta^2 takes the series branch.
    sthr = std::sqrt(static_cast<long double>(eigenzeit::numeric::small_square_threshold<T>()));
    // 1 - beta (or K/m) below min / eps^2: the rescaled branch.
    rescale = eigenzeit::numeric::rescale_threshold<T>();
    // gamma above 1/sqrt(eps): 1 - beta ~ 1/(2 gamma^2) < eps/2, beta rounds to 1 in T.
    root = 1 / std::sqrt(eps);
    eta_one = std::acosh(root);
  }
};

/// The regions of constructor c in T; a region whose range is empty for T is skipped.
template <class T>
region_set regions_of(ctor c) {
  const type_bounds<T> b;
  region_set s;
  switch (c) {
    case ctor::beta:
      s.add("series", "beta^2 below small_square_threshold (series branch)", var_beta, b.lowest, b.sthr);
      s.add("middle", "series threshold < beta <= 1/2", var_beta, b.sthr, 0.5L);
      s.add("near_1", "beta > 1/2, 1 - beta down to eps/2", var_deficit, b.eps / 2, 0.5L);
      break;
    case ctor::beta_deficit:
      s.add("rescaled", "1 - beta below min/eps^2 (rescaled branch)", var_deficit, b.lowest, b.rescale);
      s.add("small", "min/eps^2 <= 1 - beta <= 1/2", var_deficit, std::max(b.rescale, b.lowest), 0.5L);
      s.add("large", "1 - beta > 1/2, i.e. beta < 1/2 down to eps/2", var_beta, b.eps / 2, 0.5L);
      break;
    case ctor::gamma:
      s.add("near_1", "gamma - 1 in [eps, 1]", var_gamma_m1, b.eps, 1.0L);
      s.add("moderate", "1 < gamma - 1 <= 1/sqrt(eps)", var_gamma_m1, 1.0L, b.root);
      s.add("huge", "gamma > 1/sqrt(eps): beta rounds to 1", var_gamma_m1, b.root, b.huge);
      break;
    case ctor::gamma_m1:
      s.add("tiny", "gamma - 1 < eps: gamma rounds to 1", var_gamma_m1, 4 * b.lowest, b.eps);
      s.add("near_1", "gamma - 1 in [eps, 1]", var_gamma_m1, b.eps, 1.0L);
      s.add("moderate", "1 < gamma - 1 <= 1/sqrt(eps)", var_gamma_m1, 1.0L, b.root);
      s.add("huge", "gamma > 1/sqrt(eps): beta rounds to 1", var_gamma_m1, b.root, b.huge);
      break;
    case ctor::rapidity:
      s.add("small", "eta below sqrt(small_square_threshold)", var_rapidity, b.lowest, b.sthr);
      s.add("moderate", "up to acosh(1/sqrt(eps))", var_rapidity, b.sthr, b.eta_one);
      s.add("large", "beta = tanh(eta) rounds to 1", var_rapidity, b.eta_one, b.max_eta);
      break;
    case ctor::proper_speed:
      s.add("small", "u below sqrt(small_square_threshold)", var_proper_speed, b.lowest, b.sthr);
      s.add("moderate", "up to 1/sqrt(eps)", var_proper_speed, b.sthr, b.root);
      s.add("huge", "u > 1/sqrt(eps): beta rounds to 1", var_proper_speed, b.root, b.huge);
      break;
    case ctor::kinetic_energy:
      s.add("rescaled", "K/m below min/eps^2 (rescaled branch)", var_kinetic, b.tiny * 1e6L, b.rescale);
      s.add("small", "min/eps^2 <= K/m <= 1", var_kinetic, std::max(b.rescale, b.tiny * 1e6L), 1.0L);
      s.add("large", "K/m > 1", var_kinetic, 1.0L, b.huge / 1e6L);
      break;
    case ctor::momentum:
      s.add("small", "p/m below sqrt(small_square_threshold)", var_momentum, b.tiny * 1e6L, b.sthr);
      s.add("moderate", "up to 1/sqrt(eps)", var_momentum, b.sthr, b.root);
      s.add("huge", "p/m > 1/sqrt(eps): beta rounds to 1", var_momentum, b.root, b.huge / 1e6L);
      break;
  }
  return s;
}

region_set regions_of_type(int t, ctor c) {
  return t == t_float ? regions_of<float>(c) : t == t_double ? regions_of<double>(c)
                                                             : regions_of<long double>(c);
}

/// Turns a drawn value v of the region's variable (and a mass) into inputs exact in T.
/// Returns false if rounding to T leaves the domain (the draw is then repeated).  `actual`
/// is the variable recomputed from the rounded inputs, for the bins.
template <class T>
bool make_input(ctor c, const region_def& r, long double v, long double mass, T& x, T& y,
                long double& actual) {
  y = T(1);
  switch (c) {
    case ctor::beta:
    case ctor::beta_deficit: {
      // The input is beta (from_beta) or 1 - beta (from_beta_deficit); the drawn variable is
      // that input or its complement.  1 - x is exact in long double for every x used here.
      const bool input_is_var = (c == ctor::beta) == (r.var == var_beta);
      x = input_is_var ? T(v) : T(1.0L - v);
      const bool ok = c == ctor::beta ? (x >= T(0) && x < T(1)) : (x > T(0) && x <= T(1));
      actual = input_is_var ? static_cast<long double>(x) : 1.0L - static_cast<long double>(x);
      return ok;
    }
    case ctor::gamma:
      x = T(1.0L + v);
      if (!(x >= T(1)) || !std::isfinite(x)) return false;
      actual = static_cast<long double>(x) - 1.0L;
      return true;
    case ctor::gamma_m1:
    case ctor::rapidity:
    case ctor::proper_speed:
      x = T(v);
      actual = static_cast<long double>(x);
      return std::isfinite(x);
    case ctor::kinetic_energy:
    case ctor::momentum:
      y = T(mass);
      x = T(v * static_cast<long double>(y));
      actual = static_cast<long double>(x) / static_cast<long double>(y);
      return std::isfinite(x) && x >= T(0);
  }
  return false;
}

// ---- the reference ----------------------------------------------------------------------------

/// All eight views of the speed built by constructor c from exact inputs, in MPFR.
///
/// The algebraic chain is the test suite's (tests/support/reference.hpp): beta from the
/// input by its definition, then every view from beta by its definition, at the precision
/// ez_test::precision_for chooses (256 bits of margin plus the bits the cancellation of
/// those formulas costs).  Two steps differ, both transcendental:
///  * rapidity view: atanh(b) = log1p(z) / 2 with z = 2 b / (1 - b), from b and 1 - b as the
///    chain holds them (each within 2^-256 relative).  log1p is well conditioned for z >= 0
///    (relative condition number z / ((1 + z) log1p(z)) <= 1), so 256 bits suffice where
///    atanh(b) itself needs 2 log2(gamma) more;
///  * from_rapidity: beta = tanh(eta) from one exponential at 256 + 2 digits bits:
///    eta <= 1: e = expm1(-2 eta), beta = -e / (2 + e): relative error ~2^-(256 + 2 digits)
///    in beta, and in 1 - beta >= 0.23 as well;
///    eta > 1: e = exp(-2 eta), 1 - beta = 2 e / (1 + e) with that relative error, and beta =
///    1 - (1 - beta) at the chain's precision, which holds the 3 eta bits of cancellation.
///    Every later view is a well-conditioned function of beta and 1 - beta, as in the chain.
class fast_reference {
 public:
  mpfr_t val[n_views];

  fast_reference() {
    for (auto& v : val) mpfr_init2(v, cap);
    for (auto* v : {&b_, &t_, &d_, &x_, &y_, &e_, &z_}) mpfr_init2(*v, cap);
  }
  fast_reference(const fast_reference&) = delete;
  fast_reference& operator=(const fast_reference&) = delete;
  ~fast_reference() {
    for (auto& v : val) mpfr_clear(v);
    for (auto* v : {&b_, &t_, &d_, &x_, &y_, &e_, &z_}) mpfr_clear(*v);
  }

  /// `extra` bits on top of every precision below: the second evaluation that settles
  /// results lying on or next to a midpoint (see meter::settle).
  void compute(ctor c, long double x, long double y, int digits, mpfr_prec_t extra = 0) {
    const mpfr_prec_t p = ez_test::precision_for(ez_test::magnitude(c, x, y), c, digits) + extra;
    const mpfr_prec_t pt = std::max<mpfr_prec_t>(256, 2 * static_cast<mpfr_prec_t>(digits) + 128) + extra;
    const mpfr_prec_t pe = 256 + 2 * static_cast<mpfr_prec_t>(digits) + extra;
    if (p > cap) throw std::runtime_error("reference precision beyond its cap");
    for (auto& v : val) mpfr_set_prec(v, p);
    for (auto* v : {&b_, &t_, &d_, &x_, &y_}) mpfr_set_prec(*v, p);
    mpfr_set_ld(x_, x, MPFR_RNDN);  // exact: p >= 64
    mpfr_set_ld(y_, y, MPFR_RNDN);
    switch (c) {
      case ctor::beta: mpfr_set(b_, x_, MPFR_RNDN); break;
      case ctor::beta_deficit: mpfr_ui_sub(b_, 1, x_, MPFR_RNDN); break;
      case ctor::gamma:  // beta = sqrt(1 - 1/gamma^2)
        mpfr_sqr(t_, x_, MPFR_RNDN);
        mpfr_ui_div(t_, 1, t_, MPFR_RNDN);
        mpfr_ui_sub(t_, 1, t_, MPFR_RNDN);
        mpfr_sqrt(b_, t_, MPFR_RNDN);
        break;
      case ctor::gamma_m1:
      case ctor::kinetic_energy:  // gamma = 1 + x (or 1 + K/m)
        if (c == ctor::gamma_m1) {
          mpfr_add_ui(t_, x_, 1, MPFR_RNDN);
        } else {
          mpfr_div(t_, x_, y_, MPFR_RNDN);
          mpfr_add_ui(t_, t_, 1, MPFR_RNDN);
        }
        mpfr_sqr(t_, t_, MPFR_RNDN);
        mpfr_ui_div(t_, 1, t_, MPFR_RNDN);
        mpfr_ui_sub(t_, 1, t_, MPFR_RNDN);
        mpfr_sqrt(b_, t_, MPFR_RNDN);
        break;
      case ctor::rapidity:
        mpfr_set_prec(e_, pe);
        mpfr_set_ld(e_, x, MPFR_RNDN);
        mpfr_mul_si(e_, e_, -2, MPFR_RNDN);  // exact
        if (x <= 1) {
          mpfr_expm1(e_, e_, MPFR_RNDN);
          mpfr_add_ui(t_, e_, 2, MPFR_RNDN);
          mpfr_div(b_, e_, t_, MPFR_RNDN);
          mpfr_neg(b_, b_, MPFR_RNDN);
        } else {
          mpfr_exp(e_, e_, MPFR_RNDN);
          mpfr_add_ui(t_, e_, 1, MPFR_RNDN);
          mpfr_div(d_, e_, t_, MPFR_RNDN);
          mpfr_mul_2ui(d_, d_, 1, MPFR_RNDN);
          mpfr_ui_sub(b_, 1, d_, MPFR_RNDN);
        }
        break;
      case ctor::proper_speed:
      case ctor::momentum:  // beta = u / sqrt(1 + u^2)
        if (c == ctor::proper_speed) mpfr_set(d_, x_, MPFR_RNDN);
        else mpfr_div(d_, x_, y_, MPFR_RNDN);
        mpfr_sqr(t_, d_, MPFR_RNDN);
        mpfr_add_ui(t_, t_, 1, MPFR_RNDN);
        mpfr_sqrt(t_, t_, MPFR_RNDN);
        mpfr_div(b_, d_, t_, MPFR_RNDN);
        break;
    }
    using namespace ez_test;
    mpfr_set(val[v_beta], b_, MPFR_RNDN);
    mpfr_ui_sub(val[v_deficit], 1, b_, MPFR_RNDN);
    mpfr_sqr(t_, b_, MPFR_RNDN);
    mpfr_ui_sub(t_, 1, t_, MPFR_RNDN);
    mpfr_sqrt(val[v_inv_gamma], t_, MPFR_RNDN);
    mpfr_ui_div(val[v_gamma], 1, val[v_inv_gamma], MPFR_RNDN);
    mpfr_sub_ui(val[v_gamma_m1], val[v_gamma], 1, MPFR_RNDN);
    mpfr_ui_sub(val[v_dilation], 1, val[v_inv_gamma], MPFR_RNDN);
    mpfr_mul(val[v_proper_speed], b_, val[v_gamma], MPFR_RNDN);
    // atanh(b) = log1p(2 b / (1 - b)) / 2, see above.
    mpfr_set_prec(z_, pt);
    mpfr_div(z_, b_, val[v_deficit], MPFR_RNDN);
    mpfr_mul_2ui(z_, z_, 1, MPFR_RNDN);
    mpfr_set_prec(val[v_rapidity], pt);
    mpfr_log1p(val[v_rapidity], z_, MPFR_RNDN);
    mpfr_div_2ui(val[v_rapidity], val[v_rapidity], 1, MPFR_RNDN);
  }

 private:
  // precision_for caps at 8000 bits; a second evaluation may double that.
  static constexpr mpfr_prec_t cap = 16384;
  mpfr_t b_, t_, d_, x_, y_, e_, z_;
};

/// Whether a and b agree to a relative 2^-bits (both zero counts as agreement).
bool agree(const mpfr_t a, const mpfr_t b, long bits) {
  if (mpfr_zero_p(a) || mpfr_zero_p(b)) return mpfr_zero_p(a) && mpfr_zero_p(b);
  if (mpfr_nan_p(a) || mpfr_nan_p(b)) return false;
  ez_test::mp d(64);
  mpfr_sub(d.v, a, b, MPFR_RNDN);
  if (mpfr_zero_p(d.v)) return true;
  return static_cast<long>(mpfr_get_exp(d.v)) - static_cast<long>(mpfr_get_exp(b)) <= -bits;
}

// ---- measurement --------------------------------------------------------------------------------

/// The correctly rounded value of one reference value and the scale of its ulp; then the
/// error of any result against it.  Every flavour of one view shares one target.
template <class T>
struct target {
  T cr = T(0);
  bool normal = false;
  bool finite = false;
  long scale = 0;      // ulp(cr) = 2^-scale
  double frac0 = 0;    // |reference - cr| in ulps
  bool near_midpoint = false;  // within 1e-9 ulp of a midpoint: to be settled (meter::settle)
  const mpfr_t* ref = nullptr;
};

struct error_of {
  double frac;
  std::int64_t dist;
  bool normal;
  bool finite;  // the result is finite
};

/// Per-thread MPFR scratch for the measurements (64 bits hold every tested T exactly).
struct meter {
  mpfr_t c, g, diff, mid;
  meter() {
    mpfr_init2(c, 64);
    mpfr_init2(g, 64);
    mpfr_init2(diff, 64);
    mpfr_init2(mid, 72);
  }
  meter(const meter&) = delete;
  meter& operator=(const meter&) = delete;
  ~meter() {
    mpfr_clear(c);
    mpfr_clear(g);
    mpfr_clear(diff);
    mpfr_clear(mid);
  }

  template <class T>
  target<T> prepare(const mpfr_t& ref) {
    target<T> tg;
    tg.ref = &ref;
    set_cr(tg, ez_test::round_to<T>(ref));
    // Midpoints.  Many exact values are midpoints of T (1 + m for a gamma_m1 input m needs up
    // to digits + 2 bits), and others lie extremely close to one without being on it (gamma
    // - 1 = eta^2/2 (1 + eta^2/12 + ...) from a rapidity eta with few significant bits).  The
    // reference rounds either kind to one side or the other at random, so a result within
    // 1e-9 ulp of a midpoint (1/2 ulp from cr, or 1/4 ulp below a power of two, where the ulp
    // below is half the ulp above; frac0 carries 64 correct bits) is settled by settle().
    tg.near_midpoint = tg.finite && tg.cr != 0 &&
                       (std::fabs(tg.frac0 - 0.5) < 1e-9 || std::fabs(tg.frac0 - 0.25) < 1e-9);
    return tg;
  }

  /// Decides a result next to a midpoint with the reference at about twice the precision p
  /// of the first one (`hi`, same formulas).  The first reference is within ~2^-256 relative
  /// of the exact value (the margin of ez_test::precision_for), the second within
  /// ~2^-(p + 256).  If `hi` lies within 2^-(p + 128) relative of the midpoint, the exact
  /// value is the midpoint (a value that close to one but off it could not have been told
  /// apart by the first reference either), and the correctly rounded value is the neighbour
  /// with an even last digit: round to nearest, ties to even.  Otherwise `hi` decides.
  template <class T>
  void settle(target<T>& tg, const mpfr_t& hi, mpfr_prec_t p) {
    tg.ref = &hi;
    set_cr(tg, ez_test::round_to<T>(hi));
    if (!tg.finite || tg.cr == 0) return;
    ez_test::set_exact(c, tg.cr);
    mpfr_sub(diff, hi, c, MPFR_RNDN);
    if (mpfr_zero_p(diff)) return;  // exactly representable
    const T other = std::nextafter(tg.cr, mpfr_sgn(diff) > 0 ? std::numeric_limits<T>::infinity()
                                                              : -std::numeric_limits<T>::infinity());
    if (!std::isfinite(other)) return;
    ez_test::set_exact(g, other);
    mpfr_add(mid, c, g, MPFR_RNDN);  // exact: 72 bits hold the sum of two neighbours
    mpfr_div_2ui(mid, mid, 1, MPFR_RNDN);
    mpfr_sub(diff, hi, mid, MPFR_RNDN);
    const bool on_midpoint =
        mpfr_zero_p(diff) || static_cast<long>(mpfr_get_exp(diff)) - static_cast<long>(mpfr_get_exp(mid)) <
                                 -static_cast<long>(p + 128);
    if (on_midpoint && !even(tg.cr)) set_cr(tg, other);
  }

  // cr, its ulp (spacing above |cr| for normal numbers, denorm_min below, as
  // ez_test::measure) and |reference - cr| in those ulps.
  template <class T>
  void set_cr(target<T>& tg, T cr) {
    tg.cr = cr;
    tg.normal = std::isnormal(cr);
    tg.finite = std::isfinite(cr);
    if (!tg.finite) return;
    int ex = (cr == 0) ? std::numeric_limits<T>::min_exponent : std::ilogb(cr);
    if (ex < std::numeric_limits<T>::min_exponent - 1) ex = std::numeric_limits<T>::min_exponent - 1;
    tg.scale = -(static_cast<long>(ex) - std::numeric_limits<T>::digits + 1);
    ez_test::set_exact(c, cr);
    mpfr_sub(diff, *tg.ref, c, MPFR_RNDN);  // rounded to 64 bits: the error of the error is 2^-64
    mpfr_mul_2si(diff, diff, tg.scale, MPFR_RNDN);
    tg.frac0 = std::fabs(mpfr_get_d(diff, MPFR_RNDN));
  }

  // Whether the last significand bit of a normal x is 0.
  template <class T>
  static bool even(T x) {
    int e = 0;
    const T m = std::ldexp(std::frexp(x, &e), std::numeric_limits<T>::digits);  // an integer
    return std::fmod(m, T(2)) == 0;
  }

  template <class T>
  error_of measure(const target<T>& tg, T got) {
    error_of e{0.0, 0, tg.normal, std::isfinite(got)};
    if (got == tg.cr) {  // the common case: no MPFR work at all
      e.frac = tg.frac0;
      return e;
    }
    e.dist = eigenzeit::numeric::ulp_distance(got, tg.cr);
    if (!e.finite || !tg.finite) {
      e.frac = e.dist == 0 ? 0.0 : std::numeric_limits<double>::infinity();
      return e;
    }
    ez_test::set_exact(g, got);
    mpfr_sub(diff, g, *tg.ref, MPFR_RNDN);
    mpfr_mul_2si(diff, diff, tg.scale, MPFR_RNDN);
    e.frac = std::fabs(mpfr_get_d(diff, MPFR_RNDN));
    return e;
  }
};

// ---- statistics -----------------------------------------------------------------------------

struct stats {
  long n = 0;          // results whose correctly rounded value is normal (failed ones included)
  long n_exact = 0;    // ... equal to the correctly rounded value
  long n_failed = 0;   // ... inf or NaN although the exact value is finite
  long n_outside = 0;  // correctly rounded value subnormal, zero or not finite
  std::int64_t max_dist_outside = 0;
  double max_frac = 0, sum_frac = 0;
  std::int64_t max_dist = 0;  // over the normal results, failed ones included
  bool have_worst = false;
  long double worst_x = 0, worst_y = 0;
  std::int64_t worst_dist = 0;
  double worst_frac = 0;
  long n_threw = 0;          // library calls that threw on a valid input (also counted above)
  std::string threw_what;    // the first such message, with its input
  long double threw_x = 0, threw_y = 0;

  void add_exception(const std::string& what, long double x, long double y) {
    if (n_threw++ == 0) {
      threw_what = what;
      threw_x = x;
      threw_y = y;
    }
  }

  void add(const error_of& e, long double x, long double y) {
    if (!e.normal) {
      ++n_outside;
      max_dist_outside = std::max(max_dist_outside, e.dist);
      return;
    }
    ++n;
    if (e.dist == 0) ++n_exact;
    max_dist = std::max(max_dist, e.dist);
    const double frac = e.finite ? e.frac : std::numeric_limits<double>::infinity();
    if (!e.finite) ++n_failed;
    else sum_frac += e.frac;
    max_frac = std::max(max_frac, frac);
    if (worse(e.dist, frac)) set_worst(x, y, e.dist, frac);
  }
  // The worst input: the largest integer distance first (a result 0.5 + 2^-80 ulp off and a
  // correct one 0.5 - 2^-80 ulp off have the same fractional error in double), then the
  // largest fractional error.
  bool worse(std::int64_t dist, double frac) const {
    return !have_worst || dist > worst_dist || (dist == worst_dist && frac > worst_frac);
  }
  void set_worst(long double x, long double y, std::int64_t dist, double frac) {
    have_worst = true;
    worst_x = x;
    worst_y = y;
    worst_dist = dist;
    worst_frac = frac;
  }
  void merge(const stats& o) {
    if (o.have_worst && worse(o.worst_dist, o.worst_frac))
      set_worst(o.worst_x, o.worst_y, o.worst_dist, o.worst_frac);
    max_frac = std::max(max_frac, o.max_frac);
    if (n_threw == 0 && o.n_threw > 0) {
      threw_what = o.threw_what;
      threw_x = o.threw_x;
      threw_y = o.threw_y;
    }
    n_threw += o.n_threw;
    n += o.n;
    n_exact += o.n_exact;
    n_failed += o.n_failed;
    n_outside += o.n_outside;
    max_dist_outside = std::max(max_dist_outside, o.max_dist_outside);
    sum_frac += o.sum_frac;
    max_dist = std::max(max_dist, o.max_dist);
  }
  long finite() const { return n - n_failed; }
  double mean() const { return finite() > 0 ? sum_frac / static_cast<double>(finite()) : 0.0; }
  double share_exact() const { return n > 0 ? static_cast<double>(n_exact) / static_cast<double>(n) : 0.0; }
  long inputs() const { return n + n_outside; }
};

// Slots of one (routine, region): the eight views, then the five free functions (used by
// from_beta only, whose inputs they share).
constexpr int n_slots = n_views + n_free;

struct type_results {
  stats s[n_ctors][max_regions][n_slots][n_flavours];
  long inputs[n_ctors][max_regions] = {};
  void merge(const type_results& o) {
    for (int c = 0; c < n_ctors; ++c)
      for (int r = 0; r < max_regions; ++r) {
        inputs[c][r] += o.inputs[c][r];
        for (int k = 0; k < n_slots; ++k)
          for (int f = 0; f < n_flavours; ++f) s[c][r][k][f].merge(o.s[c][r][k][f]);
      }
  }
};

/// Max ulp per input bin, for the plots.  Only results inside the contract region count.
struct bin {
  long n = 0;
  double max = 0;
};
struct bin_table {
  int per_region = 0;
  std::vector<bin> b;
  void init(int bins) {
    per_region = bins;
    b.assign(static_cast<std::size_t>(n_ctors * max_regions * n_slots * n_flavours) *
                 static_cast<std::size_t>(bins), bin());
  }
  std::size_t index(int c, int r, int k, int f, int i) const {
    const std::size_t row = static_cast<std::size_t>(((c * max_regions + r) * n_slots + k) * n_flavours + f);
    return row * static_cast<std::size_t>(per_region) + static_cast<std::size_t>(i);
  }
  bin& at(int c, int r, int k, int f, int i) { return b[index(c, r, k, f, i)]; }
  const bin& at(int c, int r, int k, int f, int i) const { return b[index(c, r, k, f, i)]; }
  void merge(const bin_table& o) {
    for (std::size_t i = 0; i < b.size(); ++i) {
      b[i].n += o.b[i].n;
      b[i].max = std::max(b[i].max, o.b[i].max);
    }
  }
};

// ---- the work -----------------------------------------------------------------------------

struct run_config {
  long samples = 1000000;
  long samples_float = 0, samples_long_double = 0;  // 0: samples / 10
  bool samples_given = false;
  bool quick = false;
  bool check = false;
  std::vector<int> types;
  unsigned threads = 0;
  unsigned long long seed = 1;
  int bins_per_region = 200;
  int bins_type = t_double;
  long verify_every = 1024;
  bool verify_given = false;
  std::string text, markdown, csv, bins;
  std::string command;  // the command line, for the report
};

long samples_for(const run_config& cfg, int t) {
  if (t == t_double) return cfg.samples;
  const long n = t == t_float ? cfg.samples_float : cfg.samples_long_double;
  return n > 0 ? n : std::max(200L, cfg.samples / 10);
}

constexpr long block_size = 8192;

struct task {
  int type, ctor_index, region;
  long block, count;
};

struct shared_state {
  std::atomic<std::size_t> next{0};
  std::atomic<long> done{0};
  std::atomic<long> verified{0};
  std::atomic<bool> stop{false};
  std::atomic<int> running{0};
  std::mutex mutex;
  std::string error;

  void fail(const std::string& message) {
    std::lock_guard<std::mutex> lock(mutex);
    if (error.empty()) error = message;
    stop.store(true);
  }
};

struct thread_out {
  std::vector<type_results> res;  // one per type of cfg.types, in that order
  bin_table bins;
  double seconds[n_types] = {};  // CPU seconds per type
};

/// Results of one flavour for one input; a call that throws gives NaN and keeps its message
/// (the library must not throw on a valid input: such results count as failed).
template <class T, int N>
struct results {
  T v[N];
  bool threw[N] = {};
  std::string what[N];

  template <class F>
  void set(int k, F&& call) {
    try {
      v[k] = call();
    } catch (const std::exception& e) {
      fail(k, e.what());
    }
  }
  void fail(int k, const char* message) {
    v[k] = std::numeric_limits<T>::quiet_NaN();
    threw[k] = true;
    what[k] = message;
  }
};

template <class T, class Speed>
void read_views(const Speed& s, results<T, n_views>& out) {
  using namespace ez_test;
  out.set(v_beta, [&] { return s.beta(); });
  out.set(v_deficit, [&] { return s.beta_deficit(); });
  out.set(v_gamma, [&] { return s.gamma(); });
  out.set(v_gamma_m1, [&] { return s.gamma_m1(); });
  out.set(v_inv_gamma, [&] { return s.inv_gamma(); });
  out.set(v_dilation, [&] { return s.dilation_fraction(); });
  out.set(v_rapidity, [&] { return s.rapidity(); });
  out.set(v_proper_speed, [&] { return s.proper_speed(); });
}

/// The views of constructor c's speed, default mode (Policy = throw_policy) or the correctly
/// rounded mode (Policy = the type of eigenzeit::correctly_rounded).
template <class T, class Policy>
void library_views(ctor c, T x, T y, const Policy& pol, results<T, n_views>& out) {
  using S = eigenzeit::speed<T>;
  try {
    switch (c) {
      case ctor::beta: read_views(S::from_beta(x, pol), out); return;
      case ctor::beta_deficit: read_views(S::from_beta_deficit(x, pol), out); return;
      case ctor::gamma: read_views(S::from_gamma(x, pol), out); return;
      case ctor::gamma_m1: read_views(S::from_gamma_m1(x, pol), out); return;
      case ctor::rapidity: read_views(S::from_rapidity(x, pol), out); return;
      case ctor::proper_speed: read_views(S::from_proper_speed(x, pol), out); return;
      case ctor::kinetic_energy: read_views(S::from_kinetic_energy(x, y, pol), out); return;
      case ctor::momentum: read_views(S::from_momentum(x, y, pol), out); return;
    }
  } catch (const std::exception& e) {  // the construction itself threw
    for (int v = 0; v < n_views; ++v) out.fail(v, e.what());
  }
}

template <class T, class Policy>
void library_free(T b, const Policy& pol, results<T, n_free>& out) {
  out.set(0, [&] { return eigenzeit::lorentz_factor(b, pol); });
  out.set(1, [&] { return eigenzeit::lorentz_factor_m1(b, pol); });
  out.set(2, [&] { return eigenzeit::proper_speed(b, pol); });
  out.set(3, [&] { return eigenzeit::dilation_fraction(b, pol); });
  out.set(4, [&] { return eigenzeit::rapidity(b, pol); });
}

/// Bin index of `v` in region r (log-spaced).
int bin_index(const region_def& r, long double v, int bins) {
  if (!(v > r.lo)) return 0;
  const long double f = std::log(v / r.lo) / std::log(r.hi / r.lo);
  const long i = static_cast<long>(f * bins);
  return static_cast<int>(std::min<long>(std::max<long>(i, 0), bins - 1));
}

/// One block of inputs of (T, constructor, region).
template <class T>
void run_block(const run_config& cfg, const task& tk, type_results& out, bin_table* bins,
               fast_reference& ref, fast_reference& ref_hi, meter& m, shared_state& sh) {
  const ctor c = all_ctors[tk.ctor_index];
  const region_set rs = regions_of<T>(c);
  const region_def& reg = rs.r[tk.region];
  const int digits = std::numeric_limits<T>::digits;
  std::seed_seq seq{static_cast<unsigned>(cfg.seed & 0xffffffffu), static_cast<unsigned>(cfg.seed >> 32),
                    static_cast<unsigned>(tk.type), static_cast<unsigned>(tk.ctor_index),
                    static_cast<unsigned>(tk.region), static_cast<unsigned>(tk.block)};
  std::mt19937_64 engine(seq);
  // The bounds pass through volatile so that their logs are always run-time calls (see
  // tests/support/sampler.hpp): the inputs are then the same whatever the compiler folds.
  volatile long double vlo = reg.lo, vhi = reg.hi, vmlo = 1e-3L, vmhi = 1e6L;
  const long double llo = std::log(vlo), lhi = std::log(vhi);
  const long double mlo = std::log(vmlo), mhi = std::log(vmhi);
  std::uniform_real_distribution<long double> unit(0.0L, 1.0L);

  auto& rs_out = out.s[tk.ctor_index][tk.region];
  const bool two = ez_test::two_inputs(c);
  long verify_phase = static_cast<long>(tk.block * block_size) % std::max(1L, cfg.verify_every);

  for (long i = 0; i < tk.count; ++i) {
    if ((i & 255) == 0 && sh.stop.load(std::memory_order_relaxed)) return;
    T x = T(0), y = T(1);
    long double actual = 0;
    for (int attempt = 0;; ++attempt) {
      const long double v = std::exp(llo + (lhi - llo) * unit(engine));
      const long double mass = two ? std::exp(mlo + (mhi - mlo) * unit(engine)) : 1.0L;
      if (make_input<T>(c, reg, v, mass, x, y, actual)) break;
      if (attempt > 100) throw std::runtime_error("cannot draw an input in region " + std::string(reg.name));
    }
    const long double lx = static_cast<long double>(x), ly = two ? static_cast<long double>(y) : 0.0L;
    ref.compute(c, lx, static_cast<long double>(y), digits);

    if (cfg.verify_every > 0 && (i + verify_phase) % cfg.verify_every == 0) {
      const ez_test::reference check(c, lx, static_cast<long double>(y), digits);
      for (int v = 0; v < n_views; ++v)
        if (!agree(ref.val[v], check.val[v].v, 2L * digits + 64)) {
          char buf[256];
          std::snprintf(buf, sizeof buf, "reference disagreement: %s, view %s, input %.21Lg, %.21Lg",
                        ez_test::ctor_name(c), ez_test::view_name(v), lx, static_cast<long double>(y));
          throw std::runtime_error(buf);
        }
      sh.verified.fetch_add(1, std::memory_order_relaxed);
    }

    target<T> tg[n_views];
    bool near_midpoint = false;
    for (int v = 0; v < n_views; ++v) {
      tg[v] = m.template prepare<T>(ref.val[v]);
      near_midpoint = near_midpoint || tg[v].near_midpoint;
    }
    if (near_midpoint) {  // rare: evaluate again at twice the precision and decide there
      ref_hi.compute(c, lx, static_cast<long double>(y), digits, mpfr_get_prec(ref.val[0]));
      for (int v = 0; v < n_views; ++v)
        if (tg[v].near_midpoint) m.settle(tg[v], ref_hi.val[v], mpfr_get_prec(ref.val[v]));
    }
    const int bi = bins ? bin_index(reg, actual, bins->per_region) : 0;

    auto record = [&](int slot, int f, const target<T>& t, T got, long double wx, const std::string* threw) {
      const error_of e = m.measure(t, got);
      rs_out[slot][f].add(e, wx, ly);
      if (threw) rs_out[slot][f].add_exception(*threw, wx, ly);
      if (bins && e.normal) {
        bin& b = bins->at(tk.ctor_index, tk.region, slot, f, bi);
        ++b.n;
        const double fr = e.finite ? e.frac : std::numeric_limits<double>::infinity();
        if (fr > b.max) b.max = fr;
      }
    };

    results<T, n_views> lib, cr;
    library_views(c, x, y, eigenzeit::throw_policy(), lib);
    library_views(c, x, y, eigenzeit::correctly_rounded, cr);
    T naive[n_views];
    ez_test::naive::views(c, x, y, naive);
    for (int v = 0; v < n_views; ++v) {
      record(v, f_lib, tg[v], lib.v[v], lx, lib.threw[v] ? &lib.what[v] : nullptr);
      record(v, f_cr, tg[v], cr.v[v], lx, cr.threw[v] ? &cr.what[v] : nullptr);
      record(v, f_naive, tg[v], naive[v], lx, nullptr);
    }

    if (c == ctor::beta) {
      // The free functions on the same |beta| with a random sign; odd functions are compared
      // after an exact sign flip, since the reference is for |beta|.
      const bool negative = (engine() & 1) != 0;
      const T b = negative ? -x : x;
      const long double lb = static_cast<long double>(b);
      results<T, n_free> fl, fc;
      library_free(b, eigenzeit::throw_policy(), fl);
      library_free(b, eigenzeit::correctly_rounded, fc);
      const T fn[n_free] = {ez_test::naive::lorentz_factor(b), ez_test::naive::lorentz_factor_m1(b),
                            ez_test::naive::proper_speed(b), ez_test::naive::dilation_fraction(b),
                            ez_test::naive::rapidity(b)};
      for (int k = 0; k < n_free; ++k) {
        const bool flip = free_odd[k] && negative;
        const target<T>& t = tg[free_view[k]];
        record(n_views + k, f_lib, t, flip ? T(-fl.v[k]) : fl.v[k], lb, fl.threw[k] ? &fl.what[k] : nullptr);
        record(n_views + k, f_cr, t, flip ? T(-fc.v[k]) : fc.v[k], lb, fc.threw[k] ? &fc.what[k] : nullptr);
        record(n_views + k, f_naive, t, flip ? T(-fn[k]) : fn[k], lb, nullptr);
      }
    }
    if ((i & 1023) == 1023) sh.done.fetch_add(1024, std::memory_order_relaxed);
  }
  sh.done.fetch_add(tk.count & 1023, std::memory_order_relaxed);
  out.inputs[tk.ctor_index][tk.region] += tk.count;
}

/// CPU time of the calling thread (POSIX), so that the cost per type is not inflated by
/// other load on the machine.
double thread_cpu_seconds() {
  timespec ts{};
  clock_gettime(CLOCK_THREAD_CPUTIME_ID, &ts);
  return static_cast<double>(ts.tv_sec) + 1e-9 * static_cast<double>(ts.tv_nsec);
}

void worker(const run_config& cfg, const std::vector<task>& tasks, thread_out& out,
            shared_state& sh) {
  try {
    fast_reference ref, ref_hi;
    meter m;
    for (;;) {
      if (sh.stop.load()) break;
      const std::size_t i = sh.next.fetch_add(1);
      if (i >= tasks.size()) break;
      const task& tk = tasks[i];
      std::size_t j = 0;
      while (cfg.types[j] != tk.type) ++j;
      bin_table* bins = tk.type == cfg.bins_type && !out.bins.b.empty() ? &out.bins : nullptr;
      const double start = thread_cpu_seconds();
      if (tk.type == t_float) run_block<float>(cfg, tk, out.res[j], bins, ref, ref_hi, m, sh);
      else if (tk.type == t_double) run_block<double>(cfg, tk, out.res[j], bins, ref, ref_hi, m, sh);
      else run_block<long double>(cfg, tk, out.res[j], bins, ref, ref_hi, m, sh);
      out.seconds[tk.type] += thread_cpu_seconds() - start;
    }
  } catch (const std::exception& e) {
    sh.fail(e.what());
  } catch (...) {
    sh.fail("unknown exception");
  }
  mpfr_free_cache();
  sh.running.fetch_sub(1);
}

// ---- formatting -------------------------------------------------------------------------------

#if defined(__GNUC__)
std::string fmt(const char* format, ...) __attribute__((format(printf, 1, 2)));
#endif
std::string fmt(const char* format, ...) {
  char buf[1024];
  va_list args;
  va_start(args, format);
  std::vsnprintf(buf, sizeof buf, format, args);
  va_end(args);
  return buf;
}

std::string fmt_ulp(double x, int decimals = 3) {
  if (std::isinf(x)) return "inf";
  if (std::isnan(x)) return "nan";
  if (x >= 1e3) return fmt("%.2e", x);
  return fmt("%.*f", decimals, x);
}

std::string fmt_dist(std::int64_t d) {
  if (d == std::numeric_limits<std::int64_t>::max()) return ">9.2e+18";
  if (d >= 1000000) return fmt("%.2e", static_cast<double>(d));
  return fmt("%lld", static_cast<long long>(d));
}

std::string fmt_share(const stats& s) {
  if (s.n == 0) return "-";
  if (s.n_exact == s.n) return "100%";
  if (s.n_exact == 0) return "0%";
  return fmt("%.4f%%", 100.0 * s.share_exact());
}

std::string fmt_range(long double x) { return fmt("%.3Lg", x); }

std::string fmt_input(long double x, int digits) { return fmt("%.*Lg", digits, x); }

std::string fmt_count(long n) {
  if (n >= 1000000 && n % 1000000 == 0) return fmt("%ldM", n / 1000000);
  return fmt("%ld", n);
}

/// The routine a slot belongs to, for tables: "from_beta" or "lorentz_factor" etc.
const char* routine_name(int ci, int slot) {
  return slot < n_views ? ez_test::ctor_name(all_ctors[ci]) : free_names[slot - n_views];
}
int slot_bound(int ci, int slot) {
  return slot < n_views ? contract_bound(all_ctors[ci], slot) : contract_bound_free(slot - n_views);
}
const char* slot_formula(int ci, int slot) {
  return slot < n_views ? ez_test::naive::formula(all_ctors[ci], slot) : free_formulas[slot - n_views];
}

/// Statistics over all regions of one routine slot.
stats all_regions(const type_results& r, int ci, int slot, int f) {
  stats s;
  for (int g = 0; g < max_regions; ++g) s.merge(r.s[ci][g][slot][f]);
  return s;
}

// The rows of the tables: free functions first, then each constructor's views.
struct row_key {
  int ci, slot;
};
std::vector<row_key> table_rows() {
  std::vector<row_key> rows;
  for (int k = 0; k < n_free; ++k) rows.push_back({0, n_views + k});
  for (int ci = 0; ci < n_ctors; ++ci)
    for (int v = 0; v < n_views; ++v) rows.push_back({ci, v});
  return rows;
}
std::string row_label(const row_key& k) {
  if (k.slot >= n_views) return std::string(free_names[k.slot - n_views]) + "(beta)";
  return std::string(ez_test::ctor_name(all_ctors[k.ci])) + ": " + ez_test::view_name(k.slot);
}

// ---- the contract -------------------------------------------------------------------------------

struct violation {
  std::string what;
};

std::vector<violation> check_contract(const run_config& cfg, const std::vector<type_results>& res) {
  std::vector<violation> out;
  for (std::size_t j = 0; j < cfg.types.size(); ++j) {
    const int t = cfg.types[j];
    for (const row_key& k : table_rows()) {
      const region_set rs = regions_of_type(t, all_ctors[k.ci]);
      for (int g = 0; g < rs.n; ++g) {
        if (!rs.r[g].used()) continue;
        const stats& lib = res[j].s[k.ci][g][k.slot][f_lib];
        const std::string where = fmt("%s %s, region %s", type_names[t], row_label(k).c_str(), rs.r[g].name);
        const int bound = slot_bound(k.ci, k.slot);
        for (int fl : {f_lib, f_cr}) {
          const stats& x = res[j].s[k.ci][g][k.slot][fl];
          if (x.n_threw > 0)
            out.push_back({where + fmt(": %s flavour: %ld calls threw, first at input %s: %s",
                                       flavour_names[fl], x.n_threw,
                                       fmt_input(x.threw_x, max_digits10_of(t)).c_str(),
                                       x.threw_what.c_str())});
        }
        if (lib.n_failed > 0)
          out.push_back({where + fmt(": %ld results inf or NaN (calls that threw included)", lib.n_failed)});
        if (lib.max_dist > bound)
          out.push_back({where + fmt(": distance %s > %d (max %s ulp; worst input %s)",
                                     fmt_dist(lib.max_dist).c_str(), bound,
                                     fmt_ulp(lib.max_frac).c_str(),
                                     fmt_input(lib.worst_x, max_digits10_of(t)).c_str())});
        const stats& cr = res[j].s[k.ci][g][k.slot][f_cr];
        if (cr.n_exact != cr.n)
          out.push_back({where + fmt(": correctly_rounded flavour: %ld of %ld results not "
                                     "correctly rounded (max %s ulp; worst input %s)",
                                     cr.n - cr.n_exact, cr.n, fmt_ulp(cr.max_frac).c_str(),
                                     fmt_input(cr.worst_x, max_digits10_of(t)).c_str())});
      }
    }
  }
  return out;
}

// ---- reports ------------------------------------------------------------------------------------

std::string compiler_text() {
#if defined(__clang__)
  std::string s = fmt("clang++ %d.%d.%d", __clang_major__, __clang_minor__, __clang_patchlevel__);
#elif defined(__GNUC__)
  std::string s = fmt("g++ %d.%d.%d", __GNUC__, __GNUC_MINOR__, __GNUC_PATCHLEVEL__);
#else
  std::string s = "unknown compiler";
#endif
  s += EIGENZEIT_HAS_FAST_FMA ? ", hardware fma" : ", fma as a library call";
  return s;
}

/// Summary on stdout: per type, each routine over all its regions, three flavours.
void print_summary(std::FILE* f, const run_config& cfg, const std::vector<type_results>& res) {
  for (std::size_t j = 0; j < cfg.types.size(); ++j) {
    const int t = cfg.types[j];
    std::fprintf(f, "\n== %s: max ulp (integer distance) and share correctly rounded, all regions; "
                    "%ld inputs per region ==\n", type_names[t], samples_for(cfg, t));
    std::fprintf(f, "%-40s %-24s %-24s %-24s\n", "routine", "eigenzeit", "correctly_rounded", "naive");
    for (const row_key& k : table_rows()) {
      std::string cols[n_flavours];
      for (int fl = 0; fl < n_flavours; ++fl) {
        const stats s = all_regions(res[j], k.ci, k.slot, fl);
        cols[fl] = fmt("%s (%s) %s", fmt_ulp(s.max_frac).c_str(), fmt_dist(s.max_dist).c_str(), fmt_share(s).c_str());
      }
      std::fprintf(f, "%-40s %-24s %-24s %-24s\n", row_label(k).c_str(), cols[f_lib].c_str(),
                   cols[f_cr].c_str(), cols[f_naive].c_str());
    }
  }
}

bool write_text(const run_config& cfg, const std::vector<type_results>& res) {
  std::FILE* f = std::fopen(cfg.text.c_str(), "w");
  if (!f) return false;
  std::fprintf(f, "Accuracy of the eigenzeit speed routines against MPFR %s (ulps of the correctly "
                  "rounded result).\n"
                  "max/mean = fractional ulps; dist = max integer distance to the correctly rounded "
                  "value; cr = share correctly rounded;\noutside = results whose correctly rounded "
                  "value is subnormal or zero (outside the contract; max dist in brackets);\n"
                  "failed = inf/NaN where the exact value is finite.  %s, eigenzeit %d.%d.%d, seed %llu.\n",
               mpfr_get_version(), compiler_text().c_str(), EIGENZEIT_VERSION_MAJOR,
               EIGENZEIT_VERSION_MINOR, EIGENZEIT_VERSION_PATCH, cfg.seed);
  for (std::size_t j = 0; j < cfg.types.size(); ++j) {
    const int t = cfg.types[j];
    const bool by_region = t == t_double;  // the other types: all regions only (per region: CSV)
    std::fprintf(f, "\n== %s: %ld inputs per region%s ==\n", type_names[t], samples_for(cfg, t),
                 by_region ? "" : "; all regions together (per region: accuracy.csv)");
    std::fprintf(f, "%-40s %-9s %-17s %9s %10s %9s %9s %10s %15s %6s  %s\n", "routine", "region",
                 "flavour", "count", "max ulp", "mean ulp", "dist", "cr", "outside", "failed",
                 "worst input");
    for (const row_key& k : table_rows()) {
      const region_set rs = regions_of_type(t, all_ctors[k.ci]);
      for (int g = -1; g < (by_region ? rs.n : 0); ++g) {
        if (g >= 0 && !rs.r[g].used()) continue;
        for (int fl = 0; fl < n_flavours; ++fl) {
          const stats s = g < 0 ? all_regions(res[j], k.ci, k.slot, fl) : res[j].s[k.ci][g][k.slot][fl];
          const std::string outside = fmt("%ld (%s)", s.n_outside, fmt_dist(s.max_dist_outside).c_str());
          std::string worst = "-";
          if (s.have_worst && s.max_frac > 0) {
            worst = fmt_input(s.worst_x, max_digits10_of(t));
            if (ez_test::two_inputs(all_ctors[k.ci]) && k.slot < n_views)
              worst += " (mass " + fmt_input(s.worst_y, max_digits10_of(t)) + ")";
          }
          const std::string failed = s.n_threw ? fmt("%ld (%ld threw)", s.n_failed, s.n_threw) : fmt("%ld", s.n_failed);
          std::fprintf(f, "%-40s %-9s %-17s %9ld %10s %9s %9s %10s %15s %6s  %s\n",
                       (g < 0 && fl == 0) ? row_label(k).c_str() : "",
                       fl == 0 ? (g < 0 ? "all" : rs.r[g].name) : "", flavour_names[fl], s.n,
                       fmt_ulp(s.max_frac).c_str(), fmt_ulp(s.mean(), 4).c_str(),
                       fmt_dist(s.max_dist).c_str(), fmt_share(s).c_str(), outside.c_str(),
                       failed.c_str(), worst.c_str());
        }
      }
    }
  }
  return std::fclose(f) == 0;
}

void csv_row(std::FILE* f, int t, const row_key& k, const char* region, const region_def* rd,
             int fl, const stats& s) {
  const int d = max_digits10_of(t);
  const bool mass = ez_test::two_inputs(all_ctors[k.ci]) && k.slot < n_views;
  auto num = [](double x) { return std::isinf(x) ? std::string("inf") : fmt("%.9g", x); };
  std::fprintf(f, "%s,%s,%s,%s,%s,%s,%s,%s,%s,%d,%ld,%ld,%ld,%lld,%ld,%ld,%s,%s,%lld,%s,%s,%s,\"%s\"\n",
               type_names_csv[t], k.slot < n_views ? "constructor" : "function",
               routine_name(k.ci, k.slot), k.slot < n_views ? ez_test::view_name(k.slot) : ez_test::view_name(free_view[k.slot - n_views]),
               region, rd ? variable_names[rd->var] : "", rd ? fmt("%.6Lg", rd->lo).c_str() : "",
               rd ? fmt("%.6Lg", rd->hi).c_str() : "", flavour_names[fl], slot_bound(k.ci, k.slot),
               s.inputs(), s.n, s.n_outside, static_cast<long long>(s.max_dist_outside), s.n_failed, s.n_threw,
               num(s.max_frac).c_str(), num(s.mean()).c_str(), static_cast<long long>(s.max_dist),
               fmt("%.9g", s.share_exact()).c_str(),
               s.have_worst && s.max_frac > 0 ? fmt_input(s.worst_x, d).c_str() : "",
               s.have_worst && s.max_frac > 0 && mass ? fmt_input(s.worst_y, d).c_str() : "",
               fl == f_naive ? slot_formula(k.ci, k.slot) : "");
}

bool write_csv(const run_config& cfg, const std::vector<type_results>& res) {
  std::FILE* f = std::fopen(cfg.csv.c_str(), "w");
  if (!f) return false;
  std::fprintf(f, "type,kind,routine,view,region,variable,range_lo,range_hi,flavour,contract_ulp,"
                  "inputs,count,outside,outside_max_dist,failed,threw,max_ulp,mean_ulp,max_dist,"
                  "share_correctly_rounded,worst_input,worst_mass,naive_formula\n");
  for (std::size_t j = 0; j < cfg.types.size(); ++j) {
    const int t = cfg.types[j];
    for (const row_key& k : table_rows()) {
      const region_set rs = regions_of_type(t, all_ctors[k.ci]);
      for (int g = -1; g < rs.n; ++g) {
        if (g >= 0 && !rs.r[g].used()) continue;
        for (int fl = 0; fl < n_flavours; ++fl) {
          const stats s = g < 0 ? all_regions(res[j], k.ci, k.slot, fl) : res[j].s[k.ci][g][k.slot][fl];
          csv_row(f, t, k, g < 0 ? "all" : rs.r[g].name, g < 0 ? nullptr : &rs.r[g], fl, s);
        }
      }
    }
  }
  return std::fclose(f) == 0;
}

bool write_bins(const run_config& cfg, const bin_table& bins) {
  std::FILE* f = std::fopen(cfg.bins.c_str(), "w");
  if (!f) return false;
  const int t = cfg.bins_type;
  std::fprintf(f, "type,family,routine,view,flavour,contract_ulp,region,variable,region_lo,"
                  "region_hi,bin_lo,bin_hi,count,max_ulp\n");
  const bin_table& b = bins;
  for (const row_key& k : table_rows()) {
    const region_set rs = regions_of_type(t, all_ctors[k.ci]);
    const char* family = k.slot < n_views ? ez_test::ctor_name(all_ctors[k.ci]) : "free_functions";
    for (int g = 0; g < rs.n; ++g) {
      const region_def& rd = rs.r[g];
      if (!rd.used()) continue;
      for (int fl = 0; fl < n_flavours; ++fl) {
        for (int i = 0; i < b.per_region; ++i) {
          const bin& x = b.at(k.ci, g, k.slot, fl, i);
          if (x.n == 0) continue;
          const long double w = std::log(rd.hi / rd.lo) / b.per_region;
          std::fprintf(f, "%s,%s,%s,%s,%s,%d,%s,%s,%.17Lg,%.17Lg,%.6Lg,%.6Lg,%ld,%s\n", type_names_csv[t],
                       family, routine_name(k.ci, k.slot),
                       ez_test::view_name(k.slot < n_views ? k.slot : free_view[k.slot - n_views]),
                       flavour_names[fl], slot_bound(k.ci, k.slot), rd.name, variable_names[rd.var],
                       rd.lo, rd.hi, rd.lo * std::exp(w * i), rd.lo * std::exp(w * (i + 1)), x.n,
                       std::isinf(x.max) ? "inf" : fmt("%.4g", x.max).c_str());
        }
      }
    }
  }
  return std::fclose(f) == 0;
}

// The markdown report.
std::string md_cell(const stats& s) {
  if (s.n == 0) return "-";
  std::string c = fmt_ulp(s.max_frac);
  if (s.n_failed) c += fmt(" (%ld inf/NaN)", s.n_failed);
  if (s.n_threw) c += fmt(" (%ld threw)", s.n_threw);
  return c;
}

/// "max | mean | cr" for each flavour in report order: eigenzeit, correctly_rounded, naive.
std::string md_flavours(const stats (&s)[n_flavours]) {
  std::string out;
  for (int fl : {f_lib, f_cr, f_naive}) {
    const stats& x = s[fl];
    out += " " + md_cell(x) + " | " + (x.n ? fmt_ulp(x.mean(), 4) : std::string("-")) + " | " +
           fmt_share(x) + " |";
  }
  return out;
}
const char* const md_flavour_header =
    " eigenzeit max | mean | cr | correctly_rounded max | mean | cr | naive max | mean | cr |";
const char* const md_flavour_rule = "---:|---:|---:|---:|---:|---:|---:|---:|---:|";

bool write_markdown(const run_config& cfg, const std::vector<type_results>& res,
                    const std::vector<violation>& violations, double wall, long total,
                    const double (&seconds)[n_types], long verified) {
  std::string cpu;
  for (int t : cfg.types)
    cpu += (cpu.empty() ? "" : ", ") + fmt("%.0f s for %s", seconds[t], type_names[t]);
  std::FILE* f = std::fopen(cfg.markdown.c_str(), "w");
  if (!f) return false;
  std::time_t now = std::time(nullptr);
  char date[32];
  std::strftime(date, sizeof date, "%Y-%m-%d", std::gmtime(&now));

  std::fprintf(f, "# Accuracy report\n\n");
  std::fprintf(f, "Generated by `scripts/accuracy` (tools/accuracy.cpp) on %s: eigenzeit %d.%d.%d, "
                  "%s, MPFR %s, seed %llu, %u threads, %ld inputs in %.0f s.\n\n",
               date, EIGENZEIT_VERSION_MAJOR, EIGENZEIT_VERSION_MINOR, EIGENZEIT_VERSION_PATCH,
               compiler_text().c_str(), mpfr_get_version(), cfg.seed, cfg.threads, total, wall);
  std::fprintf(f, "Command: `%s`\n\n", cfg.command.c_str());
  std::fprintf(f,
               "> eigenzeit is not certified for safety-of-life use. These figures are measurements "
               "over random inputs, not a proof for every input; where a result feeds navigation, "
               "timing or other safety-related decisions, the governing interface specifications "
               "and your own validation take precedence.\n\n");
  std::fprintf(f,
               "Every public routine of `speed.hpp` (the five free functions of beta, and all eight "
               "views of a `speed<T>` from each of its eight named constructors) is compared with "
               "MPFR evaluating the quantity's definition formula on the exact input, in ulps of the "
               "correctly rounded result. Three flavours run on the same inputs:\n\n"
               "- **eigenzeit**: the library's default routines;\n"
               "- **correctly_rounded**: the library's correctly rounded mode "
               "(`eigenzeit::correctly_rounded` as the policy argument);\n"
               "- **naive**: the textbook formula of that quantity from the same input, every "
               "operation rounded once in the same type (formulas below).\n\n");
  std::fprintf(f,
               "Inputs: each constructor's domain is split into regions where the behaviour changes "
               "(a series branch, beta rounding to 1, a rescaled branch); inputs are drawn "
               "log-uniformly within each region, exact in the type under test. Inputs per region: "
               "%s in double, %s in float, %s in long double (the smaller sweeps confirm what double "
               "shows; the correctly rounded mode of long double runs on float128 and costs about "
               "100 us per input). The free functions share the inputs of `from_beta`, with a random "
               "sign. CPU time: %s.\n\n",
               fmt_count(samples_for(cfg, t_double)).c_str(), fmt_count(samples_for(cfg, t_float)).c_str(),
               fmt_count(samples_for(cfg, t_long_double)).c_str(), cpu.c_str());
  std::fprintf(f,
               "Columns: *max* = largest error in ulps of the correctly rounded value (fractional: "
               "0.5 means correctly rounded or a tie); *cr* = share of results equal to the correctly "
               "rounded value. Results whose correctly rounded value is subnormal or zero lie outside "
               "the precision contract and are left out (counted in accuracy.csv). *inf/NaN* counts "
               "results that overflowed or turned NaN where the exact value is a finite normal "
               "number.\n\n");
  std::fprintf(f,
               "Reference: the definition formulas (gamma = 1/sqrt(1 - beta^2), gamma - 1 = gamma "
               "minus one, and so on, beta from the constructor's input by its definition) in MPFR "
               "at a precision chosen per input to absorb their cancellation (256 + 2 digits bits "
               "of margin, plus twice the binary exponent of the input, plus 3 bits per unit of "
               "rapidity: up to about 2500 bits), with the rapidity as log1p(2 beta/(1 - beta))/2 "
               "at 256 bits and, for from_rapidity, beta from one exp or expm1 at 256 + 2 digits "
               "bits. %ld inputs were recomputed with the test "
               "suite's reference (tests/support/reference.hpp) and agreed to 2^-(2 digits + 64). "
               "Results within 1e-9 ulp of a midpoint between two neighbours are decided by a second "
               "evaluation at twice the precision; exact midpoints (1 + m for many gamma - 1 inputs "
               "m) count with round-half-to-even as the correctly rounded value.\n\n",
               verified);
  std::fprintf(f, "Contract (DESIGN.md): at most 1 ulp (integer distance to the correctly rounded "
                  "value) for every algebraic quantity, at most 2 for the rapidity and every view of "
                  "`from_rapidity`; the correctly rounded mode always correctly rounded. ");
  if (violations.empty()) std::fprintf(f, "**This run: no result broke the contract.**\n\n");
  else std::fprintf(f, "**This run: %zu contract violation%s, listed at the end.**\n\n", violations.size(),
                    violations.size() == 1 ? "" : "s");

  // Headline: double, all regions.
  const auto dj = std::find(cfg.types.begin(), cfg.types.end(), t_double);
  if (dj != cfg.types.end()) {
    const type_results& r = res[static_cast<std::size_t>(dj - cfg.types.begin())];
    // One line over every routine and region: the worst case of each flavour.
    stats total_of[n_flavours];
    int lost_all = 0, naive_failed = 0;  // routines where the textbook form loses every digit / overflows
    for (const row_key& k : table_rows())
      for (int fl = 0; fl < n_flavours; ++fl) {
        const stats a = all_regions(r, k.ci, k.slot, fl);
        total_of[fl].merge(a);
        if (fl == f_naive && a.max_frac >= std::ldexp(1.0, std::numeric_limits<double>::digits - 1)) ++lost_all;
        if (fl == f_naive && a.n_failed > 0) ++naive_failed;
      }
    const stats& tl = total_of[f_lib];
    const stats& tc = total_of[f_cr];
    std::fprintf(f, "## Summary, double\n\n"
                    "Over all %zu routines and views and all regions (%ld results in the contract "
                    "region per flavour): **eigenzeit** at most %s ulp (integer distance %s), %s "
                    "correctly rounded; **correctly_rounded mode** at most %s ulp, %s correctly "
                    "rounded%s; **textbook formulas**: %d of the %zu quantities lose every digit "
                    "(an error of 2^%d ulp or more) somewhere in their domain, %d overflow or turn "
                    "NaN where the exact result is finite.\n\n",
                 table_rows().size(), tl.n, fmt_ulp(tl.max_frac).c_str(), fmt_dist(tl.max_dist).c_str(),
                 fmt_share(tl).c_str(), fmt_ulp(tc.max_frac).c_str(), fmt_share(tc).c_str(),
                 tc.n_threw ? fmt(" (%ld calls threw)", tc.n_threw).c_str() : "",
                 lost_all, table_rows().size(), std::numeric_limits<double>::digits - 1, naive_failed);
    std::fprintf(f, "All regions together:\n\n| routine |%s\n|---|%s\n", md_flavour_header,
                 md_flavour_rule);
    for (const row_key& k : table_rows()) {
      const stats s[n_flavours] = {all_regions(r, k.ci, k.slot, 0), all_regions(r, k.ci, k.slot, 1),
                                   all_regions(r, k.ci, k.slot, 2)};
      std::fprintf(f, "| %s |%s\n", row_label(k).c_str(), md_flavours(s).c_str());
    }
    std::fprintf(f, "\n");
  }

  // Plots.
  std::fprintf(f, "## Plots\n\nLargest error per input bin, double (%d log-spaced bins per region, "
                  "merged to 60 per region in the plots of the views; tools/plot_accuracy.py). Bins "
                  "whose results were all exact are drawn at the bottom edge (\"0\"), inf or NaN at "
                  "the top (\"inf\"); gaps are bins whose results all lie outside the contract "
                  "(subnormal or zero). In the views' plots every region of the input has the same "
                  "width, each on its own log scale.\n\n", cfg.bins_per_region);
  std::fprintf(f, "![gamma - 1 from beta: eigenzeit against the textbook formula](accuracy_main.svg)\n\n");
  std::fprintf(f, "![free functions of beta](accuracy_free_functions.svg)\n\n");
  for (int ci = 0; ci < n_ctors; ++ci)
    std::fprintf(f, "![views of speed::%s](accuracy_%s.svg)\n\n", ez_test::ctor_name(all_ctors[ci]),
                 ez_test::ctor_name(all_ctors[ci]));

  // Regions.
  std::fprintf(f, "## Regions\n\n| constructor | region | sampled variable | double range | "
                  "float range | long double range | where the behaviour changes |\n"
                  "|---|---|---|---|---|---|---|\n");
  for (int ci = 0; ci < n_ctors; ++ci) {
    const region_set rd = regions_of<double>(all_ctors[ci]);
    const region_set rf = regions_of<float>(all_ctors[ci]);
    const region_set rl = regions_of<long double>(all_ctors[ci]);
    for (int g = 0; g < rd.n; ++g) {
      auto range = [](const region_def& x) {
        return x.used() ? fmt_range(x.lo) + " .. " + fmt_range(x.hi) : std::string("(empty, not sampled)");
      };
      std::fprintf(f, "| %s | %s | %s | %s | %s | %s | %s |\n", ez_test::ctor_name(all_ctors[ci]),
                   rd.r[g].name, variable_text[rd.r[g].var], range(rd.r[g]).c_str(),
                   range(rf.r[g]).c_str(), range(rl.r[g]).c_str(), rd.r[g].what);
    }
  }
  std::fprintf(f, "\nThe free functions run on the inputs of from_beta, with a random sign. Energy "
                  "constructors: the mass is drawn log-uniformly in [1e-3, 1e6] and the energy or "
                  "momentum is the ratio times the mass, rounded to the type.\n\n");

  // Naive formulas.
  std::fprintf(f, "## Textbook formulas (naive flavour)\n\nb = beta, d = 1 - beta, g = gamma, "
                  "u = proper speed, x = the constructor's input; K, p, m = kinetic energy, momentum, "
                  "mass; E = sqrt(p*p + m*m).\n\n| routine | beta | 1 - beta | gamma | gamma - 1 | "
                  "1/gamma | 1 - 1/gamma | rapidity | beta*gamma |\n|---|---|---|---|---|---|---|---|---|\n");
  for (int ci = 0; ci < n_ctors; ++ci) {
    std::fprintf(f, "| %s |", ez_test::ctor_name(all_ctors[ci]));
    for (int v = 0; v < n_views; ++v) std::fprintf(f, " `%s` |", ez_test::naive::formula(all_ctors[ci], v));
    std::fprintf(f, "\n");
  }
  std::fprintf(f, "\nFree functions: ");
  for (int k = 0; k < n_free; ++k)
    std::fprintf(f, "`%s` = `%s`%s", free_names[k], free_formulas[k], k + 1 < n_free ? ", " : ".\n\n");

  // Full tables.
  for (std::size_t j = 0; j < cfg.types.size(); ++j) {
    const int t = cfg.types[j];
    std::fprintf(f, "## %s, per region\n\n%ld inputs per region.\n\n| routine | region |%s\n|---|---|%s\n",
                 type_names[t], samples_for(cfg, t), md_flavour_header, md_flavour_rule);
    for (const row_key& k : table_rows()) {
      const region_set rs = regions_of_type(t, all_ctors[k.ci]);
      for (int g = 0; g < rs.n; ++g) {
        if (!rs.r[g].used()) continue;
        std::fprintf(f, "| %s | %s |%s\n", g == 0 ? row_label(k).c_str() : "", rs.r[g].name,
                     md_flavours(res[j].s[k.ci][g][k.slot]).c_str());
      }
    }
    std::fprintf(f, "\n");
  }

  if (!violations.empty()) {
    std::fprintf(f, "## Contract violations\n\n");
    for (const auto& v : violations) std::fprintf(f, "- %s\n", v.what.c_str());
    std::fprintf(f, "\n");
  }
  std::fprintf(f, "Machine-readable: [accuracy.csv](accuracy.csv) (every type, routine, view, region "
                  "and flavour, with the worst input); plain text: [accuracy.txt](accuracy.txt).\n");
  return std::fclose(f) == 0;
}

// ---- command line ---------------------------------------------------------------------------------

void usage(std::FILE* f) {
  std::fprintf(f,
               "usage: eigenzeit_accuracy [--samples N] [--samples-float NF] [--samples-long-double NL]\n"
               "                          [--quick] [--check] [--types LIST] [--threads K]\n"
               "                          [--seed S] [--bins-per-region B] [--bins-type T]\n"
               "                          [--verify-every V] [--text FILE] [--markdown FILE]\n"
               "                          [--csv FILE] [--bins FILE]\n"
               "N inputs per region for double (default 1000000); NF and NL (default N/10) for\n"
               "float and long double.\n");
}

std::string trim(const std::string& s) {
  const auto b = s.find_first_not_of(" \t");
  if (b == std::string::npos) return "";
  const auto e = s.find_last_not_of(" \t");
  return s.substr(b, e - b + 1);
}

int parse_type(const std::string& name) {
  if (name == "float") return t_float;
  if (name == "double") return t_double;
  if (name == "long double" || name == "long_double" || name == "longdouble" || name == "ld")
    return t_long_double;
  return -1;
}

bool parse_types(const std::string& list, std::vector<int>& out) {
  out.clear();
  std::size_t pos = 0;
  while (pos <= list.size()) {
    const std::size_t comma = std::min(list.find(',', pos), list.size());
    const std::string name = trim(list.substr(pos, comma - pos));
    const int t = parse_type(name);
    if (t < 0) {
      std::fprintf(stderr, "eigenzeit_accuracy: unknown type '%s'\n", name.c_str());
      return false;
    }
    if (std::find(out.begin(), out.end(), t) == out.end()) out.push_back(t);
    pos = comma + 1;
  }
  std::sort(out.begin(), out.end());
  return !out.empty();
}

bool parse_integer(const std::string& s, unsigned long long& out) {
  if (s.empty() || s[0] == '-') return false;
  char* end = nullptr;
  errno = 0;
  out = std::strtoull(s.c_str(), &end, 10);
  return errno == 0 && end && *end == '\0';
}

// Returns 0 to run, 1 after --help, 2 on a usage error.
int parse(int argc, char** argv, run_config& cfg) {
  cfg.types = {t_float, t_double, t_long_double};
  cfg.command = "eigenzeit_accuracy";
  for (int i = 1; i < argc; ++i) cfg.command += std::string(" ") + argv[i];
  for (int i = 1; i < argc; ++i) {
    std::string opt = argv[i], value;
    const auto eq = opt.find('=');
    bool inline_value = false;
    if (opt.rfind("--", 0) == 0 && eq != std::string::npos) {
      value = opt.substr(eq + 1);
      opt = opt.substr(0, eq);
      inline_value = true;
    }
    if (opt == "-h" || opt == "--help") {
      usage(stdout);
      return 1;
    }
    if (opt == "--quick" || opt == "--check") {
      if (inline_value) {
        std::fprintf(stderr, "eigenzeit_accuracy: %s takes no value\n", opt.c_str());
        return 2;
      }
      if (opt == "--quick") cfg.quick = true;
      else cfg.check = true;
      continue;
    }
    static const char* const valued[] = {"--samples", "--samples-float", "--samples-long-double", "--types", "--threads", "--seed",
                                         "--bins-per-region", "--bins-type", "--verify-every",
                                         "--text", "--markdown", "--csv", "--bins"};
    if (std::find_if(std::begin(valued), std::end(valued), [&](const char* o) { return opt == o; }) ==
        std::end(valued)) {
      std::fprintf(stderr, "eigenzeit_accuracy: unknown option '%s'\n", argv[i]);
      usage(stderr);
      return 2;
    }
    if (!inline_value) {
      if (i + 1 >= argc) {
        std::fprintf(stderr, "eigenzeit_accuracy: %s needs a value\n", opt.c_str());
        return 2;
      }
      value = argv[++i];
    }
    unsigned long long n = 0;
    auto bad = [&]() {
      std::fprintf(stderr, "eigenzeit_accuracy: bad %s '%s'\n", opt.c_str(), value.c_str());
      return 2;
    };
    if (opt == "--samples") {
      if (!parse_integer(value, n) || n == 0 || n > 100000000000ULL) return bad();
      cfg.samples = static_cast<long>(n);
      cfg.samples_given = true;
    } else if (opt == "--samples-float" || opt == "--samples-long-double") {
      if (!parse_integer(value, n) || n == 0 || n > 100000000000ULL) return bad();
      (opt == "--samples-float" ? cfg.samples_float : cfg.samples_long_double) = static_cast<long>(n);
    } else if (opt == "--threads") {
      if (!parse_integer(value, n) || n == 0 || n > 4096) return bad();
      cfg.threads = static_cast<unsigned>(n);
    } else if (opt == "--seed") {
      if (!parse_integer(value, n)) return bad();
      cfg.seed = n;
    } else if (opt == "--bins-per-region") {
      if (!parse_integer(value, n) || n == 0 || n > 100000) return bad();
      cfg.bins_per_region = static_cast<int>(n);
    } else if (opt == "--verify-every") {
      if (!parse_integer(value, n) || n > 1000000000ULL) return bad();
      cfg.verify_every = static_cast<long>(n);
      cfg.verify_given = true;
    } else if (opt == "--bins-type") {
      cfg.bins_type = parse_type(trim(value));
      if (cfg.bins_type < 0) return bad();
    } else if (opt == "--types") {
      if (!parse_types(value, cfg.types)) return 2;
    } else if (opt == "--text") {
      cfg.text = value;
    } else if (opt == "--markdown") {
      cfg.markdown = value;
    } else if (opt == "--csv") {
      cfg.csv = value;
    } else {
      cfg.bins = value;
    }
  }
  if (cfg.quick) {
    if (!cfg.samples_given) cfg.samples = ez_test::quick() ? 2000 : 20000;
    if (!cfg.verify_given) cfg.verify_every = 16;
  }
  if (cfg.threads == 0) cfg.threads = std::max(1u, std::thread::hardware_concurrency());
  if (!cfg.bins.empty() &&
      std::find(cfg.types.begin(), cfg.types.end(), cfg.bins_type) == cfg.types.end()) {
    std::fprintf(stderr, "eigenzeit_accuracy: --bins needs the --bins-type (%s) among --types\n",
                 type_names[cfg.bins_type]);
    return 2;
  }
  return 0;
}

}  // namespace

int main(int argc, char** argv) {
  run_config cfg;
  const int p = parse(argc, argv, cfg);
  if (p != 0) return p == 1 ? 0 : 2;
  if (cfg.threads > 1 && !mpfr_buildopt_tls_p()) {
    std::fprintf(stderr, "eigenzeit_accuracy: this MPFR is not thread-safe; using one thread\n");
    cfg.threads = 1;
  }

  // The work: blocks of every (type, constructor, region).
  std::vector<task> tasks;
  long total = 0;
  for (int t : cfg.types) {
    const long n = samples_for(cfg, t);
    for (int ci = 0; ci < n_ctors; ++ci) {
      const region_set rs = regions_of_type(t, all_ctors[ci]);
      for (int g = 0; g < rs.n; ++g) {
        if (!rs.r[g].used()) continue;
        for (long b = 0; b * block_size < n; ++b)
          tasks.push_back({t, ci, g, b, std::min(block_size, n - b * block_size)});
        total += n;
      }
    }
  }
  // Threads take the blocks in this order; no result depends on which thread ran a block.
  std::fprintf(stderr, "eigenzeit_accuracy: %ld inputs in %zu blocks on %u threads, seed %llu\n",
               total, tasks.size(), cfg.threads, cfg.seed);

  const auto start = std::chrono::steady_clock::now();
  shared_state sh;
  std::vector<thread_out> outs(cfg.threads);
  for (auto& o : outs) {
    o.res.resize(cfg.types.size());
    if (!cfg.bins.empty()) o.bins.init(cfg.bins_per_region);
  }
  std::vector<std::thread> pool;
  sh.running.store(static_cast<int>(cfg.threads));
  for (unsigned i = 0; i < cfg.threads; ++i)
    pool.emplace_back(worker, std::cref(cfg), std::cref(tasks), std::ref(outs[i]), std::ref(sh));

  // Progress about every 5%, with an estimate of the time left.
  int reported = 0;
  while (sh.running.load() > 0) {
    std::this_thread::sleep_for(std::chrono::milliseconds(200));
    const long done = sh.done.load(std::memory_order_relaxed);
    const int step = static_cast<int>((20 * done) / std::max(1L, total));
    if (step > reported && step < 20) {
      reported = step;
      const double secs = std::chrono::duration<double>(std::chrono::steady_clock::now() - start).count();
      std::fprintf(stderr, "  %3d%%  %ld of %ld inputs, %.0f s, about %.0f s left\n", 5 * step, done,
                   total, secs, secs * static_cast<double>(total - done) / static_cast<double>(std::max(1L, done)));
    }
  }
  for (auto& th : pool) th.join();
  if (!sh.error.empty()) {
    std::fprintf(stderr, "eigenzeit_accuracy: error: %s\n", sh.error.c_str());
    return 1;
  }
  const double wall = std::chrono::duration<double>(std::chrono::steady_clock::now() - start).count();
  std::fprintf(stderr, "  100%%  %ld inputs, %.1f s; %ld cross-checked with the test suite's reference\n",
               total, wall, sh.verified.load());

  std::vector<type_results> res(cfg.types.size());
  bin_table bins;
  if (!cfg.bins.empty()) bins.init(cfg.bins_per_region);
  double seconds[n_types] = {};
  for (auto& o : outs) {
    for (std::size_t j = 0; j < cfg.types.size(); ++j) res[j].merge(o.res[j]);
    if (!cfg.bins.empty()) bins.merge(o.bins);
    for (int t = 0; t < n_types; ++t) seconds[t] += o.seconds[t];
  }

  const std::vector<violation> violations = check_contract(cfg, res);
  print_summary(stdout, cfg, res);

  int status = 0;
  auto write = [&](const std::string& path, bool ok) {
    if (!path.empty() && !ok) {
      std::fprintf(stderr, "eigenzeit_accuracy: cannot write %s\n", path.c_str());
      status = 1;
    }
  };
  if (!cfg.text.empty()) write(cfg.text, write_text(cfg, res));
  if (!cfg.csv.empty()) write(cfg.csv, write_csv(cfg, res));
  if (!cfg.bins.empty()) write(cfg.bins, write_bins(cfg, bins));
  if (!cfg.markdown.empty()) write(cfg.markdown, write_markdown(cfg, res, violations, wall, total, seconds, sh.verified.load()));

  std::printf("\nMPFR %s, %s, %u threads, seed %llu.\n", mpfr_get_version(), compiler_text().c_str(),
              cfg.threads, cfg.seed);
  for (int t : cfg.types)
    std::printf("%s: %ld inputs per region, %.1f CPU seconds\n", type_names[t], samples_for(cfg, t),
                seconds[t]);
  std::printf("Total: %ld inputs, wall time %.1f s; %ld inputs cross-checked with the test suite's "
              "reference.\n", total, wall, sh.verified.load());
  if (violations.empty()) {
    std::printf("Contract: no library result broke it.\n");
  } else {
    std::printf("Contract: %zu violations:\n", violations.size());
    for (const auto& v : violations) std::printf("  %s\n", v.what.c_str());
    if (cfg.check && status == 0) status = 3;
  }
  return status;
}
