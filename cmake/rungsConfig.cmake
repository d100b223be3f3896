# find_package(rungs): the imported executable rungs::rungs, and rungs_add_netlist() and
# rungs_add_build_check() (see rungsNetlist.cmake beside this file).
if(CMAKE_VERSION VERSION_LESS 3.20)
  message(FATAL_ERROR "rungs: its CMake package needs CMake 3.20 or newer (DEPFILE with every "
                      "generator), not ${CMAKE_VERSION}")
endif()
include("${CMAKE_CURRENT_LIST_DIR}/rungsTargets.cmake")
include("${CMAKE_CURRENT_LIST_DIR}/rungsNetlist.cmake")
