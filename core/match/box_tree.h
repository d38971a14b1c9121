// Points in six dimensions with inserts and open-box range queries ("every point p with
// |p_k - c_k| < h_k for all k"), in O(log^2 n + hits) typical time per query: the lattice index's
// store (lattice_index.h). A grid would visit up to 2^6 cells per query and scan every point in
// them, mostly outside the box; here empty regions are skipped by k-d tree splits.
//
// Inserts use the logarithmic method: a small unsorted buffer plus static k-d trees, largest
// first; a full buffer is merged with the smaller trees no larger than itself into one new tree,
// so each point is rebuilt O(log n) times in all and about log2(n / kBuffer) trees stand. Every
// query searches each of them, so a caller that inserts in batches and then queries many times
// (dedup: a chunk's representatives, then the next chunk's queries) calls Compact between the two,
// which leaves at most two trees: the largest and one holding everything newer (rebuilt only while
// it stays under a quarter of the largest, else merged into it).
//
// Each tree node keeps the bounding box of its points, and most queries find nothing: a node's
// box, tested in all six dimensions at once, prunes such a query near the root, where the split
// value alone would rule out only one dimension per level.
#pragma once

#include <array>
#include <vector>

namespace nucleate::match {

class BoxTree {
 public:
  using Coordinates = std::array<double, 6>;

  // `scale`: the typical query half width per coordinate. Nodes are split along the coordinate in
  // which their points spread most in these units, so the boxes of small nodes become about as
  // wide as a query in every coordinate, whatever its units.
  explicit BoxTree(const Coordinates& scale) : scale_(scale) {}

  // Not thread-safe against concurrent queries.
  void Insert(int id, const Coordinates& x);

  // Rebuilds the stored points into at most two trees (see above): faster queries, same results.
  // Not thread-safe against concurrent queries.
  void Compact();

  // Appends the id of every point strictly inside the box centre +- half (unordered; an id
  // inserted once is reported once). Read-only: safe from many threads while no Insert runs.
  void Query(const Coordinates& centre, const Coordinates& half, std::vector<int>* out) const;

  bool empty() const { return buffer_.empty() && trees_.empty(); }

 private:
  struct Point {
    int id;
    Coordinates x;
  };
  struct Box {
    Coordinates lo, hi;  // the smallest box holding the node's points (closed)
  };
  // Points of a node = a range; node `node` has children 2 node + 1 and 2 node + 2, splitting its
  // range at the middle, down to leaves of at most kLeaf points.
  struct Tree {
    std::vector<Point> points;
    std::vector<Box> boxes;  // per node, indexed as above
  };
  void Build(Tree* tree, std::size_t node, std::size_t begin, std::size_t end) const;
  // Builds `carry` (points only) into a tree and stores it after the larger ones.
  void Store(Tree carry);
  static void Search(const Tree& tree, std::size_t node, std::size_t begin, std::size_t end,
                     const Coordinates& lo, const Coordinates& hi, std::vector<int>* out);

  Coordinates scale_;
  std::vector<Point> buffer_;
  std::vector<Tree> trees_;  // non-empty, in decreasing size
};

}  // namespace nucleate::match
