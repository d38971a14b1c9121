#include "core/match/box_tree.h"

#include <algorithm>

namespace nucleate::match {
namespace {

// Buffer size: small enough that scanning it costs less than a tree descent.
constexpr std::size_t kBuffer = 32;

bool Inside(const BoxTree::Coordinates& x, const BoxTree::Coordinates& lo,
            const BoxTree::Coordinates& hi) {
  for (int k = 0; k < 6; ++k) {
    if (!(x[k] > lo[k] && x[k] < hi[k])) return false;
  }
  return true;
}

}  // namespace

void BoxTree::Insert(int id, const Coordinates& x) {
  buffer_.push_back({id, x});
  if (buffer_.size() < kBuffer) return;
  Tree carry;
  carry.swap(buffer_);
  std::size_t k = 0;
  for (; k < trees_.size() && !trees_[k].empty(); ++k) {
    carry.insert(carry.end(), trees_[k].begin(), trees_[k].end());
    trees_[k].clear();
  }
  if (k == trees_.size()) trees_.emplace_back();
  Build(&carry, 0, carry.size(), 0);
  trees_[k].swap(carry);
}

void BoxTree::Build(Tree* tree, std::size_t begin, std::size_t end, int depth) {
  if (end - begin < 2) return;
  const std::size_t mid = begin + (end - begin) / 2;
  const int d = depth % 6;
  std::nth_element(tree->begin() + begin, tree->begin() + mid, tree->begin() + end,
                   [d](const Point& p, const Point& q) { return p.x[d] < q.x[d]; });
  Build(tree, begin, mid, depth + 1);
  Build(tree, mid + 1, end, depth + 1);
}

void BoxTree::Search(const Tree& tree, std::size_t begin, std::size_t end, int depth,
                     const Coordinates& lo, const Coordinates& hi, std::vector<int>* out) {
  while (begin < end) {
    const std::size_t mid = begin + (end - begin) / 2;
    const int d = depth % 6;
    const Point& p = tree[mid];
    if (Inside(p.x, lo, hi)) out->push_back(p.id);
    // Left of mid: coordinate d <= p.x[d]; right: >= p.x[d].
    const bool left = lo[d] < p.x[d], right = hi[d] > p.x[d];
    ++depth;
    if (left && right) {
      Search(tree, begin, mid, depth, lo, hi, out);
      begin = mid + 1;
    } else if (left) {
      end = mid;
    } else if (right) {
      begin = mid + 1;
    } else {
      return;
    }
  }
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
  for (const Tree& tree : trees_) Search(tree, 0, tree.size(), 0, lo, hi, out);
}

}  // namespace nucleate::match
