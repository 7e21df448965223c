// eigenzeit: version of this copy of the library.
// Distributed under the Boost Software License, Version 1.0 (see LICENSE).
#ifndef EIGENZEIT_VERSION_HPP
#define EIGENZEIT_VERSION_HPP

#define EIGENZEIT_VERSION_MAJOR 0
#define EIGENZEIT_VERSION_MINOR 1
#define EIGENZEIT_VERSION_PATCH 0

// One integer for comparisons: major * 10000 + minor * 100 + patch.
#define EIGENZEIT_VERSION \
  (EIGENZEIT_VERSION_MAJOR * 10000 + EIGENZEIT_VERSION_MINOR * 100 + EIGENZEIT_VERSION_PATCH)

#endif
