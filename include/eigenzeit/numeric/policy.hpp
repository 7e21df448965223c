// eigenzeit: error policies for invalid input (Boost.Math policies).
// Distributed under the Boost Software License, Version 1.0 (see LICENSE).
//
// Every public routine takes an optional policy argument.  Any Boost.Math policy works; the
// three used in practice have short names here:
//   eigenzeit::throw_policy  (default) throws std::domain_error naming function and value
//   eigenzeit::nan_policy    returns a quiet NaN (NaN-filled object for speed<T>)
//   eigenzeit::errno_policy  sets errno = EDOM and returns a quiet NaN
// The same three behaviours apply to evaluation errors (a result the library cannot
// deliver to the accuracy asked for, see numeric/rounding.hpp and numeric/guarded.hpp).
#ifndef EIGENZEIT_NUMERIC_POLICY_HPP
#define EIGENZEIT_NUMERIC_POLICY_HPP

#include <limits>

#include <boost/math/policies/error_handling.hpp>
#include <boost/math/policies/policy.hpp>

namespace eigenzeit {

using throw_policy = boost::math::policies::policy<
    boost::math::policies::domain_error<boost::math::policies::throw_on_error>,
    boost::math::policies::evaluation_error<boost::math::policies::throw_on_error>>;
using nan_policy = boost::math::policies::policy<
    boost::math::policies::domain_error<boost::math::policies::ignore_error>,
    boost::math::policies::evaluation_error<boost::math::policies::ignore_error>>;
using errno_policy = boost::math::policies::policy<
    boost::math::policies::domain_error<boost::math::policies::errno_on_error>,
    boost::math::policies::evaluation_error<boost::math::policies::errno_on_error>>;

namespace numeric {

/// Reports a domain error through the policy and returns what the policy says to return
/// (a quiet NaN unless it throws).  `function` may contain "%1%", replaced by the type name;
/// `message` contains "%1%", replaced by the offending value printed to full precision.
template <class T, class Policy>
inline T domain_error(const char* function, const char* message, const T& value,
                      const Policy& pol) {
  return boost::math::policies::raise_domain_error<T>(function, message, value, pol);
}

/// Reports an evaluation error (the routine cannot deliver the accuracy asked for) through
/// the policy: boost::math::evaluation_error (a std::runtime_error) with throw_policy; with
/// the other policies a quiet NaN (Boost's ignore/errno handlers would return the value
/// passed in, which must never reach the caller as if it were a result).
template <class T, class Policy>
inline T evaluation_error(const char* function, const char* message, const T& value,
                          const Policy& pol) {
  boost::math::policies::raise_evaluation_error<T>(function, message, value, pol);
  return std::numeric_limits<T>::quiet_NaN();
}

}  // namespace numeric
}  // namespace eigenzeit

#endif
