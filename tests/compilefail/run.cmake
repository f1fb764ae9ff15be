# Compiles one compile-fail case: cmake -DCXX=<compiler> -DINCLUDE_DIRS=<dir|dir…> -DSOURCE=<file.cpp>
#   -DEXPECT=compiles|fails -P run.cmake
# Both twins run the same command; EXPECT=fails adds -DACIDLOAD_SHOULD_FAIL and nothing else.
# The compiler's diagnostics are printed (CTest matches them with PASS_REGULAR_EXPRESSION) and the
# exit code is inverted for EXPECT=fails: this script fails if the bad twin compiles.
foreach(v CXX INCLUDE_DIRS SOURCE EXPECT)
  if(NOT DEFINED ${v})
    message(FATAL_ERROR "run.cmake: -D${v}=… is required")
  endif()
endforeach()
string(REPLACE "|" ";" dirs "${INCLUDE_DIRS}")
set(flags -std=c++17 -fsyntax-only -fdiagnostics-color=never -Wall -Wextra -Wpedantic -Werror)
foreach(d IN LISTS dirs)
  if(d)
    list(APPEND flags -I${d})
  endif()
endforeach()
if(EXPECT STREQUAL "fails")
  list(APPEND flags -DACIDLOAD_SHOULD_FAIL)
elseif(NOT EXPECT STREQUAL "compiles")
  message(FATAL_ERROR "run.cmake: EXPECT must be compiles or fails, not '${EXPECT}'")
endif()
# LC_ALL=C: plain ASCII quotes in the diagnostics, as the expected patterns are written.
execute_process(COMMAND ${CMAKE_COMMAND} -E env LC_ALL=C LANG=C ${CXX} ${flags} ${SOURCE}
                RESULT_VARIABLE rc OUTPUT_VARIABLE out ERROR_VARIABLE err)
message("${out}${err}")
if(EXPECT STREQUAL "fails" AND rc EQUAL 0)
  message(FATAL_ERROR "${SOURCE} compiled with -DACIDLOAD_SHOULD_FAIL, but must not")
elseif(EXPECT STREQUAL "compiles" AND NOT rc EQUAL 0)
  message(FATAL_ERROR "${SOURCE} does not compile without -DACIDLOAD_SHOULD_FAIL (exit ${rc})")
endif()
message(STATUS "${SOURCE}: ${EXPECT} as it must")
