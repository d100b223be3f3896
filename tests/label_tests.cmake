# CTest labels from Catch2 tags, run after a test executable is linked (cmake -P): every test
# case is `fast`, or `slow` when tagged [slow]; one tagged [ngspice] also gets `ngspice`.
# Writes set_tests_properties() calls to LABELS_FILE, which CTest includes after the tests
# that catch_discover_tests registered (names TEST_PREFIX + test case name).
# Inputs: TEST_EXECUTABLE, TEST_PREFIX, LABELS_FILE.
cmake_minimum_required(VERSION 3.25)

# The names of the test cases that match the Catch2 test spec `spec`, into `out`.
function(test_names spec out)
  execute_process(COMMAND "${TEST_EXECUTABLE}" ${spec} --list-test-names-only
                  OUTPUT_VARIABLE listed RESULT_VARIABLE code)
  # Catch2 exits with the number of names it listed; anything else is a crash.
  if(NOT code MATCHES "^[0-9]+$")
    message(FATAL_ERROR "listing the tests of ${TEST_EXECUTABLE} failed: ${code}")
  endif()
  string(REGEX REPLACE "\n$" "" listed "${listed}")
  if(listed STREQUAL "")
    set(${out} "" PARENT_SCOPE)
  else()
    string(REPLACE "\n" ";" listed "${listed}")
    set(${out} "${listed}" PARENT_SCOPE)
  endif()
endfunction()

test_names("" all)
test_names("[slow]" slow)
test_names("[ngspice]" ngspice)

set(script "")
foreach(name IN LISTS all)
  # A slow test also gets a high COST, so that ctest -j starts it early even before it has
  # timings of its own (Testing/Temporary/CTestCostData.txt).
  if(name IN_LIST slow)
    set(labels slow)
    set(cost 100)
  else()
    set(labels fast)
    set(cost 0)
  endif()
  if(name IN_LIST ngspice)
    list(APPEND labels ngspice)
  endif()
  string(APPEND script "set_tests_properties([==[${TEST_PREFIX}${name}]==] PROPERTIES LABELS "
                       "\"${labels}\" COST ${cost})\n")
endforeach()
file(WRITE "${LABELS_FILE}" "${script}")
