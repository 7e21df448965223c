# Settings for the project's own programs: tests, benchmarks, examples and tools.
# Nothing here touches the eigenzeit INTERFACE target, so users of the library never inherit it.

include(CheckCXXCompilerFlag)
include(CheckCXXSourceCompiles)

# MPFR and GMP: the reference arithmetic that the tests, tools and demo compare against.
find_path(EIGENZEIT_MPFR_INCLUDE_DIR mpfr.h)
find_path(EIGENZEIT_GMP_INCLUDE_DIR gmp.h)
find_library(EIGENZEIT_MPFR_LIBRARY mpfr)
find_library(EIGENZEIT_GMP_LIBRARY gmp)
foreach(_ez_var EIGENZEIT_MPFR_INCLUDE_DIR EIGENZEIT_GMP_INCLUDE_DIR EIGENZEIT_MPFR_LIBRARY EIGENZEIT_GMP_LIBRARY)
  if(NOT ${_ez_var})
    message(FATAL_ERROR "eigenzeit: MPFR and GMP are needed by the tests, benchmarks, examples and tools "
      "(Debian packages libmpfr-dev and libgmp-dev; scripts/install-deps installs them)")
  endif()
endforeach()

# libquadmath, linked when the compiler knows __float128 and the library links (GCC; clang on
# x86-64 too). Nothing is defined here: the headers detect float128 support themselves.
set(CMAKE_REQUIRED_LIBRARIES quadmath)
check_cxx_source_compiles([[
extern "C" __float128 sqrtq(__float128);
int main() { __float128 x = 4; return sqrtq(x) == 2 ? 0 : 1; }
]] EIGENZEIT_HAVE_QUADMATH)
unset(CMAKE_REQUIRED_LIBRARIES)

# eigenzeit_reference: the library plus everything needed to check it.
add_library(eigenzeit_reference INTERFACE)
target_include_directories(eigenzeit_reference SYSTEM INTERFACE
  ${EIGENZEIT_MPFR_INCLUDE_DIR} ${EIGENZEIT_GMP_INCLUDE_DIR})
target_link_libraries(eigenzeit_reference INTERFACE
  eigenzeit::eigenzeit ${EIGENZEIT_MPFR_LIBRARY} ${EIGENZEIT_GMP_LIBRARY})
if(EIGENZEIT_HAVE_QUADMATH)
  target_link_libraries(eigenzeit_reference INTERFACE quadmath)
endif()

# Warnings for our own code. Third-party headers (Boost, doctest, MPFR, Google Benchmark) come
# in as system headers, so their warnings do not count.
if(MSVC)
  set(EIGENZEIT_WARNING_FLAGS /W4)
  set(EIGENZEIT_WERROR_FLAG /WX)
else()
  set(EIGENZEIT_WARNING_FLAGS -Wall -Wextra -Wpedantic -Wconversion -Wshadow)
  set(EIGENZEIT_WERROR_FLAG -Werror)
endif()
# g++ 12 reports -Warray-bounds inside Boost 1.74's cpp_int shifts (right_shift_generic, reached
# from converting cpp_bin_float<2D> to cpp_bin_float<D> for D >= 100, as the widening ladder
# does) although the headers are system headers: a known false positive of GCC 12's middle end
# on constant-propagated limb counts.  Only that one warning is turned off, only for g++.
if(CMAKE_CXX_COMPILER_ID STREQUAL "GNU")
  list(APPEND EIGENZEIT_WARNING_FLAGS -Wno-array-bounds)
endif()

check_cxx_compiler_flag(-mfma EIGENZEIT_HAVE_MFMA)
if(EIGENZEIT_NATIVE_FMA AND NOT EIGENZEIT_HAVE_MFMA)
  message(FATAL_ERROR "eigenzeit: EIGENZEIT_NATIVE_FMA is ON but the compiler does not accept -mfma")
endif()

# eigenzeit_own_target(<target>): warnings, -Werror, sanitizers and -mfma as the options ask.
function(eigenzeit_own_target target)
  target_compile_options(${target} PRIVATE ${EIGENZEIT_WARNING_FLAGS})
  if(EIGENZEIT_WERROR)
    target_compile_options(${target} PRIVATE ${EIGENZEIT_WERROR_FLAG})
  endif()
  if(EIGENZEIT_SANITIZE)
    target_compile_options(${target} PRIVATE
      -fsanitize=${EIGENZEIT_SANITIZE} -fno-omit-frame-pointer -fno-sanitize-recover=all)
    target_link_options(${target} PRIVATE -fsanitize=${EIGENZEIT_SANITIZE})
  endif()
  if(EIGENZEIT_NATIVE_FMA)
    target_compile_options(${target} PRIVATE -mfma)
  endif()
endfunction()

# eigenzeit_add_program(<target> <source>): one executable from one source, linked with the
# library and the reference arithmetic, with the project's own settings.
function(eigenzeit_add_program target source)
  add_executable(${target} ${source})
  target_link_libraries(${target} PRIVATE eigenzeit_reference)
  eigenzeit_own_target(${target})
endfunction()
