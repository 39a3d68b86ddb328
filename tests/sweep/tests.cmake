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
