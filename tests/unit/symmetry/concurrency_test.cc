// spglib 2.0.2 is not thread-safe (its error code is a static); nucleate serialises every call.
// Eight threads analysing different structures at once must give exactly the serial results.
#include <thread>

#include <gtest/gtest.h>

#include "core/common/error.h"
#include "core/symmetry/symmetry.h"
#include "tests/unit/symmetry/structure_transforms.h"
#include "tests/unit/symmetry/textbook_structures.h"

namespace nucleate::symmetry::testing {
namespace {

struct Summary {
  int number = 0;
  int hall_number = 0;
  std::vector<char> wyckoffs;
  std::vector<int> equivalent_atoms;
  std::size_t operations = 0;
  std::string error;  // what() of an expected failure
  bool operator==(const Summary& o) const {
    return number == o.number && hall_number == o.hall_number && wyckoffs == o.wyckoffs &&
           equivalent_atoms == o.equivalent_atoms && operations == o.operations &&
           error == o.error;
  }
};

Summary Analyse(const structure::Crystal& c) {
  Summary s;
  try {
    const SymmetryInfo info = AnalyseSymmetry(c, 0.1);
    s.number = info.number;
    s.hall_number = info.hall_number;
    s.wyckoffs = info.wyckoffs;
    s.equivalent_atoms = info.equivalent_atoms;
    s.operations = info.operations.size();
    // Exercise the other entry points too; they share the same mutex.
    s.operations += Symmetrise(c, 0.1).size() + NiggliReduce(c).size();
  } catch (const Error& e) {
    s.error = e.what();
  }
  return s;
}

TEST(Concurrency, EightThreadsMatchSerial) {
  std::vector<structure::Crystal> inputs;
  std::uint64_t seed = 500;
  for (const auto& t : TextbookStructures()) {
    if (t.crystal.size() > 30) continue;  // spinel: the test is about overlap, not size
    inputs.push_back(t.crystal);
    inputs.push_back(Perturb(t.crystal, 0.01, ++seed));
  }
  // Failures go through spglib's error static as well: a cell spglib refuses.
  structure::Crystal bad = inputs[0];
  bad.numbers = {11, 11};  // same species 0.004 A apart: refused
  bad.frac = {Eigen::Vector3d(0.1, 0.1, 0.1), Eigen::Vector3d(0.101, 0.1, 0.1)};
  inputs.push_back(bad);

  std::vector<Summary> serial;
  for (const auto& c : inputs) serial.push_back(Analyse(c));
  ASSERT_FALSE(serial.back().error.empty());

  constexpr int kThreads = 8;
  constexpr int kRounds = 1;
  // Per thread: how many analyses differed from the serial result, and the first that did.
  std::vector<int> mismatches(kThreads, 0);
  std::vector<std::size_t> first_mismatch(kThreads, 0);
  std::vector<std::thread> threads;
  for (int t = 0; t < kThreads; ++t) {
    threads.emplace_back([&, t] {
      // Each thread walks the inputs from a different start so different structures overlap.
      for (int round = 0; round < kRounds; ++round)
        for (std::size_t k = 0; k < inputs.size(); ++k) {
          const std::size_t i = (k + 3 * t) % inputs.size();
          if (!(Analyse(inputs[i]) == serial[i]) && mismatches[t]++ == 0) first_mismatch[t] = i;
        }
    });
  }
  for (auto& th : threads) th.join();
  for (int t = 0; t < kThreads; ++t)
    EXPECT_EQ(mismatches[t], 0) << "thread " << t << ", first at structure " << first_mismatch[t];
}

}  // namespace
}  // namespace nucleate::symmetry::testing
