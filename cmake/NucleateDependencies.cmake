# Finds every dependency; a missing one stops the configure step with the Debian package that
# provides it. scripts/install-deps.sh installs them all on Debian 12.

find_package(Threads REQUIRED)

function(nucleate_require found what package)
  if(NOT ${found})
    message(FATAL_ERROR
      "nucleate: ${what} not found. On Debian 12: apt-get install ${package} "
      "(or run scripts/install-deps.sh). Without root, point CMAKE_PREFIX_PATH at a prefix "
      "that holds it.")
  endif()
endfunction()

find_package(Eigen3 3.3 QUIET NO_MODULE)
nucleate_require(Eigen3_FOUND "Eigen 3" libeigen3-dev)

find_package(Protobuf QUIET)
nucleate_require(Protobuf_FOUND "Protocol Buffers library" libprotobuf-dev)
if(NOT Protobuf_PROTOC_EXECUTABLE)
  nucleate_require(FALSE "protoc, the Protocol Buffers compiler" protobuf-compiler)
endif()

find_package(PkgConfig QUIET)
nucleate_require(PKG_CONFIG_FOUND "pkg-config" pkg-config)
pkg_check_modules(SPGLIB QUIET IMPORTED_TARGET spglib)
nucleate_require(SPGLIB_FOUND "spglib" libsymspg-dev)

find_package(yaml-cpp QUIET)
nucleate_require(yaml-cpp_FOUND "yaml-cpp" libyaml-cpp-dev)

find_path(RANDOM123_INCLUDE_DIR Random123/philox.h)
nucleate_require(RANDOM123_INCLUDE_DIR "Random123 headers" librandom123-dev)

if(NUCLEATE_BUILD_MPI)
  find_package(MPI QUIET COMPONENTS CXX)
  if(NOT MPI_CXX_FOUND)
    message(FATAL_ERROR
      "nucleate: MPI (C++) not found for nucleate-mpi. On Debian 12: apt-get install "
      "libopenmpi-dev openmpi-bin (or run scripts/install-deps.sh), or configure with "
      "-DNUCLEATE_BUILD_MPI=OFF to build without the MPI driver.")
  endif()
endif()

if(NUCLEATE_BUILD_CLI)
  find_package(CLI11 QUIET CONFIG)
  if(NOT CLI11_FOUND)
    find_path(CLI11_INCLUDE_DIR CLI/CLI.hpp)
    nucleate_require(CLI11_INCLUDE_DIR "CLI11" libcli11-dev)
    add_library(CLI11::CLI11 INTERFACE IMPORTED)
    target_include_directories(CLI11::CLI11 INTERFACE "${CLI11_INCLUDE_DIR}")
  endif()
endif()

if(NUCLEATE_BUILD_TESTS)
  find_package(GTest QUIET)
  nucleate_require(GTest_FOUND "GoogleTest" libgtest-dev)
endif()
