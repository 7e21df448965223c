// eigenzeit_accuracy: accuracy report of speed<T> and the free functions of beta, measured
// against the MPFR reference of the test suite (tests/support/reference.hpp).
//
// Usage:
//   eigenzeit_accuracy [--samples N] [--types float,double,long double] [--threads K]
//                      [--csv FILE] [--markdown FILE] [--seed S]
//
//   --samples N   inputs per constructor (and for the free-function sweep) for double;
//                 float and long double get N/5 (at least 1).  Default N = 1000000.
//   --types LIST  comma-separated subset of float, double, long double (also accepted:
//                 long_double, ld).  Quote the list when it contains the space of
//                 "long double".  Default: all three, in the order float, double, long double.
//   --threads K   worker threads (default: std::thread::hardware_concurrency()).  Thread i
//                 draws from its own std::mt19937_64 seeded with S + i; the statistics are
//                 merged at the end.  A run is reproducible for the same N, K, S and types
//                 (the sampler, tests/support/sampler.hpp, keeps its logs out of
//                 compile-time folding, so builds with other flags draw the same inputs).
//   --csv FILE    one row per type / constructor-or-function / view / flavour (careful|naive).
//   --markdown FILE  compact tables: type, quantity, max ulp, mean ulp, share correctly
//                 rounded; for the free functions also the naive formula's max ulp.
//   --seed S      base seed (default 1).
//
// Example:
//   eigenzeit_accuracy --samples 20000 --types "double,long double" --csv acc.csv
//
// Build by hand (CMake builds it as eigenzeit_accuracy from tools/accuracy.cpp):
//   g++ -std=gnu++17 -O2 -I include -I tests tools/accuracy.cpp -lmpfr -lgmp -lpthread
//
// What is measured.  For each real type and each named constructor of speed<T>, inputs are
// drawn log-uniformly over the same domains as the sweep in tests/test_speed.cpp (its sampler
// is copied below), all eight views are evaluated, and each result is compared with the MPFR
// value of the view's definition formula on the exact input, at a working precision that
// absorbs the formula's cancellation.  Per (type, constructor, view):
//   count     results whose correctly rounded value is a normal number (the contract region)
//   max ulp   largest |result - exact| in ulps of the correctly rounded value (fractional)
//   mean ulp  mean of the same over the count
//   max dist  largest integer distance, in representable values, to the correctly rounded value
//             (saturates at INT64_MAX = 9223372036854775807, shown as >9.2e+18)
//   cr        share of the count that equals the correctly rounded value
//   worst     the input with the largest fractional error (mass too for the energy constructors;
//             "-" when every result was exact)
//   outside   results whose correctly rounded value is subnormal or zero (or overflows): they
//             lie outside the precision contract and are only counted, with their max dist.
// The five free functions are measured on signed beta drawn like the from_beta inputs with a
// random sign, and next to each the textbook formula evaluated in the same type on the same
// input:  1/sqrt(1-b*b), 1/sqrt(1-b*b) - 1, b/sqrt(1-b*b), 1 - sqrt(1-b*b),
// 0.5*log((1+b)/(1-b)).  A result that is inf or NaN where the exact value is a finite normal
// number counts as failed: the failure count is reported, the max ulp becomes inf, and the
// failed results are left out of the mean and of the max dist (which then describes the
// finite results only).  The careful forms get exactly the same treatment.
//
// Progress goes to stderr about every 10%; the wall time and the sample totals are printed at
// the end.  The exit status is 0 after a complete run, 1 on an error, 2 on a usage error.
#include <mpfr.h>

#include <algorithm>
#include <atomic>
#include <cerrno>
#include <cstdarg>
#include <chrono>
#include <cmath>
#include <cstdint>
#include <cstdio>
#include <cstdlib>
#include <cstring>
#include <exception>
#include <limits>
#include <mutex>
#include <random>
#include <string>
#include <thread>
#include <type_traits>
#include <vector>

#include <eigenzeit/speed.hpp>

#include "../tests/support/reference.hpp"
#include "../tests/support/sampler.hpp"

namespace {

using ez_test::construct;
using ez_test::ctor;
using ez_test::sampler;
using ez_test::two_inputs;
using ez_test::views_of;

constexpr int n_ctors = 8;
constexpr int n_views = ez_test::n_views;
constexpr int n_free = 5;

const ctor all_ctors[n_ctors] = {ctor::beta,         ctor::beta_deficit,   ctor::gamma,
                                 ctor::gamma_m1,     ctor::rapidity,       ctor::proper_speed,
                                 ctor::kinetic_energy, ctor::momentum};

const char* const free_names[n_free] = {"lorentz_factor", "lorentz_factor_m1", "proper_speed",
                                        "dilation_fraction", "rapidity"};
const int free_view[n_free] = {ez_test::v_gamma, ez_test::v_gamma_m1, ez_test::v_proper_speed,
                               ez_test::v_dilation, ez_test::v_rapidity};
const bool free_odd[n_free] = {false, false, true, false, true};
const char* const naive_formulas[n_free] = {"1/sqrt(1-b*b)", "1/sqrt(1-b*b) - 1", "b/sqrt(1-b*b)",
                                            "1 - sqrt(1-b*b)", "0.5*log((1+b)/(1-b))"};


// ---- the real types ---------------------------------------------------------------------------

enum type_id { t_float, t_double, t_long_double, n_types };
const char* const type_names[n_types] = {"float", "double", "long double"};
const char* const type_names_csv[n_types] = {"float", "double", "long_double"};

template <class T>
int max_digits10() {
  return std::numeric_limits<T>::max_digits10;
}
int max_digits10_of(int t) {
  return t == t_float ? max_digits10<float>() : t == t_double ? max_digits10<double>()
                                                              : max_digits10<long double>();
}

// ---- input generation: copied from tests/test_speed.cpp (log-uniform over each constructor's
// domain, exact in T).  The only change: the engine is the calling thread's, held by reference.

// ---- statistics -----------------------------------------------------------------------------

struct stats {
  long n = 0;          // results whose correctly rounded value is normal (failed ones included)
  long n_exact = 0;    // ... equal to the correctly rounded value
  long n_failed = 0;   // ... inf or NaN although the exact value is finite
  long n_outside = 0;  // correctly rounded value subnormal, zero or not finite
  std::int64_t max_dist_outside = 0;
  double max_frac = 0, sum_frac = 0;
  std::int64_t max_dist = 0;  // over the finite results
  bool have_worst = false;
  long double worst_x = 0, worst_y = 0;

  void add(const ez_test::ulp_error& e, bool got_finite, long double x, long double y) {
    if (!e.normal) {
      ++n_outside;
      max_dist_outside = std::max(max_dist_outside, e.dist);
      return;
    }
    ++n;
    if (e.exact) ++n_exact;
    if (!got_finite) {
      ++n_failed;
      if (!have_worst || !(max_frac == std::numeric_limits<double>::infinity())) set_worst(x, y);
      max_frac = std::numeric_limits<double>::infinity();
      return;
    }
    sum_frac += e.frac;
    max_dist = std::max(max_dist, e.dist);
    if (!have_worst || e.frac > max_frac) {
      max_frac = std::max(max_frac, e.frac);
      set_worst(x, y);
    }
  }
  void set_worst(long double x, long double y) {
    have_worst = true;
    worst_x = x;
    worst_y = y;
  }
  void merge(const stats& o) {
    if (o.have_worst && (!have_worst || o.max_frac > max_frac)) {
      max_frac = o.max_frac;
      set_worst(o.worst_x, o.worst_y);
    }
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

struct type_stats {
  stats view[n_ctors][n_views];
  stats careful[n_free];
  stats naive[n_free];
  double thread_seconds = 0;  // summed over threads

  void merge(const type_stats& o) {
    for (int c = 0; c < n_ctors; ++c)
      for (int v = 0; v < n_views; ++v) view[c][v].merge(o.view[c][v]);
    for (int k = 0; k < n_free; ++k) {
      careful[k].merge(o.careful[k]);
      naive[k].merge(o.naive[k]);
    }
    thread_seconds += o.thread_seconds;
  }
};

struct shared_state {
  std::atomic<long> done{0};  // inputs processed, over all threads
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

// ---- the sweeps -------------------------------------------------------------------------------

/// `count` inputs for every constructor, then `count` signed betas for the free functions.
template <class T>
void sweep_type(std::mt19937_64& engine, long count, type_stats& out, shared_state& sh) {
  const auto start = std::chrono::steady_clock::now();
  sampler<T> gen(engine);
  const int digits = std::numeric_limits<T>::digits;

  for (int ci = 0; ci < n_ctors; ++ci) {
    const ctor c = all_ctors[ci];
    for (long i = 0; i < count; ++i) {
      if (sh.stop.load(std::memory_order_relaxed)) return;
      T x = T(0), y = T(1);
      gen.draw(c, x, y);
      const eigenzeit::speed<T> s = construct(c, x, y);
      T got[n_views];
      views_of(s, got);
      const ez_test::reference ref(c, x, y, digits);
      for (int v = 0; v < n_views; ++v)
        out.view[ci][v].add(ez_test::measure<T>(got[v], ref.val[v].v), std::isfinite(got[v]), x,
                            two_inputs(c) ? static_cast<long double>(y) : 0.0L);
      sh.done.fetch_add(1, std::memory_order_relaxed);
    }
  }

  for (long i = 0; i < count; ++i) {
    if (sh.stop.load(std::memory_order_relaxed)) return;
    T a = T(0), unused = T(1);
    gen.draw(ctor::beta, a, unused);
    const bool negative = (gen.rng() & 1) != 0;
    const T b = negative ? -a : a;
    const T careful[n_free] = {eigenzeit::lorentz_factor(b), eigenzeit::lorentz_factor_m1(b),
                               eigenzeit::proper_speed(b), eigenzeit::dilation_fraction(b),
                               eigenzeit::rapidity(b)};
    // The textbook formulas, every operation in T.
    const T one_minus_b2 = T(1) - b * b;
    const T root = std::sqrt(one_minus_b2);
    const T naive_gamma = T(1) / root;
    const T naive[n_free] = {naive_gamma, naive_gamma - T(1), b / root, T(1) - root,
                             T(0.5) * std::log((T(1) + b) / (T(1) - b))};
    const ez_test::reference ref(ctor::beta, a, 1, digits);
    for (int k = 0; k < n_free; ++k) {
      // The reference is for |b|; odd functions are compared after an (exact) sign flip.
      const bool flip = free_odd[k] && negative;
      const T gc = flip ? -careful[k] : careful[k];
      const T gn = flip ? -naive[k] : naive[k];
      const auto& r = ref.val[free_view[k]].v;
      out.careful[k].add(ez_test::measure<T>(gc, r), std::isfinite(gc), b, 0.0L);
      out.naive[k].add(ez_test::measure<T>(gn, r), std::isfinite(gn), b, 0.0L);
    }
    sh.done.fetch_add(1, std::memory_order_relaxed);
  }
  out.thread_seconds +=
      std::chrono::duration<double>(std::chrono::steady_clock::now() - start).count();
}

struct run_config {
  long samples = 1000000;
  std::vector<int> types;
  unsigned threads = 0;
  unsigned long long seed = 1;
  std::string csv, markdown;
};

long samples_for(const run_config& cfg, int t) {
  return t == t_double ? cfg.samples : std::max(1L, cfg.samples / 5);
}

// Share of `total` handled by thread `i` of `k`.
long share(long total, unsigned i, unsigned k) {
  const long kk = static_cast<long>(k), ii = static_cast<long>(i);
  return total / kk + (ii < total % kk ? 1 : 0);
}

void worker(const run_config& cfg, unsigned index, std::vector<type_stats>& out, shared_state& sh) {
  try {
    std::mt19937_64 engine(cfg.seed + index);
    for (std::size_t j = 0; j < cfg.types.size(); ++j) {
      const int t = cfg.types[j];
      const long count = share(samples_for(cfg, t), index, cfg.threads);
      if (t == t_float) sweep_type<float>(engine, count, out[j], sh);
      else if (t == t_double) sweep_type<double>(engine, count, out[j], sh);
      else sweep_type<long double>(engine, count, out[j], sh);
    }
  } catch (const std::exception& e) {
    sh.fail(std::string("thread ") + std::to_string(index) + ": " + e.what());
  } catch (...) {
    sh.fail(std::string("thread ") + std::to_string(index) + ": unknown exception");
  }
  mpfr_free_cache();
  sh.running.fetch_sub(1);
}

// ---- formatting ---------------------------------------------------------------------------------

#if defined(__GNUC__)
std::string fmt(const char* format, ...) __attribute__((format(printf, 1, 2)));
#endif
std::string fmt(const char* format, ...) {
  char buf[512];
  va_list args;
  va_start(args, format);
  std::vsnprintf(buf, sizeof buf, format, args);
  va_end(args);
  return buf;
}

std::string fmt_ulp(double x, int decimals) {
  if (std::isinf(x)) return "inf";
  if (std::isnan(x)) return "nan";
  if (x >= 1e5) return fmt("%.3e", x);
  return fmt("%.*f", decimals, x);
}

// The distance saturates at INT64_MAX (ulp_distance caps it there for long double).
std::string fmt_dist(std::int64_t d) {
  if (d == std::numeric_limits<std::int64_t>::max()) return ">9.2e+18";
  if (d >= 1000000) return fmt("%.3e", static_cast<double>(d));
  return fmt("%lld", static_cast<long long>(d));
}

std::string fmt_share(const stats& s) {
  if (s.n == 0) return "-";
  return fmt("%.4f%%", 100.0 * s.share_exact());
}

std::string fmt_input(long double x, int digits) { return fmt("%.*Lg", digits, x); }

std::string fmt_worst(const stats& s, int t, bool with_mass) {
  if (!s.have_worst || s.max_frac == 0) return "-";  // no error at all: no worst input
  const int d = max_digits10_of(t);
  if (with_mass) return fmt_input(s.worst_x, d) + " (mass " + fmt_input(s.worst_y, d) + ")";
  return fmt_input(s.worst_x, d);
}

void print_text(const run_config& cfg, const std::vector<type_stats>& res) {
  std::printf("Accuracy of eigenzeit speed routines against MPFR (ulps of the correctly rounded "
              "result).\n"
              "max/mean = fractional ulps, dist = max integer ulp distance to the correctly rounded "
              "value,\ncr = share correctly rounded, outside = results whose correctly rounded "
              "value is subnormal or zero\n(outside the contract; their max dist in brackets), "
              "failed = inf/NaN where the exact value is finite.\n");
  for (std::size_t j = 0; j < cfg.types.size(); ++j) {
    const int t = cfg.types[j];
    const type_stats& r = res[j];
    std::printf("\n== %s: speed<%s> views, %ld inputs per constructor ==\n", type_names[t],
                type_names[t], samples_for(cfg, t));
    std::printf("%-20s %-18s %9s %10s %10s %6s %10s %14s  %s\n", "constructor", "view", "count",
                "max ulp", "mean ulp", "dist", "cr", "outside", "worst input");
    for (int ci = 0; ci < n_ctors; ++ci) {
      for (int v = 0; v < n_views; ++v) {
        const stats& s = r.view[ci][v];
        std::string outside = fmt("%ld (%s)", s.n_outside, fmt_dist(s.max_dist_outside).c_str());
        std::printf("%-20s %-18s %9ld %10s %10s %6s %10s %14s  %s%s\n",
                    v == 0 ? ez_test::ctor_name(all_ctors[ci]) : "", ez_test::view_name(v), s.n,
                    fmt_ulp(s.max_frac, 3).c_str(), fmt_ulp(s.mean(), 4).c_str(),
                    fmt_dist(s.max_dist).c_str(), fmt_share(s).c_str(), outside.c_str(),
                    fmt_worst(s, t, two_inputs(all_ctors[ci])).c_str(),
                    s.n_failed ? fmt("  FAILED %ld", s.n_failed).c_str() : "");
      }
    }
    std::printf("\n== %s: free functions of signed beta, %ld inputs; naive = textbook formula in "
                "%s ==\n", type_names[t], samples_for(cfg, t), type_names[t]);
    std::printf("%-18s %-8s %9s %10s %10s %10s %10s %9s %7s  %s\n", "function", "flavour", "count",
                "max ulp", "mean ulp", "dist", "cr", "outside", "failed", "worst input");
    for (int k = 0; k < n_free; ++k) {
      for (int f = 0; f < 2; ++f) {
        const stats& s = f == 0 ? r.careful[k] : r.naive[k];
        std::printf("%-18s %-8s %9ld %10s %10s %10s %10s %9ld %7ld  %s\n",
                    f == 0 ? free_names[k] : "", f == 0 ? "careful" : "naive", s.n,
                    fmt_ulp(s.max_frac, 3).c_str(), fmt_ulp(s.mean(), 4).c_str(),
                    fmt_dist(s.max_dist).c_str(), fmt_share(s).c_str(), s.n_outside, s.n_failed,
                    fmt_worst(s, t, false).c_str());
      }
    }
    std::printf("naive formulas:");
    for (int k = 0; k < n_free; ++k) std::printf(" %s = %s%s", free_names[k], naive_formulas[k], k + 1 < n_free ? ";" : "\n");
  }
}

std::string csv_number(double x) {
  if (std::isinf(x)) return "inf";
  return fmt("%.17g", x);
}

void csv_row(std::FILE* f, int t, const char* kind, const char* quantity, const char* view,
             const char* flavour, const stats& s, bool with_mass) {
  const int d = max_digits10_of(t);
  std::fprintf(f, "%s,%s,%s,%s,%s,%ld,%ld,%ld,%lld,%ld,%s,%s,%lld,%s,%s,%s\n", type_names_csv[t],
               kind, quantity, view, flavour, s.inputs(), s.n, s.n_outside,
               static_cast<long long>(s.max_dist_outside), s.n_failed,
               csv_number(s.max_frac).c_str(), csv_number(s.mean()).c_str(),
               static_cast<long long>(s.max_dist), csv_number(s.share_exact()).c_str(),
               s.have_worst && s.max_frac > 0 ? fmt_input(s.worst_x, d).c_str() : "",
               s.have_worst && s.max_frac > 0 && with_mass ? fmt_input(s.worst_y, d).c_str() : "");
}

bool write_csv(const run_config& cfg, const std::vector<type_stats>& res) {
  std::FILE* f = std::fopen(cfg.csv.c_str(), "w");
  if (!f) return false;
  std::fprintf(f, "type,kind,quantity,view,flavour,inputs,count,outside,outside_max_dist,failed,"
                  "max_ulp,mean_ulp,max_dist,share_correctly_rounded,worst_input,worst_mass\n");
  for (std::size_t j = 0; j < cfg.types.size(); ++j) {
    const int t = cfg.types[j];
    for (int ci = 0; ci < n_ctors; ++ci)
      for (int v = 0; v < n_views; ++v)
        csv_row(f, t, "constructor", ez_test::ctor_name(all_ctors[ci]), ez_test::view_name(v),
                "careful", res[j].view[ci][v], two_inputs(all_ctors[ci]));
    for (int k = 0; k < n_free; ++k) {
      csv_row(f, t, "function", free_names[k], ez_test::view_name(free_view[k]), "careful",
              res[j].careful[k], false);
      csv_row(f, t, "function", free_names[k], ez_test::view_name(free_view[k]), "naive",
              res[j].naive[k], false);
    }
  }
  return std::fclose(f) == 0;
}

bool write_markdown(const run_config& cfg, const std::vector<type_stats>& res, unsigned threads) {
  std::FILE* f = std::fopen(cfg.markdown.c_str(), "w");
  if (!f) return false;
  std::fprintf(f, "Accuracy against MPFR %s, in ulps of the correctly rounded result; results whose "
                  "correctly rounded value is subnormal or zero are left out.  Inputs per "
                  "constructor: %ld for double, %ld for float and long double; seed %llu, %u "
                  "threads.\n\n",
               mpfr_get_version(), cfg.samples, std::max(1L, cfg.samples / 5), cfg.seed, threads);
  std::fprintf(f, "| type | quantity | max ulp | mean ulp | correctly rounded |\n"
                  "|---|---|---:|---:|---:|\n");
  for (std::size_t j = 0; j < cfg.types.size(); ++j) {
    const int t = cfg.types[j];
    for (int ci = 0; ci < n_ctors; ++ci)
      for (int v = 0; v < n_views; ++v) {
        const stats& s = res[j].view[ci][v];
        std::fprintf(f, "| %s | %s: %s | %s | %s | %s |\n", type_names[t],
                     ez_test::ctor_name(all_ctors[ci]), ez_test::view_name(v),
                     fmt_ulp(s.max_frac, 3).c_str(), fmt_ulp(s.mean(), 4).c_str(),
                     fmt_share(s).c_str());
      }
  }
  std::fprintf(f, "\nFree functions of signed beta; naive = the textbook formula in the same type "
                  "(failed = inf or NaN for a finite exact value).\n\n"
                  "| type | quantity | max ulp | mean ulp | correctly rounded | naive max ulp |\n"
                  "|---|---|---:|---:|---:|---:|\n");
  for (std::size_t j = 0; j < cfg.types.size(); ++j) {
    const int t = cfg.types[j];
    for (int k = 0; k < n_free; ++k) {
      const stats& s = res[j].careful[k];
      const stats& nv = res[j].naive[k];
      std::string naive = fmt_ulp(nv.max_frac, 3);
      if (nv.n_failed) naive += fmt(" (%ld failed)", nv.n_failed);
      std::fprintf(f, "| %s | %s | %s | %s | %s | %s |\n", type_names[t], free_names[k],
                   fmt_ulp(s.max_frac, 3).c_str(), fmt_ulp(s.mean(), 4).c_str(),
                   fmt_share(s).c_str(), naive.c_str());
    }
  }
  return std::fclose(f) == 0;
}

// ---- command line ---------------------------------------------------------------------------------

void usage(std::FILE* f) {
  std::fprintf(f, "usage: eigenzeit_accuracy [--samples N] [--types float,double,long double] "
                  "[--threads K]\n                          [--csv FILE] [--markdown FILE] "
                  "[--seed S]\n"
                  "N inputs per constructor for double (default 1000000), N/5 for float and "
                  "long double.\n");
}

std::string trim(const std::string& s) {
  const auto b = s.find_first_not_of(" \t");
  if (b == std::string::npos) return "";
  const auto e = s.find_last_not_of(" \t");
  return s.substr(b, e - b + 1);
}

bool parse_types(const std::string& list, std::vector<int>& out) {
  out.clear();
  std::size_t pos = 0;
  while (pos <= list.size()) {
    const std::size_t comma = std::min(list.find(',', pos), list.size());
    const std::string name = trim(list.substr(pos, comma - pos));
    int t = -1;
    if (name == "float") t = t_float;
    else if (name == "double") t = t_double;
    else if (name == "long double" || name == "long_double" || name == "longdouble" || name == "ld")
      t = t_long_double;
    if (t < 0) {
      std::fprintf(stderr, "eigenzeit_accuracy: unknown type '%s'\n", name.c_str());
      return false;
    }
    if (std::find(out.begin(), out.end(), t) == out.end()) out.push_back(t);
    pos = comma + 1;
  }
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
    const bool known = opt == "--samples" || opt == "--types" || opt == "--threads" ||
                       opt == "--csv" || opt == "--markdown" || opt == "--seed";
    if (!known) {
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
    if (opt == "--samples") {
      if (!parse_integer(value, n) || n == 0 || n > 1000000000000ULL) {
        std::fprintf(stderr, "eigenzeit_accuracy: bad --samples '%s'\n", value.c_str());
        return 2;
      }
      cfg.samples = static_cast<long>(n);
    } else if (opt == "--threads") {
      if (!parse_integer(value, n) || n == 0 || n > 4096) {
        std::fprintf(stderr, "eigenzeit_accuracy: bad --threads '%s'\n", value.c_str());
        return 2;
      }
      cfg.threads = static_cast<unsigned>(n);
    } else if (opt == "--seed") {
      if (!parse_integer(value, n)) {
        std::fprintf(stderr, "eigenzeit_accuracy: bad --seed '%s'\n", value.c_str());
        return 2;
      }
      cfg.seed = n;
    } else if (opt == "--types") {
      if (!parse_types(value, cfg.types)) return 2;
    } else if (opt == "--csv") {
      cfg.csv = value;
    } else {
      cfg.markdown = value;
    }
  }
  if (cfg.threads == 0) cfg.threads = std::max(1u, std::thread::hardware_concurrency());
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

  long total = 0;  // inputs drawn: eight constructors plus the free-function sweep, per type
  long compared = 0;
  for (int t : cfg.types) {
    total += (n_ctors + 1) * samples_for(cfg, t);
    compared += (n_ctors * n_views + 2 * n_free) * samples_for(cfg, t);
  }
  std::fprintf(stderr, "eigenzeit_accuracy: %ld inputs on %u threads, seed %llu\n", total,
               cfg.threads, cfg.seed);

  const auto start = std::chrono::steady_clock::now();
  shared_state sh;
  std::vector<std::vector<type_stats>> per_thread(cfg.threads,
                                                  std::vector<type_stats>(cfg.types.size()));
  std::vector<std::thread> pool;
  sh.running.store(static_cast<int>(cfg.threads));
  for (unsigned i = 0; i < cfg.threads; ++i)
    pool.emplace_back(worker, std::cref(cfg), i, std::ref(per_thread[i]), std::ref(sh));

  // Progress about every 10%.
  int reported = 0;
  while (sh.running.load() > 0) {
    std::this_thread::sleep_for(std::chrono::milliseconds(100));
    const long done = sh.done.load(std::memory_order_relaxed);
    const int tenth = static_cast<int>((10 * done) / std::max(1L, total));
    if (tenth > reported && tenth < 10) {
      reported = tenth;
      const double secs = std::chrono::duration<double>(std::chrono::steady_clock::now() - start).count();
      std::fprintf(stderr, "  %3d%%  %ld of %ld inputs, %.1f s\n", 10 * tenth, done, total, secs);
    }
  }
  for (auto& th : pool) th.join();
  if (!sh.error.empty()) {
    std::fprintf(stderr, "eigenzeit_accuracy: error: %s\n", sh.error.c_str());
    return 1;
  }
  const double wall = std::chrono::duration<double>(std::chrono::steady_clock::now() - start).count();
  std::fprintf(stderr, "  100%%  %ld of %ld inputs, %.1f s\n", sh.done.load(), total, wall);

  std::vector<type_stats> res(cfg.types.size());
  for (unsigned i = 0; i < cfg.threads; ++i)
    for (std::size_t j = 0; j < cfg.types.size(); ++j) res[j].merge(per_thread[i][j]);

  print_text(cfg, res);

  int status = 0;
  if (!cfg.csv.empty() && !write_csv(cfg, res)) {
    std::fprintf(stderr, "eigenzeit_accuracy: cannot write %s\n", cfg.csv.c_str());
    status = 1;
  }
  if (!cfg.markdown.empty() && !write_markdown(cfg, res, cfg.threads)) {
    std::fprintf(stderr, "eigenzeit_accuracy: cannot write %s\n", cfg.markdown.c_str());
    status = 1;
  }

  std::printf("\nMPFR %s, %u threads, seed %llu.\n", mpfr_get_version(), cfg.threads, cfg.seed);
  for (std::size_t j = 0; j < cfg.types.size(); ++j)
    std::printf("%s: %ld inputs per sweep, %.1f thread-seconds\n", type_names[cfg.types[j]],
                samples_for(cfg, cfg.types[j]), res[j].thread_seconds);
  std::printf("Total: %ld inputs, %ld results compared with MPFR, wall time %.2f s.\n", total,
              compared, wall);
  return status;
}
