// The panel solution's coupling quantities against exact potential-flow solutions.
//  - A circle with surface sources: the single-layer potential of density cos(theta) on a circle
//    (expansion of ln|x - x'| in circular harmonics, e.g. Milne-Thomson, Theoretical
//    Aerodynamics, 4th ed. 1958, ch. 4 / any potential theory text) and the zero interior flow
//    of a uniform ring source.
//  - D against finite differences of a full re-solve with sources.
//  - The wake as a streamline of the computed flow.
#include "solvers/inviscid/panel_solver.h"

#include <gtest/gtest.h>

#include <cmath>
#include <numbers>
#include <vector>

#include "solvers/inviscid/testing/karman_trefftz.h"
#include "solvers/inviscid/testing/trailing_edge_gap.h"

namespace fulmar {
namespace {

using testing::KarmanTrefftz;
using testing::opened;

constexpr double kPi = std::numbers::pi;
using testing::deg;

// The cambered Karman-Trefftz section of panel_solver_test.cpp: 12 % thick, 4 % camber, unit
// chord. kGap: the trailing-edge gap of its open variant, 0.5 % chord.
const KarmanTrefftz kCambered{0.10, 0.08, 10.0};
constexpr double kGap = 0.005;

// A circle of radius a about (a, 0) as a "section" with a sharp trailing edge at (2a, 0).
Points circle_nodes(int panels, double a) {
  Points p(panels + 1, 2);
  for (int k = 0; k <= panels; ++k) {
    const double t = 2.0 * kPi * k / panels;
    p(k, 0) = a + a * std::cos(t);
    p(k, 1) = a * std::sin(t);
  }
  p.row(panels) = p.row(0);
  return p;
}

// A uniform ring source of strength sigma on a circle leaves the inside at rest and adds the
// radial field sigma a / r outside (potential theory: the single layer of constant density);
// the surface speed must not change and the wake (on the axis behind) gains sigma a / r.
TEST(InviscidSources, UniformRingSourceOnCircle) {
  const double a = 0.5;
  const InviscidSolver solver(circle_nodes(160, a));
  const Points wake = solver.wake_trajectory(0.0);
  const int n = solver.panel_count(), nw = static_cast<int>(wake.rows());
  Eigen::VectorXd sigma = Eigen::VectorXd::Zero(n + nw - 1);
  const Eigen::VectorXd base = solver.edge_velocity_with_sources(0.0, wake, sigma);
  sigma.head(n).setConstant(1.0);
  const Eigen::VectorXd with = solver.edge_velocity_with_sources(0.0, wake, sigma);
  // Panels are chords of the circle: O(h^2) = (2 pi / 160)^2 ~ 1.5e-3 discretisation error.
  for (int i = 1; i < n; ++i) EXPECT_NEAR(with(i) - base(i), 0.0, 3e-3) << "node " << i;
  for (int k = 2; k < nw; ++k) {
    const double r = (wake.row(k) - Eigen::RowVector2d(a, 0.0)).norm();
    EXPECT_NEAR(with(n + 1 + k) - base(n + 1 + k), a / r, 3e-3) << "wake node " << k;
  }
}

// Density cos(theta): outside it adds 1/2 sin(theta) to the counter-clockwise tangential
// velocity and inside a uniform -1/2 x velocity, which the vortex sheet cancels, adding another
// 1/2 sin(theta) outside (the perturbation of a circle in a uniform stream of -1/2). So the
// clockwise surface speed changes by -sin(theta).
TEST(InviscidSources, CosineSourceOnCircle) {
  const double a = 0.5;
  const int n = 160;
  const InviscidSolver solver(circle_nodes(n, a));
  const Points wake = solver.wake_trajectory(0.0);
  const int nw = static_cast<int>(wake.rows());
  Eigen::VectorXd sigma = Eigen::VectorXd::Zero(n + nw - 1);
  const Eigen::VectorXd base = solver.edge_velocity_with_sources(0.0, wake, sigma);
  for (int j = 0; j < n; ++j) sigma(j) = std::cos(2.0 * kPi * (j + 0.5) / n);
  const Eigen::VectorXd with = solver.edge_velocity_with_sources(0.0, wake, sigma);
  for (int i = 1; i < n; ++i) {
    EXPECT_NEAR(with(i) - base(i), -std::sin(2.0 * kPi * i / n), 3e-3) << "node " << i;
  }
}

// D must equal the derivative of a full re-solve with the sources S m (the system is linear,
// so central differences are exact up to round-off: 1e-7 relative to the column's largest entry
// is far above round-off, ~1e-12, and far below any missing term). With `precomputed` the model
// is built on the angle-independent surface-source response, which must not change the check.
void check_mass_influence(const Points& nodes, double alpha, bool precomputed = false) {
  const InviscidSolver solver(nodes);
  const SurfaceSourceResponse surface = solver.surface_source_response();
  const CouplingModel m = solver.coupling_model(alpha, precomputed ? &surface : nullptr);
  const int ns = m.surface_nodes, nw = m.wake_nodes, n = ns - 1;
  ASSERT_EQ(m.mass_influence.rows(), ns + nw);
  ASSERT_EQ(m.mass_influence.cols(), ns + nw);
  auto sources = [&](const Eigen::VectorXd& mass) {
    Eigen::VectorXd sigma(n + nw - 1);
    for (int j = 0; j < n; ++j) {
      sigma(j) = -(mass(j + 1) - mass(j)) / (m.arc_length(j + 1) - m.arc_length(j));
    }
    for (int k = 0; k < nw - 1; ++k) {
      sigma(n + k) =
          (mass(ns + k + 1) - mass(ns + k)) / (m.arc_length(ns + k + 1) - m.arc_length(ns + k));
    }
    return sigma;
  };
  const Eigen::VectorXd ue0 =
      solver.edge_velocity_with_sources(alpha, m.wake, Eigen::VectorXd::Zero(n + nw - 1));
  // Same solution by another route (superposed base solutions vs one direct solve): agreement to
  // round-off amplified by the condition number (rcond ~ 1e-7 here): 1e-9.
  EXPECT_LT((ue0 - m.edge_velocity).cwiseAbs().maxCoeff(), 1e-9);
  const double h = 0.1;  // linear: any step is exact; a large one keeps round-off small
  for (int j : {0, 1, 7, n / 3, n / 2, n - 1, n, ns, ns + 1, ns + nw / 2, ns + nw - 1}) {
    Eigen::VectorXd mp = Eigen::VectorXd::Zero(ns + nw), mm = mp;
    mp(j) = h;
    mm(j) = -h;
    const Eigen::VectorXd fd = (solver.edge_velocity_with_sources(alpha, m.wake, sources(mp)) -
                                solver.edge_velocity_with_sources(alpha, m.wake, sources(mm))) /
                               (2.0 * h);
    const double scale = fd.cwiseAbs().maxCoeff();
    EXPECT_LT((m.mass_influence.col(j) - fd).cwiseAbs().maxCoeff(), 1e-7 * scale) << "column " << j;
  }
}

TEST(InviscidCoupling, MassInfluenceMatchesResolveSharpEdge) {
  check_mass_influence(kCambered.panel_nodes(120), deg(4.0));
}

TEST(InviscidCoupling, MassInfluenceMatchesResolveOpenEdge) {
  check_mass_influence(opened(kCambered.panel_nodes(120), kGap), deg(4.0));
}

// The precomputed surface part (one per shape) serves every angle.
TEST(InviscidCoupling, PrecomputedSurfaceSourcesMatchResolve) {
  for (double a : {-6.0, 4.0, 12.0}) {
    check_mass_influence(kCambered.panel_nodes(120), deg(a), true);
    check_mass_influence(opened(kCambered.panel_nodes(120), kGap), deg(a), true);
  }
}

// Same model with and without the precomputed part: one computation reordered, so equal to
// round-off (1e-12 of the largest entry; the factored system's rcond ~ 1e-7 amplifies 1e-16).
TEST(InviscidCoupling, PrecomputedSurfaceSourcesGiveTheSameModel) {
  const InviscidSolver solver(opened(kCambered.panel_nodes(120), kGap));
  const SurfaceSourceResponse surface = solver.surface_source_response();
  for (double a : {-6.0, 4.0}) {
    const CouplingModel full = solver.coupling_model(deg(a));
    const CouplingModel pre = solver.coupling_model(deg(a), &surface);
    const double scale = full.mass_influence.cwiseAbs().maxCoeff();
    EXPECT_LT((full.mass_influence - pre.mass_influence).cwiseAbs().maxCoeff(), 1e-12 * scale);
    EXPECT_LT((full.edge_velocity - pre.edge_velocity).cwiseAbs().maxCoeff(), 1e-12);
    EXPECT_EQ((full.wake - pre.wake).cwiseAbs().maxCoeff(), 0.0);
  }
}

// The wake is a streamline: its segments follow the local velocity (Heun steps of error
// O(ds^3 curvature), well below 1e-3 rad here), it starts at the trailing-edge midpoint, is at
// least the requested length, and far behind the section the speed tends to the free stream
// (the section's disturbance decays like chord / distance: within 10 % one chord behind).
TEST(InviscidCoupling, WakeIsAStreamline) {
  const InviscidSolver solver(kCambered.panel_nodes(160));
  const double alpha = deg(5.0);
  const CouplingModel m = solver.coupling_model(alpha);
  const Points& w = m.wake;
  EXPECT_NEAR((w.row(0) - solver.nodes().row(0)).norm(), 0.0, 1e-12);
  EXPECT_GE(m.arc_length(m.surface_nodes + m.wake_nodes - 1), 0.999 * solver.chord());
  for (int k = 2; k < w.rows() - 1; ++k) {
    const Eigen::Vector2d v = solver.velocity_at(alpha, w.row(k).transpose()).normalized();
    const Eigen::Vector2d seg = (w.row(k + 1) - w.row(k - 1)).transpose().normalized();
    EXPECT_LT(std::abs(v.x() * seg.y() - v.y() * seg.x()), 2e-3) << "wake node " << k;
  }
  EXPECT_NEAR(m.edge_velocity(m.surface_nodes + m.wake_nodes - 1), 1.0, 0.1);
}

}  // namespace
}  // namespace fulmar
