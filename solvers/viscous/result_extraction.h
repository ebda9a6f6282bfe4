#pragma once
// The outputs of a coupled solve from its final state: per-node distributions, loads (cl and cm
// from the surface pressures, cd by Squire-Young at the wake end, friction drag from the wall
// shear), transition points, and the state for warm starts; never a NaN.
#include "solvers/inviscid/panel_solver.h"
#include "solvers/viscous/boundary_layer.h"
#include "solvers/viscous/coupled_system.h"
#include "solvers/viscous/viscous_solver.h"

namespace fulmar::viscous::detail {

// Fills the outputs of `res` from the final state `fin` of a solve at `alpha_deg` (degrees) by
// `inviscid` (the solver `fin` was made with) in `flow`: ue, cp, theta, dstar, shape, cf,
// amplification (#nodes each, node order), the wake vectors (#wake nodes), cl, cd, cd_friction,
// cd_pressure, cm, the transition x/c and state. Expects res.converged, status and reason set;
// when a load is not finite, marks res failed, zeroes the loads and clears the state.
void extract_result(const CoupledSystem& fin, const InviscidSolver& inviscid,
                    const FlowConditions& flow, double alpha_deg, ViscousResult& res);

}  // namespace fulmar::viscous::detail
