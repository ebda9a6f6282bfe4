// The coupled viscous-inviscid Newton solve. State of this solver (see the report): it converges
// from a cold start on NACA 0012 at zero incidence; at other angles and from warm starts it does
// not yet converge, which it reports as a result (the checks below hold for every angle).
#include "solvers/viscous/viscous_solver.h"

#include <gtest/gtest.h>

#include <cmath>

#include "common/error.h"
#include "geometry/naca.h"
#include "geometry/panelling.h"

namespace fulmar::viscous {
namespace {

Points naca_nodes(const std::string& digits, int panels) {
  PanellingOptions po;
  po.panels = panels;
  return panel_nodes(naca_section(digits), po);
}

TEST(ViscousSolver, Naca0012ZeroIncidenceConvergesQuadratically) {
  ViscousOptions o;
  o.reynolds = 6.0e6;
  const ViscousSolver solver(naca_nodes("0012", 160), o);
  const ViscousResult r = solver.solve_alpha(0.0);
  ASSERT_TRUE(r.converged) << r.reason;
  EXPECT_EQ(r.status, SolveStatus::kConverged);
  EXPECT_LT(r.residual, o.tolerance);
  // Newton with exact Jacobians: the last steps square the residual (r_k+1 <= C r_k^2, C = 20
  // allows for the problem's scaling).
  const auto& h = r.residual_history;
  ASSERT_GE(h.size(), 3u);
  for (std::size_t k = h.size() - 2; k < h.size(); ++k) EXPECT_LT(h[k], 20.0 * h[k - 1] * h[k - 1]);
  // Symmetric section at zero incidence: no lift, no moment, the same transition on both sides.
  EXPECT_NEAR(r.cl, 0.0, 1e-3);
  EXPECT_NEAR(r.cm, 0.0, 1e-3);
  EXPECT_NEAR(r.transition_upper, r.transition_lower, 0.01);
  // Abbott & von Doenhoff 1959 (Theory of Wing Sections, app. IV, NACA 0012 at Re 6e6, smooth):
  // cd about 0.0058 at zero lift (the figure; from memory). Tolerance 15 %, as the issue
  // asks for cd_min of cambered sections.
  EXPECT_NEAR(r.cd, 0.0058, 0.15 * 0.0058);
  // Friction dominates the drag of a thin section at zero lift; pressure drag small and positive
  // within the accuracy of the split (common practice: 5-20 % of cd).
  EXPECT_GT(r.cd_friction, 0.6 * r.cd);
  EXPECT_LT(r.cd_friction, 1.1 * r.cd);
}

TEST(ViscousSolver, EveryResultIsFiniteAndSaysWhatHappened) {
  ViscousOptions o;
  o.reynolds = 1.0e6;
  o.max_iterations = 8;
  const ViscousSolver solver(naca_nodes("2412", 120), o);
  for (double a : {-2.0, 3.0, 90.0}) {
    const ViscousResult r = solver.solve_alpha(a);
    for (double v : {r.cl, r.cd, r.cm, r.cd_friction, r.cd_pressure,
                     r.residual == INFINITY ? 0.0 : r.residual})
      EXPECT_TRUE(std::isfinite(v)) << a;
    EXPECT_FALSE(r.reason.empty());
    EXPECT_EQ(r.converged, r.status == SolveStatus::kConverged);
    const nlohmann::json j = r.to_json();
    EXPECT_EQ(j.at("status").get<std::string>(), to_string(r.status));
  }
}

TEST(ViscousOptions, ValidateNamesTheField) {
  ViscousOptions o;
  o.reynolds = -5.0;
  try {
    o.Validate();
    FAIL() << "no error";
  } catch (const InputError& e) {
    EXPECT_NE(std::string(e.what()).find("reynolds"), std::string::npos);
  }
  o = ViscousOptions{};
  o.trip_upper = 1.5;
  EXPECT_THROW(o.Validate(), InputError);
  EXPECT_EQ(solve_status_from_string("not_converged"), SolveStatus::kNotConverged);
  EXPECT_THROW(solve_status_from_string("fine"), InputError);
}

}  // namespace
}  // namespace fulmar::viscous
