// Rows are added one at a time; each addition grows a shortest-path tree over columns using the
// reduced costs cost(i, j) - u[i] - v[j] (kept >= 0 by the potentials) until it reaches a free
// column, then flips the matching along that path. Column 0 is a virtual start: columns are
// 1-based inside, as in the classical formulation.
#include "core/match/hungarian.h"

#include <limits>

namespace nucleate::match {

double SolveAssignment(const double* cost, int n, std::vector<int>* row_to_col,
                       AssignmentWorkspace* w) {
  const double inf = std::numeric_limits<double>::infinity();
  w->u.assign(n + 1, 0.0);
  w->v.assign(n + 1, 0.0);
  w->col_owner.assign(n + 1, 0);  // row (1-based) matched to each column, 0 = free
  w->way.assign(n + 1, 0);
  for (int row = 1; row <= n; ++row) {
    w->col_owner[0] = row;
    int col0 = 0;
    w->min_to.assign(n + 1, inf);
    w->used.assign(n + 1, 0);
    do {
      w->used[col0] = 1;
      const int i0 = w->col_owner[col0];
      double delta = inf;
      int col1 = 0;
      for (int j = 1; j <= n; ++j) {
        if (w->used[j]) continue;
        const double reduced = cost[(i0 - 1) * n + (j - 1)] - w->u[i0] - w->v[j];
        if (reduced < w->min_to[j]) {
          w->min_to[j] = reduced;
          w->way[j] = col0;
        }
        if (w->min_to[j] < delta) {
          delta = w->min_to[j];
          col1 = j;
        }
      }
      for (int j = 0; j <= n; ++j) {
        if (w->used[j]) {
          w->u[w->col_owner[j]] += delta;
          w->v[j] -= delta;
        } else {
          w->min_to[j] -= delta;
        }
      }
      col0 = col1;
    } while (w->col_owner[col0] != 0);
    do {  // flip the augmenting path back to the virtual column
      const int col1 = w->way[col0];
      w->col_owner[col0] = w->col_owner[col1];
      col0 = col1;
    } while (col0 != 0);
  }
  row_to_col->assign(n, -1);
  double total = 0;
  for (int j = 1; j <= n; ++j) {
    const int row = w->col_owner[j] - 1;
    (*row_to_col)[row] = j - 1;
    total += cost[row * n + (j - 1)];
  }
  return total;
}

}  // namespace nucleate::match
