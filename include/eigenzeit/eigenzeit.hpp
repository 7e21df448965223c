// eigenzeit: umbrella header, includes every public header.
// Distributed under the Boost Software License, Version 1.0 (see LICENSE).
#ifndef EIGENZEIT_EIGENZEIT_HPP
#define EIGENZEIT_EIGENZEIT_HPP

#include <eigenzeit/config.hpp>
#include <eigenzeit/version.hpp>
#include <eigenzeit/numeric/traits.hpp>
#include <eigenzeit/numeric/eft.hpp>
#include <eigenzeit/numeric/series.hpp>
#include <eigenzeit/numeric/policy.hpp>
#include <eigenzeit/numeric/ulp.hpp>
#include <eigenzeit/numeric/wider.hpp>
#include <eigenzeit/numeric/ladder.hpp>
#include <eigenzeit/numeric/rounding.hpp>
#include <eigenzeit/numeric/guarded.hpp>
#include <eigenzeit/constants.hpp>
#include <eigenzeit/speed.hpp>
#include <eigenzeit/frames/vectors.hpp>
#include <eigenzeit/frames/lorentz_boost.hpp>
#include <eigenzeit/frames/compose.hpp>
#include <eigenzeit/frames/momentum.hpp>
#include <eigenzeit/frames/invariant_mass.hpp>
#include <eigenzeit/timing/two_part_time.hpp>
#include <eigenzeit/timing/time_scales.hpp>
#include <eigenzeit/timing/clock_rate.hpp>
#include <eigenzeit/timing/potential.hpp>
#include <eigenzeit/timing/orbit_clock.hpp>
#include <eigenzeit/timing/trajectory.hpp>
#include <eigenzeit/timing/proper_time.hpp>
#include <eigenzeit/timing/accelerated.hpp>
#include <eigenzeit/timing/decay.hpp>

#endif
