// eigenzeit_hunt_hard_cases: searches for the inputs on which each routine of speed.hpp is
// least accurate, measured against the MPFR reference of the test suite, and writes the worst
// ones as a table that tests/test_hard_cases.cpp replays (tests/data/hard_cases.hpp).
//
// Usage:
//   eigenzeit_hunt_hard_cases [--seconds N | --total N | --evals N | --evals-from FILE]
//                             [--top K] [--out FILE] [--seed S] [--threads K] [--types LIST]
//
//   --seconds N      time budget per (type, routine), in seconds (default 5).
//   --total N        total budget in seconds of wall time: split evenly over all (type,
//                    routine) pairs, times the number of threads.
//   --evals N        budget per (type, routine) in evaluations instead of seconds.
//   --evals-from F   the evaluation counts recorded in an earlier table F ("// evals" lines):
//                    repeats that run exactly (same seed, same build).
//   --top K          entries kept per (type, routine) in the table (default 8).
//   --out FILE       the table to write (default hard_cases.hpp in the current directory).
//   --seed S         base seed (default 1).
//   --threads K      worker threads (default 1).
//   --types LIST     comma-separated subset of float, double, long_double (default all).
//
// Example (the committed table):
//   eigenzeit_hunt_hard_cases --total 1500 --threads 2 --top 8 --seed 1
//       --out tests/data/hard_cases.hpp        (one line)
//
// Routines.  For each of float, double and long double: the five free functions of beta
// (lorentz_factor, lorentz_factor_m1, proper_speed, dilation_fraction, rapidity) and every
// named constructor of speed<T> with every view (8 x 8).  The hunt runs in groups: one group
// per constructor (one construction and one MPFR reference give all eight views) and one for
// the free functions (one reference, ctor::beta, gives all five).  Every evaluation offers
// its result to every routine of its group.
//
// Error.  |result - exact| in ulps of the correctly rounded result (ez_test::measure), over
// the inputs whose correctly rounded result is a normal number (the precision contract's
// region, DESIGN.md).  An input in the documented domain that the constructor refuses counts
// as an infinite error for every view.
//
// Strategies, one deterministic stream of candidates per (type, group):
//   1. structured points: both ends of the domain (0, the smallest subnormal, 1 - eps / 2, the
//      largest finite value, the largest rapidity whose cosh is finite), 16 neighbours each;
//      powers of two and 1 -+ 2^-k; and every branch switch of speed.hpp, placed in any
//      constructor's variable by converting it with the MPFR reference: the series threshold
//      beta^2 = small_square_threshold<T>(), the rescale threshold 1 - beta =
//      rescale_threshold<T>(), beta = 1/9 and the log1p argument 1/4 of atanh, rapidity 4,
//      gamma - 1 = 1, proper speed 1 and sqrt(3), the largest-gamma switch
//      2^(max_exponent/2 - 4) of speed<T>::rapidity, the exp overflow log(max), and the
//      underflow points of beta^2 and 1 / gamma^2; 8 neighbours on each side, several masses
//      for the energy constructors;
//   2. epochs of a random sweep (log-uniform over each domain, with extra weight near 0, near
//      1 and near the branch points), each followed by hill climbing for every routine of
//      the group, once from the sweep's worst point for that routine and once from one of
//      its worst points so far: random perturbations at shrinking scales (factors 2^(+-16),
//      2^(+-4), 2^(+-1), relative 2^-4, 2^-8, ..., then +-1..16 nextafter steps), also in
//      1 - x and x - 1 near 1; a move is kept when it raises the routine's fractional ulp
//      error.
//
// Determinism.  Each group draws from its own std::mt19937_64 seeded from (seed, type, group),
// so the stream does not depend on the thread count or scheduling; a time budget only decides
// where the stream is cut.  The table records the evaluation count of every group, and
// --evals-from reproduces the run exactly (for the same build: contraction into fma by the
// compiler may change last bits of the library's results).
//
// Progress and a summary (worst error per routine, in-domain inputs refused) go to stderr.
// Exit status 0 after a complete run, 1 on an error, 2 on a usage error.
#include <mpfr.h>

#include <algorithm>
#include <atomic>
#include <cerrno>
#include <chrono>
#include <cmath>
#include <cstdint>
#include <cstdio>
#include <cstdlib>
#include <cstring>
#include <ctime>
#include <exception>
#include <fstream>
#include <limits>
#include <map>
#include <mutex>
#include <random>
#include <set>
#include <sstream>
#include <string>
#include <thread>
#include <type_traits>
#include <utility>
#include <vector>

#include <eigenzeit/speed.hpp>

#include "../tests/support/reference.hpp"
#include "../tests/support/routines.hpp"

namespace {

using ez_test::ctor;
using ez_test::n_views;
using ez_test::reference;

using clock_type = std::chrono::steady_clock;

// ---- groups and routines ------------------------------------------------------------------------

constexpr int n_groups = 9;  // the eight constructors, then the free functions
constexpr int free_group = 8;
constexpr int n_types = 3;
const char* const type_names[n_types] = {"float", "double", "long_double"};

int routines_in(int group) { return group == free_group ? int(ez_test::n_free_fns) : int(n_views); }
const char* group_name(int group) {
  return group == free_group ? "free_functions" : ez_test::ctor_name(ez_test::all_ctor_tags[group]);
}
int routines_per_type() {
  int n = 0;
  for (int g = 0; g < n_groups; ++g) n += routines_in(g);
  return n;
}

// ---- limits of each type ------------------------------------------------------------------------

template <class T>
struct lim {
  static T dmin() { return std::numeric_limits<T>::denorm_min(); }
  static T tmin() { return std::numeric_limits<T>::min(); }
  static T max() { return std::numeric_limits<T>::max(); }
  static T eps() { return std::numeric_limits<T>::epsilon(); }
  static T below_one() { return std::nextafter(T(1), T(0)); }
  static constexpr int digits = std::numeric_limits<T>::digits;
  static constexpr int e_lo = std::numeric_limits<T>::min_exponent - digits;  // of denorm_min
  static constexpr int e_hi = std::numeric_limits<T>::max_exponent - 1;       // of max
};

template <class T>
T round_with(const mpfr_t r, mpfr_rnd_t mode) {
  if constexpr (std::is_same<T, float>::value) return mpfr_get_flt(r, mode);
  else if constexpr (std::is_same<T, double>::value) return mpfr_get_d(r, mode);
  else return mpfr_get_ld(r, mode);
}

/// The largest rapidity whose cosh is finite in T (rounded up: in_domain decides exactly) and
/// log(max), where exp(eta) overflows.
template <class T>
T rapidity_limit() {
  ez_test::mp m(256);
  ez_test::set_exact(m.v, lim<T>::max());
  mpfr_acosh(m.v, m.v, MPFR_RNDU);
  return round_with<T>(m.v, MPFR_RNDU);
}
template <class T>
T log_of_max() {
  ez_test::mp m(256);
  ez_test::set_exact(m.v, lim<T>::max());
  mpfr_log(m.v, m.v, MPFR_RNDN);
  return round_with<T>(m.v, MPFR_RNDN);
}

template <class T>
T steps(T x, int n) {  // n nextafter steps up (n > 0) or down
  const T to = n > 0 ? std::numeric_limits<T>::infinity() : -std::numeric_limits<T>::infinity();
  for (int i = 0; i < std::abs(n); ++i) x = std::nextafter(x, to);
  return x;
}

// ---- results ------------------------------------------------------------------------------------

template <class T>
struct entry {
  double frac;        // |result - exact| in ulps of the correctly rounded result
  std::int64_t dist;  // distance to the correctly rounded result, in representable values
  T x, y;
};

/// The worst entries of one routine, worst first; inputs distinct.  Ties are ordered by the
/// input so that the list does not depend on the order of discovery.
template <class T>
class ranked {
 public:
  explicit ranked(std::size_t cap) : cap_(cap) {}
  static bool before(const entry<T>& a, const entry<T>& b) {
    if (a.frac != b.frac) return a.frac > b.frac;
    if (a.x != b.x) return a.x < b.x;
    return a.y < b.y;
  }
  void offer(const entry<T>& e) {
    if (items_.size() >= cap_ && !before(e, items_.back())) return;
    for (const auto& it : items_)
      if (it.x == e.x && it.y == e.y) return;
    items_.insert(std::upper_bound(items_.begin(), items_.end(), e, before), e);
    if (items_.size() > cap_) items_.pop_back();
  }
  const std::vector<entry<T>>& items() const { return items_; }

 private:
  std::size_t cap_;
  std::vector<entry<T>> items_;
};

/// The worst entries of one routine, kept apart by whether they break the precision contract,
/// so that a region where the contract breaks (for example inputs the library refuses) does
/// not crowd out the worst results within the contract.
template <class T>
class top_list {
 public:
  top_list(std::size_t cap, std::int64_t allowed) : allowed_(allowed), within_(cap), beyond_(cap) {}
  void offer(const entry<T>& e) {
    if (!(e.frac > 0)) return;
    (e.dist > allowed_ ? beyond_ : within_).offer(e);
  }
  const std::vector<entry<T>>& within() const { return within_.items(); }
  const std::vector<entry<T>>& beyond() const { return beyond_.items(); }
  bool empty() const { return within().empty() && beyond().empty(); }
  /// The worst entry of all.
  const entry<T>& worst() const {
    if (beyond().empty()) return within().front();
    if (within().empty()) return beyond().front();
    return ranked<T>::before(within().front(), beyond().front()) ? within().front() : beyond().front();
  }
  /// The k rows for the table: up to k/2 beyond the contract (worst first), then the worst
  /// within it, then more beyond if there is still room; worst first.
  std::vector<entry<T>> rows(std::size_t k) const {
    std::vector<entry<T>> out;
    const std::size_t nb = std::min(beyond().size(), std::max<std::size_t>(k / 2, k > within().size() ? k - within().size() : 0));
    out.insert(out.end(), beyond().begin(), beyond().begin() + static_cast<std::ptrdiff_t>(nb));
    const std::size_t nw = std::min(within().size(), k - nb);
    out.insert(out.end(), within().begin(), within().begin() + static_cast<std::ptrdiff_t>(nw));
    std::sort(out.begin(), out.end(), ranked<T>::before);
    return out;
  }

 private:
  std::int64_t allowed_;
  ranked<T> within_, beyond_;
};

struct budget {
  long max_evals = 0;     // 0: no limit in evaluations
  double seconds = 0;     // 0: no time limit
};

// ---- the hunt of one (type, group) --------------------------------------------------------------

template <class T>
class hunt {
 public:
  hunt(int group, unsigned long long seed, budget b, std::size_t pool)
      : group_(group),
        c_(group == free_group ? ctor::beta : ez_test::all_ctor_tags[group]),
        nr_(routines_in(group)),
        rng_(seed),
        budget_(b),
        eta_hi_(steps(rapidity_limit<T>(), 64)) {
    for (int r = 0; r < nr_; ++r)
      tops_.emplace_back(pool, ez_test::contract_ulps(group == free_group, c_, r));
  }

  void run() {
    start_ = clock_type::now();
    structured();
    epochs();
  }

  long evaluations() const { return evals_; }
  long refused() const { return refused_; }
  const entry<T>& first_refused() const { return first_refused_; }
  const top_list<T>& top(int r) const { return tops_[static_cast<std::size_t>(r)]; }

 private:
  int group_;
  ctor c_;
  int nr_;
  std::mt19937_64 rng_;
  budget budget_;
  T eta_hi_;
  std::vector<top_list<T>> tops_;
  long evals_ = 0;
  long refused_ = 0;
  entry<T> first_refused_{0, 0, T(0), T(0)};
  bool stopped_ = false;
  clock_type::time_point start_;
  double err_[n_views] = {};

  bool two_inputs() const { return c_ == ctor::kinetic_energy || c_ == ctor::momentum; }

  /// Whether the budget allows another evaluation; once false, false for good.
  bool more() {
    if (stopped_) return false;
    if (budget_.max_evals > 0 && evals_ >= budget_.max_evals) stopped_ = true;
    if (budget_.seconds > 0 && (evals_ & 15) == 0 &&
        std::chrono::duration<double>(clock_type::now() - start_).count() >= budget_.seconds)
      stopped_ = true;
    return !stopped_;
  }

  // ---- domains ----

  T x_lo() const {
    if (c_ == ctor::beta_deficit) return lim<T>::dmin();
    if (c_ == ctor::gamma) return T(1);
    return T(0);
  }
  T x_hi() const {
    switch (c_) {
      case ctor::beta: return lim<T>::below_one();
      case ctor::beta_deficit: return T(1);
      case ctor::rapidity: return eta_hi_;
      default: return lim<T>::max();
    }
  }
  T clamp_x(T x) const {
    if (std::isnan(x)) return x_lo();
    return std::min(std::max(x, x_lo()), x_hi());
  }
  static T clamp_mass(T m) {
    if (std::isnan(m)) return T(1);
    return std::min(std::max(m, lim<T>::dmin()), lim<T>::max());
  }

  // ---- one evaluation: every routine of the group at (x, y) ----

  /// Errors of all routines of the group at (x, y) in err_, -1 where the input or the result
  /// is outside the contract.  Returns nullptr when the budget is spent (nothing evaluated).
  const double* evaluate(T x, T y) {
    if (!more()) return nullptr;
    ++evals_;
    for (double& e : err_) e = -1;
    reference ref(ez_test::reference_precision(c_, x, y));
    ez_test::compute_reference(ref, c_, x, y);
    T got[n_views];
    if (group_ == free_group) {
      const eigenzeit::throw_policy pol;
      for (int f = 0; f < ez_test::n_free_fns; ++f) got[f] = ez_test::free_value(f, x, pol);
    } else {
      if (!ez_test::in_domain<T>(ref)) return err_;  // must be refused; nothing to measure
      try {
        ez_test::read_views(ez_test::construct_with(c_, x, y, eigenzeit::throw_policy()), got);
      } catch (const std::exception&) {
        for (T& g : got) g = std::numeric_limits<T>::quiet_NaN();
        if (refused_++ == 0) first_refused_ = {0, 0, x, y};
      }
    }
    for (int r = 0; r < nr_; ++r) {
      const int view = group_ == free_group ? ez_test::free_fn_view(r) : r;
      const ez_test::ulp_error e = ez_test::measure<T>(got[r], ref.val[view].v);
      if (!e.normal) continue;
      const double frac = std::isnan(e.frac) ? std::numeric_limits<double>::infinity() : e.frac;
      err_[r] = frac;
      tops_[static_cast<std::size_t>(r)].offer({frac, e.dist, x, y});
    }
    return err_;
  }

  // ---- random numbers ----

  long double uniform(long double a, long double b) {
    return std::uniform_real_distribution<long double>(a, b)(rng_);
  }
  int uniform_int(int a, int b) { return std::uniform_int_distribution<int>(a, b)(rng_); }
  bool coin() { return (rng_() & 1) != 0; }

  /// m 2^e with e uniform in [e_lo, e_hi] and m uniform in [1, 2) (63 random bits), in T.
  /// Three draws in four keep |e| <= 16 digits: the reference needs 2 |e| more bits, and
  /// long double's 2^-16445 .. 2^16384 would otherwise take most of the time.
  T pow_draw(int e_lo, int e_hi) {
    constexpr int moderate = 16 * lim<T>::digits;
    e_lo = std::max(e_lo, lim<T>::e_lo);
    e_hi = std::min(e_hi, lim<T>::e_hi);
    if (uniform_int(0, 3) != 0 && e_lo < moderate && e_hi > -moderate) {
      e_lo = std::max(e_lo, -moderate);
      e_hi = std::min(e_hi, moderate);
    }
    const long double m = 1.0L + static_cast<long double>(rng_() >> 1) * 0x1p-63L;
    const T v = T(std::ldexp(m, uniform_int(e_lo, e_hi)));
    return std::isfinite(v) ? v : lim<T>::max();
  }

  /// One random input in the variable of the group (the ratio for the energy constructors).
  T draw_variable() {
    constexpr int d = lim<T>::digits;
    const int region = uniform_int(0, 3);
    switch (c_) {
      case ctor::beta:
        if (region == 0) return pow_draw(lim<T>::e_lo, -1);
        if (region == 1) return T(1) - pow_draw(-d - 1, -1);
        if (region == 2) return T(uniform(0, 1));
        return pow_draw(-4 * d, -1);
      case ctor::beta_deficit:
        if (region == 0) return pow_draw(lim<T>::e_lo, -1);
        if (region == 1) return T(1) - pow_draw(-d - 1, -1);
        if (region == 2) return T(uniform(0, 1));
        return pow_draw(-4 * d, -1);
      case ctor::gamma:
        if (region == 0) return T(1) + pow_draw(-d - 1, 0);
        if (region == 1) return pow_draw(1, lim<T>::e_hi);
        return pow_draw(0, 2 * d);
      case ctor::rapidity:
        if (region == 0) return pow_draw(lim<T>::e_lo, 2);
        if (region == 1) return T(uniform(0, eta_hi_));
        if (region == 2) return T(uniform(0, 4.5L));
        return pow_draw(-2 * d, 3);
      default:  // gamma - 1, proper speed, and the ratios of the energy constructors
        if (region <= 1) return pow_draw(lim<T>::e_lo, lim<T>::e_hi);
        return pow_draw(-2 * d, 2 * d);
    }
  }

  T draw_mass() {
    const int region = uniform_int(0, 4);
    if (region == 0) return T(1);
    if (region == 1) return pow_draw(std::numeric_limits<T>::min_exponent - 1, lim<T>::e_hi);
    return pow_draw(-16, 16);
  }

  /// x = ratio * mass rounded to T, computed exactly in MPFR first.
  static T times(T ratio, T mass) {
    ez_test::mp p(4 * lim<T>::digits);
    ez_test::mp q(4 * lim<T>::digits);
    ez_test::set_exact(p.v, ratio);
    ez_test::set_exact(q.v, mass);
    mpfr_mul(p.v, p.v, q.v, MPFR_RNDN);
    return ez_test::round_to<T>(p.v);
  }

  std::pair<T, T> draw() {
    if (!two_inputs()) return {clamp_x(draw_variable()), T(1)};
    const T m = draw_mass();
    const T x = times(draw_variable(), m);
    return {std::isfinite(x) ? x : lim<T>::max(), m};
  }

  // ---- perturbations ----

  static constexpr int n_log_levels = 3;
  static constexpr int n_rel_levels = (lim<T>::digits - 4) / 4;
  static constexpr int n_levels = n_log_levels + n_rel_levels + 1;

  /// A random neighbour of v > 0 at a level: factors 2^(+-16), 2^(+-4), 2^(+-1); relative
  /// 2^-4, 2^-8, ...; then +-1..16 representable steps.
  T move(T v, int level) {
    if (level >= n_log_levels + n_rel_levels) {
      int n = uniform_int(1, 16);
      return steps(v, coin() ? n : -n);
    }
    if (v == T(0)) return pow_draw(lim<T>::e_lo, 0);
    const long double r = uniform(-1, 1);
    if (level < n_log_levels) {
      static const long double span[n_log_levels] = {16, 4, 1};
      return T(static_cast<long double>(v) * std::exp2(r * span[level]));
    }
    const int k = 4 * (level - n_log_levels + 1);
    return T(static_cast<long double>(v) * (1 + std::ldexp(r, -k)));
  }

  /// Neighbour of x at a level, half of the time moved in 1 - x or x - 1 when x is near 1
  /// (both exact there), so that moves near 1 keep their scale.
  T perturb_x(T x, int level) {
    if (x >= T(0.5) && x <= T(1) && coin()) return clamp_x(T(1) - std::abs(move(T(1) - x, level)));
    if (x >= T(1) && x <= T(2) && coin()) return clamp_x(T(1) + std::abs(move(x - T(1), level)));
    return clamp_x(std::abs(move(x, level)));
  }

  std::pair<T, T> perturb(std::pair<T, T> p, int level) {
    if (!two_inputs()) return {perturb_x(p.first, level), p.second};
    const int mode = uniform_int(0, 4);
    if (mode <= 1) return {perturb_x(p.first, level), p.second};  // the ratio moves
    if (mode == 2) return {p.first, clamp_mass(std::abs(move(p.second, level)))};
    // Mass and energy scaled together: the ratio stays, the roundings change.
    const T m = clamp_mass(std::abs(move(p.second, level)));
    const long double f = static_cast<long double>(m) / static_cast<long double>(p.second);
    const T x = T(static_cast<long double>(p.first) * f);
    return {std::isfinite(x) ? clamp_x(x) : p.first, m};
  }

  // ---- strategy 1: structured points ----

  std::set<std::pair<T, T>> seen_;

  void visit(T x, T y) {
    if (std::isnan(x) || std::isnan(y)) return;
    if (two_inputs()) {
      if (!(x >= 0) || !std::isfinite(x) || !(y > 0) || !std::isfinite(y)) return;
    } else {
      if (x < x_lo() || x > x_hi()) return;
    }
    if (!seen_.insert({x, y}).second) return;
    evaluate(x, y);
  }

  void around(T x, T y, int n) {
      for (int k = -n; k <= n && more(); ++k) visit(steps(x, k), y);
  }

  /// Points of the group's own variable, then anchors converted from other variables.
  void structured() {
    constexpr int d = lim<T>::digits;
    const T masses[] = {T(1), T(3), T(0.3L), lim<T>::tmin() * 4, std::sqrt(lim<T>::max()),
                        T(1) / std::sqrt(lim<T>::max()), lim<T>::max() / 4};
    // Ends of the domain.
    if (!two_inputs()) {
      around(x_lo(), T(1), 16);
      around(lim<T>::dmin(), T(1), 16);
      around(lim<T>::tmin(), T(1), 4);
      around(x_hi(), T(1), 16);
    }
    // Anchors: branch switches and ends, each given in the variable where it is simplest.
    struct anchor {
      ctor c;
      long double v;
    };
    const long double sst = eigenzeit::numeric::small_square_threshold<T>();
    const long double rst = eigenzeit::numeric::rescale_threshold<T>();
    const long double tmin = lim<T>::tmin(), dmin = lim<T>::dmin(), eps = lim<T>::eps();
    const long double big = lim<T>::max();
    const long double gamma_switch =
        std::ldexp(1.0L, std::numeric_limits<T>::max_exponent / 2 - 4);  // speed<T>::rapidity
    const anchor anchors[] = {
        {ctor::beta, std::sqrt(sst)},          // series threshold on beta^2
        {ctor::beta, std::sqrt(tmin)},         // beta^2 leaves the normal range
        {ctor::beta, std::sqrt(2 * tmin)},     // gamma - 1 ~ beta^2 / 2 leaves it
        {ctor::beta, 2 * std::sqrt(tmin)},
        {ctor::beta, 1.0L / 9},                // atanh: log1p below, log above
        {ctor::beta, 0.25L},
        {ctor::beta, 1.0L / 3},                // (1 + beta) / (1 - beta) = 2
        {ctor::beta, 0.5L},
        {ctor::beta, 0.6L},
        {ctor::beta, 0.8L},
        {ctor::beta, std::sqrt(3.0L) / 2},     // gamma = 2
        {ctor::beta, static_cast<long double>(lim<T>::below_one())},
        {ctor::beta, dmin},
        {ctor::beta, tmin},
        {ctor::beta, eps},
        {ctor::beta, std::sqrt(eps)},
        {ctor::beta, 1 - std::sqrt(eps)},
        {ctor::beta_deficit, rst},             // rescaling of tiny deficits
        {ctor::beta_deficit, rst / 2},
        {ctor::beta_deficit, 2 * rst},
        {ctor::beta_deficit, tmin},
        {ctor::beta_deficit, dmin},
        {ctor::beta_deficit, eps * eps},
        {ctor::gamma, gamma_switch},           // largest-gamma switch of the rapidity view
        {ctor::gamma, 1 / std::sqrt(2 * tmin)},  // 1 - beta ~ 1 / (2 gamma^2) leaves the normal range
        {ctor::gamma, std::sqrt(big)},
        {ctor::gamma, big / 2},
        {ctor::gamma, big},
        {ctor::gamma, 1 + eps},
        {ctor::gamma_m1, 1},                   // gamma - 1 <= 1 switch
        {ctor::gamma_m1, sst / 2},
        {ctor::gamma_m1, rst},                 // rescaling of tiny kinetic energies
        {ctor::gamma_m1, tmin},
        {ctor::gamma_m1, dmin},
        {ctor::gamma_m1, 0.5L},
        {ctor::gamma_m1, 2},
        {ctor::rapidity, 4},                   // series / exp switch of from_rapidity
        {ctor::rapidity, static_cast<long double>(rapidity_limit<T>())},
        {ctor::rapidity, static_cast<long double>(log_of_max<T>())},  // exp(eta) overflows
        {ctor::rapidity, (std::numeric_limits<T>::max_exponent / 2 - 3) * std::log(2.0L)},
        {ctor::rapidity, 0.5L},
        {ctor::proper_speed, 1},               // u <= 1 switch
        {ctor::proper_speed, std::sqrt(3.0L)}, // gamma = 2 from the proper speed
        {ctor::proper_speed, std::sqrt(tmin)},
        {ctor::proper_speed, tmin},
        {ctor::proper_speed, dmin},
        {ctor::proper_speed, std::sqrt(big)},
        {ctor::proper_speed, big},
    };
    for (const anchor& a : anchors) {
      if (!more()) return;
      // All views of the anchor's speed, from its long double value (exact).
      reference ref(ez_test::reference_precision<long double>(a.c, a.v, 1.0L));
      ez_test::compute_reference(ref, a.c, a.v, 1.0L);
      if (group_ == free_group || !two_inputs()) {
        const int view = view_of_variable(c_);
        const T x = ez_test::round_to<T>(ref.val[view].v);
        if (std::isfinite(x)) around(clamp_x(x), T(1), 8);
      } else {
        const int view = c_ == ctor::kinetic_energy ? ez_test::v_gamma_m1 : ez_test::v_proper_speed;
        for (T m : masses) {
          ez_test::mp p(ref.prec + 4 * d);
          ez_test::set_exact(p.v, m);
          mpfr_mul(p.v, p.v, ref.val[view].v, MPFR_RNDN);
          const T x = ez_test::round_to<T>(p.v);
          if (!std::isfinite(x)) continue;
          around(x, m, 6);
          visit(x, steps(m, 1));
          visit(x, steps(m, -1));
        }
      }
    }
    // Powers of two (at most 256 binades, evenly spread) and 1 -+ 2^-k.
    const int span = lim<T>::e_hi - lim<T>::e_lo;
    const int stride = std::max(1, span / 256);
    for (int e = lim<T>::e_lo; e <= lim<T>::e_hi && more(); e += stride) {
      const T p = std::ldexp(T(1), e);
      if (two_inputs()) {
        for (int k = -1; k <= 1; ++k) visit(steps(p, k), T(1));
      } else {
        around(p, T(1), 1);
      }
    }
    for (int k = 1; k <= d + 1 && more(); ++k) {
      const T h = std::ldexp(T(1), -k);
      around(T(1) - h, T(1), 1);
      around(T(1) + h, T(1), 1);
    }
  }

  static int view_of_variable(ctor c) {
    switch (c) {
      case ctor::beta: return ez_test::v_beta;
      case ctor::beta_deficit: return ez_test::v_deficit;
      case ctor::gamma: return ez_test::v_gamma;
      case ctor::gamma_m1: case ctor::kinetic_energy: return ez_test::v_gamma_m1;
      case ctor::rapidity: return ez_test::v_rapidity;
      default: return ez_test::v_proper_speed;
    }
  }

  // ---- strategy 2: sweep and hill climbing ----

  static constexpr int sweep_block = 1000;
  static constexpr int tries_per_level = 12;

  void epochs() {
    while (more()) {
      // Random sweep; remember the worst point of the block for each routine.
      std::vector<std::pair<T, T>> worst(static_cast<std::size_t>(nr_));
      std::vector<double> worst_err(static_cast<std::size_t>(nr_), 0.0);
      for (int i = 0; i < sweep_block; ++i) {
        const std::pair<T, T> p = draw();
        const double* e = evaluate(p.first, p.second);
        if (!e) return;
        for (int r = 0; r < nr_; ++r)
          if (e[r] > worst_err[static_cast<std::size_t>(r)]) {
            worst_err[static_cast<std::size_t>(r)] = e[r];
            worst[static_cast<std::size_t>(r)] = p;
          }
      }
      // Climb for every routine from the sweep's worst point and from one of its worst so far.
      for (int r = 0; r < nr_; ++r) {
        const std::size_t ri = static_cast<std::size_t>(r);
        if (worst_err[ri] > 0) climb(r, worst[ri], worst_err[ri], 0);
        // Seeds mostly within the contract (to push those further), else beyond it.
        const auto& items =
            tops_[ri].within().empty() || (!tops_[ri].beyond().empty() && uniform_int(0, 3) == 0)
                ? tops_[ri].beyond()
                : tops_[ri].within();
        if (!items.empty()) {
          std::size_t i = 0;
          while (i + 1 < items.size() && coin()) ++i;  // geometric: mostly the worst ones
          climb(r, {items[i].x, items[i].y}, items[i].frac, uniform_int(n_log_levels, n_levels - 1));
        }
      }
    }
  }

  /// Hill climbing on routine r's fractional ulp error, from coarse to fine moves.
  void climb(int r, std::pair<T, T> cur, double err, int first_level) {
    if (std::isinf(err)) return;  // nothing to climb to
    for (int level = first_level; level < n_levels; ++level) {
      int fails = 0;
      while (fails < tries_per_level) {
        const std::pair<T, T> cand = perturb(cur, level);
        if (cand == cur) {
          ++fails;
          continue;
        }
        const double* e = evaluate(cand.first, cand.second);
        if (!e) return;
        if (e[r] > err) {
          cur = cand;
          err = e[r];
          fails = 0;
        } else {
          ++fails;
        }
      }
    }
  }
};

// ---- running every (type, group) ----------------------------------------------------------------

/// The outcome of one (type, group), as text for the table and numbers for the summary.
struct task_result {
  int type = 0, group = 0;
  long evals = 0, refused = 0;
  std::string first_refused;
  double seconds = 0;
  // Per routine: rows (already formatted) and the worst entry.
  std::vector<std::vector<std::string>> rows;
  std::vector<double> worst_frac;
  std::vector<long long> worst_dist;
  std::vector<std::string> worst_input;
};

template <class T>
std::string literal(T v) {
  char buf[80];
  if constexpr (std::is_same<T, long double>::value) {
    std::snprintf(buf, sizeof buf, "%LaL", v);
  } else {
    std::snprintf(buf, sizeof buf, std::is_same<T, float>::value ? "%af" : "%a",
                  static_cast<double>(v));
  }
  return buf;
}

std::string ulps_literal(double frac) {
  if (std::isinf(frac)) return "std::numeric_limits<double>::infinity()";
  char buf[40];
  std::snprintf(buf, sizeof buf, "%.6g", frac);
  std::string s = buf;
  if (s.find_first_of(".e") == std::string::npos) s += ".0";
  return s;
}

bool group_has_mass(int group) {
  return group != free_group && (ez_test::all_ctor_tags[group] == ctor::kinetic_energy ||
                                 ez_test::all_ctor_tags[group] == ctor::momentum);
}

template <class T>
std::string input_text(int group, T x, T y) {
  return group_has_mass(group) ? literal(x) + ", mass " + literal(y) : literal(x);
}

template <class T>
void run_task(task_result& out, unsigned long long seed, budget b, std::size_t top_k) {
  const auto t0 = clock_type::now();
  const std::size_t pool = std::max<std::size_t>(top_k, 32);
  hunt<T> h(out.group, seed, b, pool);
  h.run();
  out.seconds = std::chrono::duration<double>(clock_type::now() - t0).count();
  out.evals = h.evaluations();
  out.refused = h.refused();
  if (out.refused > 0) out.first_refused = input_text(out.group, h.first_refused().x, h.first_refused().y);
  const int nr = routines_in(out.group);
  out.rows.assign(static_cast<std::size_t>(nr), {});
  out.worst_frac.assign(static_cast<std::size_t>(nr), 0.0);
  out.worst_dist.assign(static_cast<std::size_t>(nr), 0);
  out.worst_input.assign(static_cast<std::size_t>(nr), "-");
  for (int r = 0; r < nr; ++r) {
    const std::size_t ri = static_cast<std::size_t>(r);
    const char* routine = out.group == free_group ? ez_test::free_fn_name(r) : group_name(out.group);
    const char* view = out.group == free_group ? "" : ez_test::view_name(r);
    for (const entry<T>& e : h.top(r).rows(top_k)) {
      out.rows[ri].push_back("{\"" + std::string(routine) + "\", \"" + view + "\", " +
                             literal(e.x) + ", " + literal(e.y) + ", " + ulps_literal(e.frac) +
                             ", " + std::to_string(static_cast<long long>(e.dist)) + "LL}");
    }
    if (!h.top(r).empty()) {
      const entry<T>& w = h.top(r).worst();
      out.worst_frac[ri] = w.frac;
      out.worst_dist[ri] = static_cast<long long>(w.dist);
      out.worst_input[ri] = input_text(out.group, w.x, w.y);
    }
  }
}

// ---- options ------------------------------------------------------------------------------------

struct options {
  double seconds = 0, total = 0;
  long evals = 0;
  std::string evals_from;
  std::size_t top = 8;
  std::string out = "hard_cases.hpp";
  unsigned long long seed = 1;
  int threads = 1;
  bool types[n_types] = {true, true, true};
  std::string command_line;
};

[[noreturn]] void usage(const char* why) {
  std::fprintf(stderr,
               "eigenzeit_hunt_hard_cases: %s\n"
               "usage: eigenzeit_hunt_hard_cases [--seconds N | --total N | --evals N | "
               "--evals-from FILE]\n"
               "         [--top K] [--out FILE] [--seed S] [--threads K] [--types LIST]\n",
               why);
  std::exit(2);
}

double number(const char* flag, const char* text, double lo) {
  char* end = nullptr;
  errno = 0;
  const double v = std::strtod(text, &end);
  if (errno != 0 || end == text || *end != 0 || !(v >= lo) || !std::isfinite(v))
    usage((std::string("bad value for ") + flag + ": " + text).c_str());
  return v;
}

std::string quoted(const std::string& a) {
  if (a.find_first_of(" \t\"'") == std::string::npos && !a.empty()) return a;
  return "\"" + a + "\"";
}

options parse(int argc, char** argv) {
  options o;
  int budgets = 0;
  o.command_line = "eigenzeit_hunt_hard_cases";
  for (int i = 1; i < argc; ++i) o.command_line += " " + quoted(argv[i]);
  for (int i = 1; i < argc; ++i) {
    const std::string a = argv[i];
    auto value = [&]() -> const char* {
      if (i + 1 >= argc) usage(("missing value after " + a).c_str());
      return argv[++i];
    };
    if (a == "--seconds") { o.seconds = number("--seconds", value(), 0.001); ++budgets; }
    else if (a == "--total") { o.total = number("--total", value(), 0.001); ++budgets; }
    else if (a == "--evals") { o.evals = static_cast<long>(number("--evals", value(), 1)); ++budgets; }
    else if (a == "--evals-from") { o.evals_from = value(); ++budgets; }
    else if (a == "--top") o.top = static_cast<std::size_t>(number("--top", value(), 1));
    else if (a == "--out") o.out = value();
    else if (a == "--seed") o.seed = static_cast<unsigned long long>(number("--seed", value(), 0));
    else if (a == "--threads") o.threads = static_cast<int>(number("--threads", value(), 1));
    else if (a == "--types") {
      std::fill(std::begin(o.types), std::end(o.types), false);
      std::stringstream list(value());
      std::string t;
      while (std::getline(list, t, ',')) {
        bool known = false;
        for (int k = 0; k < n_types; ++k)
          if (t == type_names[k] || (k == 2 && (t == "long double" || t == "ld"))) {
            o.types[k] = true;
            known = true;
          }
        if (!known) usage(("unknown type " + t).c_str());
      }
    } else if (a == "--help" || a == "-h") {
      usage("searches for the inputs with the largest errors of each routine");
    } else {
      usage(("unknown option " + a).c_str());
    }
  }
  if (budgets > 1) usage("give one of --seconds, --total, --evals, --evals-from");
  if (budgets == 0) o.seconds = 5;
  return o;
}

/// "// evals <type> <group> <count>" lines of an earlier table.
std::map<std::pair<std::string, std::string>, long> read_counts(const std::string& file) {
  std::ifstream in(file);
  if (!in) {
    std::fprintf(stderr, "eigenzeit_hunt_hard_cases: cannot read %s\n", file.c_str());
    std::exit(1);
  }
  std::map<std::pair<std::string, std::string>, long> counts;
  std::string line;
  while (std::getline(in, line)) {
    std::istringstream s(line);
    std::string slashes, word, type, group;
    long n = 0;
    if (s >> slashes >> word >> type >> group >> n && slashes == "//" && word == "evals")
      counts[{type, group}] = n;
  }
  return counts;
}

std::string utc_date() {
  std::time_t t = std::time(nullptr);
  if (const char* sde = std::getenv("SOURCE_DATE_EPOCH")) t = static_cast<std::time_t>(std::atoll(sde));
  char buf[40];
  std::strftime(buf, sizeof buf, "%Y-%m-%d %H:%M UTC", std::gmtime(&t));
  return buf;
}

std::string compiler() {
#if defined(__clang__)
  return std::string("clang++ ") + __clang_version__;
#elif defined(__GNUC__)
  return std::string("g++ ") + __VERSION__;
#else
  return "unknown compiler";
#endif
}

const char* type_cpp(int t) { return t == 0 ? "float" : t == 1 ? "double" : "long double"; }

void write_table(const options& o, const std::vector<task_result>& results, double wall) {
  std::ofstream f(o.out);
  if (!f) {
    std::fprintf(stderr, "eigenzeit_hunt_hard_cases: cannot write %s\n", o.out.c_str());
    std::exit(1);
  }
  f << "// hard_cases.hpp: the inputs with the largest errors found for each routine of\n"
       "// speed.hpp, replayed against MPFR by tests/test_hard_cases.cpp.\n"
       "//\n"
       "// Generated, do not edit.\n"
       "// Generator:    tools/hunt_hard_cases.cpp (built as eigenzeit_hunt_hard_cases)\n"
       "// Command line: " << o.command_line << "\n"
       "// Date:         " << utc_date() << "\n"
       "// Reference:    MPFR " << mpfr_get_version() << ", the definition formulas on the exact\n"
       "//               input at 256 + 2 digits(T) + 2 |binary exponent of the input| bits\n"
       "//               (+ 3 bits per unit of rapidity): ez_test::reference_precision in\n"
       "//               tests/support/routines.hpp.\n"
       "// Built with:   " << compiler() << (EIGENZEIT_HAS_FAST_FMA ? ", hardware fma" : ", no hardware fma")
    << "\n"
       "// Wall time:    " << static_cast<long>(wall + 0.5) << " s\n"
       "//\n"
       "// Each row: routine (a named constructor of speed<T>, or a free function of beta), view\n"
       "// (\"\" for a free function), the input x (beta for a free function, which the test also\n"
       "// replays as -beta; kinetic energy or momentum for the energy constructors), the mass\n"
       "// (1 where unused), the error found, |result - exact| in ulps of the correctly rounded\n"
       "// result, and the distance to the correctly rounded result in representable values.\n"
       "// Only results whose correctly rounded value is a normal number are listed (the region\n"
       "// of the precision contract); an input the library refused although its gamma and\n"
       "// proper speed are finite would be listed with an infinite error.  Up to "
    << o.top << " rows per\n"
       "// (type, routine), worst first; routines that were exact on every input hunted have\n"
       "// no rows.  The long double rows are for the x87 80-bit format.\n"
       "//\n"
       "// Evaluations per (type, group), read back by --evals-from:\n";
  for (const auto& r : results)
    f << "// evals " << type_names[r.type] << " " << group_name(r.group) << " " << r.evals << "\n";
  f << "\n#ifndef EIGENZEIT_TESTS_DATA_HARD_CASES_HPP\n#define EIGENZEIT_TESTS_DATA_HARD_CASES_HPP\n\n"
       "#include <cstddef>\n#include <limits>\n\nnamespace eigenzeit_testdata {\n\n"
       "template <class T>\nstruct hard_case {\n"
       "  const char* routine;  // from_beta, ..., from_momentum, or lorentz_factor, ..., rapidity\n"
       "  const char* view;     // beta, ..., proper_speed; \"\" for a free function\n"
       "  T x;                  // the input (energy or momentum for the energy constructors)\n"
       "  T mass;               // mass of the energy constructors, 1 otherwise\n"
       "  double ulps;          // error found, in ulps of the correctly rounded result\n"
       "  long long dist;       // distance to the correctly rounded result\n"
       "};\n";
  for (int t = 0; t < n_types; ++t) {
    std::size_t count = 0;
    std::string body;
    for (const auto& r : results) {
      if (r.type != t) continue;
      for (const auto& rows : r.rows)
        for (const auto& row : rows) {
          body += "    " + row + ",\n";
          ++count;
        }
    }
    const std::string name = std::string("hard_cases_") + type_names[t];
    f << "\n// " << type_cpp(t) << ": " << count << " rows" << (o.types[t] ? "" : " (not hunted)") << "\n";
    f << "inline constexpr std::size_t " << name << "_count = " << count << ";\n";
    f << "inline constexpr hard_case<" << type_cpp(t) << "> " << name << "[] = {\n";
    if (count == 0) f << "    {\"\", \"\", 0, 1, 0.0, 0LL},  // placeholder, not a row\n";
    f << body << "};\n";
  }
  f << "\n}  // namespace eigenzeit_testdata\n\n#endif\n";
}

}  // namespace

int main(int argc, char** argv) {
  const options o = parse(argc, argv);
  if (o.threads > 1 && !mpfr_buildopt_tls_p()) {
    std::fprintf(stderr, "eigenzeit_hunt_hard_cases: this MPFR is not thread-safe; use --threads 1\n");
    return 1;
  }
  std::map<std::pair<std::string, std::string>, long> counts;
  if (!o.evals_from.empty()) counts = read_counts(o.evals_from);

  std::vector<task_result> results;
  int routines = 0;
  for (int t = 0; t < n_types; ++t)
    if (o.types[t]) {
      routines += routines_per_type();
      for (int g = 0; g < n_groups; ++g) {
        task_result r;
        r.type = t;
        r.group = g;
        results.push_back(r);
      }
    }
  if (results.empty()) usage("no types");
  const double per_routine =
      o.seconds > 0 ? o.seconds : o.total > 0 ? o.total * o.threads / routines : 0.0;
  std::fprintf(stderr, "hunting %zu (type, group) tasks, %d routines, %d thread(s), seed %llu\n",
               results.size(), routines, o.threads, o.seed);

  const auto t0 = clock_type::now();
  std::atomic<std::size_t> next{0};
  std::atomic<bool> failed{false};
  std::mutex io;
  auto worker = [&]() {
    // MPFR keeps constants and caches per thread: free them when the thread is done.
    struct cache_release {
      ~cache_release() { mpfr_free_cache(); }
    } release;
    for (;;) {
      const std::size_t i = next++;
      if (i >= results.size() || failed) return;
      task_result& r = results[i];
      budget b;
      const int nr = routines_in(r.group);
      if (!o.evals_from.empty()) {
        const auto it = counts.find({type_names[r.type], group_name(r.group)});
        if (it == counts.end()) {
          std::lock_guard<std::mutex> lock(io);
          std::fprintf(stderr, "no evaluation count for %s %s in %s\n", type_names[r.type],
                       group_name(r.group), o.evals_from.c_str());
          failed = true;
          return;
        }
        b.max_evals = it->second;
      } else if (o.evals > 0) {
        b.max_evals = o.evals * nr;
      } else {
        b.seconds = per_routine * nr;
      }
      // One stream per (type, group), whatever thread runs it.
      const unsigned long long seed =
          o.seed * 1000003ULL + static_cast<unsigned long long>(r.type * n_groups + r.group);
      try {
        if (r.type == 0) run_task<float>(r, seed, b, o.top);
        else if (r.type == 1) run_task<double>(r, seed, b, o.top);
        else run_task<long double>(r, seed, b, o.top);
      } catch (const std::exception& e) {
        std::lock_guard<std::mutex> lock(io);
        std::fprintf(stderr, "error in %s %s: %s\n", type_names[r.type], group_name(r.group), e.what());
        failed = true;
        return;
      }
      std::lock_guard<std::mutex> lock(io);
      double worst = 0;
      for (double w : r.worst_frac) worst = std::max(worst, w);
      std::fprintf(stderr, "[%3zu/%zu] %-11s %-19s %9ld evaluations in %6.1f s, worst %.4f ulp%s\n",
                   i + 1, results.size(), type_names[r.type], group_name(r.group), r.evals,
                   r.seconds, worst, r.refused ? ", REFUSED IN-DOMAIN INPUTS" : "");
    }
  };
  std::vector<std::thread> pool;
  for (int k = 0; k < o.threads; ++k) pool.emplace_back(worker);
  for (auto& th : pool) th.join();
  if (failed) return 1;
  const double wall = std::chrono::duration<double>(clock_type::now() - t0).count();

  // Summary.
  bool breach = false;
  for (const auto& r : results) {
    const int nr = routines_in(r.group);
    for (int k = 0; k < nr; ++k) {
      const std::size_t ki = static_cast<std::size_t>(k);
      const bool is_free = r.group == free_group;
      const int allowed = ez_test::contract_ulps(is_free, is_free ? ctor::beta : ez_test::all_ctor_tags[r.group], k);
      const bool bad = r.worst_dist[ki] > allowed;
      breach = breach || bad;
      std::printf("%-11s %-19s %-18s max %10.6f ulp (dist %lld, allowed %d)%s  at %s\n",
                  type_names[r.type], group_name(r.group),
                  is_free ? ez_test::free_fn_name(k) : ez_test::view_name(k), r.worst_frac[ki],
                  r.worst_dist[ki], allowed, bad ? "  OUTSIDE THE CONTRACT" : "",
                  r.worst_input[ki].c_str());
    }
    if (r.refused > 0)
      std::printf("%-11s %-19s refused %ld in-domain inputs, first %s\n", type_names[r.type],
                  group_name(r.group), r.refused, r.first_refused.c_str());
  }
  write_table(o, results, wall);
  long total = 0;
  for (const auto& r : results) total += r.evals;
  std::fprintf(stderr, "%ld evaluations in %.0f s; table written to %s%s\n", total, wall,
               o.out.c_str(), breach ? "; SOME ROUTINES BREAK THE PRECISION CONTRACT" : "");
  return 0;
}
