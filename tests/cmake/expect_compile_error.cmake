# Compiles SOURCE with COMPILER and FLAGS ('|'-separated) and passes only if the compiler refuses
# and its output contains EXPECT. Run by ctest as: cmake -DCOMPILER=... -DFLAGS=... -DSOURCE=...
# -DEXPECT=... -P expect_compile_error.cmake
foreach(var COMPILER FLAGS SOURCE EXPECT)
  if(NOT DEFINED ${var})
    message(FATAL_ERROR "expect_compile_error.cmake: ${var} is not set")
  endif()
endforeach()
string(REPLACE "|" ";" flags "${FLAGS}")

execute_process(
  COMMAND "${COMPILER}" ${flags} "${SOURCE}"
  RESULT_VARIABLE result
  OUTPUT_VARIABLE output
  ERROR_VARIABLE output)

string(REPLACE ";" " " shown_flags "${flags}")
message("command: ${COMPILER} ${shown_flags} ${SOURCE}\nexit status: ${result}\noutput:\n${output}")
if(result EQUAL 0)
  message(FATAL_ERROR "the compile succeeded, but it must fail")
endif()
string(FIND "${output}" "${EXPECT}" where)
if(where EQUAL -1)
  message(FATAL_ERROR "the compile failed, but the output does not contain \"${EXPECT}\"")
endif()
message("ok: the compile failed with \"${EXPECT}\"")
