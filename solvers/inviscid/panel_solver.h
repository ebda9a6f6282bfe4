#pragma once
// Inviscid, incompressible flow about a wing section by a linear-vorticity stream-function panel
// method (vortex sheet strength linear along straight panels between the section nodes; the
// stream function is held constant at every node), with the Kutta condition, a trailing-edge gap
// panel that lets the flow leave a blunt trailing edge, and the Karman-Tsien compressibility
// correction (Tsien, J. Aero. Sci. 6(10), 1939). The matrix is factored once per shape; every angle
// of attack is a superposition of the alpha = 0 and alpha = 90 deg base solutions.
//
// Sign conventions (used throughout, also by the viscous coupling):
//  - Nodes: #nodes by 2, from the upper trailing edge over the leading edge to the lower trailing
//    edge (counter-clockwise around the section). N = #nodes - 1 panels.
//  - Free stream of unit speed at angle alpha (rad) to the +x axis of the nodes, counter-clockwise
//    positive (nose-up when the section points along +x).
//  - Surface speed q_i ("ue" in the results): the tangential velocity of the outer flow at node i
//    over V_inf, POSITIVE IN THE CLOCKWISE DIRECTION (opposite to the node order). So on the upper
//    surface q > 0 means flow toward the trailing edge; on the lower surface q > 0 means flow
//    toward the leading edge (the usual lower-surface boundary-layer edge velocity is -q there). q
//    equals the clockwise vortex-sheet strength gamma_i (the flow inside the section is at rest).
//  - Kutta condition: q_0 + q_N = 0 (equal speeds leaving the trailing edge on both sides).
//  - Cp = 1 - q^2 (incompressible), Karman-Tsien corrected when mach > 0.
//  - cl normal to the free stream, cm about the quarter-chord point, nose-up positive, both over
//    the chord c = distance from the trailing-edge midpoint to the farthest node (the leading
//    edge).
#include <Eigen/Core>
#include <Eigen/LU>
#include <nlohmann/json.hpp>
#include <string>
#include <vector>

#include "geometry/section.h"

namespace fulmar {
namespace panel {
struct Frame;
}

struct InviscidOptions {
  // Free-stream Mach number for the Karman-Tsien correction, 0 <= mach <= 0.8 (0: incompressible).
  // The correction is trusted to about 0.7 and only while the flow stays subcritical.
  double mach = 0.0;
  // A trailing-edge gap below this fraction of the chord is treated as closed (sharp or cusped):
  // the stream-function equations at the two trailing-edge nodes are replaced by linear
  // extrapolation of the speed to the trailing edge on each side. In (0, 0.01].
  double sharp_te_gap = 1e-6;
  // Wake trajectory length behind the trailing-edge midpoint, in chords, >= 1.
  double wake_length = 1.0;
  // Number of wake nodes including the one at the trailing-edge midpoint; 0 = automatic (the
  // spacing grows geometrically from the mean length of the two trailing-edge panels by a ratio
  // near 1.12). Otherwise 4..1000.
  int wake_nodes = 0;

  // Throws InputError naming the field, its value and the rule it breaks.
  void Validate() const;
};

// The solution at one angle of attack. Vectors have #nodes entries and are reused (not
// reallocated) when a result object is passed again for the same shape.
struct InviscidResult {
  double alpha = 0.0;           // rad
  double mach = 0.0;            // the free-stream Mach number used for the correction
  double cl = 0.0;              // lift coefficient: cl_circulation when mach = 0, else cl_pressure
                                // (cl_circulation when the Karman-Tsien correction is invalid)
  double cl_circulation = 0.0;  // 2 Gamma / (V c) (Kutta-Joukowski; Prandtl-Glauert scaled if M>0)
  double cl_pressure = 0.0;     // from integrating the (corrected) Cp over the section panels
  double cd_pressure = 0.0;     // pressure drag from the same integral (zero in exact 2-D flow)
  double cm = 0.0;              // about the quarter chord, nose-up positive
  Eigen::VectorXd cp;           // Cp at each node (Karman-Tsien corrected when mach > 0)
  Eigen::VectorXd ue;           // surface speed q / V_inf at each node, clockwise positive
                                // (see the sign conventions above); corrected when mach > 0
  double cp_min = 0.0;          // minimum of cp
  int cp_min_node = 0;          // the node where it occurs
  double cp_critical = 0.0;     // sonic Cp for the free-stream Mach (-inf when mach = 0)
  bool critical_exceeded = false;  // cp_min < cp_critical: locally supersonic, results doubtful
  bool converged = false;          // the solution is usable (finite, correction valid)
  int iterations = 0;   // for a target-cl solve: Newton steps taken (0 for a plain solve)
  std::string message;  // what happened, with the measured values

  // The scalar results (no per-node vectors), alpha in degrees; cp_critical and
  // critical_exceeded only when mach > 0.
  nlohmann::json to_json() const;
};

// Influence data for a viscous-inviscid coupling at one angle of attack (Drela & Giles, AIAA J.
// 25(10), 1987 style). Stations: the N+1 surface nodes (in node order), then the Nw wake nodes
// from the trailing-edge midpoint downstream. Incompressible (apply Karman-Tsien on top).
//
// Mass defect at a station: surface m_i = q_i * delta*_i with q the clockwise-positive surface
// speed (so m_i < 0 on the lower surface where the flow goes toward the trailing edge); wake
// m_k = ue_k * delta*_k with ue_k positive downstream. Sources: constant on each panel,
// sigma = d(m_BL)/ds_BL, i.e. sigma_j = -(m_{j+1} - m_j) / L_j on surface panel j (nodes j, j+1)
// and sigma_k = (m_{k+1} - m_k) / L_k on wake panel k (wake nodes k, k+1). Positive sigma blows
// out. The vortex strengths are re-solved with the sources through the factored system, so the
// Kutta condition and constant stream function still hold. Wake edge velocity: the free stream plus
// all vortex and source panels projected on the wake tangent at the node (mean of the adjacent
// wake segments). Seen from a wake node, the wake's sources are not constant per panel but the
// continuous piecewise-linear sheet of panel::wake_source_velocity (same sigma_k at each panel
// midpoint): constant panels would give the node-to-node mode of the wake mass defect almost no
// response, and the coupled solution a free sawtooth in the near wake. The surface stream
// function sees the wake panels' constant sources (far from them, the two differ by a
// redistribution within a panel). Wake node 0 lies on the trailing edge, where the velocity
// is not defined: its edge velocity is the mean trailing-edge speed (q_0 - q_N) / 2, and its row
// of D is the same mean of rows 0 and N.
struct CouplingModel {
  double alpha = 0.0;              // rad
  int surface_nodes = 0;           // N + 1
  int wake_nodes = 0;              // Nw
  Points wake;                     // Nw by 2: the wake streamline, wake(0) = trailing-edge midpoint
  Eigen::VectorXd arc_length;      // #stations: surface arc length from node 0 along the node
                                   // order; wake: distance along the wake from its first node
  Eigen::VectorXd edge_velocity;   // #stations: inviscid q (surface, clockwise positive) and ue
                                   // (wake, downstream positive), over V_inf
  Eigen::MatrixXd mass_influence;  // D, #stations by #stations: d(edge_velocity_i)/d(m_j)
};

// The part of the coupling model that does not depend on the angle of attack: the change of the
// vortex strengths (and of the trailing-edge unknown) per unit constant source on each surface
// panel, through the factored system. (N+2) by N. Build once per shape (O(N^3)) and pass it to
// coupling_model for every angle.
struct SurfaceSourceResponse {
  Eigen::MatrixXd dgamma;
};

class InviscidSolver {
 public:
  // Builds and factors the system for `nodes` (#nodes by 2, counter-clockwise as above, at least 9
  // nodes, no repeated consecutive nodes). Throws InputError for bad nodes or options.
  explicit InviscidSolver(const Points& nodes, const InviscidOptions& options = {});

  // The solution at `alpha_rad`. O(#nodes) work from the two base solutions; no allocation when
  // `out` already holds vectors of the right size.
  void solve(double alpha_rad, InviscidResult& out) const;

  // The angle (rad) at which cl equals `cl_target`. For mach = 0 in closed form (cl_circulation
  // is exactly A cos(alpha) + B sin(alpha)); for mach > 0 by Newton iteration on the Karman-Tsien
  // cl to |cl - cl_target| < 1e-10. `out` holds the solution there; out.converged is false (with a
  // reason) when no angle within +-60 deg gives that cl.
  void solve_for_cl(double cl_target, InviscidResult& out) const;

  // Loads from a given surface speed distribution (#nodes, clockwise positive, incompressible),
  // e.g. a viscous edge velocity: fills cp, ue, cl, cl_circulation, cl_pressure, cd_pressure, cm,
  // cp_min and the critical flag of `out` as solve() would (with Karman-Tsien when mach > 0).
  void loads_from_speed(double alpha_rad, const Eigen::VectorXd& q, InviscidResult& out) const;

  // The wake streamline at `alpha_rad`: #wake nodes by 2, from the trailing-edge midpoint along
  // the trailing-edge bisector, then following the inviscid velocity (Heun steps).
  Points wake_trajectory(double alpha_rad) const;

  // Coupling data at `alpha_rad` (wake trajectory, inviscid edge velocities, D). O(n^3): build it
  // once per shape and angle (or wake), not per Newton step. With `surface` (from
  // surface_source_response() of this solver) only the wake panels' sources are solved for:
  // O(n^2 #wake nodes); the result is the same to round-off.
  CouplingModel coupling_model(double alpha_rad,
                               const SurfaceSourceResponse* surface = nullptr) const;
  // The angle-independent part of coupling_model (see SurfaceSourceResponse).
  SurfaceSourceResponse surface_source_response() const;

  // A full re-solve with given panel sources (the reference for D): constant `sigma` on the N
  // surface panels then on the #wake-1 panels of `wake` (#wake by 2, as from wake_trajectory).
  // Returns the #stations edge velocities in the CouplingModel conventions.
  Eigen::VectorXd edge_velocity_with_sources(double alpha_rad, const Points& wake,
                                             const Eigen::VectorXd& sigma) const;

  // Velocity (u, v) / V_inf of the inviscid flow at a field point away from the section surface.
  Eigen::Vector2d velocity_at(double alpha_rad, const Eigen::Vector2d& point) const;

  const Points& nodes() const { return nodes_; }
  int panel_count() const { return static_cast<int>(nodes_.rows()) - 1; }
  const Eigen::VectorXd& arc_length() const { return arc_; }  // #nodes, from node 0
  double chord() const { return chord_; }
  double te_gap() const { return te_gap_; }  // |node_0 - node_N| / chord
  bool sharp_trailing_edge() const { return sharp_; }
  double rcond() const { return rcond_; }  // LU reciprocal condition estimate
  const InviscidOptions& options() const { return options_; }
  // Surface speeds of the alpha = 0 and alpha = 90 deg base solutions (#nodes).
  const Eigen::VectorXd& base_speed_0() const { return q0_; }
  const Eigen::VectorXd& base_speed_90() const { return q90_; }

 private:
  void surface_speed(double alpha_rad, Eigen::VectorXd& q) const;
  // Frames of the N section panels, then of the trailing-edge gap panel (unless sharp).
  std::vector<panel::Frame> section_frames() const;
  Points nodes_;
  InviscidOptions options_;
  Eigen::PartialPivLU<Eigen::MatrixXd> lu_;
  Eigen::VectorXd q0_, q90_, arc_;
  Eigen::Vector2d te_mid_, te_bisector_, le_, quarter_chord_;
  double chord_ = 1.0, te_gap_ = 0.0, rcond_ = 0.0;
  double cn_ = 0.0, cs_ = 0.0;  // TE gap panel: sigma = cn (q0 - qN), gamma = -cs (q0 - qN)
  bool sharp_ = false;
  double cl_circ_0_ = 0.0, cl_circ_90_ = 0.0;  // circulation cl of the base solutions
};

// Karman-Tsien rule (Tsien 1939): compressible Cp from the incompressible Cp0 at free-stream Mach.
double karman_tsien_cp(double cp0, double mach);
// Karman-Tsien speed relation: compressible q / V_inf from the incompressible q0 / V_inf.
double karman_tsien_speed(double q0, double mach);
// Sonic (critical) pressure coefficient for a free-stream Mach in (0, 1), gamma = 1.4.
double critical_cp(double mach);

}  // namespace fulmar
