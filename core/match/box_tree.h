// Points in six dimensions with inserts and open-box range queries ("every point p with
// |p_k - c_k| < h_k for all k"), in O(log^2 n + hits) typical time per query: the lattice index's
// store (lattice_index.h). A grid would visit up to 2^6 cells per query and scan every point in
// them, mostly outside the box; here empty regions are skipped by k-d tree splits.
//
// Inserts use the logarithmic method: a small unsorted buffer plus static k-d trees of sizes
// kBuffer * 2^k; a full buffer is merged with the trees of equal size into one new tree, so each
// point is rebuilt O(log n) times in all.
#pragma once

#include <array>
#include <vector>

namespace nucleate::match {

class BoxTree {
 public:
  using Coordinates = std::array<double, 6>;

  // Not thread-safe against concurrent queries.
  void Insert(int id, const Coordinates& x);

  // Appends the id of every point strictly inside the box centre +- half (unordered; an id
  // inserted once is reported once). Read-only: safe from many threads while no Insert runs.
  void Query(const Coordinates& centre, const Coordinates& half, std::vector<int>* out) const;

  bool empty() const { return buffer_.empty() && trees_.empty(); }

 private:
  struct Point {
    int id;
    Coordinates x;
  };
  using Tree = std::vector<Point>;  // implicit k-d tree: node = middle of a range, split on depth % 6
  static void Build(Tree* tree, std::size_t begin, std::size_t end, int depth);
  static void Search(const Tree& tree, std::size_t begin, std::size_t end, int depth,
                     const Coordinates& lo, const Coordinates& hi, std::vector<int>* out);

  std::vector<Point> buffer_;
  std::vector<Tree> trees_;  // trees_[k]: empty or kBuffer * 2^k points
};

}  // namespace nucleate::match
