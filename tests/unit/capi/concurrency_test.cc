// Calls are stateless and reentrant: many threads at once give the bytes of serial calls.
#include <thread>
#include <vector>

#include <gtest/gtest.h>

#include "call_helpers.h"

namespace nucleate::test {
namespace {

TEST(Concurrency, MixedCallsFromManyThreadsEqualSerialCalls) {
  const std::vector<std::pair<std::string, std::string>> requests = {
      {"Schedule", R"({"variance":{"kind":"VARIANCE_KIND_COSINE","steps":300}})"},
      {"Schedule", R"({"sigma":{"steps":40}})"},
      {"Schedule", R"({"transition":{"num_classes":5,"steps":20,"include_matrices":true}})"},
      {"DesignSchedule", R"({"steps":200})"},
      {"WrappedNormal", R"({"sigma":0.2,"x":[0.1,0.5,0.9]})"},
      {"Schedule", R"({"variance":{"steps":0}})"},  // errors too must not interfere
  };
  std::vector<CallResult> serial;
  for (const auto& [method, request] : requests) serial.push_back(Call(method, request));

  constexpr int kThreads = 8, kRounds = 12;
  std::vector<int> mismatches(kThreads, 0);
  std::vector<std::thread> threads;
  for (int t = 0; t < kThreads; ++t) {
    threads.emplace_back([&, t] {
      for (int round = 0; round < kRounds; ++round) {
        const size_t i = static_cast<size_t>(t + round) % requests.size();
        const CallResult result = Call(requests[i].first, requests[i].second);
        if (result.status != serial[i].status || result.reply != serial[i].reply ||
            result.message != serial[i].message) {
          ++mismatches[static_cast<size_t>(t)];
        }
      }
    });
  }
  for (std::thread& thread : threads) thread.join();
  for (int t = 0; t < kThreads; ++t) EXPECT_EQ(mismatches[static_cast<size_t>(t)], 0) << t;
}

}  // namespace
}  // namespace nucleate::test
