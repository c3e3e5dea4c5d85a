# Writes the manual page qftplan(1) by running the built program: `qftplan help --man`, which
# generates it from the same option tables as --help.
#   cmake -DQFTPLAN_PROGRAM=path/to/qftplan -DOUTPUT=qftplan.1 -P make_man_page.cmake
execute_process(COMMAND "${QFTPLAN_PROGRAM}" help --man
                OUTPUT_FILE "${OUTPUT}.tmp"
                RESULT_VARIABLE rc)
if(NOT rc EQUAL 0)
  file(REMOVE "${OUTPUT}.tmp")
  message(FATAL_ERROR "qftplan help --man failed (${rc})")
endif()
file(RENAME "${OUTPUT}.tmp" "${OUTPUT}")
