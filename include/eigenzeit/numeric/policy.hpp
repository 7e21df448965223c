// eigenzeit: error policies for invalid input (Boost.Math policies).
// Distributed under the Boost Software License, Version 1.0 (see LICENSE).
//
// Every public routine takes an optional policy argument.  Any Boost.Math policy works; the
// three used in practice have short names here:
//   eigenzeit::throw_policy  (default) throws std::domain_error naming function and value
//   eigenzeit::nan_policy    returns a quiet NaN (NaN-filled object for speed<T>)
//   eigenzeit::errno_policy  sets errno = EDOM and returns a quiet NaN
#ifndef EIGENZEIT_NUMERIC_POLICY_HPP
#define EIGENZEIT_NUMERIC_POLICY_HPP

#include <limits>

#include <boost/math/policies/error_handling.hpp>
#include <boost/math/policies/policy.hpp>

namespace eigenzeit {

using throw_policy = boost::math::policies::policy<
    boost::math::policies::domain_error<boost::math::policies::throw_on_error>>;
using nan_policy = boost::math::policies::policy<
    boost::math::policies::domain_error<boost::math::policies::ignore_error>>;
using errno_policy = boost::math::policies::policy<
    boost::math::policies::domain_error<boost::math::policies::errno_on_error>>;

namespace numeric {

/// Reports a domain error through the policy and returns what the policy says to return
/// (a quiet NaN unless it throws).  `function` may contain "%1%", replaced by the type name;
/// `message` contains "%1%", replaced by the offending value printed to full precision.
template <class T, class Policy>
inline T domain_error(const char* function, const char* message, const T& value,
                      const Policy& pol) {
  return boost::math::policies::raise_domain_error<T>(function, message, value, pol);
}

}  // namespace numeric
}  // namespace eigenzeit

#endif
