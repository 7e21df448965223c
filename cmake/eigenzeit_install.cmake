# Install rules: headers, the CMake package, the pkg-config file and the license.
# The library is header-only and the same on every architecture, so its package files go under
# share/ (CMake's find_package and pkg-config both search there).

include(CMakePackageConfigHelpers)

set(EIGENZEIT_CMAKE_DIR "${CMAKE_INSTALL_DATADIR}/cmake/eigenzeit" CACHE STRING
  "Install directory of eigenzeitConfig.cmake, relative to the prefix")
set(EIGENZEIT_PKGCONFIG_DIR "${CMAKE_INSTALL_DATADIR}/pkgconfig" CACHE STRING
  "Install directory of eigenzeit.pc, relative to the prefix")

install(DIRECTORY "${PROJECT_SOURCE_DIR}/include/eigenzeit"
  DESTINATION "${CMAKE_INSTALL_INCLUDEDIR}"
  FILES_MATCHING PATTERN "*.hpp")

install(TARGETS eigenzeit EXPORT eigenzeitTargets)
install(EXPORT eigenzeitTargets
  NAMESPACE eigenzeit::
  DESTINATION "${EIGENZEIT_CMAKE_DIR}")

configure_package_config_file(
  "${PROJECT_SOURCE_DIR}/cmake/eigenzeitConfig.cmake.in"
  "${PROJECT_BINARY_DIR}/eigenzeitConfig.cmake"
  INSTALL_DESTINATION "${EIGENZEIT_CMAKE_DIR}")
write_basic_package_version_file(
  "${PROJECT_BINARY_DIR}/eigenzeitConfigVersion.cmake"
  COMPATIBILITY SameMajorVersion
  ARCH_INDEPENDENT)
install(FILES
  "${PROJECT_BINARY_DIR}/eigenzeitConfig.cmake"
  "${PROJECT_BINARY_DIR}/eigenzeitConfigVersion.cmake"
  DESTINATION "${EIGENZEIT_CMAKE_DIR}")

# eigenzeit.pc is filled in at install time, so that `cmake --install --prefix <dir>` writes
# <dir> into it rather than the prefix chosen at configure time.
if(IS_ABSOLUTE "${CMAKE_INSTALL_INCLUDEDIR}")
  set(_ez_pc_includedir "${CMAKE_INSTALL_INCLUDEDIR}")
else()
  set(_ez_pc_includedir "\${prefix}/${CMAKE_INSTALL_INCLUDEDIR}")
endif()
# Boost has no .pc file of its own: name its include directory unless the compiler already
# searches it (as it does for Debian's /usr/include).
set(_ez_pc_extra_cflags "")
foreach(_ez_dir IN LISTS Boost_INCLUDE_DIRS)
  if(NOT _ez_dir IN_LIST CMAKE_CXX_IMPLICIT_INCLUDE_DIRECTORIES)
    string(APPEND _ez_pc_extra_cflags " -I${_ez_dir}")
  endif()
endforeach()
set(_ez_pc_file "${PROJECT_BINARY_DIR}/eigenzeit.pc")
install(CODE "
  set(PROJECT_VERSION [[${PROJECT_VERSION}]])
  set(PROJECT_DESCRIPTION [[${PROJECT_DESCRIPTION}]])
  set(EIGENZEIT_PC_INCLUDEDIR [[${_ez_pc_includedir}]])
  set(EIGENZEIT_PC_EXTRA_CFLAGS [[${_ez_pc_extra_cflags}]])
  configure_file([[${PROJECT_SOURCE_DIR}/cmake/eigenzeit.pc.in]] [[${_ez_pc_file}]] @ONLY)
")
install(FILES "${_ez_pc_file}" DESTINATION "${EIGENZEIT_PKGCONFIG_DIR}")

install(FILES "${PROJECT_SOURCE_DIR}/LICENSE" DESTINATION "${CMAKE_INSTALL_DOCDIR}")
