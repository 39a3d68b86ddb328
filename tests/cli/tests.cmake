# Command-line tests that need no C++: registered with CTest from tests/CMakeLists.txt.

# Every example run file must validate: `tubewave check` on each file in configs/.
file(GLOB TUBEWAVE_EXAMPLE_CONFIGS CONFIGURE_DEPENDS ${PROJECT_SOURCE_DIR}/configs/*.yaml)
foreach(cfg ${TUBEWAVE_EXAMPLE_CONFIGS})
  get_filename_component(cfg_name ${cfg} NAME_WE)
  add_test(NAME "configs: tubewave check ${cfg_name}"
           COMMAND $<TARGET_FILE:tubewave> check ${cfg})
  set_tests_properties("configs: tubewave check ${cfg_name}" PROPERTIES LABELS unit)
endforeach()

# The key reference in README.md (between <!-- keys:begin --> and <!-- keys:end -->) must
# match `tubewave keys`: regenerate it after changing run-file keys.
add_test(NAME "readme: key reference is up to date"
         COMMAND ${CMAKE_CURRENT_LIST_DIR}/check_keys_reference.sh
                 $<TARGET_FILE:tubewave> ${PROJECT_SOURCE_DIR}/README.md)
set_tests_properties("readme: key reference is up to date" PROPERTIES LABELS unit)

# `tubewave modes --json` parses and carries the table's numbers (tests/cli/check_modes_json.py).
add_test(NAME "modes: JSON output parses and matches the Hall-MHD identities"
         COMMAND /usr/bin/python3 ${CMAKE_CURRENT_LIST_DIR}/check_modes_json.py $<TARGET_FILE:tubewave> ${PROJECT_SOURCE_DIR})
set_tests_properties("modes: JSON output parses and matches the Hall-MHD identities" PROPERTIES LABELS unit)
