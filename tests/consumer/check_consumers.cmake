# Installs rotorq into a scratch prefix, then builds and runs a small consumer twice: once through
# find_package(rotorq CONFIG) and once through add_subdirectory.
#   cmake -DSOURCE_DIR=... -DWORK_DIR=... -P this
file(REMOVE_RECURSE ${WORK_DIR})
set(prefix ${WORK_DIR}/prefix)

function(run)
  execute_process(
    COMMAND ${ARGN}
    RESULT_VARIABLE result
    OUTPUT_VARIABLE output
    ERROR_VARIABLE output)
  if(NOT result EQUAL 0)
    message(FATAL_ERROR "failed: ${ARGN}\n${output}")
  endif()
endfunction()

run(${CMAKE_COMMAND}
    -S
    ${SOURCE_DIR}
    -B
    ${WORK_DIR}/rotorq
    -G
    Ninja
    -DROTORQ_BUILD_TESTS=OFF
    -DROTORQ_BUILD_TOOLS=OFF
    -DROTORQ_BUILD_BENCHMARKS=OFF
    -DCMAKE_INSTALL_PREFIX=${prefix})
run(${CMAKE_COMMAND} --install ${WORK_DIR}/rotorq)

foreach(mode find_package add_subdirectory)
  run(${CMAKE_COMMAND}
      -S
      ${CMAKE_CURRENT_LIST_DIR}
      -B
      ${WORK_DIR}/${mode}
      -G
      Ninja
      -DCONSUMER_MODE=${mode}
      -DROTORQ_SOURCE_DIR=${SOURCE_DIR}
      -DCMAKE_PREFIX_PATH=${prefix})
  run(${CMAKE_COMMAND} --build ${WORK_DIR}/${mode})
  run(${WORK_DIR}/${mode}/consumer)
  message(STATUS "consumer through ${mode}: built and ran")
endforeach()
