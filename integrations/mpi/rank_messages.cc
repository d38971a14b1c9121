#include "rank_messages.h"

#include <algorithm>
#include <cstdint>
#include <limits>
#include <stdexcept>

namespace nucleate::mpi {

std::vector<int> GatherInts(int value, MPI_Comm communicator) {
  int rank = 0, ranks = 1;
  MPI_Comm_rank(communicator, &rank);
  MPI_Comm_size(communicator, &ranks);
  std::vector<int> values(rank == 0 ? ranks : 0);
  MPI_Gather(&value, 1, MPI_INT, values.data(), 1, MPI_INT, 0, communicator);
  return values;
}

std::vector<std::string> GatherStrings(const std::string& value, MPI_Comm communicator) {
  int rank = 0;
  MPI_Comm_rank(communicator, &rank);
  constexpr std::int64_t kMaxBytes = std::numeric_limits<int>::max();
  long long size = static_cast<long long>(value.size());
  std::vector<long long> sizes;
  {
    int ranks = 1;
    MPI_Comm_size(communicator, &ranks);
    sizes.resize(rank == 0 ? ranks : 0);
    MPI_Gather(&size, 1, MPI_LONG_LONG, sizes.data(), 1, MPI_LONG_LONG, 0, communicator);
  }
  // Rank 0 decides whether the parts fit one MPI message and tells everyone.
  std::vector<int> counts(sizes.size()), offsets(sizes.size());
  long long total = 0;
  for (std::size_t r = 0; r < sizes.size(); ++r) {
    offsets[r] = static_cast<int>(std::min<long long>(total, kMaxBytes));
    counts[r] = static_cast<int>(std::min<long long>(sizes[r], kMaxBytes));
    total += sizes[r];
  }
  int fits = total <= kMaxBytes ? 1 : 0;
  MPI_Bcast(&fits, 1, MPI_INT, 0, communicator);
  if (fits == 0) {
    if (rank != 0) return {};
    throw std::length_error("the parts of all ranks come to " + std::to_string(total) +
                            " bytes, above the 2 GiB one gather can move: ask fewer candidates "
                            "per run (split the campaign with first_index)");
  }
  std::string all(static_cast<std::size_t>(total), '\0');
  MPI_Gatherv(value.data(), static_cast<int>(size), MPI_CHAR, all.data(), counts.data(),
              offsets.data(), MPI_CHAR, 0, communicator);
  std::vector<std::string> values;
  for (std::size_t r = 0; r < sizes.size(); ++r) values.push_back(all.substr(offsets[r], counts[r]));
  return values;
}

}  // namespace nucleate::mpi
