# Finds the Gmsh SDK (Debian's libgmsh-dev ships no CMake config). Defines Gmsh::Gmsh.
find_path(GMSH_INCLUDE_DIR gmsh.h)
find_library(GMSH_LIBRARY NAMES gmsh)
include(FindPackageHandleStandardArgs)
find_package_handle_standard_args(Gmsh DEFAULT_MSG GMSH_LIBRARY GMSH_INCLUDE_DIR)
if(Gmsh_FOUND AND NOT TARGET Gmsh::Gmsh)
  add_library(Gmsh::Gmsh UNKNOWN IMPORTED)
  set_target_properties(Gmsh::Gmsh PROPERTIES IMPORTED_LOCATION "${GMSH_LIBRARY}"
                        INTERFACE_INCLUDE_DIRECTORIES "${GMSH_INCLUDE_DIR}")
endif()
