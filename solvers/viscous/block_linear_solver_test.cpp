// The block linear solve of the Newton step against a dense LU of the same system: on random
// block-lower-triangular-plus-coupling systems, through the single-precision capacitance LU, its
// double-precision replacement and the dense fallback.
#include "solvers/viscous/block_linear_solver.h"

#include <gtest/gtest.h>

#include <Eigen/LU>
#include <Eigen/QR>
#include <algorithm>
#include <cmath>
#include <numeric>
#include <random>
#include <vector>

namespace fulmar::viscous::detail {
namespace {

// A system as the Newton solve sees it, with its dense matrix built here independently of
// BlockLinearSystem::dense (rows station-major, columns var-major).
struct TestSystem {
  BlockLinearSystem sys;
  RowMatrix d;
  std::vector<int> order;
  Eigen::MatrixXd dense;  // 3 n square
  explicit TestSystem(int n)
      : sys(n), d(RowMatrix::Zero(n, n)), dense(Eigen::MatrixXd::Zero(3 * n, 3 * n)) {}
  int n() const { return sys.stations(); }
  void add_block(int row, int col, const Eigen::Matrix3d& b) {
    sys.block(row, col) += b;
    for (int e = 0; e < 3; ++e)
      for (int v = 0; v < 3; ++v) dense(3 * row + e, v * n() + col) += b(e, v);
  }
  void add_speed(int r, int col, double value) {
    sys.add_speed(r, col, value);
    speed.push_back({r, col, value});
  }
  // Adds G D to `dense`; call once, after D and G are set.
  void finish() {
    for (const Term& t : speed) dense.row(t.r).tail(n()) += t.value * d.row(t.col);
  }
  struct Term {
    int r, col;
    double value;
  };
  std::vector<Term> speed;
};

// n stations in a random marching order; L: well-conditioned diagonal blocks and one or two
// blocks on stations earlier in the order (as an interval and the trailing-edge merge have); G: up
// to five terms per row (one more than stored in place, to use the spill list); D random.
// With `singular_pos` >= 0 the diagonal block of the station at that position of the order has
// a zero m column, and the station's m equation is coupled to its own edge velocity instead.
TestSystem random_system(int n, unsigned seed, int singular_pos = -1) {
  std::mt19937 rng(seed);
  std::uniform_real_distribution<double> u(-1.0, 1.0);
  std::uniform_int_distribution<int> pick(0, n - 1);
  TestSystem t(n);
  t.order.resize(static_cast<std::size_t>(n));
  std::iota(t.order.begin(), t.order.end(), 0);
  std::shuffle(t.order.begin(), t.order.end(), rng);
  auto random_block = [&](double scale) {
    Eigen::Matrix3d b;
    for (int i = 0; i < 3; ++i)
      for (int j = 0; j < 3; ++j) b(i, j) = scale * u(rng);
    return b;
  };
  for (int p = 0; p < n; ++p) {
    const int s = t.order[static_cast<std::size_t>(p)];
    Eigen::Matrix3d diagonal = random_block(1.0) + 4.0 * Eigen::Matrix3d::Identity();
    if (p == singular_pos) diagonal.col(2).setZero();
    t.add_block(s, s, diagonal);
    if (p >= 1) t.add_block(s, t.order[static_cast<std::size_t>(p - 1)], random_block(1.0));
    if (p >= 2 && p % 3 == 0)
      t.add_block(s, t.order[static_cast<std::size_t>(p - 2)], random_block(0.5));
  }
  for (int i = 0; i < n; ++i)
    for (int j = 0; j < n; ++j) t.d(i, j) = 0.3 * u(rng) / n;
  for (int r = 0; r < 3 * n; ++r) {
    const int terms = r % 6;  // 0 .. 5
    for (int k = 0; k < terms; ++k) t.add_speed(r, pick(rng), 0.5 * u(rng));
  }
  if (singular_pos >= 0) {
    const int s = t.order[static_cast<std::size_t>(singular_pos)];
    t.add_speed(3 * s + 2, s, 2.0);
    t.d(s, s) += 1.0;
  }
  t.finish();
  return t;
}

Eigen::VectorXd random_vector(int size, unsigned seed) {
  std::mt19937 rng(seed);
  std::uniform_real_distribution<double> u(-1.0, 1.0);
  Eigen::VectorXd v(size);
  for (int i = 0; i < size; ++i) v(i) = u(rng);
  return v;
}

// The block solve and a double-precision partial-pivoting LU of the same matrix are both
// backward stable; these systems have condition numbers of order 10-100, so their solutions
// agree to far better than 1e-10 of the largest entry (1e-16 times the condition number and n).
constexpr double kAgreement = 1e-10;

TEST(BlockLinearSystem, SolvesLikeADenseLu) {
  for (unsigned seed : {1u, 2u, 3u}) {
    TestSystem t = random_system(12, seed);
    const Eigen::VectorXd res = random_vector(36, 100 + seed);
    Eigen::VectorXd step;
    ASSERT_TRUE(t.sys.solve(t.d, t.order, res, step));
    const Eigen::VectorXd expected = t.dense.partialPivLu().solve(-res);
    EXPECT_LE((step - expected).cwiseAbs().maxCoeff(), kAgreement * expected.cwiseAbs().maxCoeff())
        << "seed " << seed;
    // Solved through the blocks and the single-precision capacitance LU (its refinement reached
    // the tolerance): no fallback.
    EXPECT_EQ(t.sys.dense_solves(), 0);
    EXPECT_EQ(t.sys.double_capacitance_solves(), 0);
  }
}

TEST(BlockLinearSystem, DenseAndProductAreTheAssembledMatrix) {
  TestSystem t = random_system(9, 7);
  // Both sum the same few products in another order: equal to rounding.
  EXPECT_LE((t.sys.dense(t.d) - t.dense).cwiseAbs().maxCoeff(), 1e-14);
  const Eigen::VectorXd v = random_vector(27, 8);
  EXPECT_LE((t.sys.multiply(t.d, v) - t.dense * v).cwiseAbs().maxCoeff(), 1e-13);
}

TEST(BlockLinearSystem, ClearEmptiesTheSystem) {
  TestSystem t = random_system(6, 9);
  t.sys.clear();
  EXPECT_EQ(t.sys.dense(t.d).cwiseAbs().maxCoeff(), 0.0);
}

// L = I and G taking each station's m equation to its own edge velocity make the capacitance
// matrix I + D; with D = A - I for an A of condition number 1e8, single precision (relative
// precision 6e-8) cannot factor it usefully and refinement does not converge: the capacitance
// system is solved in double precision, and the step still solves the full system.
TEST(BlockLinearSystem, IllConditionedCapacitanceFallsBackToDoublePrecision) {
  const int n = 10;
  TestSystem t(n);
  t.order.resize(n);
  std::iota(t.order.begin(), t.order.end(), 0);
  for (int s = 0; s < n; ++s) {
    t.add_block(s, s, Eigen::Matrix3d::Identity());
    t.add_speed(3 * s + 2, s, 1.0);
  }
  const Eigen::MatrixXd q1 =
      Eigen::MatrixXd(random_vector(n * n, 21).reshaped(n, n)).householderQr().householderQ();
  const Eigen::MatrixXd q2 =
      Eigen::MatrixXd(random_vector(n * n, 22).reshaped(n, n)).householderQr().householderQ();
  Eigen::VectorXd sv(n);
  for (int i = 0; i < n; ++i) sv(i) = std::pow(10.0, -8.0 * i / (n - 1));
  const Eigen::MatrixXd a = q1 * sv.asDiagonal() * q2.transpose();
  t.d = a - Eigen::MatrixXd::Identity(n, n);
  t.finish();
  const Eigen::VectorXd res = random_vector(3 * n, 23);
  Eigen::VectorXd step;
  ASSERT_TRUE(t.sys.solve(t.d, t.order, res, step));
  EXPECT_EQ(t.sys.double_capacitance_solves(), 1);
  EXPECT_EQ(t.sys.dense_solves(), 0);
  // The solve's own check: max |J step + res| <= 1e-6 max |res| (else the dense fallback).
  EXPECT_LE((t.dense * step + res).cwiseAbs().maxCoeff(), 1e-6 * res.cwiseAbs().maxCoeff());
  // Against a dense LU: both carry errors of 1e-16 times the condition number 1e8 relative.
  const Eigen::VectorXd expected = t.dense.partialPivLu().solve(-res);
  EXPECT_LE((step - expected).cwiseAbs().maxCoeff(), 1e-6 * expected.cwiseAbs().maxCoeff());
}

// A singular diagonal block (a boundary layer that cannot fix its own m with the edge velocity
// held, as at separation) whose coupling makes the full system regular: the elimination through
// L is impossible and the step comes from the dense LU.
TEST(BlockLinearSystem, SingularBlockFallsBackToTheDenseLu) {
  TestSystem t = random_system(8, 31, 3);
  const Eigen::VectorXd res = random_vector(24, 32);
  Eigen::VectorXd step;
  ASSERT_TRUE(t.sys.solve(t.d, t.order, res, step));
  EXPECT_EQ(t.sys.dense_solves(), 1);
  const Eigen::VectorXd expected = t.dense.partialPivLu().solve(-res);
  // The same LU of the same matrix (assembled in another order): equal to rounding.
  EXPECT_LE((step - expected).cwiseAbs().maxCoeff(), kAgreement * expected.cwiseAbs().maxCoeff());
}

TEST(BlockInverse, InvertsAndFlagsASingularBlock) {
  Eigen::Matrix3d a;
  a << 0.0, 2.0, 1.0, 1.0, -1.0, 3.0, 4.0, 0.5, -2.0;  // needs a row exchange at the first pivot
  // Gaussian elimination with partial pivoting on a well-conditioned 3 by 3: rounding only.
  EXPECT_LE((block_inverse(a) * a - Eigen::Matrix3d::Identity()).cwiseAbs().maxCoeff(), 1e-14);
  a.col(2).setZero();
  EXPECT_FALSE(block_inverse(a).allFinite());
}

}  // namespace
}  // namespace fulmar::viscous::detail
