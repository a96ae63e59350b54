# Runs the accuracy report on a reduced sweep with a drive configuration file and checks what it
# wrote: the summary, CSV and JSON with every row, the physical units of the configured drive, and
# the exit status (0: every function within its bound).
#   cmake -DTOOL=... -DWORK_DIR=... -P this
file(REMOVE_RECURSE ${WORK_DIR})
file(MAKE_DIRECTORY ${WORK_DIR})
file(WRITE ${WORK_DIR}/drive.cfg "# a made-up 24 V fan drive\ncurrent-full-scale = 5\nbus-voltage = 24\n"
                                 "pole-pairs = 7\npwm-frequency = 16000\ntimer-period = 3125\n")
execute_process(
  COMMAND ${TOOL} --quick --config ${WORK_DIR}/drive.cfg --report ${WORK_DIR}/report
  RESULT_VARIABLE result
  OUTPUT_VARIABLE output
  ERROR_VARIABLE errors)
if(NOT result EQUAL 0)
  message(FATAL_ERROR "the report failed (${result}):\n${output}\n${errors}")
endif()
foreach(file summary.md results.csv results.json data/sin_cos_q15.dat data/park_map.dat data/histograms.dat)
  if(NOT EXISTS ${WORK_DIR}/report/${file})
    message(FATAL_ERROR "the report has no ${file}")
  endif()
endforeach()
file(READ ${WORK_DIR}/report/results.json json)
string(JSON rows LENGTH "${json}" rows)
string(JSON bus GET "${json}" drive bus_voltage_V)
string(
  JSON
  first_function
  GET
  "${json}"
  rows
  0
  function)
if(rows LESS 40 OR NOT bus EQUAL 24)
  message(FATAL_ERROR "results.json has ${rows} rows and bus voltage ${bus}")
endif()
if(NOT output MATCHES "report written to"
   OR NOT output MATCHES " mA"
   OR NOT output MATCHES "deg el")
  message(FATAL_ERROR "the terminal summary lacks the report location or the physical units:\n${output}")
endif()
message(STATUS "report with ${rows} rows (first: ${first_function}) written to ${WORK_DIR}/report")
