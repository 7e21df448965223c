# Builds and runs the project in tests/consumer against eigenzeit, as a user would.
# Run by ctest as cmake -DMODE=<mode> ... -P consumer.cmake, where MODE is one of
#   install           cmake --install the main build tree into PREFIX
#   find_package      consumer finds the copy in PREFIX with find_package(eigenzeit CONFIG)
#   add_subdirectory  consumer adds the source tree with add_subdirectory
#   pkg_config        pkg-config finds the copy in PREFIX; compile the consumer with its flags
# Other variables: SOURCE_DIR, BINARY_DIR (the main build tree), WORK_DIR, PREFIX, PC_DIR,
# CXX, STD_FLAG, GENERATOR, CONFIG, VERSION, PKG_CONFIG.

# run(<command...>): run a command, stop with its exit status if it fails.
function(run)
  string(REPLACE ";" " " shown "${ARGN}")
  message("+ ${shown}")
  execute_process(COMMAND ${ARGN} RESULT_VARIABLE rc)
  if(NOT rc EQUAL 0)
    message(FATAL_ERROR "failed (exit status ${rc}): ${shown}")
  endif()
endfunction()

# build_and_run(<extra configure args...>): configure, build and run the consumer in WORK_DIR.
function(build_and_run)
  file(REMOVE_RECURSE "${WORK_DIR}")
  run("${CMAKE_COMMAND}" -S "${SOURCE_DIR}/tests/consumer" -B "${WORK_DIR}" -G "${GENERATOR}"
      "-DCMAKE_CXX_COMPILER=${CXX}" "-DCMAKE_BUILD_TYPE=${CONFIG}" ${ARGN})
  run("${CMAKE_COMMAND}" --build "${WORK_DIR}" --config "${CONFIG}")
  foreach(app "${WORK_DIR}/app" "${WORK_DIR}/${CONFIG}/app" "${WORK_DIR}/app.exe" "${WORK_DIR}/${CONFIG}/app.exe")
    if(EXISTS "${app}")
      run("${app}")
      return()
    endif()
  endforeach()
  message(FATAL_ERROR "the consumer built, but its program was not found under ${WORK_DIR}")
endfunction()

if(MODE STREQUAL "install")
  file(REMOVE_RECURSE "${PREFIX}")
  run("${CMAKE_COMMAND}" --install "${BINARY_DIR}" --prefix "${PREFIX}" --config "${CONFIG}")

elseif(MODE STREQUAL "find_package")
  build_and_run("-DCMAKE_PREFIX_PATH=${PREFIX}" "-DEIGENZEIT_EXPECTED_VERSION=${VERSION}"
                -DCMAKE_FIND_USE_PACKAGE_REGISTRY=OFF)

elseif(MODE STREQUAL "add_subdirectory")
  build_and_run("-DEIGENZEIT_SOURCE_DIR=${SOURCE_DIR}")

elseif(MODE STREQUAL "pkg_config")
  set(ENV{PKG_CONFIG_PATH} "${PREFIX}/${PC_DIR}")
  execute_process(COMMAND "${PKG_CONFIG}" --modversion eigenzeit
                  RESULT_VARIABLE rc OUTPUT_VARIABLE version OUTPUT_STRIP_TRAILING_WHITESPACE)
  if(NOT rc EQUAL 0 OR NOT version STREQUAL VERSION)
    message(FATAL_ERROR "pkg-config --modversion eigenzeit gave '${version}' (exit ${rc}), expected ${VERSION}")
  endif()
  execute_process(COMMAND "${PKG_CONFIG}" --cflags eigenzeit
                  RESULT_VARIABLE rc OUTPUT_VARIABLE cflags OUTPUT_STRIP_TRAILING_WHITESPACE)
  message("pkg-config --cflags eigenzeit: ${cflags}")
  string(FIND " ${cflags} " " -I${PREFIX}/include " where)
  if(NOT rc EQUAL 0 OR where EQUAL -1)
    message(FATAL_ERROR "pkg-config --cflags eigenzeit does not name ${PREFIX}/include")
  endif()
  separate_arguments(cflags UNIX_COMMAND "${cflags}")
  file(REMOVE_RECURSE "${WORK_DIR}")
  file(MAKE_DIRECTORY "${WORK_DIR}")
  run("${CXX}" ${STD_FLAG} ${cflags} "${SOURCE_DIR}/tests/consumer/main.cpp" -o "${WORK_DIR}/app")
  run("${WORK_DIR}/app")

else()
  message(FATAL_ERROR "consumer.cmake: unknown MODE '${MODE}'")
endif()
