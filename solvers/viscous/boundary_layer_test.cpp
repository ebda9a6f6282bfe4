// Interval equations: Jacobians against finite differences; the direct march on a flat plate
// against Blasius (laminar) and Schlichting's turbulent friction law.
#include "solvers/viscous/boundary_layer.h"

#include <gtest/gtest.h>

#include <cmath>
#include <vector>

namespace fulmar::viscous {
namespace {

StationState perturbed(StationState s, int k, double h) {
  (k == 0 ? s.c : k == 1 ? s.theta : k == 2 ? s.dstar : s.ue) += h;
  return s;
}

double component(const StationState& s, int k) {
  return k == 0 ? s.c : k == 1 ? s.theta : k == 2 ? s.dstar : s.ue;
}

void expect_exact_jacobian(const IntervalSpec& spec, const StationState& a, const StationState& b,
                           const FlowConditions& flow) {
  const IntervalLinearization lin = linearize_interval(spec, a, b, flow);
  const bool similarity = spec.type == IntervalType::kSimilarity;
  if (similarity) {
    // Column 0 is the derivative with respect to the station's arc length x2.
    IntervalSpec sp = spec, sm = spec;
    const double h = 1e-6 * spec.x2;
    sp.x2 += h;
    sm.x2 -= h;
    const Eigen::Vector3d fd =
        (linearize_interval(sp, a, b, flow).r - linearize_interval(sm, a, b, flow).r) / (2.0 * h);
    for (int i = 0; i < 3; ++i)
      EXPECT_NEAR(lin.j(i, 0), fd(i), 1e-5 * std::max(1.0, std::abs(fd(i)))) << "d/dx2 eq " << i;
  }
  // The derivative with respect to a shift of the arc-length origin (x1, x2 together).
  if (!similarity) {
    Eigen::Vector3d d_origin;
    linearize_interval(spec, a, b, flow, nullptr, &d_origin);
    IntervalSpec sp = spec, sm = spec;
    const double h = 1e-6 * spec.x1;
    sp.x1 += h;
    sp.x2 += h;
    sm.x1 -= h;
    sm.x2 -= h;
    const Eigen::Vector3d fd =
        (linearize_interval(sp, a, b, flow).r - linearize_interval(sm, a, b, flow).r) / (2.0 * h);
    for (int i = 0; i < 3; ++i)
      EXPECT_NEAR(d_origin(i), fd(i), 1e-5 * std::max(1.0, std::abs(fd(i)))) << "origin eq " << i;
  }
  // Closures handed in by the caller (from the neighbouring interval) give the same
  // linearization as those computed inside (up to rounding: the same arithmetic, perhaps
  // contracted differently).
  if (spec.type == IntervalType::kLaminar || spec.type == IntervalType::kTurbulent ||
      spec.type == IntervalType::kWake) {
    const LayerKind kind = spec.type == IntervalType::kLaminar     ? LayerKind::kLaminar
                           : spec.type == IntervalType::kTurbulent ? LayerKind::kTurbulent
                                                                   : LayerKind::kWake;
    const Closure<StationDual> ka = station_closure(kind, a, flow, spec.gap1);
    const Closure<StationDual> kb = station_closure(kind, b, flow, spec.gap2);
    const IntervalLinearization given =
        linearize_interval(spec, a, b, flow, nullptr, nullptr, {&ka, &kb});
    for (int i = 0; i < 3; ++i) {
      EXPECT_NEAR(given.r(i), lin.r(i), 1e-14 * std::max(1.0, std::abs(lin.r(i))));
      for (int k = 0; k < 8; ++k)
        EXPECT_NEAR(given.j(i, k), lin.j(i, k), 1e-14 * std::max(1.0, std::abs(lin.j(i, k))))
            << "given closures, eq " << i << " var " << k;
    }
  }
  for (int k = similarity ? 4 : 0; k < 8; ++k) {
    const bool second = k >= 4;
    const double base = component(second ? b : a, k % 4);
    const double h = 1e-6 * std::max(std::abs(base), 1e-4);
    const StationState ap = second ? a : perturbed(a, k, h), am = second ? a : perturbed(a, k, -h);
    const StationState bp = second ? perturbed(b, k - 4, h) : b;
    const StationState bm = second ? perturbed(b, k - 4, -h) : b;
    const Eigen::Vector3d fd =
        (linearize_interval(spec, ap, bp, flow).r - linearize_interval(spec, am, bm, flow).r) /
        (2.0 * h);
    for (int i = 0; i < 3; ++i) {
      // Central differences: truncation ~h^2 |f'''|; 1e-5 relative to the row scale is far above
      // it and far below any real derivative error.
      const double scale =
          std::max(1.0, lin.j.row(i).cwiseAbs().maxCoeff() * std::max(std::abs(base), 1e-4));
      EXPECT_NEAR(lin.j(i, k), fd(i), 1e-5 * scale / std::max(std::abs(base), 1e-4))
          << "type " << static_cast<int>(spec.type) << " eq " << i << " var " << k;
    }
  }
}

TEST(IntervalJacobian, MatchesFiniteDifferencesForEveryType) {
  FlowConditions flow;
  flow.reynolds = 2.0e6;
  flow.mach = 0.3;
  const StationState lam1{3.0, 2.0e-4, 5.4e-4, 1.2}, lam2{4.0, 2.2e-4, 6.2e-4, 1.15};
  const StationState tur1{0.04, 5.0e-4, 7.5e-4, 1.1}, tur2{0.042, 5.6e-4, 8.6e-4, 1.08};
  IntervalSpec spec;
  spec.x1 = 0.30;
  spec.x2 = 0.32;
  for (IntervalType t : {IntervalType::kLaminar, IntervalType::kSimilarity}) {
    spec.type = t;
    expect_exact_jacobian(spec, lam1, lam2, flow);
  }
  spec.type = IntervalType::kTurbulent;
  expect_exact_jacobian(spec, tur1, tur2, flow);
  spec.type = IntervalType::kWake;
  spec.gap1 = 1e-4;
  spec.gap2 = 0.8e-4;
  expect_exact_jacobian(spec, tur1, tur2, flow);
  // Transition inside the interval (N1 close to N_crit so the natural point lies inside).
  spec.type = IntervalType::kTransition;
  StationState l1 = lam1;
  l1.c = 8.9;
  flow.reynolds = 6.0e6;
  double w = -1.0;
  linearize_interval(spec, l1, tur2, flow, &w);
  EXPECT_GT(w, 0.0);
  EXPECT_LT(w, 1.0);
  expect_exact_jacobian(spec, l1, tur2, flow);
  // Forced transition at a fixed fraction.
  spec.trip_fraction = 0.3;
  l1.c = 1.0;
  expect_exact_jacobian(spec, l1, tur2, flow);
}

Eigen::VectorXd geometric_stations(double first, double last, int n) {
  Eigen::VectorXd x(n);
  for (int i = 0; i < n; ++i) x(i) = first * std::pow(last / first, double(i) / (n - 1));
  return x;
}

TEST(FlatPlate, LaminarSkinFrictionMatchesBlasius) {
  // Blasius: Cf = 0.664 / sqrt(Re_x) (Schlichting, Boundary-Layer Theory, ch. 7). Issue
  // requirement: within 3 %. Transition suppressed (N_crit beyond reach).
  FlowConditions flow;
  flow.reynolds = 1.0e6;
  flow.n_crit = 1.0e3;
  const Eigen::VectorXd x = geometric_stations(1e-3, 1.0, 80);
  const Eigen::VectorXd ue = Eigen::VectorXd::Ones(x.size());
  const MarchResult m = march_surface(x, ue, 0.0, 10.0, flow, false);
  ASSERT_TRUE(m.converged);
  EXPECT_LT(m.x_transition, 0.0);
  for (int i = 0; i < x.size(); ++i) {
    const double cf = skin_friction(LayerKind::kLaminar, m.stations[i], flow);
    const double blasius = 0.664 / std::sqrt(flow.reynolds * x(i));
    EXPECT_NEAR(cf, blasius, 0.03 * blasius) << "x = " << x(i);
    EXPECT_NEAR(shape_factor(m.stations[i]), 2.59, 0.03 * 2.59);
  }
}

class TurbulentFlatPlate : public ::testing::TestWithParam<double> {};

TEST_P(TurbulentFlatPlate, DragMatchesSchlichting) {
  // Prandtl-Schlichting skin-friction law for a plate turbulent from the leading edge:
  // C_F = 0.455 / (log10 Re_L)^2.58 (Schlichting, Boundary-Layer Theory, ch. 21). One side:
  // C_F = 2 theta(L) / L. Issue requirement: within 5 %. Tripped at x/L = 0.001. (We find 3-4 %
  // low; the Karman-Schoenherr-type law 0.523/ln^2(0.06 Re) of White, Viscous Fluid Flow, is
  // itself 1.5-3.4 % below Schlichting's over this range, from memory.)
  FlowConditions flow;
  flow.reynolds = GetParam();
  const Eigen::VectorXd x = geometric_stations(2e-4, 1.0, 120);
  const Eigen::VectorXd ue = Eigen::VectorXd::Ones(x.size());
  const MarchResult m = march_surface(x, ue, 0.0, 1e-3, flow, false);
  ASSERT_TRUE(m.converged);
  EXPECT_NEAR(m.x_transition, 1e-3, 1e-9);
  const double cf_total = 2.0 * m.stations.back().theta;
  const double schlichting = 0.455 / std::pow(std::log10(flow.reynolds), 2.58);
  EXPECT_NEAR(cf_total, schlichting, 0.05 * schlichting) << "Re " << flow.reynolds;
}

INSTANTIATE_TEST_SUITE_P(Reynolds, TurbulentFlatPlate, ::testing::Values(1e6, 3e6, 1e7));

TEST(FlatPlate, FreeTransitionMovesForwardWithReynolds) {
  // e^N on a flat plate: transition Re_x of a few million at N = 9 (Schlichting ch. 15, from
  // memory: 2.8e6 to 3.5e6). Envelope fit: within a factor 1.5.
  FlowConditions flow;
  flow.reynolds = 1.0e7;
  const Eigen::VectorXd x = geometric_stations(1e-4, 1.0, 200);
  const MarchResult m = march_surface(x, Eigen::VectorXd::Ones(x.size()), 0.0, 10.0, flow);
  ASSERT_GT(m.x_transition, 0.0);
  const double re_tr = m.x_transition * flow.reynolds;
  EXPECT_GT(re_tr, 3.0e6 / 1.5);
  EXPECT_LT(re_tr, 3.0e6 * 1.5);
}

}  // namespace
}  // namespace fulmar::viscous

namespace fulmar::viscous {
namespace {

TEST(FlatPlate, TransitionPointAndDragMoveSmoothlyWithReynolds) {
  // The transition point is interpolated inside its interval: as Re rises it moves forward
  // continuously, not from node to node (stations here are ~1.5 % of the length apart near
  // x = 0.5, while each Re step moves transition by ~0.2 %). Criterion: no step in x_tr or in
  // the drag 2 theta(L) more than 3 times the mean step (a node-to-node jump would be ~7 times).
  FlowConditions flow;
  const Eigen::VectorXd x = geometric_stations(1e-4, 1.0, 200);
  const Eigen::VectorXd ue = Eigen::VectorXd::Ones(x.size());
  std::vector<double> xt, cd;
  for (int i = 0; i <= 50; ++i) {
    flow.reynolds = 5.0e6 + 2.0e4 * i;
    const MarchResult m = march_surface(x, ue, 0.0, 10.0, flow, false);
    ASSERT_TRUE(m.converged);
    xt.push_back(m.x_transition);
    cd.push_back(2.0 * m.stations.back().theta);
  }
  auto check = [](const std::vector<double>& v, const char* what) {
    const double mean = std::abs(v.back() - v.front()) / double(v.size() - 1);
    ASSERT_GT(mean, 0.0) << what;
    for (std::size_t i = 1; i < v.size(); ++i)
      EXPECT_LT(std::abs(v[i] - v[i - 1]), 3.0 * mean) << what << " step " << i;
  };
  check(xt, "x_transition");
  check(cd, "drag");
}

}  // namespace
}  // namespace fulmar::viscous
