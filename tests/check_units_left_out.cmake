# acidload/units.hpp (Boost.Units) is for C++ users who link acidload::units; the library, the
# program and the Python module must not compile it. Two checks:
#  1. no source or header of libacidload/ (other than units.hpp itself) or bindings/ includes it;
#  2. the umbrella header acidload/acidload.hpp, preprocessed with Boost on the include path, pulls
#     in no boost/units header (a dependency list, as check_core_headers.cmake takes).
set(failed "")
file(GLOB_RECURSE sources ${SOURCE_DIR}/libacidload/*.hpp ${SOURCE_DIR}/libacidload/*.cpp
     ${SOURCE_DIR}/bindings/*.hpp ${SOURCE_DIR}/bindings/*.cpp ${SOURCE_DIR}/bindings/*.h)
set(n 0)
foreach(f IN LISTS sources)
  if(f MATCHES "/include/acidload/units\\.hpp$")
    continue()
  endif()
  math(EXPR n "${n} + 1")
  file(STRINGS ${f} hits REGEX "#[ \t]*include[ \t]*[<\"](acidload/)?units\\.hpp[>\"]")
  if(hits)
    list(APPEND failed "${f}: includes acidload/units.hpp (${hits})")
  endif()
endforeach()
if(n LESS 50)
  list(APPEND failed "only ${n} sources found under ${SOURCE_DIR}: the check would prove nothing")
endif()

file(MAKE_DIRECTORY ${WORK_DIR})
set(tu ${WORK_DIR}/umbrella.cpp)
file(WRITE ${tu} "#include <acidload/acidload.hpp>\nint main() { return 0; }\n")
set(boost_flags "")
string(REPLACE "|" ";" boost_dirs "${BOOST_INCLUDE}")
foreach(d IN LISTS boost_dirs)
  if(d)
    list(APPEND boost_flags -I${d})
  endif()
endforeach()
execute_process(COMMAND ${CXX} -std=c++17 -M -I${SOURCE_DIR}/libacidload/include ${boost_flags} ${tu}
                RESULT_VARIABLE rc OUTPUT_VARIABLE deps ERROR_VARIABLE err)
if(NOT rc EQUAL 0)
  list(APPEND failed "acidload/acidload.hpp does not preprocess alone:\n${err}")
elseif(deps MATCHES "(boost/units/[^ \\\\]*|acidload/units\\.hpp)")
  list(APPEND failed "acidload/acidload.hpp pulls in ${CMAKE_MATCH_1}")
endif()

if(failed)
  string(REPLACE ";" "\n" msg "${failed}")
  message(FATAL_ERROR "${msg}")
endif()
message(STATUS "${n} library and binding sources leave acidload/units.hpp out; the umbrella pulls in no Boost.Units")
