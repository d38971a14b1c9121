// Sampling spread over MPI ranks: each rank runs the Sample method for its own slice of the
// request's sample indices (rank r of P takes [first + r*count/P, first + (r+1)*count/P)), the
// parts are gathered on rank 0, and the library method MergeSamples joins them into the reply of
// the whole request, duplicates grouped across ranks. Because a sample depends only on the seed
// and its index, rank 0 then writes exactly the files of a serial `nucleate sample`.
#pragma once

#include <mpi.h>

#include "sample_command.h"

namespace nucleate::mpi {

// The caller for the shared `sample` command on `communicator` (every rank must run the same
// command line). A library refusal on any rank is raised on rank 0 naming the rank; the other
// ranks then return quietly.
cli::SampleCaller DistributedSampleCaller(MPI_Comm communicator);

}  // namespace nucleate::mpi
