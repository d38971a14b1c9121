#include "mpi_collective.h"

#include <algorithm>
#include <limits>
#include <vector>

namespace nucleate::mpi {

MpiCollective::MpiCollective(MPI_Comm communicator) : communicator_(communicator) {
  collective_.struct_size = sizeof(nucleate_collective_v1);
  MPI_Comm_rank(communicator, &collective_.rank);
  MPI_Comm_size(communicator, &collective_.size);
  collective_.sum_doubles = &MpiCollective::SumDoubles;
  collective_.context = this;
}

int32_t MpiCollective::SumDoubles(double* values, int64_t count, void* context) {
  const auto* self = static_cast<const MpiCollective*>(context);
  // Every rank gets the same count, so every rank refuses an oversized one alike.
  if (count < 0 || count > std::numeric_limits<int>::max()) return 1;
  const int n = static_cast<int>(count);
  std::vector<double> sums(self->collective_.rank == 0 ? n : 0);
  if (MPI_Reduce(values, sums.data(), n, MPI_DOUBLE, MPI_SUM, 0, self->communicator_) !=
      MPI_SUCCESS) {
    return 2;
  }
  if (self->collective_.rank == 0) std::copy(sums.begin(), sums.end(), values);
  return MPI_Bcast(values, n, MPI_DOUBLE, 0, self->communicator_) == MPI_SUCCESS ? 0 : 3;
}

}  // namespace nucleate::mpi
