# Installed layout (GNUInstallDirs):
#   bin/nucleate
#   lib*/libnucleate.so (SOVERSION = ABI major), lib*/libnucleate_fortran.so
#   include/nucleate/nucleate.h, nucleate_version.h
#   include/nucleate/fortran/<compiler>-<version>/nucleate.mod, include/nucleate/fortran/nucleate.F90
#   lib*/cmake/nucleate/nucleateConfig.cmake (+ version file, targets nucleate::nucleate and
#   nucleate::fortran), lib*/pkgconfig/nucleate.pc
include(CMakePackageConfigHelpers)

set(NUCLEATE_CMAKE_DIR "${CMAKE_INSTALL_LIBDIR}/cmake/nucleate")
set(NUCLEATE_INSTALL_TARGETS nucleate)
if(NUCLEATE_BUILD_FORTRAN)
  list(APPEND NUCLEATE_INSTALL_TARGETS nucleate_fortran)
endif()

install(TARGETS ${NUCLEATE_INSTALL_TARGETS}
  EXPORT nucleateTargets
  LIBRARY DESTINATION "${CMAKE_INSTALL_LIBDIR}"
  INCLUDES DESTINATION "${CMAKE_INSTALL_INCLUDEDIR}")
install(FILES
  "${PROJECT_SOURCE_DIR}/capi/include/nucleate/nucleate.h"
  "${PROJECT_BINARY_DIR}/capi/include/nucleate/nucleate_version.h"
  DESTINATION "${CMAKE_INSTALL_INCLUDEDIR}/nucleate")
if(NUCLEATE_BUILD_FORTRAN)
  install(FILES "${PROJECT_BINARY_DIR}/integrations/fortran/modules/nucleate.mod"
    DESTINATION "${CMAKE_INSTALL_INCLUDEDIR}/${NUCLEATE_FORTRAN_MODULE_SUBDIR}")
  install(FILES "${PROJECT_SOURCE_DIR}/integrations/fortran/nucleate.F90"
    DESTINATION "${CMAKE_INSTALL_INCLUDEDIR}/nucleate/fortran")
endif()
if(NUCLEATE_BUILD_CLI)
  install(TARGETS nucleate_cli RUNTIME DESTINATION "${CMAKE_INSTALL_BINDIR}")
endif()
if(NUCLEATE_BUILD_MPI)
  install(TARGETS nucleate_mpi RUNTIME DESTINATION "${CMAKE_INSTALL_BINDIR}")
endif()
install(DIRECTORY "${PROJECT_SOURCE_DIR}/schemas/nucleate"
  DESTINATION "${CMAKE_INSTALL_DATADIR}/nucleate/schemas")

install(EXPORT nucleateTargets NAMESPACE nucleate:: DESTINATION "${NUCLEATE_CMAKE_DIR}")
configure_package_config_file(cmake/nucleateConfig.cmake.in
  "${PROJECT_BINARY_DIR}/nucleateConfig.cmake"
  INSTALL_DESTINATION "${NUCLEATE_CMAKE_DIR}")
write_basic_package_version_file("${PROJECT_BINARY_DIR}/nucleateConfigVersion.cmake"
  COMPATIBILITY SameMajorVersion)
install(FILES "${PROJECT_BINARY_DIR}/nucleateConfig.cmake"
              "${PROJECT_BINARY_DIR}/nucleateConfigVersion.cmake"
  DESTINATION "${NUCLEATE_CMAKE_DIR}")

# pkg-config: relocatable, every path relative to the .pc file's own folder.
file(RELATIVE_PATH NUCLEATE_PC_TO_PREFIX
  "/${CMAKE_INSTALL_LIBDIR}/pkgconfig" "/")
string(REGEX REPLACE "/$" "" NUCLEATE_PC_TO_PREFIX "${NUCLEATE_PC_TO_PREFIX}")
configure_file(cmake/nucleate.pc.in "${PROJECT_BINARY_DIR}/nucleate.pc" @ONLY)
install(FILES "${PROJECT_BINARY_DIR}/nucleate.pc"
  DESTINATION "${CMAKE_INSTALL_LIBDIR}/pkgconfig")
