// The C ABI's description of the MPI ranks (nucleate_collective_v1) for data-parallel training:
// the library stays free of MPI, and this driver supplies the one operation it needs, a sum over
// the ranks that gives every rank the same bits (MPI_Reduce to rank 0, then MPI_Bcast; an
// MPI_Allreduce may round differently on different ranks, and the ranks' weights would drift).
#pragma once

#include <mpi.h>

#include "nucleate/nucleate.h"

namespace nucleate::mpi {

class MpiCollective {
 public:
  explicit MpiCollective(MPI_Comm communicator);
  const nucleate_collective_v1* get() const { return &collective_; }

 private:
  static int32_t SumDoubles(double* values, int64_t count, void* context);
  MPI_Comm communicator_;
  nucleate_collective_v1 collective_{};
};

}  // namespace nucleate::mpi
