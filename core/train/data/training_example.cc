#include "core/train/data/training_example.h"

#include <utility>

namespace nucleate::train::data {

void DatasetReport::AddProblem(std::string source, std::string reason) {
  if (problems.size() < kMaxListedProblems) {
    problems.push_back({std::move(source), std::move(reason)});
  } else {
    ++problems_not_listed;
  }
}

void DatasetReport::AddWarning(std::string warning) {
  if (warnings.size() < kMaxListedProblems) {
    warnings.push_back(std::move(warning));
  } else {
    ++warnings_not_listed;
  }
}

}  // namespace nucleate::train::data
