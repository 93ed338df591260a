#include "solver/supernodal_solve.hpp"

#include <omp.h>

#include <algorithm>
#include <numeric>

namespace aquiledger {

namespace {

/// Splits stop once the largest group holds at most this much more than the mean, or after
/// max_subtree_splits (each split moves one supernode, a separator, into the serial part).
constexpr double group_balance = 1.03;
constexpr int max_subtree_splits = 256;

/// The largest-first assignment of subtree weights to `groups` bins (LPT rule): bin of each.
std::vector<int> largest_first_bins(const std::vector<double>& weight, int groups,
                                    double& largest_bin) {
  std::vector<int> order(weight.size());
  std::iota(order.begin(), order.end(), 0);
  std::sort(order.begin(), order.end(), [&](int a, int b) { return weight[a] > weight[b]; });
  std::vector<double> load(static_cast<std::size_t>(groups), 0.0);
  std::vector<int> bin(weight.size(), 0);
  for (int k : order) {
    const auto lightest = std::min_element(load.begin(), load.end()) - load.begin();
    bin[static_cast<std::size_t>(k)] = static_cast<int>(lightest);
    load[static_cast<std::size_t>(lightest)] += weight[static_cast<std::size_t>(k)];
  }
  largest_bin = *std::max_element(load.begin(), load.end());
  return bin;
}

}  // namespace

SupernodalSolve::SupernodalSolve(const SupernodalFactor& f, int threads) {
  const int ns = f.n_supernodes;
  // Parent of each supernode: the supernode holding its first row below its own columns.
  std::vector<int> supernode_of(static_cast<std::size_t>(f.n));
  for (int s = 0; s < ns; ++s)
    for (int c = f.first_column[s]; c < f.first_column[s + 1]; ++c)
      supernode_of[static_cast<std::size_t>(c)] = s;
  std::vector<int> parent(static_cast<std::size_t>(ns), -1);
  std::vector<double> weight(static_cast<std::size_t>(ns));  // entries of the subtree
  double total = 0.0;
  for (int s = 0; s < ns; ++s) {
    const int n_cols = f.first_column[s + 1] - f.first_column[s];
    const int n_rows = f.row_start[s + 1] - f.row_start[s];
    max_rows_ = std::max(max_rows_, n_rows);
    if (n_rows > n_cols)
      parent[static_cast<std::size_t>(s)] =
          supernode_of[static_cast<std::size_t>(f.rows[f.row_start[s] + n_cols])];
    const double own = static_cast<double>(n_rows) * n_cols;
    total += own;
    weight[static_cast<std::size_t>(s)] += own;
    // Children come before their parent (CHOLMOD's topological order), so s is complete here.
    if (parent[static_cast<std::size_t>(s)] > s) {
      weight[static_cast<std::size_t>(parent[static_cast<std::size_t>(s)])] +=
          weight[static_cast<std::size_t>(s)];
    } else if (parent[static_cast<std::size_t>(s)] >= 0) {
      threads = 1;  // not a topological order: no split (never seen; kept safe)
    }
  }
  supernode_of = {};
  std::vector<int> child_start(static_cast<std::size_t>(ns) + 1, 0), children;
  for (int s = 0; s < ns; ++s)
    if (parent[static_cast<std::size_t>(s)] >= 0)
      ++child_start[static_cast<std::size_t>(parent[static_cast<std::size_t>(s)]) + 1];
  std::partial_sum(child_start.begin(), child_start.end(), child_start.begin());
  children.resize(static_cast<std::size_t>(child_start.back()));
  {
    std::vector<int> next(child_start.begin(), child_start.end() - 1);
    for (int s = 0; s < ns; ++s)
      if (parent[static_cast<std::size_t>(s)] >= 0)
        children[static_cast<std::size_t>(
            next[static_cast<std::size_t>(parent[static_cast<std::size_t>(s)])]++)] = s;
  }

  // Subtree roots, starting from the forest's roots; the heaviest is split while the groups
  // are out of balance. Split supernodes go to the serial part.
  std::vector<char> serial(static_cast<std::size_t>(ns), 0);
  std::vector<int> roots;
  for (int s = 0; s < ns; ++s)
    if (parent[static_cast<std::size_t>(s)] < 0) roots.push_back(s);
  std::vector<int> bin(roots.size(), 0);
  const int n_groups = std::max(1, threads);
  for (int split = 0;; ++split) {
    std::vector<double> w;
    for (int r : roots) w.push_back(weight[static_cast<std::size_t>(r)]);
    double largest = 0.0;
    bin = largest_first_bins(w, n_groups, largest);
    double in_groups = std::accumulate(w.begin(), w.end(), 0.0);
    if (n_groups == 1 || largest <= group_balance * in_groups / n_groups ||
        split == max_subtree_splits || roots.empty())
      break;
    const auto heaviest = std::max_element(w.begin(), w.end()) - w.begin();
    const int r = roots[static_cast<std::size_t>(heaviest)];
    roots.erase(roots.begin() + heaviest);
    serial[static_cast<std::size_t>(r)] = 1;
    for (int k = child_start[static_cast<std::size_t>(r)];
         k < child_start[static_cast<std::size_t>(r) + 1]; ++k)
      roots.push_back(children[static_cast<std::size_t>(k)]);
  }
  if (n_groups == 1) {
    roots.clear();
    std::fill(serial.begin(), serial.end(), 1);
  }

  // Owner group of every supernode: that of its subtree's root (parents first: descending).
  std::vector<int> group_of(static_cast<std::size_t>(ns), -1), end_of(static_cast<std::size_t>(ns));
  for (std::size_t k = 0; k < roots.size(); ++k) {
    group_of[static_cast<std::size_t>(roots[k])] = bin[k];
    end_of[static_cast<std::size_t>(roots[k])] = f.first_column[roots[k] + 1] - 1;
  }
  for (int s = ns - 1; s >= 0; --s) {
    const int p = parent[static_cast<std::size_t>(s)];
    if (serial[static_cast<std::size_t>(s)] || group_of[static_cast<std::size_t>(s)] >= 0 || p < 0)
      continue;
    group_of[static_cast<std::size_t>(s)] = group_of[static_cast<std::size_t>(p)];
    end_of[static_cast<std::size_t>(s)] = end_of[static_cast<std::size_t>(p)];
  }
  groups_.assign(roots.empty() ? 0 : static_cast<std::size_t>(n_groups), {});
  double serial_weight = 0.0;
  for (int s = 0; s < ns; ++s) {
    const int g = group_of[static_cast<std::size_t>(s)];
    if (g >= 0) {
      groups_[static_cast<std::size_t>(g)].push_back({s, end_of[static_cast<std::size_t>(s)]});
      continue;
    }
    serial_.push_back(s);
    serial_first_.push_back(f.first_column[s]);
    serial_offset_.push_back(serial_columns_);
    serial_columns_ += f.first_column[s + 1] - f.first_column[s];
    serial_weight += static_cast<double>(f.row_start[s + 1] - f.row_start[s]) *
                     (f.first_column[s + 1] - f.first_column[s]);
  }
  serial_share_ = total > 0.0 ? serial_weight / total : 1.0;
  y_.resize(static_cast<std::size_t>(f.n));
  work_.assign(std::max<std::size_t>(1, groups_.size()),
               std::vector<double>(static_cast<std::size_t>(max_rows_)));
  delta_.assign(groups_.size(), std::vector<double>(static_cast<std::size_t>(serial_columns_)));
}

int SupernodalSolve::serial_position(int c) const {
  const auto k =
      std::upper_bound(serial_first_.begin(), serial_first_.end(), c) - serial_first_.begin() - 1;
  return serial_offset_[static_cast<std::size_t>(k)] + c -
         serial_first_[static_cast<std::size_t>(k)];
}

/// Solves the supernode's diagonal block and subtracts its below-diagonal block's product
/// from the rows below: into y where the row is the group's own (or every row, when
/// subtree_end is the last column), into delta (serial positions) beyond subtree_end.
void SupernodalSolve::forward(const SupernodalFactor& f, int s, int subtree_end, double* w,
                              double* delta) {
  const int k1 = f.first_column[s];
  const int n_cols = f.first_column[s + 1] - k1;
  const int* rows = f.rows + f.row_start[s];
  const int n_rows = f.row_start[s + 1] - f.row_start[s];
  const double* l = f.values + f.value_start[s];
  double* y = y_.data();
  for (int i = 0; i < n_cols; ++i) w[i] = y[k1 + i];
  std::fill(w + n_cols, w + n_rows, 0.0);
  for (int j = 0; j < n_cols; ++j) {
    const double* column = l + static_cast<std::ptrdiff_t>(j) * n_rows;
    const double wj = w[j] / column[j];
    w[j] = wj;
#pragma omp simd
    for (int i = j + 1; i < n_rows; ++i) w[i] -= column[i] * wj;
  }
  for (int i = 0; i < n_cols; ++i) y[k1 + i] = w[i];
  for (int i = n_cols; i < n_rows; ++i) {
    const int r = rows[i];
    if (r <= subtree_end)
      y[r] += w[i];
    else
      delta[serial_position(r)] += w[i];
  }
}

/// Subtracts the below-diagonal block's transpose times the (final) rows below, then solves
/// the transposed diagonal block.
void SupernodalSolve::backward(const SupernodalFactor& f, int s, double* w) {
  const int k1 = f.first_column[s];
  const int n_cols = f.first_column[s + 1] - k1;
  const int* rows = f.rows + f.row_start[s];
  const int n_rows = f.row_start[s + 1] - f.row_start[s];
  const double* l = f.values + f.value_start[s];
  const double* y = y_.data();
  for (int i = 0; i < n_rows; ++i) w[i] = y[rows[i]];
  for (int j = n_cols - 1; j >= 0; --j) {
    const double* column = l + static_cast<std::ptrdiff_t>(j) * n_rows;
    double sum = 0.0;
#pragma omp simd reduction(+ : sum)
    for (int i = j + 1; i < n_rows; ++i) sum += column[i] * w[i];
    w[j] = (w[j] - sum) / column[j];
  }
  std::copy(w, w + n_cols, y_.data() + k1);
}

void SupernodalSolve::solve(const SupernodalFactor& f, const double* b, double* x) {
  const int n = f.n;
  double* y = y_.data();
  const int* p = f.permutation;
  const int n_groups = static_cast<int>(groups_.size());
  const int last = n - 1;
#pragma omp parallel num_threads(std::max(1, n_groups))
  {
#pragma omp for schedule(static)
    for (int k = 0; k < n; ++k) y[k] = b[p[k]];
    // Forward: the groups' subtrees side by side, their updates of the serial part apart.
    const int stride = omp_get_num_threads();
    for (int g = omp_get_thread_num(); g < n_groups; g += stride)
      for (const Entry& e : groups_[static_cast<std::size_t>(g)])
        forward(f, e.supernode, e.subtree_end, work_[static_cast<std::size_t>(g)].data(),
                delta_[static_cast<std::size_t>(g)].data());
#pragma omp barrier
#pragma omp single
    {
      for (std::vector<double>& d : delta_) {
        for (std::size_t k = 0; k < serial_.size(); ++k) {
          const int c0 = serial_first_[k], c1 = f.first_column[serial_[k] + 1];
          double* dk = d.data() + serial_offset_[k];
          for (int c = c0; c < c1; ++c) y[c] += dk[c - c0];
        }
        std::fill(d.begin(), d.end(), 0.0);
      }
      double* w = work_.front().data();
      for (int s : serial_) forward(f, s, last, w, nullptr);
      for (auto it = serial_.rbegin(); it != serial_.rend(); ++it) backward(f, *it, w);
    }
    // Backward: the serial part is final; each group reads it and writes its own columns.
    for (int g = omp_get_thread_num(); g < n_groups; g += stride) {
      const std::vector<Entry>& entries = groups_[static_cast<std::size_t>(g)];
      for (auto it = entries.rbegin(); it != entries.rend(); ++it)
        backward(f, it->supernode, work_[static_cast<std::size_t>(g)].data());
    }
#pragma omp barrier
#pragma omp for schedule(static)
    for (int k = 0; k < n; ++k) x[p[k]] = y[k];
  }
}

}  // namespace aquiledger
