// Calls are stateless and reentrant (nucleate.h): many threads calling mixed methods at once get
// the bytes of serial calls. The requests are those of the conformance suite (every method but
// Train, which writes files), in both encodings, so each method's real work runs concurrently
// with every other's: sampling and assessment on the committed tiny model, checks with spglib
// (not thread-safe itself: core serialises it), matching, dedup with its own worker threads.
// Built a second time under ThreadSanitizer in CI (scripts/run-tests.sh).
#include <algorithm>
#include <filesystem>
#include <fstream>
#include <iterator>
#include <memory>
#include <string>
#include <thread>
#include <vector>

#include <google/protobuf/descriptor.h>
#include <google/protobuf/message.h>
#include <google/protobuf/util/json_util.h>
#include <gtest/gtest.h>

#include "nucleate/v1/service.pb.h"
#include "tests/unit/capi/call_helpers.h"

namespace nucleate::test {
namespace {

namespace fs = std::filesystem;
namespace pb = google::protobuf;

struct Job {
  std::string name;  // the conformance case, and the encoding
  std::string method;
  std::string request;
  int32_t encoding;
};

std::string ReadFile(const fs::path& path) {
  std::ifstream in(path, std::ios::binary);
  return {std::istreambuf_iterator<char>(in), std::istreambuf_iterator<char>()};
}

std::string Trimmed(std::string text) {
  while (!text.empty() && (text.back() == '\n' || text.back() == ' ')) text.pop_back();
  return text;
}

// The JSON request as binary protobuf, through the method's request type in service.proto.
std::string ToBinary(const std::string& method, const std::string& json) {
  const pb::MethodDescriptor* rpc = pb::DescriptorPool::generated_pool()
                                        ->FindServiceByName("nucleate.v1.Nucleate")
                                        ->FindMethodByName(method);
  if (rpc == nullptr) return json;
  std::unique_ptr<pb::Message> message(
      pb::MessageFactory::generated_factory()->GetPrototype(rpc->input_type())->New());
  // A request that does not parse (the malformed-JSON cases) is sent as it is.
  if (!pb::util::JsonStringToMessage(json, message.get()).ok()) return json;
  return message->SerializeAsString();
}

std::vector<Job> ConformanceJobs() {
  std::vector<Job> jobs;
  std::vector<fs::path> cases;
  for (const auto& entry : fs::directory_iterator("cases")) cases.push_back(entry.path());
  std::sort(cases.begin(), cases.end());
  for (const fs::path& folder : cases) {
    const std::string method = Trimmed(ReadFile(folder / "method"));
    if (method == "Train") continue;  // writes its model file: not a read-only call
    const std::string json = ReadFile(folder / "request.json");
    const std::string name = folder.filename().string();
    jobs.push_back({name + " (JSON)", method, json, NUCLEATE_ENCODING_JSON});
    jobs.push_back({name + " (binary)", method, ToBinary(method, json), NUCLEATE_ENCODING_BINARY});
  }
  return jobs;
}

TEST(Concurrency, MixedMethodsFromManyThreadsEqualSerialCalls) {
  const std::vector<Job> jobs = ConformanceJobs();
  ASSERT_GE(jobs.size(), 100u) << "run from tests/conformance, where the cases are";
  std::vector<CallResult> serial;
  for (const Job& job : jobs) serial.push_back(Call(job.method, job.request, job.encoding));

  // Each thread runs every job, starting at a different one, so at any moment different methods
  // run side by side.
  constexpr int kThreads = 6;
  std::vector<std::vector<std::string>> differences(kThreads);
  std::vector<std::thread> threads;
  for (int t = 0; t < kThreads; ++t) {
    threads.emplace_back([&, t] {
      for (std::size_t k = 0; k < jobs.size(); ++k) {
        const std::size_t i = (k + static_cast<std::size_t>(t) * jobs.size() / kThreads) % jobs.size();
        const CallResult r = Call(jobs[i].method, jobs[i].request, jobs[i].encoding);
        if (r.status != serial[i].status || r.reply != serial[i].reply ||
            r.message != serial[i].message) {
          differences[static_cast<std::size_t>(t)].push_back(jobs[i].name);
        }
      }
    });
  }
  for (std::thread& thread : threads) thread.join();
  for (int t = 0; t < kThreads; ++t) {
    EXPECT_TRUE(differences[t].empty())
        << "thread " << t << " got other bytes than a serial call for " << differences[t].size()
        << " jobs, first " << differences[t].front();
  }
  RecordProperty("jobs", static_cast<int>(jobs.size()));
}

}  // namespace
}  // namespace nucleate::test
