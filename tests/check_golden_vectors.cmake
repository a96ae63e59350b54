# Regenerates the golden vectors into WORK_DIR and compares them with the committed file: the
# library's results on the host are still the ones the targets are checked against.
#   cmake -DGENERATOR=... -DGOLDEN=... -DWORK_DIR=... -P this
execute_process(COMMAND ${GENERATOR} ${WORK_DIR}/golden_vectors_now.inc RESULT_VARIABLE result)
if(NOT result EQUAL 0)
  message(FATAL_ERROR "rotorq-vectors failed")
endif()
execute_process(COMMAND ${CMAKE_COMMAND} -E compare_files ${GOLDEN} ${WORK_DIR}/golden_vectors_now.inc
                RESULT_VARIABLE different)
if(different)
  message(
    FATAL_ERROR "tests/target/golden_vectors.inc no longer matches the library's results; if the change "
                "is intended, run `cmake --build <build> --target golden_vectors` and commit the file")
endif()
message(STATUS "golden_vectors.inc matches the library")
