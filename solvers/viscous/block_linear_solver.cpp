// The Newton step's linear solve through the block lower-triangular boundary-layer part and the
// capacitance matrix of the edge-velocity coupling (see block_linear_solver.h).
#include "solvers/viscous/block_linear_solver.h"

#include <algorithm>
#include <cmath>

namespace fulmar::viscous::detail {

NewtonScratch& newton_scratch() {
  thread_local NewtonScratch scratch;
  return scratch;
}

Eigen::Matrix3d block_inverse(Eigen::Matrix3d a) {
  Eigen::Matrix3d x = Eigen::Matrix3d::Identity();
  for (int k = 0; k < 3; ++k) {
    int best = k;
    for (int i = k + 1; i < 3; ++i)
      if (std::abs(a(i, k)) > std::abs(a(best, k))) best = i;
    a.row(k).swap(a.row(best));
    x.row(k).swap(x.row(best));
    for (int i = k + 1; i < 3; ++i) {
      const double f = a(i, k) / a(k, k);
      if (f == 0.0) continue;
      a.row(i) -= f * a.row(k);
      x.row(i) -= f * x.row(k);
    }
  }
  for (int k = 2; k >= 0; --k) {
    for (int c = k + 1; c < 3; ++c) x.row(k) -= a(k, c) * x.row(c);
    x.row(k) /= a(k, k);
  }
  return x;
}

BlockLinearSystem::BlockLinearSystem(int stations) : n_(stations) {
  const int n3 = 3 * n_;
  g_count_.assign(static_cast<std::size_t>(n3), 0);
  g_col_.assign(static_cast<std::size_t>(kSpeedTerms * n3), 0);
  g_val_.assign(static_cast<std::size_t>(kSpeedTerms * n3), 0.0);
  g_spill_.reserve(16);
  blocks_.resize(static_cast<std::size_t>(kBlocks * n_));
  block_station_.assign(static_cast<std::size_t>(kBlocks * n_), -1);
  block_count_.assign(static_cast<std::size_t>(n_), 0);
}

void BlockLinearSystem::clear() {
  std::fill(g_count_.begin(), g_count_.end(), 0);
  g_spill_.clear();
  std::fill(block_count_.begin(), block_count_.end(), 0);
}

void BlockLinearSystem::add_speed(int r, int i, double coef) {
  const std::size_t base = static_cast<std::size_t>(kSpeedTerms * r);
  int& count = g_count_[static_cast<std::size_t>(r)];
  for (int k = 0; k < count; ++k)
    if (g_col_[base + k] == i) {
      g_val_[base + k] += coef;
      return;
    }
  if (count < kSpeedTerms) {
    g_col_[base + count] = i;
    g_val_[base + count] = coef;
    ++count;
    return;
  }
  g_spill_.push_back({r, i, coef});
}

Eigen::Matrix3d& BlockLinearSystem::block(int row, int col) {
  int& count = block_count_[static_cast<std::size_t>(row)];
  for (int k = 0; k < count; ++k)
    if (block_station_[static_cast<std::size_t>(kBlocks * row + k)] == col)
      return blocks_[static_cast<std::size_t>(kBlocks * row + k)];
  const std::size_t k = static_cast<std::size_t>(kBlocks * row + std::min(count, kBlocks - 1));
  count = std::min(count + 1, kBlocks);
  block_station_[k] = col;
  blocks_[k].setZero();
  return blocks_[k];
}

// With W = L^-1 G D (3 #stations by #stations) and z0 = -L^-1 r, the mass-defect part dm of
// the step solves (I + P W) dm = P z0, and then L dx = -r - G D dm gives the whole step. G is
// sparse, so G D costs O(n^2) (a few rows of D per equation) and the block solve through L is
// O(n^2); only the LU of the #stations-square capacitance matrix is O(n^3). W is formed station
// by station in marching order and only its m rows are kept (in the capacitance matrix): the
// rows of a station are needed only until the stations downstream that see it are done, so
// the work stays in a few small buffers instead of a 3 #stations by #stations + 1 matrix
// streamed through memory three times.
bool BlockLinearSystem::solve(const RowMatrix& d, const std::vector<int>& order,
                              const Eigen::VectorXd& res, Eigen::VectorXd& step) {
  const int n = n_;
  Eigen::MatrixXd& cap_t = ws_.cap_t;
  Eigen::VectorXd &dm = ws_.dm, &dm_solved = ws_.dm_solved, &z = ws_.z;
  step.resize(3 * n);
  cap_t.resize(n, n);
  dm.resize(n);
  a_inv_.resize(static_cast<std::size_t>(n));
  bool singular = false;  // no elimination through L: the dense fallback below solves the step
  // Where each station's rows are last needed (position in order; -1: by none).
  last_use_.assign(static_cast<std::size_t>(n), -1);
  for (int pos = 0; pos < n; ++pos) {
    const int s = order[static_cast<std::size_t>(pos)];
    for (int k = 0; k < block_count_[static_cast<std::size_t>(s)]; ++k) {
      const int j = block_station_[static_cast<std::size_t>(kBlocks * s + k)];
      if (j != s) last_use_[static_cast<std::size_t>(j)] = pos;
    }
  }
  slot_of_.assign(static_cast<std::size_t>(n), -1);
  free_slots_.clear();
  int slots_used = 0;
  for (int pos = 0; pos < n && !singular; ++pos) {
    const int s = order[static_cast<std::size_t>(pos)];
    int slot;
    if (!free_slots_.empty()) {
      slot = free_slots_.back();
      free_slots_.pop_back();
    } else {
      slot = slots_used++;
      if (static_cast<int>(ws_.w_rows.size()) < slots_used) ws_.w_rows.emplace_back();
      ws_.w_rows[static_cast<std::size_t>(slot)].resize(3, n + 1);
    }
    slot_of_[static_cast<std::size_t>(s)] = slot;
    BlockRows& x = ws_.w_rows[static_cast<std::size_t>(slot)];
    // The station's rows of [-r, G D] into b.
    BlockRows& b = ws_.block_rhs;
    b.resize(3, n + 1);
    for (int e = 0; e < 3; ++e) {
      const int r = 3 * s + e;
      b(e, 0) = -res(r);
      const std::size_t base = static_cast<std::size_t>(kSpeedTerms * r);
      auto w = b.row(e).tail(n);
      const double* g = &g_val_[base];
      auto d_row = [&](int k) { return d.row(g_col_[base + static_cast<std::size_t>(k)]); };
      // One pass over the row whatever the number of terms (kSpeedTerms).
      static_assert(kSpeedTerms == 4);
      switch (g_count_[static_cast<std::size_t>(r)]) {
        case 0:
          w.setZero();
          break;
        case 1:
          w = g[0] * d_row(0);
          break;
        case 2:
          w = g[0] * d_row(0) + g[1] * d_row(1);
          break;
        case 3:
          w = g[0] * d_row(0) + g[1] * d_row(1) + g[2] * d_row(2);
          break;
        default:
          w = g[0] * d_row(0) + g[1] * d_row(1) + g[2] * d_row(2) + g[3] * d_row(3);
      }
    }
    for (const SpeedTerm& t : g_spill_)
      if (t.row / 3 == s) b.row(t.row % 3).tail(n) += t.value * d.row(t.col);
    // X_s = A^-1 (B_s - sum_k M_k X_k) over the off-diagonal blocks M_k.
    const int count = block_count_[static_cast<std::size_t>(s)];
    int self = -1;
    for (int k = 0; k < count; ++k)
      if (block_station_[static_cast<std::size_t>(kBlocks * s + k)] == s) self = k;
    if (self < 0) {
      singular = true;
      break;
    }
    Eigen::Matrix3d& a_inv = a_inv_[static_cast<std::size_t>(s)];
    a_inv = block_inverse(blocks_[static_cast<std::size_t>(kBlocks * s + self)]);
    if (!a_inv.allFinite()) {
      singular = true;
      break;
    }
    for (int k = 0; k < count && !singular; ++k) {
      if (k == self) continue;
      const int j = block_station_[static_cast<std::size_t>(kBlocks * s + k)];
      // A block on a station not yet eliminated would mean L is not lower triangular in the
      // marching order: not expected; the dense fallback solves such a system.
      if (slot_of_[static_cast<std::size_t>(j)] < 0) {
        singular = true;
        break;
      }
      b.noalias() -= blocks_[static_cast<std::size_t>(kBlocks * s + k)] *
                     ws_.w_rows[static_cast<std::size_t>(slot_of_[j])];
    }
    if (singular) break;
    x.noalias() = a_inv * b;
    // The capacitance matrix is stored transposed (its columns are these rows, contiguous).
    cap_t.col(s) = x.row(2).tail(n).transpose();
    dm(s) = x(2, 0);
    // Rows no station downstream needs any more free their buffers.
    for (int k = 0; k < count; ++k) {
      const int j = block_station_[static_cast<std::size_t>(kBlocks * s + k)];
      if (j != s && last_use_[static_cast<std::size_t>(j)] == pos &&
          slot_of_[static_cast<std::size_t>(j)] >= 0) {
        free_slots_.push_back(slot_of_[static_cast<std::size_t>(j)]);
        slot_of_[static_cast<std::size_t>(j)] = -1;
      }
    }
    if (last_use_[static_cast<std::size_t>(s)] < 0) {
      free_slots_.push_back(slot);
      slot_of_[static_cast<std::size_t>(s)] = -1;
    }
  }
  if (singular) {
    step.setConstant(NAN);
  } else {
    cap_t.diagonal().array() += 1.0;
    solve_capacitance();
    // L dx = -r - G D dm, one column through the blocks.
    due_scratch_.noalias() = d * dm_solved;
    z = -res;
    for_each_speed_term([&](int r, int col, double value) { z(r) -= value * due_scratch_(col); });
    for (int s : order) {
      const int count = block_count_[static_cast<std::size_t>(s)];
      Eigen::Vector3d v = z.segment<3>(3 * s);
      for (int k = 0; k < count; ++k) {
        const int j = block_station_[static_cast<std::size_t>(kBlocks * s + k)];
        if (j != s) v -= blocks_[static_cast<std::size_t>(kBlocks * s + k)] * z.segment<3>(3 * j);
      }
      z.segment<3>(3 * s) = a_inv_[static_cast<std::size_t>(s)] * v;
    }
    for (int i = 0; i < n; ++i) {
      step(i) = z(3 * i);
      step(n + i) = z(3 * i + 1);
      step(2 * n + i) = z(3 * i + 2);
    }
  }
  // The boundary-layer blocks alone become singular where the layer separates (with the edge
  // velocity held, the equations cannot fix the layer there; only the coupling does), and the
  // elimination through them then loses accuracy: check the step against the full system and
  // fall back to a dense LU of it when it does not solve it.
  const double scale = res.cwiseAbs().maxCoeff();
  if (!step.allFinite() || (multiply(d, step) + res).cwiseAbs().maxCoeff() > 1e-6 * scale + 1e-12) {
    step = dense(d).partialPivLu().solve(-res);
    ++dense_solves_;
  }
  return step.allFinite();
}

// C is factored in single precision, which takes about half the time of a double-precision LU
// (twice the numbers per vector instruction; this LU is the one O(n^3) part of a step), and the
// solution refined against the double matrix (O(n^2) per refinement) to max |C x - dm| <=
// kCapacitanceTolerance max |dm|, the accuracy of a double-precision LU. When
// kCapacitanceRefinements do not get there (C too ill-conditioned for single precision, or out
// of its range), C is factored in double precision (in bench_polar's 20 regression polars: 127
// of 7926 steps; 1.6 refinements per step on average, and the same converged solutions as a
// double LU).
namespace {
constexpr int kCapacitanceRefinements = 4;
constexpr double kCapacitanceTolerance = 1e-12;
}  // namespace

void BlockLinearSystem::solve_capacitance() {
  const Eigen::MatrixXd& cap_t = ws_.cap_t;
  const Eigen::VectorXd& dm = ws_.dm;
  Eigen::VectorXd& dm_solved = ws_.dm_solved;
  ws_.cap_f = cap_t.cast<float>();
  ws_.cap_luf.compute(ws_.cap_f);
  ws_.cap_bf = dm.cast<float>();
  ws_.cap_xf = ws_.cap_luf.transpose().solve(ws_.cap_bf);
  dm_solved = ws_.cap_xf.cast<double>();
  const double target = kCapacitanceTolerance * dm.cwiseAbs().maxCoeff();
  for (int k = 0;; ++k) {
    ws_.cap_r = dm;
    ws_.cap_r.noalias() -= cap_t.transpose() * dm_solved;
    if (ws_.cap_r.cwiseAbs().maxCoeff() <= target) return;
    if (k == kCapacitanceRefinements) break;
    ws_.cap_bf = ws_.cap_r.cast<float>();
    ws_.cap_xf = ws_.cap_luf.transpose().solve(ws_.cap_bf);
    dm_solved += ws_.cap_xf.cast<double>();
  }
  ws_.cap_lu.compute(cap_t);
  dm_solved = ws_.cap_lu.transpose().solve(dm);
  ++double_capacitance_solves_;
}

const Eigen::VectorXd& BlockLinearSystem::multiply(const RowMatrix& d,
                                                   const Eigen::VectorXd& v) const {
  const int n = n_;
  due_scratch_.noalias() = d * v.segment(2 * n, n);
  jv_.setZero(3 * n);
  for_each_speed_term([&](int r, int col, double value) { jv_(r) += value * due_scratch_(col); });
  for (int s = 0; s < n; ++s)
    for (int k = 0; k < block_count_[static_cast<std::size_t>(s)]; ++k) {
      const int c = block_station_[static_cast<std::size_t>(kBlocks * s + k)];
      const Eigen::Vector3d x(v(c), v(n + c), v(2 * n + c));
      jv_.segment<3>(3 * s) += blocks_[static_cast<std::size_t>(kBlocks * s + k)] * x;
    }
  return jv_;
}

Eigen::MatrixXd BlockLinearSystem::dense(const RowMatrix& d) const {
  const int n = n_;
  Eigen::MatrixXd j = Eigen::MatrixXd::Zero(3 * n, 3 * n);
  for (int s = 0; s < n; ++s)
    for (int k = 0; k < block_count_[static_cast<std::size_t>(s)]; ++k) {
      const int c = block_station_[static_cast<std::size_t>(kBlocks * s + k)];
      const Eigen::Matrix3d& b = blocks_[static_cast<std::size_t>(kBlocks * s + k)];
      for (int e = 0; e < 3; ++e)
        for (int v = 0; v < 3; ++v) j(3 * s + e, v * n + c) += b(e, v);
    }
  for_each_speed_term(
      [&](int r, int col, double value) { j.row(r).tail(n) += value * d.row(col); });
  return j;
}

}  // namespace fulmar::viscous::detail
