// Test support: the textbook formulas, evaluated in the type under test, that the accuracy
// report (tools/accuracy.cpp) sets beside the library; tests may reuse them to show what the
// careful forms win.
//
// "Textbook" means the formula as it is usually written, every operation rounded once in T,
// in the order written:
//   * the free functions of a signed beta b: gamma = 1/sqrt(1 - b*b), gamma - 1 =
//     1/sqrt(1 - b*b) - 1, beta*gamma = b/sqrt(1 - b*b), 1 - 1/gamma = 1 - sqrt(1 - b*b),
//     rapidity = 0.5*log((1 + b)/(1 - b));
//   * the views of a speed: each view from that constructor's own input, with the same
//     formulas (from_gamma: beta = sqrt(1 - 1/(g*g)), gamma - 1 = g - 1, ...; see formula()).
//     Quantities that equal the input are the input itself (from_beta: beta = b).
// Products that feed an addition go through product(), so that no compiler fuses them into a
// fused multiply-add (GNU mode contracts across statements when the target has fma): a fused
// 1 - b*b would be a different, more accurate formula than the one written.
#ifndef EIGENZEIT_TESTS_SUPPORT_NAIVE_HPP
#define EIGENZEIT_TESTS_SUPPORT_NAIVE_HPP

#include <cmath>

#include "reference.hpp"

namespace ez_test {
namespace naive {

/// a * b rounded to T on its own (a volatile store cannot be fused with a later addition).
template <class T>
inline T product(T a, T b) {
  volatile T p = a * b;
  return p;
}

// ---- free functions of a signed beta --------------------------------------------------------

template <class T>
inline T lorentz_factor(T b) {
  using std::sqrt;
  return T(1) / sqrt(T(1) - product(b, b));
}

template <class T>
inline T lorentz_factor_m1(T b) {
  using std::sqrt;
  return T(1) / sqrt(T(1) - product(b, b)) - T(1);
}

template <class T>
inline T proper_speed(T b) {
  using std::sqrt;
  return b / sqrt(T(1) - product(b, b));
}

template <class T>
inline T dilation_fraction(T b) {
  using std::sqrt;
  return T(1) - sqrt(T(1) - product(b, b));
}

template <class T>
inline T rapidity(T b) {
  using std::log;
  return T(0.5) * log((T(1) + b) / (T(1) - b));
}

// ---- the views of a speed, from each constructor's input --------------------------------------

namespace detail {

// From beta b (and the deficit d as the caller has it: 1 - b, or the input itself).
template <class T>
inline void from_beta(T b, T d, T out[n_views]) {
  using std::log;
  using std::sqrt;
  const T root = sqrt(T(1) - product(b, b));  // 1/gamma
  out[v_beta] = b;
  out[v_deficit] = d;
  out[v_gamma] = T(1) / root;
  out[v_gamma_m1] = T(1) / root - T(1);
  out[v_inv_gamma] = root;
  out[v_dilation] = T(1) - root;
  out[v_rapidity] = T(0.5) * log((T(1) + b) / (T(1) - b));
  out[v_proper_speed] = b / root;
}

// From gamma g (and gamma - 1 as the caller has it: g - 1, or the input itself).
template <class T>
inline void from_gamma(T g, T m, T out[n_views]) {
  using std::log;
  using std::sqrt;
  const T b = sqrt(T(1) - T(1) / (g * g));
  const T u = sqrt(product(g, g) - T(1));  // beta*gamma = sqrt(g^2 - 1)
  out[v_beta] = b;
  out[v_deficit] = T(1) - b;
  out[v_gamma] = g;
  out[v_gamma_m1] = m;
  out[v_inv_gamma] = T(1) / g;
  out[v_dilation] = T(1) - T(1) / g;
  out[v_rapidity] = log(g + u);  // acosh(g)
  out[v_proper_speed] = u;
}

// From the proper speed u = beta*gamma.
template <class T>
inline void from_proper_speed(T u, T out[n_views]) {
  using std::log;
  using std::sqrt;
  const T g = sqrt(T(1) + product(u, u));
  out[v_beta] = u / g;
  out[v_deficit] = T(1) - u / g;
  out[v_gamma] = g;
  out[v_gamma_m1] = g - T(1);
  out[v_inv_gamma] = T(1) / g;
  out[v_dilation] = T(1) - T(1) / g;
  out[v_rapidity] = log(u + g);  // asinh(u)
  out[v_proper_speed] = u;
}

}  // namespace detail

/// The eight views (indexed by ez_test::view) by the textbook formulas from constructor c's
/// input x (and y, the mass of the energy constructors).
template <class T>
inline void views(ctor c, T x, T y, T out[n_views]) {
  using std::cosh;
  using std::log;
  using std::sinh;
  using std::sqrt;
  using std::tanh;
  switch (c) {
    case ctor::beta: detail::from_beta(x, T(1) - x, out); return;
    case ctor::beta_deficit: detail::from_beta(T(1) - x, x, out); return;
    case ctor::gamma: detail::from_gamma(x, x - T(1), out); return;
    case ctor::gamma_m1: detail::from_gamma(T(1) + x, x, out); return;
    case ctor::kinetic_energy: {
      const T m = x / y;  // gamma - 1 = K / (m c^2)
      detail::from_gamma(T(1) + m, m, out);
      return;
    }
    case ctor::rapidity: {
      const T b = tanh(x), g = cosh(x);
      out[v_beta] = b;
      out[v_deficit] = T(1) - b;
      out[v_gamma] = g;
      out[v_gamma_m1] = g - T(1);
      out[v_inv_gamma] = T(1) / g;
      out[v_dilation] = T(1) - T(1) / g;
      out[v_rapidity] = x;
      out[v_proper_speed] = sinh(x);
      return;
    }
    case ctor::proper_speed: detail::from_proper_speed(x, out); return;
    case ctor::momentum: {
      // E = sqrt(p^2 + m^2) (energies in one unit), beta = p/E, gamma = E/m.
      const T e = sqrt(product(x, x) + product(y, y));
      out[v_beta] = x / e;
      out[v_deficit] = T(1) - x / e;
      out[v_gamma] = e / y;
      out[v_gamma_m1] = e / y - T(1);
      out[v_inv_gamma] = y / e;
      out[v_dilation] = T(1) - y / e;
      out[v_rapidity] = log((e + x) / y);
      out[v_proper_speed] = x / y;
      return;
    }
  }
}

/// The formula views() uses, as text (x is the input; K, p, m for the energy constructors).
inline const char* formula(ctor c, int view) {
  switch (c) {
    case ctor::beta: {
      static const char* const f[n_views] = {
          "b", "1 - b", "1/sqrt(1 - b*b)", "1/sqrt(1 - b*b) - 1", "sqrt(1 - b*b)",
          "1 - sqrt(1 - b*b)", "0.5*log((1 + b)/(1 - b))", "b/sqrt(1 - b*b)"};
      return f[view];
    }
    case ctor::beta_deficit: {
      static const char* const f[n_views] = {
          "b = 1 - d", "d", "1/sqrt(1 - b*b)", "1/sqrt(1 - b*b) - 1", "sqrt(1 - b*b)",
          "1 - sqrt(1 - b*b)", "0.5*log((1 + b)/(1 - b))", "b/sqrt(1 - b*b)"};
      return f[view];
    }
    case ctor::gamma: {
      static const char* const f[n_views] = {
          "sqrt(1 - 1/(g*g))", "1 - sqrt(1 - 1/(g*g))", "g", "g - 1", "1/g", "1 - 1/g",
          "log(g + sqrt(g*g - 1))", "sqrt(g*g - 1)"};
      return f[view];
    }
    case ctor::gamma_m1: {
      static const char* const f[n_views] = {
          "sqrt(1 - 1/(g*g)), g = 1 + x", "1 - sqrt(1 - 1/(g*g))", "1 + x", "x", "1/g",
          "1 - 1/g", "log(g + sqrt(g*g - 1))", "sqrt(g*g - 1)"};
      return f[view];
    }
    case ctor::kinetic_energy: {
      static const char* const f[n_views] = {
          "sqrt(1 - 1/(g*g)), g = 1 + K/m", "1 - sqrt(1 - 1/(g*g))", "1 + K/m", "K/m", "1/g",
          "1 - 1/g", "log(g + sqrt(g*g - 1))", "sqrt(g*g - 1)"};
      return f[view];
    }
    case ctor::rapidity: {
      static const char* const f[n_views] = {
          "tanh(x)", "1 - tanh(x)", "cosh(x)", "cosh(x) - 1", "1/cosh(x)", "1 - 1/cosh(x)",
          "x", "sinh(x)"};
      return f[view];
    }
    case ctor::proper_speed: {
      static const char* const f[n_views] = {
          "u/g, g = sqrt(1 + u*u)", "1 - u/g", "sqrt(1 + u*u)", "g - 1", "1/g", "1 - 1/g",
          "log(u + g)", "u"};
      return f[view];
    }
    case ctor::momentum: {
      static const char* const f[n_views] = {
          "p/E, E = sqrt(p*p + m*m)", "1 - p/E", "E/m", "E/m - 1", "m/E", "1 - m/E",
          "log((E + p)/m)", "p/m"};
      return f[view];
    }
  }
  return "?";
}

}  // namespace naive
}  // namespace ez_test

#endif
