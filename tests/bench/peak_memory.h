// The process's peak resident memory so far, for the benchmarks' "peak memory" figures.
#pragma once

#include <sys/resource.h>

namespace nucleate::bench {

inline double PeakMemoryMb() {
  rusage usage{};
  getrusage(RUSAGE_SELF, &usage);
  return usage.ru_maxrss / 1024.0;  // Linux reports kilobytes
}

}  // namespace nucleate::bench
