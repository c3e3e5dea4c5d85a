# ctest driver (cmake -P): installs the build tree into a fresh prefix, then uses that prefix as a
# stranger would: find_package(qftplan) from a separate CMake project, pkg-config with a plain
# compiler call, the installed program, the installed schemas, and the installed Python module.
# Variables: BUILD_DIR, CONSUMER_DIR, WORK_DIR, CXX, and optionally PYTHON and PYTHON_DIR (the module's
# folder relative to the prefix).

# Exact QFT on 8 qubits of a line: the parity network (ours, include/qftplan/networks/parity_qft.hpp) has one
# step of 2 CX for each of the n(n-1)/2 = 28 meetings of the linear-nearest-neighbour network
# (Fowler, Devitt and Hollenberg, Quantum Inf. Comput. 4, 237, 2004) and a closing ladder of n-1 CX:
# n^2 - 1 = 63.
set(expected_cx 63)

function(run)
  execute_process(COMMAND ${ARGN} RESULT_VARIABLE rc OUTPUT_VARIABLE out ERROR_VARIABLE err)
  if(NOT rc EQUAL 0)
    string(REPLACE ";" " " cmd "${ARGN}")
    message(FATAL_ERROR "failed (${rc}): ${cmd}\n${out}\n${err}")
  endif()
  set(out "${out}" PARENT_SCOPE)
endfunction()

set(prefix ${WORK_DIR}/prefix)
file(REMOVE_RECURSE ${WORK_DIR})
file(MAKE_DIRECTORY ${WORK_DIR})

# 1. Install.
run(${CMAKE_COMMAND} --install ${BUILD_DIR} --prefix ${prefix})
foreach(f bin/qftplan include/qftplan/planners/plan.hpp include/qftplan/networks/end_order.hpp share/man/man1/qftplan.1
          share/qftplan/schemas/plan-report.schema.json)
  if(NOT EXISTS ${prefix}/${f})
    message(FATAL_ERROR "not installed: ${f}")
  endif()
endforeach()
file(GLOB_RECURSE config ${prefix}/*/qftplanConfig.cmake)
file(GLOB_RECURSE pc ${prefix}/*/qftplan.pc)
file(GLOB_RECURSE lib ${prefix}/*/libqftplan.a)
if(NOT config OR NOT pc OR NOT lib)
  message(FATAL_ERROR "missing package files: config '${config}', pkg-config '${pc}', library '${lib}'")
endif()

# 2. find_package from a separate project.
run(${CMAKE_COMMAND} -S ${CONSUMER_DIR} -B ${WORK_DIR}/build -DCMAKE_PREFIX_PATH=${prefix}
    -DCMAKE_BUILD_TYPE=Release -DCMAKE_CXX_COMPILER=${CXX})
run(${CMAKE_COMMAND} --build ${WORK_DIR}/build)
run(${WORK_DIR}/build/qftplan_consumer)
if(NOT out MATCHES "cx_count ${expected_cx}\n" OR NOT out MATCHES "schema_version 1\n")
  message(FATAL_ERROR "consumer (find_package) printed:\n${out}expected cx_count ${expected_cx}")
endif()
message(STATUS "find_package consumer: ${out}")

# 3. pkg-config with a plain compiler call.
find_program(PKG_CONFIG pkg-config)
if(PKG_CONFIG)
  get_filename_component(pcdir ${pc} DIRECTORY)
  set(ENV{PKG_CONFIG_PATH} ${pcdir})
  run(${PKG_CONFIG} --cflags --libs qftplan)
  string(STRIP "${out}" flags)
  separate_arguments(flags UNIX_COMMAND "${flags}")
  run(${CXX} -O1 ${CONSUMER_DIR}/main.cpp -o ${WORK_DIR}/consumer_pc ${flags})
  run(${WORK_DIR}/consumer_pc)
  if(NOT out MATCHES "cx_count ${expected_cx}\n")
    message(FATAL_ERROR "consumer (pkg-config) printed:\n${out}")
  endif()
  message(STATUS "pkg-config consumer: ok")
endif()

# 4. The installed program.
run(${prefix}/bin/qftplan --version)
message(STATUS "installed program: ${out}")

# 5. The installed Python module, from a clean environment pointing only at the prefix.
if(PYTHON AND PYTHON_DIR)
  set(ENV{PYTHONPATH} ${prefix}/${PYTHON_DIR})
  # No semicolons: they would split the CMake argument list.
  run(${PYTHON} -c "import os, qftplan\nprint(os.path.realpath(qftplan.__file__))\nprint(qftplan.plan('line:8', 8).report['cx_count'])")
  file(REAL_PATH ${prefix} real_prefix)
  string(FIND "${out}" "${real_prefix}/" at)
  if(NOT at EQUAL 0 OR NOT out MATCHES "\n${expected_cx}\n")
    message(FATAL_ERROR "installed Python module: ${out}")
  endif()
  message(STATUS "installed Python module: ok")
endif()
