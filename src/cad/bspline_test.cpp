// B-spline evaluation against exact cases.
#include "cad/bspline.h"

#include <gtest/gtest.h>

#include <cmath>
#include <random>

namespace fulmar::cad {
namespace {

// A clamped knot vector with `interior` random (non-uniform) interior knots on [0, 1].
Eigen::VectorXd random_knots(int degree, int interior, unsigned seed) {
  std::mt19937 rng(seed);
  std::uniform_real_distribution<double> uni(0.0, 1.0);
  std::vector<double> in(interior);
  for (double& v : in) v = uni(rng);
  std::sort(in.begin(), in.end());
  Eigen::VectorXd t(interior + 2 * (degree + 1));
  int k = 0;
  for (int j = 0; j <= degree; ++j) t(k++) = 0.0;
  for (double v : in) t(k++) = v;
  for (int j = 0; j <= degree; ++j) t(k++) = 1.0;
  return t;
}

class BSplineDegree : public ::testing::TestWithParam<int> {};

// Partition of unity: the basis functions of any knot span sum to one and are non-negative
// (de Boor, A Practical Guide to Splines, 1978, ch. IX, property (ii)). Round-off only: 1e-14.
TEST_P(BSplineDegree, BasisIsAPartitionOfUnity) {
  const int p = GetParam();
  const Eigen::VectorXd t = random_knots(p, 9, 11u + p);
  const int n = static_cast<int>(t.size()) - p - 1;
  std::vector<double> basis(p + 1);
  for (int k = 0; k <= 1000; ++k) {
    const double u = k / 1000.0;
    const int s = knot_span(t, p, n, u);
    ASSERT_GE(s, p);
    ASSERT_LE(s, n - 1);
    basis_functions(t, p, s, u, basis.data());
    double sum = 0.0;
    for (double b : basis) {
      EXPECT_GE(b, -1e-15);
      sum += b;
    }
    EXPECT_NEAR(sum, 1.0, 1e-14) << "u = " << u;
  }
}

// Marsden's identity (de Boor 1978, ch. IX, eq. (IX.19)): with control values
// c_i = prod_{j=1..p} (t_{i+j} - tau) the spline is exactly (x - tau)^p. So a B-spline reproduces
// a polynomial of its degree exactly, on any knot vector; only round-off remains (1e-12).
TEST_P(BSplineDegree, ReproducesAPolynomialExactly) {
  const int p = GetParam();
  const double tau = 0.37;
  BSplineCurve c;
  c.degree = p;
  c.knots = random_knots(p, 7, 101u + p);
  const int n = static_cast<int>(c.knots.size()) - p - 1;
  c.control.resize(n, 2);
  for (int i = 0; i < n; ++i) {
    double prod = 1.0;
    for (int j = 1; j <= p; ++j) prod *= c.knots(i + j) - tau;
    c.control(i, 1) = prod;
    // Greville abscissae as x: the x-coordinate is then the identity map (linear precision).
    double g = 0.0;
    for (int j = 1; j <= p; ++j) g += c.knots(i + j);
    c.control(i, 0) = g / p;
  }
  c.check();
  for (int k = 0; k <= 200; ++k) {
    const double u = k / 200.0;
    const Eigen::VectorXd v = point_at(c, u);
    EXPECT_NEAR(v(0), u, 1e-14);
    EXPECT_NEAR(v(1), std::pow(u - tau, p), 1e-12) << "u = " << u;
  }
  // Its derivative is p (x - tau)^(p-1), again exactly.
  const BSplineCurve d = derivative(c);
  for (int k = 0; k <= 50; ++k) {
    const double u = k / 50.0;
    EXPECT_NEAR(point_at(d, u)(1), p * std::pow(u - tau, p - 1), 1e-11) << "u = " << u;
  }
}

// de Boor's scheme equals the explicit sum of basis functions times control points.
TEST_P(BSplineDegree, DeBoorEqualsBasisSum) {
  const int p = GetParam();
  BSplineCurve c;
  c.degree = p;
  c.knots = random_knots(p, 6, 7u + p);
  const int n = static_cast<int>(c.knots.size()) - p - 1;
  std::mt19937 rng(5);
  std::normal_distribution<double> g;
  c.control.resize(n, 3);
  for (int i = 0; i < n; ++i) c.control.row(i) << g(rng), g(rng), g(rng);
  std::vector<double> basis(p + 1);
  for (int k = 0; k <= 300; ++k) {
    const double u = k / 300.0;
    const int s = knot_span(c.knots, p, n, u);
    basis_functions(c.knots, p, s, u, basis.data());
    Eigen::Vector3d sum = Eigen::Vector3d::Zero();
    for (int j = 0; j <= p; ++j) sum += basis[j] * c.control.row(s - p + j).transpose();
    EXPECT_LT((point_at(c, u) - sum).norm(), 1e-13);
  }
  // Clamped ends interpolate the end control points.
  EXPECT_LT((point_at(c, 0.0) - c.control.row(0).transpose()).norm(), 1e-15);
  EXPECT_LT((point_at(c, 1.0) - c.control.row(n - 1).transpose()).norm(), 1e-15);
}

// The derivative curve against central differences (step 1e-6: truncation ~1e-12 times the third
// derivative, round-off ~1e-10; hence 1e-7).
TEST_P(BSplineDegree, DerivativeMatchesFiniteDifferences) {
  const int p = GetParam();
  BSplineCurve c;
  c.degree = p;
  c.knots = random_knots(p, 5, 3u + p);
  const int n = static_cast<int>(c.knots.size()) - p - 1;
  std::mt19937 rng(9);
  std::normal_distribution<double> g;
  c.control.resize(n, 2);
  for (int i = 0; i < n; ++i) c.control.row(i) << g(rng), g(rng);
  const BSplineCurve d = derivative(c);
  const double h = 1e-6;
  for (int k = 1; k < 100; ++k) {
    const double u = k / 100.0;
    bool near_knot = false;
    for (Eigen::Index j = 0; j < c.knots.size(); ++j) near_knot |= std::abs(c.knots(j) - u) < 2 * h;
    if (near_knot && p <= 2) continue;
    const Eigen::VectorXd fd = (point_at(c, u + h) - point_at(c, u - h)) / (2 * h);
    EXPECT_LT((point_at(d, u) - fd).norm(), 1e-7 * (1.0 + fd.norm())) << "u = " << u;
  }
}

INSTANTIATE_TEST_SUITE_P(Degrees, BSplineDegree, ::testing::Values(1, 2, 3, 4, 5, 7));

TEST(BSpline, KnotSpanAtTheEndsAndOnKnots) {
  Eigen::VectorXd t(9);
  t << 0, 0, 0, 0, 0.5, 1, 1, 1, 1;
  EXPECT_EQ(knot_span(t, 3, 5, 0.0), 3);
  EXPECT_EQ(knot_span(t, 3, 5, 0.5), 4);
  EXPECT_EQ(knot_span(t, 3, 5, 0.49), 3);
  EXPECT_EQ(knot_span(t, 3, 5, 1.0), 4);
  EXPECT_EQ(knot_span(t, 3, 5, 2.0), 4);  // clamped to the domain
}

TEST(BSpline, CheckRejectsInconsistentCurves) {
  BSplineCurve c;
  c.degree = 3;
  c.control = Eigen::MatrixXd::Zero(4, 2);
  c.knots.resize(7);
  EXPECT_THROW(c.check(), std::invalid_argument);
}

}  // namespace
}  // namespace fulmar::cad
