// The station layout helpers of the coupled solve: the wake base thickness, the stagnation node
// search, and the model of the stagnation point's position between two nodes.
#include <gtest/gtest.h>

#include <cmath>

#include "solvers/viscous/coupled_system.h"

namespace fulmar::viscous::detail {
namespace {

TEST(WakeGap, FadesSmoothlyOverTwoAndAHalfHeights) {
  const double h = 0.004;
  EXPECT_EQ(wake_gap(h, 0.0), h);
  EXPECT_EQ(wake_gap(h, 2.5 * h), 0.0);
  EXPECT_EQ(wake_gap(h, 10.0 * h), 0.0);
  EXPECT_EQ(wake_gap(0.0, 0.001), 0.0);  // sharp trailing edge
  // Zero slope at both ends (a cubic blend): one-sided differences of O(step) there, against a
  // mid-range slope of order 1 (1e-3 relative to h over a step of 1e-6 h is 1e-3 of that).
  const double d = 1e-6 * h;
  EXPECT_LT(std::abs(wake_gap(h, d) - h) / d, 1e-3);
  EXPECT_LT(std::abs(wake_gap(h, 2.5 * h - d)) / d, 1e-3);
  EXPECT_GT(std::abs(wake_gap(h, 1.25 * h) - h) / (1.25 * h), 0.1);
}

TEST(StagnationNode, TakesTheSignChangeNearestTheLeadingEdge) {
  Eigen::VectorXd q(8);
  q << 1.0, 0.5, -0.2, -0.4, 0.3, -0.1, -0.5, -1.0;  // sign changes after nodes 1 and 4
  EXPECT_EQ(stagnation_node(q, 8, 2), 1);
  EXPECT_EQ(stagnation_node(q, 8, 5), 4);
  q.setOnes();  // no sign change: the leading-edge node
  EXPECT_EQ(stagnation_node(q, 8, 3), 3);
}

TEST(StagnationFraction, IsTheLinearZeroAwayFromTheNodesAndBoundedNearThem) {
  // Upper side, t = a / (a + b) where it is not near a node.
  const auto f = CoupledSystem::stagnation_fraction(0, 0.3, 0.7);
  EXPECT_DOUBLE_EQ(f.t, 0.3);
  EXPECT_DOUBLE_EQ(f.sum, 1.0);
  // The lower side measures from the other node.
  EXPECT_DOUBLE_EQ(CoupledSystem::stagnation_fraction(1, 0.3, 0.7).t, 0.7);
  // A node on the stagnation point is modelled at kMinStagnationFraction of the interval.
  EXPECT_DOUBLE_EQ(CoupledSystem::stagnation_fraction(0, 0.0, 1.0).t,
                   CoupledSystem::kMinStagnationFraction);
  // In the blend, t stays above the floor and its derivatives match central differences (to
  // their truncation error, O(h^2) with h = 1e-6 on a quadratic blend).
  for (double a : {0.02, 0.05, 0.08}) {
    const auto g = CoupledSystem::stagnation_fraction(0, a, 1.0);
    EXPECT_GE(g.t, CoupledSystem::kMinStagnationFraction);
    const double h = 1e-6;
    const double dta = (CoupledSystem::stagnation_fraction(0, a + h, 1.0).t -
                        CoupledSystem::stagnation_fraction(0, a - h, 1.0).t) /
                       (2.0 * h);
    const double dtb = (CoupledSystem::stagnation_fraction(0, a, 1.0 + h).t -
                        CoupledSystem::stagnation_fraction(0, a, 1.0 - h).t) /
                       (2.0 * h);
    EXPECT_NEAR(g.d_uk, dta, 1e-8) << "a " << a;
    EXPECT_NEAR(g.d_uk1, dtb, 1e-8) << "a " << a;
  }
}

}  // namespace
}  // namespace fulmar::viscous::detail
