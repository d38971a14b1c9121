#include "core/common/thread_count.h"

#include <thread>

#include <gtest/gtest.h>

namespace nucleate {
namespace {

TEST(ResolveThreadCount, ZeroMeansEveryHardwareThread) {
  const int expected = static_cast<int>(std::max(1u, std::thread::hardware_concurrency()));
  EXPECT_EQ(ResolveThreadCount(0), expected);
  EXPECT_EQ(ResolveThreadCount(1), 1);
  EXPECT_EQ(ResolveThreadCount(kMaxThreads), kMaxThreads);
}

TEST(ResolveThreadCount, RefusesNegativeAndAboveTheCeilingNamingTheField) {
  try {
    ResolveThreadCount(-1, "options.threads");
    FAIL() << "-1 accepted";
  } catch (const Error& e) {
    EXPECT_EQ(e.kind(), ErrorKind::kInvalidArgument);
    EXPECT_EQ(e.field(), "options.threads");
  }
  // 50,496,778 threads is what a fuzzer asked of Dedup (tests/fuzz/findings): refused before any
  // per-thread scratch is allocated.
  for (std::int64_t count : {kMaxThreads + 1, std::int64_t{50496778}}) {
    try {
      ResolveThreadCount(count);
      FAIL() << count << " accepted";
    } catch (const Error& e) {
      EXPECT_EQ(e.kind(), ErrorKind::kLimitExceeded);
      EXPECT_EQ(e.field(), "threads");
      EXPECT_NE(e.detail().find("1024"), std::string::npos) << e.detail();
    }
  }
}

}  // namespace
}  // namespace nucleate
