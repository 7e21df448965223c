// Replays tests/data/hard_cases.hpp, the inputs on which tools/hunt_hard_cases.cpp found the
// largest errors of each routine of speed.hpp, against the MPFR reference (the definition
// formulas on the exact input, tests/support/routines.hpp).  Every entry must keep the
// precision contract of DESIGN.md (at most 1 ulp from the correctly rounded result for the
// algebraic views and free functions, 2 ulp for the rapidity and every view of a speed built
// from a rapidity), and in the correctly rounded mode every float and double entry must give
// exactly the correctly rounded result.  A failure names the entry: type, routine, view and
// the input as a hex-float literal.
#include <doctest/doctest.h>

#include <algorithm>
#include <cmath>
#include <cstdint>
#include <cstdio>
#include <exception>
#include <limits>
#include <map>
#include <string>
#include <type_traits>

#include <eigenzeit/speed.hpp>

#include "data/hard_cases.hpp"
#include "support/reference.hpp"
#include "support/routines.hpp"

namespace {

namespace td = eigenzeit_testdata;
using ez_test::ctor;
using ez_test::type_name;

template <class T>
struct table;
template <>
struct table<float> {
  static const td::hard_case<float>* rows() { return td::hard_cases_float; }
  static std::size_t count() { return td::hard_cases_float_count; }
};
template <>
struct table<double> {
  static const td::hard_case<double>* rows() { return td::hard_cases_double; }
  static std::size_t count() { return td::hard_cases_double_count; }
};
template <>
struct table<long double> {
  static const td::hard_case<long double>* rows() { return td::hard_cases_long_double; }
  static std::size_t count() { return td::hard_cases_long_double_count; }
};

template <class T>
std::string hex(T v) {
  char buf[64];
  if constexpr (std::is_same<T, long double>::value) std::snprintf(buf, sizeof buf, "%La", v);
  else std::snprintf(buf, sizeof buf, "%a", static_cast<double>(v));
  return buf;
}

/// One entry of the table, resolved: which routine, and a description for failure messages.
template <class T>
struct resolved {
  bool ok = false;
  bool is_free = false;
  ctor c = ctor::beta;
  int index = 0;  // view, or free function
  std::string name;

  explicit resolved(const td::hard_case<T>& row) {
    const bool has_mass = std::string(row.routine) == "from_kinetic_energy" ||
                          std::string(row.routine) == "from_momentum";
    name = std::string(type_name<T>()) + " " + row.routine + (*row.view ? "." : "") + row.view +
           "(" + hex(row.x) + (has_mass ? ", mass " + hex(row.mass) : std::string()) + ")";
    if (ez_test::ctor_from_name(row.routine, c)) {
      index = ez_test::view_from_name(row.view);
      ok = index >= 0;
    } else {
      is_free = true;
      index = ez_test::free_fn_from_name(row.routine);
      ok = index >= 0 && *row.view == 0;
    }
  }
  int view() const { return is_free ? ez_test::free_fn_view(index) : index; }
  int allowed() const { return ez_test::contract_ulps(is_free, c, index); }
  std::string key() const {
    return is_free ? std::string(ez_test::free_fn_name(index))
                   : std::string(ez_test::ctor_name(c)) + "." + ez_test::view_name(index);
  }
};

/// The routine's result in the mode that Policy selects; NaN when the constructor refuses.
/// `negated` asks for the free function at -x, sign restored for the odd ones.
template <class T, class Policy>
T result(const resolved<T>& r, T x, T mass, const Policy& pol, bool negated, std::string& error) {
  try {
    if (r.is_free) {
      const T v = ez_test::free_value(r.index, negated ? T(-x) : x, pol);
      return (negated && ez_test::free_fn_odd(r.index)) ? T(-v) : v;
    }
    T views[ez_test::n_views];
    ez_test::read_views(ez_test::construct_with(r.c, x, mass, pol), views);
    return views[r.index];
  } catch (const std::exception& e) {
    error = e.what();
    return std::numeric_limits<T>::quiet_NaN();
  }
}

struct routine_stats {
  long rows = 0;
  double max_now = 0, max_hunted = 0;
  std::int64_t max_dist = 0;
};

/// Replays every row for T; with `rounded`, also the correctly rounded mode.
template <class T>
void replay(bool rounded) {
  const std::size_t n = table<T>::count();
  const td::hard_case<T>* rows = table<T>::rows();
  std::map<std::string, routine_stats> stats;
  long checked = 0, rounded_checked = 0;
  for (std::size_t i = 0; i < n; ++i) {
    const td::hard_case<T>& row = rows[i];
    const resolved<T> r(row);
    INFO("hard case #", i, ": ", r.name);
    REQUIRE(r.ok);
    const ctor rc = r.is_free ? ctor::beta : r.c;
    ez_test::reference ref(ez_test::reference_precision(rc, row.x, row.mass));
    ez_test::compute_reference(ref, rc, row.x, row.mass);
    const mpfr_srcptr exact = ref.val[r.view()].v;
    // The table lists only inputs in the documented domain whose correctly rounded result is
    // a normal number: the region of the precision contract.
    if (!r.is_free) CHECK(ez_test::in_domain<T>(ref));
    CHECK(std::isnormal(ez_test::round_to<T>(exact)));

    routine_stats& st = stats[r.key()];
    ++st.rows;
    st.max_hunted = std::max(st.max_hunted, row.ulps);
    for (int sign = 0; sign < (r.is_free ? 2 : 1); ++sign) {
      std::string error;
      const T got = result(r, row.x, row.mass, eigenzeit::throw_policy(), sign == 1, error);
      const ez_test::ulp_error e = ez_test::measure<T>(got, exact);
      const std::string detail =
          std::string(sign ? "at -x: " : "") + "result " + hex(got) + ", correctly rounded " +
          hex(ez_test::round_to<T>(exact)) + ", error " + std::to_string(e.frac) +
          " ulp (distance " + std::to_string(e.dist) + "), allowed " +
          std::to_string(r.allowed()) + (error.empty() ? "" : ", refused: " + error);
      INFO(detail);
      CHECK(e.dist <= r.allowed());
      st.max_now = std::max(st.max_now, e.frac);
      st.max_dist = std::max(st.max_dist, e.dist);
      ++checked;
    }
    if (rounded) {
      for (int sign = 0; sign < (r.is_free ? 2 : 1); ++sign) {
        std::string error;
        const T got = result(r, row.x, row.mass, eigenzeit::correctly_rounded, sign == 1, error);
        const T want = ez_test::round_to<T>(exact);
        const std::string detail = std::string("correctly rounded mode") +
                                   (sign ? " at -x" : "") + ": result " + hex(got) +
                                   ", correctly rounded " + hex(want) +
                                   (error.empty() ? "" : ", refused: " + error);
        INFO(detail);
        CHECK(ez_test::measure<T>(got, exact).dist == 0);
        ++rounded_checked;
      }
    }
  }
  std::printf("\n%s: %zu hard cases, %ld results checked%s\n", type_name<T>(), n, checked,
              rounded ? (", " + std::to_string(rounded_checked) + " in the correctly rounded mode").c_str() : "");
  std::printf("  %-37s %5s %12s %6s %14s\n", "routine", "rows", "max ulp now", "dist", "when hunted");
  for (const auto& kv : stats) {
    const std::int64_t d = kv.second.max_dist;
    std::printf("  %-37s %5ld %12.6f %6s %14.6f\n", kv.first.c_str(), kv.second.rows,
                kv.second.max_now,
                d > 999999 ? ">1e6" : std::to_string(static_cast<long long>(d)).c_str(),
                kv.second.max_hunted);
  }
  // The table must exercise the type at all: most routines have rows (those that were exact
  // on every input hunted have none).
  CHECK(stats.size() >= 40);
  CHECK(n >= 4 * stats.size());
}

}  // namespace

TEST_CASE("hard cases (tools/hunt_hard_cases.cpp) keep the precision contract: double") {
  replay<double>(true);
}

TEST_CASE("hard cases (tools/hunt_hard_cases.cpp) keep the precision contract: float") {
  replay<float>(true);
}

TEST_CASE("hard cases (tools/hunt_hard_cases.cpp) keep the precision contract: long double") {
  // The long double rows hold x87 80-bit values; elsewhere they would not be the inputs the
  // hunt found.
  if (std::numeric_limits<long double>::digits != 64 ||
      std::numeric_limits<long double>::max_exponent != 16384) {
    MESSAGE("long double is not the x87 80-bit format here: its hard cases are skipped");
    return;
  }
  replay<long double>(false);
}
