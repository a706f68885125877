# Finds SuiteSparse CHOLMOD 3/4 (Debian's SuiteSparse 5 ships no CMake config).
# Defines CHOLMOD::CHOLMOD.
find_path(CHOLMOD_INCLUDE_DIR cholmod.h PATH_SUFFIXES suitesparse)
find_library(CHOLMOD_LIBRARY NAMES cholmod)
find_library(SUITESPARSECONFIG_LIBRARY NAMES suitesparseconfig)
include(FindPackageHandleStandardArgs)
find_package_handle_standard_args(CHOLMOD DEFAULT_MSG CHOLMOD_LIBRARY SUITESPARSECONFIG_LIBRARY CHOLMOD_INCLUDE_DIR)
if(CHOLMOD_FOUND AND NOT TARGET CHOLMOD::CHOLMOD)
  add_library(CHOLMOD::CHOLMOD UNKNOWN IMPORTED)
  set_target_properties(CHOLMOD::CHOLMOD PROPERTIES IMPORTED_LOCATION "${CHOLMOD_LIBRARY}"
                        INTERFACE_INCLUDE_DIRECTORIES "${CHOLMOD_INCLUDE_DIR}"
                        INTERFACE_LINK_LIBRARIES "${SUITESPARSECONFIG_LIBRARY}")
endif()

# UMFPACK (same SuiteSparse package): sparse LU for non-symmetric Jacobians.
find_library(UMFPACK_LIBRARY NAMES umfpack)
if(UMFPACK_LIBRARY AND NOT TARGET UMFPACK::UMFPACK)
  add_library(UMFPACK::UMFPACK UNKNOWN IMPORTED)
  set_target_properties(UMFPACK::UMFPACK PROPERTIES IMPORTED_LOCATION "${UMFPACK_LIBRARY}"
                        INTERFACE_INCLUDE_DIRECTORIES "${CHOLMOD_INCLUDE_DIR}"
                        INTERFACE_LINK_LIBRARIES "${SUITESPARSECONFIG_LIBRARY}")
endif()
if(NOT UMFPACK_LIBRARY)
  message(FATAL_ERROR "UMFPACK not found: install libsuitesparse-dev (tools/setup-deps.sh)")
endif()
