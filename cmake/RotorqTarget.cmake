# Programs for the core of the cross toolchain (ports/toolchains/<core>.cmake), run by CTest on the
# emulated machine that CMAKE_CROSSCOMPILING_EMULATOR names.
#
#   rotorq_add_target_test(NAME <name> SOURCES <file>... [LIBRARIES <target>...] [TIMEOUT <seconds>])
#
# builds <name>.elf from the sources with rotorq::rotorq and the project's warnings, prints its
# section sizes after each link, and registers the test <name>. A test program prints
# "N passed, M failed" and returns non-zero from main when M > 0. CTest fails the test on a non-zero
# exit status (a failed check, or a fault: picolibc's fault handler exits with status 1), on output
# that reports a failure or no check at all, and after TIMEOUT seconds (default 120), so a program
# that hangs fails too. FAIL_REGULAR_EXPRESSION rather than PASS_REGULAR_EXPRESSION: the latter would
# make CTest ignore the exit status.
include_guard(GLOBAL)

if(NOT CMAKE_CROSSCOMPILING)
  message(FATAL_ERROR "RotorqTarget.cmake is for cross builds (a toolchain file from ports/toolchains)")
endif()

# The size tool of the same binutils as the nm that CMake found beside the compiler.
get_filename_component(rotorq_binutils_dir "${CMAKE_NM}" DIRECTORY)
get_filename_component(rotorq_nm_name "${CMAKE_NM}" NAME)
string(REGEX REPLACE "nm$" "size" rotorq_size_name "${rotorq_nm_name}")
find_program(
  ROTORQ_TARGET_SIZE
  NAMES ${rotorq_size_name}
  HINTS ${rotorq_binutils_dir} REQUIRED)

# The summary line a target test prints; a failure count above zero, or no check at all, fails it.
set(ROTORQ_TARGET_TEST_FAILURE "[1-9][0-9]* failed" "(^|[^0-9])0 passed")

function(rotorq_add_target_test)
  cmake_parse_arguments(PARSE_ARGV 0 arg "" "NAME;TIMEOUT" "SOURCES;LIBRARIES")
  if(NOT arg_NAME OR NOT arg_SOURCES)
    message(FATAL_ERROR "rotorq_add_target_test needs NAME and SOURCES")
  endif()
  if(arg_UNPARSED_ARGUMENTS)
    message(FATAL_ERROR "rotorq_add_target_test: unknown arguments ${arg_UNPARSED_ARGUMENTS}")
  endif()
  if(NOT arg_TIMEOUT)
    set(arg_TIMEOUT 120)
  endif()

  add_executable(${arg_NAME} ${arg_SOURCES})
  set_target_properties(${arg_NAME} PROPERTIES SUFFIX .elf)
  target_link_libraries(${arg_NAME} PRIVATE rotorq::rotorq rotorq_project_options ${arg_LIBRARIES})
  add_custom_command(
    TARGET ${arg_NAME}
    POST_BUILD
    COMMAND ${ROTORQ_TARGET_SIZE} $<TARGET_FILE:${arg_NAME}>
    VERBATIM)

  add_test(NAME ${arg_NAME} COMMAND ${arg_NAME})
  set_tests_properties(${arg_NAME} PROPERTIES TIMEOUT ${arg_TIMEOUT} FAIL_REGULAR_EXPRESSION
                                              "${ROTORQ_TARGET_TEST_FAILURE}")
endfunction()
