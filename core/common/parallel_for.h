// Runs body(i) for i in [0, n) on up to `threads` std::threads, handing out indices one at a time
// (work per index varies a lot: a pairwise match can take microseconds or milliseconds). Every
// index runs even if some throw; afterwards the exception of the LOWEST failing index is
// rethrown, so which error a caller sees does not depend on the thread count or timing.
// A body taking (i, worker) also learns which worker runs it (0 <= worker < max(threads, 1), one
// index at a time per worker), e.g. to use per-worker buffers.
#pragma once

#include <algorithm>
#include <atomic>
#include <cstddef>
#include <exception>
#include <mutex>
#include <thread>
#include <type_traits>
#include <vector>

namespace nucleate {

template <typename Body>
void ParallelFor(std::size_t n, int threads, const Body& body) {
  std::atomic<std::size_t> next{0};
  std::mutex error_mutex;
  std::size_t error_index = n;
  std::exception_ptr error;
  const auto worker = [&](int w) {
    for (std::size_t i = next++; i < n; i = next++) {
      try {
        if constexpr (std::is_invocable_v<const Body&, std::size_t, int>) {
          body(i, w);
        } else {
          body(i);
        }
      } catch (...) {
        std::lock_guard<std::mutex> lock(error_mutex);
        if (i < error_index) {
          error_index = i;
          error = std::current_exception();
        }
      }
    }
  };
  const std::size_t extra =
      std::min<std::size_t>(n > 0 ? n - 1 : 0, static_cast<std::size_t>(std::max(threads, 1) - 1));
  std::vector<std::thread> pool;
  pool.reserve(extra);
  for (std::size_t t = 0; t < extra; ++t) pool.emplace_back(worker, static_cast<int>(t + 1));
  worker(0);
  for (auto& t : pool) t.join();
  if (error) std::rethrow_exception(error);
}

}  // namespace nucleate
