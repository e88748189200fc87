# Sourced by tools/sanitize.sh and tools/fuzz_run.sh: sanitizer settings for every process of a
# sanitized build (mpiexec passes the environment on to the ranks it starts on this host).
sanitize_tools="$(cd "$(dirname "${BASH_SOURCE[0]}")" && pwd)"
# detect_leaks: leaks of our code fail the run (libraries' own leaks are suppressed, with reasons,
# in sanitize_lsan.supp); abort_on_error=0: exit with a code, so ctest reports the test as failed.
# fast_unwind_on_malloc=0: whole stacks through Debian's libraries (built without frame pointers),
# so the suppressions can name the library a leak comes from.
# allocator_may_return_null=1: an impossible request (HDF5 asks for the size a damaged header
# claims, e.g. 8e18 bytes) returns null as glibc's malloc does, and HDF5 then reports an error.
export ASAN_OPTIONS="detect_leaks=1:fast_unwind_on_malloc=0:allocator_may_return_null=1:check_initialization_order=1:strict_init_order=1:detect_stack_use_after_return=1${ASAN_OPTIONS:+:$ASAN_OPTIONS}"
export LSAN_OPTIONS="suppressions=$sanitize_tools/sanitize_lsan.supp:print_suppressions=0${LSAN_OPTIONS:+:$LSAN_OPTIONS}"
export UBSAN_OPTIONS="print_stacktrace=1:halt_on_error=1${UBSAN_OPTIONS:+:$UBSAN_OPTIONS}"
# Open MPI unloads its plugins at the end, which leaves their frames in a leak report unnamed.
export OMPI_MCA_mca_base_component_disable_dlclose=1
