# Writes the bundled demo case into a header, so that `acidload demo` works wherever the program
# is installed (a wheel, a prefix) and not only beside the source tree.
file(READ ${INPUT} text)
file(WRITE ${OUTPUT} "#pragma once\n// Generated from cases/demo-site.yaml by bindings/cli/embed_demo.cmake.\nstatic const char* const demo_case_text = R\"acidload_demo(${text})acidload_demo\";\n")
