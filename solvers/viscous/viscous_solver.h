#pragma once
// Viscous-inviscid analysis of a wing section: integral boundary layers on both surfaces and the
// wake, strongly coupled to the panel method through its mass-defect influence matrix and solved
// by one global Newton method on all boundary-layer equations (M. Drela and M. B. Giles, AIAA J.
// 25(10), 1347-1355, 1987). Edge velocity: ue = ue_inviscid + D m with m = ue delta*.
//
// Unknowns per station (surface node or wake node): c (N laminar, sqrt(Ctau) turbulent), theta,
// m. The stagnation point lies between the two nodes where the surface speed changes sign, at
// the linearly interpolated zero; it moves with the solution (its influence on the first
// stations' arc length is in the Jacobian; it may hop a node between iterations).
//
// Drag: Squire-Young (ARC R&M 1838, 1938) at the wake end, cd = 2 theta (ue)^((H + 5)/2);
// friction drag from the wall shear; pressure drag = cd - cd_friction. cl and cm from the pressures
// of the viscous surface speed (Karman-Tsien for M > 0; the boundary layer itself is
// incompressible apart from the Mach terms in its closures).
#include <Eigen/Core>
#include <nlohmann/json.hpp>
#include <string>
#include <vector>

#include "geometry/section.h"
#include "solvers/inviscid/panel_solver.h"
#include "solvers/viscous/boundary_layer.h"
#include "solvers/viscous/viscous_options.h"

namespace fulmar::viscous {

// The boundary-layer state of a solution, to warm-start a neighbouring one (same shape).
struct ViscousState {
  double alpha = 0.0;                  // deg, the angle this state was solved at
  int stagnation_node = -1;            // upper-side first node (the flow turns between it and +1)
  std::vector<StationState> stations;  // #nodes surface stations then the wake stations
  std::vector<LayerKind> kinds;
  bool valid() const { return stagnation_node >= 0 && !stations.empty(); }
};

// One Newton iteration of a solve, for the iteration history.
struct NewtonIteration {
  double residual = 0.0;    // max |residual| before the step
  int worst_station = -1;   // where that residual is (station index; surface nodes then wake)
  int worst_equation = -1;  // 0 amplification or lag, 1 momentum, 2 kinetic energy
  int stagnation_node = -1;
  int transition_upper = -1, transition_lower = -1;  // transition intervals (BL position), -1 none
  double relaxation = 0.0;                           // fraction of the Newton step taken
  std::string limited_by;  // what limited the step ("" when the full step was taken)
};

struct ViscousResult {
  bool converged = false;
  SolveStatus status = SolveStatus::kFailed;
  std::string reason;     // what happened, with the measured residual against the tolerance
  double residual = 0.0;  // final max |residual|
  int iterations = 0;
  std::vector<double> residual_history;  // max |residual| before each Newton step
  std::vector<NewtonIteration> history;  // the same iterations in detail
  double alpha = 0.0;                    // deg
  double cl = 0.0, cd = 0.0, cd_friction = 0.0, cd_pressure = 0.0, cm = 0.0;
  double transition_upper = 1.0, transition_lower = 1.0;  // x/c (1: laminar to the TE)
  // Per surface node (#nodes, node order): clockwise-positive speed q as in the inviscid solver,
  // Cp, momentum and displacement thickness, H, skin friction (on free-stream q), N or sqrt(Ctau).
  Eigen::VectorXd ue, cp, theta, dstar, shape, cf, amplification;
  Eigen::VectorXd wake_theta, wake_dstar, wake_ue;  // per wake node
  ViscousState state;

  nlohmann::json to_json() const;  // scalars and residual history (no per-node vectors)
};

struct JacobianCheck {
  Eigen::MatrixXd analytic, difference;
};

class ViscousSolver {
 public:
  // `nodes`: #nodes by 2 panel nodes (see solvers/inviscid/panel_solver.h: upper TE first,
  // counter-clockwise, chord-normalised). Throws InputError for bad nodes or options.
  ViscousSolver(const Points& nodes, const ViscousOptions& options);

  // Solution at `alpha_deg` (degrees). `warm_start`: a state of this shape (e.g. the previous
  // angle's result.state) or null for a cold start from a boundary-layer march on the inviscid
  // flow. When a start does not converge the solve falls back: warm -> cold -> continuation from
  // the warm state's angle in sub-steps (halving, at most 6 levels); `iterations` counts the
  // Newton iterations of all attempts and `reason` says which one converged. Never throws for
  // flow reasons: non-convergence is in the result.
  ViscousResult solve_alpha(double alpha_deg, const ViscousState* warm_start = nullptr) const;

  // Solution at lift coefficient `cl` (secant iteration on alpha, warm-started, to
  // |cl - target| < 1e-5); converged false with a reason when it cannot be reached.
  ViscousResult solve_cl(double cl, const ViscousState* warm_start = nullptr) const;

  // For the consistency test: the Newton Jacobian (3 #stations square; columns c, theta, m per
  // station) after `newton_steps` steps from a cold start at `alpha_deg`, and the same by central
  // differences of the residuals (layer kinds held fixed); from `warm_start` when given.
  JacobianCheck jacobian_check(double alpha_deg, int newton_steps,
                               const ViscousState* warm_start = nullptr) const;

  // One Newton solve from one start (no fallback).
  ViscousResult solve_from(double alpha_deg, const ViscousState* warm_start) const;

  const InviscidSolver& inviscid() const { return inviscid_; }
  const ViscousOptions& options() const { return options_; }

 private:
  // One Newton solve from one start on a coupling model of this shape at alpha_deg.
  ViscousResult solve_on(const CouplingModel& model, double alpha_deg,
                         const ViscousState* warm_start) const;
  CouplingModel model_at(double alpha_deg) const;

  InviscidSolver inviscid_;
  ViscousOptions options_;
  FlowConditions flow_;
  SurfaceSourceResponse surface_response_;  // angle-independent part of every coupling model
};

}  // namespace fulmar::viscous
