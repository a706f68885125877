# Sanitiser and fuzzing builds (DEVELOPERS.md, "Sanitisers and fuzzing").
#
#   HEARTH_SANITIZE=ON  every target of the project built with AddressSanitizer (with
#                       LeakSanitizer) and UndefinedBehaviorSanitizer, gcc or clang;
#                       undefined behaviour halts the program.
#   HEARTH_FUZZ=ON      the same with clang's coverage instrumentation for libFuzzer,
#                       and the fuzz targets of tests/fuzz. Needs clang.
#
# Libraries from Debian (Gmsh, VTK, yaml-cpp, hypre, MPI, OpenBLAS) are not
# instrumented: errors inside them are found only where our code passes them bad
# memory. Each executable gets the sanitisers' default options compiled in
# (tools/sanitize/sanitizer_options.cpp), so the test discovery, ctest and a plain
# run all use the same leak suppressions; ASAN_OPTIONS, UBSAN_OPTIONS and
# LSAN_OPTIONS in the environment still override them.
option(HEARTH_SANITIZE "Build with AddressSanitizer and UndefinedBehaviorSanitizer" OFF)
option(HEARTH_FUZZ "Build the libFuzzer targets (clang; implies the sanitisers)" OFF)

if(HEARTH_FUZZ AND NOT CMAKE_CXX_COMPILER_ID STREQUAL "Clang")
  message(FATAL_ERROR "HEARTH_FUZZ=ON needs clang (libFuzzer): configure a separate build folder with "
                      "-DCMAKE_C_COMPILER=clang -DCMAKE_CXX_COMPILER=clang++ (Debian packages clang-14, "
                      "libclang-rt-14-dev, libomp-14-dev; tools/setup-deps.sh installs them)")
endif()

if(HEARTH_SANITIZE OR HEARTH_FUZZ)
  set(HEARTH_SANITIZER_FLAGS -fsanitize=address,undefined -fno-sanitize-recover=undefined)
  if(HEARTH_FUZZ)
    # Coverage feedback for libFuzzer in every object; the fuzz targets add the
    # libFuzzer main with -fsanitize=fuzzer at link time (tests/fuzz).
    list(APPEND HEARTH_SANITIZER_FLAGS -fsanitize=fuzzer-no-link)
  endif()
  # Frame pointers and line tables so that reports show readable stacks.
  add_compile_options(${HEARTH_SANITIZER_FLAGS} -fno-omit-frame-pointer -g)
  if(CMAKE_CXX_COMPILER_ID STREQUAL "GNU")
    # gcc 12's flow analysis of the instrumented code warns of uninitialised members
    # inside libstdc++'s std::regex and std::function, which the plain build does not.
    add_compile_options(-Wno-maybe-uninitialized)
  endif()
  add_link_options(-fsanitize=address,undefined)
  set(HEARTH_LSAN_SUPPRESSIONS "${PROJECT_SOURCE_DIR}/tools/sanitize/lsan.supp")
  # Slow (DWARF) unwinding so that the suppressions see the library frames; not for
  # fuzzing, where it costs ten times the speed (tools/sanitize/sanitizer_options.cpp).
  if(HEARTH_FUZZ)
    set(HEARTH_ASAN_OPTIONS "detect_leaks=1")
  else()
    set(HEARTH_ASAN_OPTIONS "detect_leaks=1:fast_unwind_on_malloc=0")
  endif()
endif()

# The executables defined in `dir` and the folders below it.
function(hearth_executables_below dir result)
  set(found "")
  get_property(targets DIRECTORY "${dir}" PROPERTY BUILDSYSTEM_TARGETS)
  foreach(target IN LISTS targets)
    get_target_property(type ${target} TYPE)
    if(type STREQUAL "EXECUTABLE")
      list(APPEND found ${target})
    endif()
  endforeach()
  get_property(subdirs DIRECTORY "${dir}" PROPERTY SUBDIRECTORIES)
  foreach(subdir IN LISTS subdirs)
    hearth_executables_below("${subdir}" below)
    list(APPEND found ${below})
  endforeach()
  set(${result} "${found}" PARENT_SCOPE)
endfunction()

# Called once at the end of the top-level CMakeLists.txt: every executable, including
# those added later by anyone, gets the sanitisers' default options.
function(hearth_add_sanitizer_options)
  if(NOT (HEARTH_SANITIZE OR HEARTH_FUZZ))
    return()
  endif()
  hearth_executables_below("${PROJECT_SOURCE_DIR}" executables)
  set(options_source "${PROJECT_SOURCE_DIR}/tools/sanitize/sanitizer_options.cpp")
  foreach(target IN LISTS executables)
    target_sources(${target} PRIVATE "${options_source}")
    # Source properties belong to the folder of the target that compiles the file.
    set_source_files_properties("${options_source}" TARGET_DIRECTORY ${target} PROPERTIES
                                COMPILE_DEFINITIONS "HEARTH_LSAN_SUPPRESSIONS=\"${HEARTH_LSAN_SUPPRESSIONS}\";HEARTH_ASAN_OPTIONS=\"${HEARTH_ASAN_OPTIONS}\"")
  endforeach()
endfunction()
