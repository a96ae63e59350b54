# Compiles each header in HEADERS on its own with COMPILER (C++17, freestanding, no exceptions, no
# RTTI, the project's warnings as errors) plus FLAGS, then compiles freestanding_usage.cpp, which
# calls every target function. With NM given (a bare-metal toolchain without an FPU), the usage
# object must need no soft-float helper: the target path has no floating point. The helpers are
# libgcc's (__mulsf3, __adddf3, ...) and, on Arm, the run-time ABI's (__aeabi_fmul, __aeabi_dadd,
# __aeabi_f2iz, __aeabi_i2d, ...); integer helpers such as __aeabi_lmul or __aeabi_uldivmod are fine.
#   cmake -DCOMPILER=... -DFLAGS=... -DINCLUDE_DIR=... -DHEADERS=... -DWORK_DIR=... [-DNM=...] -P this
file(MAKE_DIRECTORY ${WORK_DIR})
set(common
    -std=c++17
    -ffreestanding
    -fno-exceptions
    -fno-rtti
    -Wall
    -Wextra
    -Wconversion
    -Wsign-conversion
    -Wshadow
    -Werror
    ${FLAGS}
    -I${INCLUDE_DIR})
foreach(header IN LISTS HEADERS)
  string(MAKE_C_IDENTIFIER ${header} unit)
  file(WRITE ${WORK_DIR}/${unit}.cpp "#include \"${header}\"\n")
  execute_process(
    COMMAND ${COMPILER} ${common} -c ${WORK_DIR}/${unit}.cpp -o ${WORK_DIR}/${unit}.o
    RESULT_VARIABLE result
    ERROR_VARIABLE errors)
  if(NOT result EQUAL 0)
    message(FATAL_ERROR "${header} does not compile on its own with ${COMPILER} ${FLAGS}:\n${errors}")
  endif()
endforeach()

execute_process(
  COMMAND ${COMPILER} ${common} -O2 -c ${CMAKE_CURRENT_LIST_DIR}/freestanding_usage.cpp -o ${WORK_DIR}/usage.o
  RESULT_VARIABLE result
  ERROR_VARIABLE errors)
if(NOT result EQUAL 0)
  message(FATAL_ERROR "freestanding_usage.cpp does not compile with ${COMPILER} ${FLAGS}:\n${errors}")
endif()
if(NM)
  execute_process(COMMAND ${NM} -u ${WORK_DIR}/usage.o OUTPUT_VARIABLE undefined)
  if(undefined MATCHES "__[a-z]+(sf|df)[0-9a-z]*" OR undefined MATCHES "__aeabi_([df][a-z0-9]+|u?[il]2[df])")
    message(FATAL_ERROR "the target path calls soft-float helpers:\n${undefined}")
  endif()
  message(STATUS "undefined symbols of the usage object: '${undefined}'")
endif()
message(STATUS "${HEADERS}: each compiles on its own with ${COMPILER} ${FLAGS}")
