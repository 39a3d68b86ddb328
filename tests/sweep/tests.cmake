# The sweep tests (test_*.cpp here) are their own executable, tubewave_sweep_tests, so the
# build without MPI (preset nompi) compiles only them besides tubewave. In builds with MPI
# they include the `mpiexec -np 2` comparison (TUBEWAVE_MPIEXEC_FLAGS: the launcher's
# options; Open MPI's let it run as root and on more ranks than cores).
file(GLOB TUBEWAVE_SWEEP_TEST_SOURCES CONFIGURE_DEPENDS ${CMAKE_CURRENT_LIST_DIR}/test_*.cpp)
add_executable(tubewave_sweep_tests ${TUBEWAVE_SWEEP_TEST_SOURCES} ${CMAKE_CURRENT_LIST_DIR}/../support/test_support.cpp)
target_link_libraries(tubewave_sweep_tests PRIVATE tubewave::core tubewave_options Catch2::Catch2WithMain)
target_include_directories(tubewave_sweep_tests PRIVATE ${CMAKE_CURRENT_LIST_DIR}/..)
target_compile_definitions(tubewave_sweep_tests PRIVATE
  TUBEWAVE_SOURCE_DIR="${PROJECT_SOURCE_DIR}"
  TUBEWAVE_EXE="$<TARGET_FILE:tubewave>")
if(TUBEWAVE_HAVE_MPI)
  set(TUBEWAVE_MPIEXEC_FLAGS "--allow-run-as-root --oversubscribe" CACHE STRING "mpiexec options for the MPI sweep test")
  target_compile_definitions(tubewave_sweep_tests PRIVATE
    TUBEWAVE_TEST_MPIEXEC="${MPIEXEC_EXECUTABLE} ${TUBEWAVE_MPIEXEC_FLAGS}")
endif()
add_dependencies(tubewave_sweep_tests tubewave)
catch_discover_tests(tubewave_sweep_tests TEST_SPEC "[unit]"
  PROPERTIES LABELS unit ENVIRONMENT "OMP_NUM_THREADS=1")

# The example sweeps in configs/sweeps/: each is validated (`--list` checks every case's run
# file) and run with shortened cases into the build tree.
file(GLOB TUBEWAVE_EXAMPLE_SWEEPS CONFIGURE_DEPENDS ${PROJECT_SOURCE_DIR}/configs/sweeps/*.yaml)
foreach(sw ${TUBEWAVE_EXAMPLE_SWEEPS})
  get_filename_component(sw_name ${sw} NAME_WE)
  add_test(NAME "configs: tubewave sweep --list ${sw_name}"
           COMMAND $<TARGET_FILE:tubewave> sweep ${sw} --list)
  set(sw_out ${CMAKE_CURRENT_BINARY_DIR}/example-sweeps/${sw_name})
  add_test(NAME "configs: tubewave sweep ${sw_name} (shortened)"
           COMMAND sh -c "rm -rf '${sw_out}' && '$<TARGET_FILE:tubewave>' sweep '${sw}' --output-dir '${sw_out}' --set grid.cells=64 --set time.end=8e-6")
  set_tests_properties("configs: tubewave sweep --list ${sw_name}" "configs: tubewave sweep ${sw_name} (shortened)"
                       PROPERTIES LABELS unit)
endforeach()

# The sweep-file key reference in README.md must match `tubewave sweep --keys`.
add_test(NAME "readme: sweep-file key reference is up to date"
         COMMAND ${CMAKE_CURRENT_LIST_DIR}/check_sweep_keys.sh $<TARGET_FILE:tubewave> ${PROJECT_SOURCE_DIR}/README.md)
set_tests_properties("readme: sweep-file key reference is up to date" PROPERTIES LABELS unit)
