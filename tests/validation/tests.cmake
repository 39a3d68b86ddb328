# The validation suite's quick subset (validation/run_all.py --quick): a few cases of every
# model run, measured and compared with their analytic dispersion. Label
# `validation-quick`; the full suite is `/usr/bin/python3 validation/run_all.py` (see
# validation/README.md), not a CTest test.
add_test(NAME "validation: quick subset of validation/run_all.py"
         COMMAND /usr/bin/python3 ${PROJECT_SOURCE_DIR}/validation/run_all.py --quick --jobs 2
                 --out ${CMAKE_BINARY_DIR}/validation-quick --tubewave $<TARGET_FILE:tubewave>)
set_tests_properties("validation: quick subset of validation/run_all.py" PROPERTIES
                     LABELS validation-quick ENVIRONMENT "OMP_NUM_THREADS=1;MPLBACKEND=Agg" TIMEOUT 600)
