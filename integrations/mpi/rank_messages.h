// Gathering values of every rank on rank 0: the only collective operations the MPI driver needs.
#pragma once

#include <mpi.h>

#include <string>
#include <vector>

namespace nucleate::mpi {

// On rank 0: the value of every rank, by rank; elsewhere: empty. Collective over `communicator`.
std::vector<int> GatherInts(int value, MPI_Comm communicator);

// As GatherInts for strings. MPI counts are int, so the strings together must stay below 2 GiB:
// when they do not, every rank returns without moving them and rank 0 raises
// std::length_error (no rank is left waiting).
std::vector<std::string> GatherStrings(const std::string& value, MPI_Comm communicator);

}  // namespace nucleate::mpi
