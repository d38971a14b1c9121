// Minimum-cost perfect assignment of a square cost matrix (the Hungarian method in its
// shortest-augmenting-path form with row and column potentials, O(n^3)).
#pragma once

#include <vector>

namespace nucleate::match {

// Reusable buffers so the matcher's inner loop does not allocate.
struct AssignmentWorkspace {
  std::vector<double> u, v, min_to;
  std::vector<int> col_owner, way;
  std::vector<char> used;
};

// cost: n x n, row-major, finite. Fills row_to_col (size n) with the column given to each row and
// returns the total cost. Exact: the result is a minimum over all n! assignments.
double SolveAssignment(const double* cost, int n, std::vector<int>* row_to_col,
                       AssignmentWorkspace* workspace);

}  // namespace nucleate::match
