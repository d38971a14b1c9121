#include "core/match/box_tree.h"

#include <algorithm>

#include <Eigen/Dense>

namespace nucleate::match {
namespace {

// Buffer size: small enough that scanning it costs less than a tree descent.
constexpr std::size_t kBuffer = 8;
// Leaf size: below this many points, testing each costs less than descending further.
constexpr std::size_t kLeaf = 8;

// Both tests take the extreme of the coordinate differences and compare once, in packed
// arithmetic and with one branch rather than up to twelve (which the predictor would mostly
// miss). They decide exactly as the comparisons would: the rounded difference of two finite
// doubles has the sign of the exact difference (a < b iff b - a > 0).
using Row = Eigen::Array<double, 6, 1>;

inline bool Inside(const BoxTree::Coordinates& x, const BoxTree::Coordinates& lo,
                   const BoxTree::Coordinates& hi) {
  const Eigen::Map<const Row> p(x.data()), qlo(lo.data()), qhi(hi.data());
  return (p - qlo).min(qhi - p).minCoeff() > 0;
}

// Whether no point of a node with closed bounding box [box_lo, box_hi] can lie strictly inside
// the open query box (lo, hi): box_hi <= lo or box_lo >= hi in some coordinate.
inline bool Disjoint(const BoxTree::Coordinates& box_lo, const BoxTree::Coordinates& box_hi,
                     const BoxTree::Coordinates& lo, const BoxTree::Coordinates& hi) {
  const Eigen::Map<const Row> blo(box_lo.data()), bhi(box_hi.data()), qlo(lo.data()),
      qhi(hi.data());
  return (qlo - bhi).max(blo - qhi).maxCoeff() >= 0;
}

// Nodes of a tree over `n` points: enough for the deepest leaf's index.
std::size_t NodeCount(std::size_t n) {
  std::size_t count = 1, leaves = 1;
  while (n > kLeaf * leaves) {
    leaves *= 2;
    count += leaves;
  }
  return count;
}

}  // namespace

void BoxTree::Insert(int id, const Coordinates& x) {
  buffer_.push_back({id, x});
  if (buffer_.size() < kBuffer) return;
  Tree carry;
  carry.points.swap(buffer_);
  while (!trees_.empty() && trees_.back().points.size() <= carry.points.size()) {
    carry.points.insert(carry.points.end(), trees_.back().points.begin(),
                        trees_.back().points.end());
    trees_.pop_back();
  }
  Store(std::move(carry));
}

void BoxTree::Compact() {
  if (buffer_.empty() && trees_.size() <= 2) return;
  Tree carry;
  carry.points.swap(buffer_);
  while (trees_.size() > 1) {
    carry.points.insert(carry.points.end(), trees_.back().points.begin(),
                        trees_.back().points.end());
    trees_.pop_back();
  }
  if (!trees_.empty() && carry.points.size() * 4 > trees_[0].points.size()) {
    carry.points.insert(carry.points.end(), trees_[0].points.begin(), trees_[0].points.end());
    trees_.pop_back();
  }
  if (!carry.points.empty()) Store(std::move(carry));
}

void BoxTree::Store(Tree carry) {
  carry.boxes.resize(NodeCount(carry.points.size()));
  Build(&carry, 0, 0, carry.points.size());
  trees_.push_back(std::move(carry));
}

void BoxTree::Build(Tree* tree, std::size_t node, std::size_t begin, std::size_t end) const {
  Box& box = tree->boxes[node];
  box.lo = box.hi = tree->points[begin].x;
  for (std::size_t i = begin + 1; i < end; ++i) {
    for (int k = 0; k < 6; ++k) {
      box.lo[k] = std::min(box.lo[k], tree->points[i].x[k]);
      box.hi[k] = std::max(box.hi[k], tree->points[i].x[k]);
    }
  }
  if (end - begin <= kLeaf) return;
  const std::size_t mid = begin + (end - begin) / 2;
  int d = 0;
  for (int k = 1; k < 6; ++k) {
    if ((box.hi[k] - box.lo[k]) / scale_[k] > (box.hi[d] - box.lo[d]) / scale_[d]) d = k;
  }
  std::nth_element(tree->points.begin() + begin, tree->points.begin() + mid,
                   tree->points.begin() + end,
                   [d](const Point& p, const Point& q) { return p.x[d] < q.x[d]; });
  Build(tree, 2 * node + 1, begin, mid);
  Build(tree, 2 * node + 2, mid, end);
}

void BoxTree::Search(const Tree& tree, std::size_t node, std::size_t begin, std::size_t end,
                     const Coordinates& lo, const Coordinates& hi, std::vector<int>* out) {
  const Box& box = tree.boxes[node];
  if (Disjoint(box.lo, box.hi, lo, hi)) return;
  if (end - begin <= kLeaf) {
    for (std::size_t i = begin; i < end; ++i) {
      if (Inside(tree.points[i].x, lo, hi)) out->push_back(tree.points[i].id);
    }
    return;
  }
  const std::size_t mid = begin + (end - begin) / 2;
  Search(tree, 2 * node + 1, begin, mid, lo, hi, out);
  Search(tree, 2 * node + 2, mid, end, lo, hi, out);
}

void BoxTree::Query(const Coordinates& centre, const Coordinates& half,
                    std::vector<int>* out) const {
  Coordinates lo, hi;
  for (int k = 0; k < 6; ++k) {
    lo[k] = centre[k] - half[k];
    hi[k] = centre[k] + half[k];
  }
  for (const Point& p : buffer_) {
    if (Inside(p.x, lo, hi)) out->push_back(p.id);
  }
  for (const Tree& tree : trees_) Search(tree, 0, 0, tree.points.size(), lo, hi, out);
}

}  // namespace nucleate::match
