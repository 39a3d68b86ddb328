# The post-processing scripts (scripts-post/, Debian's /usr/bin/python3) each run on a small
# run file and must produce their image; the run's XDMF sidecar must parse as XML and point
# at datasets that exist. Label `unit`.
set(TW_POST_DIR ${CMAKE_BINARY_DIR}/post-tests)
set(TW_POST_RUN ${TW_POST_DIR}/small.h5)
set(TW_PY /usr/bin/python3)
set(TW_CHECK ${CMAKE_CURRENT_LIST_DIR}/check_image.py)

# Fixture: a short plate-driven run with probes, measured once (so the omega-k plot reads the
# stored spectrum), and a synthetic complex (re/im) run file.
add_test(NAME "post: make a small run"
         COMMAND ${CMAKE_COMMAND} -E make_directory ${TW_POST_DIR})
add_test(NAME "post: run the small case"
         COMMAND $<TARGET_FILE:tubewave> run ${PROJECT_SOURCE_DIR}/configs/demo_column.yaml -o ${TW_POST_RUN}
                 --quiet --threads 1 --set grid.cells=200 --set time.end=20e-6
                 --set output.snapshot_interval=0.5e-6 --set output.probe_interval=0.1e-6)
add_test(NAME "post: measure the small case"
         COMMAND $<TARGET_FILE:tubewave> measure ${TW_POST_RUN} --field velocity_y)
add_test(NAME "post: make a complex-field run file"
         COMMAND ${TW_PY} ${CMAKE_CURRENT_LIST_DIR}/make_complex_run.py ${TW_POST_DIR}/complex.h5)
set_tests_properties("post: make a small run" PROPERTIES FIXTURES_SETUP tw_post_dir LABELS unit)
set_tests_properties("post: run the small case" PROPERTIES FIXTURES_SETUP tw_post_run FIXTURES_REQUIRED tw_post_dir
                     LABELS unit ENVIRONMENT "OMP_NUM_THREADS=1")
set_tests_properties("post: measure the small case" PROPERTIES FIXTURES_SETUP tw_post_measured
                     FIXTURES_REQUIRED tw_post_run LABELS unit)
set_tests_properties("post: make a complex-field run file" PROPERTIES FIXTURES_SETUP tw_post_complex
                     FIXTURES_REQUIRED tw_post_dir LABELS unit)

function(tw_post_test name script fixture)
  add_test(NAME "post: ${name}"
           COMMAND ${TW_PY} ${TW_CHECK} ${PROJECT_SOURCE_DIR}/scripts-post/${script} ${ARGN})
  set_tests_properties("post: ${name}" PROPERTIES FIXTURES_REQUIRED ${fixture} LABELS unit
                       ENVIRONMENT "MPLBACKEND=Agg")
endfunction()

tw_post_test("space-time diagram" plot_spacetime.py tw_post_run ${TW_POST_RUN} --field velocity_y -o ${TW_POST_DIR}/spacetime.png)
tw_post_test("probe traces" plot_probes.py tw_post_run ${TW_POST_RUN} --field magnetic_field_y -o ${TW_POST_DIR}/probes.png)
tw_post_test("energy budget" plot_budget.py tw_post_run ${TW_POST_RUN} -o ${TW_POST_DIR}/budget.png)
tw_post_test("omega-k spectrum with branches" plot_omega_k.py tw_post_measured ${TW_POST_RUN} --field velocity_y -o ${TW_POST_DIR}/omega_k.png)
tw_post_test("profile snapshots" plot_profiles.py tw_post_run ${TW_POST_RUN} --times 5e-6,10e-6,20e-6 -o ${TW_POST_DIR}/profiles.png)
tw_post_test("space-time of a complex field" plot_spacetime.py tw_post_complex ${TW_POST_DIR}/complex.h5 --field velocity_y --part re -o ${TW_POST_DIR}/complex_spacetime.png)
tw_post_test("omega-k of a complex field (computed here)" plot_omega_k.py tw_post_complex ${TW_POST_DIR}/complex.h5 --field velocity_y --branches none -o ${TW_POST_DIR}/complex_omega_k.png)
tw_post_test("probe traces of a complex field" plot_probes.py tw_post_complex ${TW_POST_DIR}/complex.h5 -o ${TW_POST_DIR}/complex_probes.png)

add_test(NAME "post: the XDMF sidecar parses and points at existing datasets"
         COMMAND ${TW_PY} ${CMAKE_CURRENT_LIST_DIR}/check_xdmf.py ${TW_POST_DIR}/small.xmf ${TW_POST_RUN})
set_tests_properties("post: the XDMF sidecar parses and points at existing datasets" PROPERTIES
                     FIXTURES_REQUIRED tw_post_run LABELS unit)
add_test(NAME "post: the reader refuses an incomplete run file"
         COMMAND ${TW_PY} ${CMAKE_CURRENT_LIST_DIR}/check_reader.py ${TW_POST_RUN} ${TW_POST_DIR})
set_tests_properties("post: the reader refuses an incomplete run file" PROPERTIES
                     FIXTURES_REQUIRED tw_post_run LABELS unit)

add_test(NAME "post: Hall-MHD dispersion formulas match the reference values"
         COMMAND ${TW_PY} ${CMAKE_CURRENT_LIST_DIR}/check_hall_dispersion.py)
set_tests_properties("post: Hall-MHD dispersion formulas match the reference values" PROPERTIES LABELS unit)
