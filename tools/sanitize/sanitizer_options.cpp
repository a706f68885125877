// Default options of the sanitiser runtimes, compiled into every executable of a
// HEARTH_SANITIZE or HEARTH_FUZZ build (cmake/HearthSanitizers.cmake). The runtimes
// call these before main; ASAN_OPTIONS, UBSAN_OPTIONS and LSAN_OPTIONS set in the
// environment are applied after them and win.

#define HEARTH_SANITIZER_HOOK extern "C" __attribute__((visibility("default"), used)) const char*

// Leaks are reported (LeakSanitizer runs at exit). In the sanitised build allocation
// stacks are unwound with DWARF, not frame pointers (fast_unwind_on_malloc=0): the
// Debian libraries are built without frame pointers, and the suppressions (lsan.supp)
// must see the library function on the stack that made the allocation. That doubles
// the tests' time, and would make a fuzzer ten times slower, so the fuzzing build,
// whose targets start neither MPI nor Gmsh, keeps the fast unwinder.
// HEARTH_ASAN_OPTIONS comes from cmake/HearthSanitizers.cmake.
HEARTH_SANITIZER_HOOK __asan_default_options() { return HEARTH_ASAN_OPTIONS; }

// Undefined behaviour stops the program with a stack (the code is also compiled with
// -fno-sanitize-recover=undefined, which makes every check fatal).
HEARTH_SANITIZER_HOOK __ubsan_default_options() { return "halt_on_error=1:print_stacktrace=1"; }

// Allocations that Debian's MPI runtime and other libraries keep until exit on
// purpose; each suppression is explained in the file.
HEARTH_SANITIZER_HOOK __lsan_default_options() { return "suppressions=" HEARTH_LSAN_SUPPRESSIONS; }
