# Finds hypre (Debian's libhypre-dev ships no CMake config). Defines HYPRE::HYPRE.
# Debian builds hypre with MPI, so the target carries MPI::MPI_C.
find_path(HYPRE_INCLUDE_DIR HYPRE.h PATH_SUFFIXES hypre)
find_library(HYPRE_LIBRARY NAMES HYPRE)
include(FindPackageHandleStandardArgs)
find_package_handle_standard_args(HYPRE DEFAULT_MSG HYPRE_LIBRARY HYPRE_INCLUDE_DIR)
if(HYPRE_FOUND AND NOT TARGET HYPRE::HYPRE)
  add_library(HYPRE::HYPRE UNKNOWN IMPORTED)
  set_target_properties(HYPRE::HYPRE PROPERTIES IMPORTED_LOCATION "${HYPRE_LIBRARY}"
                        INTERFACE_INCLUDE_DIRECTORIES "${HYPRE_INCLUDE_DIR}"
                        INTERFACE_LINK_LIBRARIES MPI::MPI_C)
endif()
