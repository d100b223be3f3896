# rungs_add_netlist() and rungs_add_build_check(): netlists as build outputs of a CMake
# project. Loaded by find_package(rungs), and by rungs's own CMakeLists.txt, so that a
# project that adds rungs with add_subdirectory() has them too. Both run the executable
# target rungs::rungs.
include_guard(GLOBAL)

# rungs_add_netlist(<output>
#                   SOURCE <description.rungs>
#                   [REPORT <file>] [REPORT_JSON <file>]
#                   [TEMPLATES <folder>] [LIBRARY] [WITH_IDEAL]
#                   [OUTPUTS_VARIABLE <variable>])
#
# Adds a custom command that writes the netlist <output> (and the reports) with
# `rungs emit`, and a depfile, so the build re-runs it when the description, a template
# override or rungs itself changes. Relative output and report paths are taken from the
# current binary folder, relative SOURCE and TEMPLATES from the current source folder.
# The command runs in the current source folder with the description's path relative to
# it, so the netlist's header names the description the same way on every checkout.
# Add the files to a target to have them built, for example:
#   rungs_add_netlist(netlists/clock.cir SOURCE lines/clock.rungs OUTPUTS_VARIABLE files)
#   add_custom_target(netlists ALL DEPENDS ${files})
# OUTPUTS_VARIABLE, when given, receives (appended) the absolute paths of every file
# the command writes.
function(rungs_add_netlist output)
  cmake_parse_arguments(PARSE_ARGV 1 arg "LIBRARY;WITH_IDEAL"
                        "SOURCE;REPORT;REPORT_JSON;TEMPLATES;OUTPUTS_VARIABLE" "")
  if(arg_UNPARSED_ARGUMENTS)
    message(FATAL_ERROR "rungs_add_netlist: unknown arguments: ${arg_UNPARSED_ARGUMENTS}")
  endif()
  if(NOT arg_SOURCE)
    message(FATAL_ERROR "rungs_add_netlist(${output}): SOURCE <description.rungs> is required")
  endif()
  if(NOT TARGET rungs::rungs)
    message(FATAL_ERROR "rungs_add_netlist: no target rungs::rungs; call find_package(rungs) "
                        "first")
  endif()

  cmake_path(ABSOLUTE_PATH output BASE_DIRECTORY "${CMAKE_CURRENT_BINARY_DIR}" NORMALIZE)
  set(source "${arg_SOURCE}")
  cmake_path(ABSOLUTE_PATH source BASE_DIRECTORY "${CMAKE_CURRENT_SOURCE_DIR}" NORMALIZE)
  file(RELATIVE_PATH source_from_here "${CMAKE_CURRENT_SOURCE_DIR}" "${source}")

  set(outputs "${output}")
  set(options -o "${output}" --depfile "${output}.d" -q)
  foreach(kind IN ITEMS REPORT REPORT_JSON)
    if(arg_${kind})
      set(path "${arg_${kind}}")
      cmake_path(ABSOLUTE_PATH path BASE_DIRECTORY "${CMAKE_CURRENT_BINARY_DIR}" NORMALIZE)
      list(APPEND outputs "${path}")
      if(kind STREQUAL "REPORT")
        list(APPEND options --report "${path}")
      else()
        list(APPEND options --report-json "${path}")
      endif()
    endif()
  endforeach()
  if(arg_TEMPLATES)
    set(templates "${arg_TEMPLATES}")
    cmake_path(ABSOLUTE_PATH templates BASE_DIRECTORY "${CMAKE_CURRENT_SOURCE_DIR}" NORMALIZE)
    list(APPEND options --templates "${templates}")
  endif()
  if(arg_LIBRARY)
    list(APPEND options --library)
  endif()
  if(arg_WITH_IDEAL)
    list(APPEND options --with-ideal)
  endif()

  # Folders for the outputs; rungs writes files, not folders.
  set(folders "")
  foreach(path IN LISTS outputs)
    cmake_path(GET path PARENT_PATH folder)
    list(APPEND folders "${folder}")
  endforeach()
  list(REMOVE_DUPLICATES folders)

  add_custom_command(
    OUTPUT ${outputs}
    COMMAND "${CMAKE_COMMAND}" -E make_directory ${folders}
    COMMAND rungs::rungs emit "${source_from_here}" ${options}
    MAIN_DEPENDENCY "${source}"
    DEPENDS rungs::rungs
    DEPFILE "${output}.d"
    WORKING_DIRECTORY "${CMAKE_CURRENT_SOURCE_DIR}"
    COMMENT "rungs: netlist ${output}"
    VERBATIM)
  if(arg_OUTPUTS_VARIABLE)
    set(${arg_OUTPUTS_VARIABLE} ${${arg_OUTPUTS_VARIABLE}} ${outputs} PARENT_SCOPE)
  endif()
endfunction()

# rungs_add_build_check(<test-name> [MANIFEST <rungs.toml>])
#
# Adds a CTest test that runs `rungs build --check`: it fails, listing them, when a netlist
# that the manifest names (relative MANIFEST: from the current source folder; default
# rungs.toml there) is stale or missing, so CI can gate on committed netlists.
function(rungs_add_build_check name)
  cmake_parse_arguments(PARSE_ARGV 1 arg "" "MANIFEST" "")
  if(arg_UNPARSED_ARGUMENTS)
    message(FATAL_ERROR "rungs_add_build_check: unknown arguments: ${arg_UNPARSED_ARGUMENTS}")
  endif()
  set(manifest "rungs.toml")
  if(arg_MANIFEST)
    set(manifest "${arg_MANIFEST}")
  endif()
  cmake_path(ABSOLUTE_PATH manifest BASE_DIRECTORY "${CMAKE_CURRENT_SOURCE_DIR}" NORMALIZE)
  add_test(NAME "${name}" COMMAND rungs::rungs build --check --manifest "${manifest}")
endfunction()
