// eigenzeit: the next wider type for Boost.Multiprecision binary floats (first rung of the
// widening ladder; see numeric::wider in traits.hpp).
// Distributed under the Boost Software License, Version 1.0 (see LICENSE).
#ifndef EIGENZEIT_NUMERIC_WIDER_HPP
#define EIGENZEIT_NUMERIC_WIDER_HPP

#include <boost/multiprecision/cpp_bin_float.hpp>

#include <eigenzeit/numeric/traits.hpp>

namespace eigenzeit {
namespace numeric {

/// cpp_bin_float<D> -> cpp_bin_float<2D> (same digit base, allocator and exponent type; the
/// exponent range is left at the type's default so that the wider type holds every value).
template <unsigned D, boost::multiprecision::backends::digit_base_type B, class A, class E,
          E MinE, E MaxE, boost::multiprecision::expression_template_option ET>
struct wider<boost::multiprecision::number<
    boost::multiprecision::backends::cpp_bin_float<D, B, A, E, MinE, MaxE>, ET>> {
  using type = boost::multiprecision::number<
      boost::multiprecision::backends::cpp_bin_float<2 * D, B, A, E, MinE, MaxE>, ET>;
};

}  // namespace numeric
}  // namespace eigenzeit

#endif
