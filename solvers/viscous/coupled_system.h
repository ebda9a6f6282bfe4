#pragma once
// The Newton system and state of one coupled viscous-inviscid solve (internal to the viscous
// solver): the unknowns (c, theta, m) per station, the station layout around the stagnation
// point, the discrete switches between Newton steps, the residuals and Jacobian, and the step.
// Its member functions are defined by responsibility in
//   stations.cpp           layout, stagnation point model, station states;
//   starts.cpp             cold start (boundary-layer marches) and warm start;
//   discrete_switches.cpp  stagnation relocation and transition interval moves;
//   assembly.cpp           residuals and Jacobian (and the difference Jacobian);
//   step_control.cpp       the Newton step, its limits and the shape-factor floors.
// Stations: the #nodes surface nodes (node order) then the wake nodes; per station three
// equations (0 amplification or lag, 1 momentum, 2 kinetic energy) and three unknowns.
#include <Eigen/Core>
#include <array>
#include <string>
#include <utility>
#include <vector>

#include "solvers/inviscid/panel_solver.h"
#include "solvers/viscous/block_linear_solver.h"
#include "solvers/viscous/boundary_layer.h"
#include "solvers/viscous/viscous_options.h"
#include "solvers/viscous/viscous_solver.h"

namespace fulmar::viscous::detail {

// Everything about one solve that depends on the angle and the stagnation node.
struct Layout {
  int n_surface = 0, n_wake = 0, n = 0;  // stations
  int stag = 0;                          // upper-side first node; lower-side first is stag + 1
  Eigen::VectorXd sign;                  // +1 upper and wake, -1 lower
  Eigen::VectorXd ue_inviscid;           // boundary-layer sense (> 0 downstream)
  // D in boundary-layer sense: sign_i sign_j D_ij (row-major: the Newton solve combines its rows)
  RowMatrix d;
  Eigen::VectorXd s;    // arc length: surface from node 0, wake from TE
  Eigen::VectorXd gap;  // wake base thickness per station (0 on the surface)
  Eigen::VectorXd x;    // x/c of the surface nodes
};

// Wake base thickness (chord units) at `distance` (chords) behind a trailing edge of base
// height h (chords).
double wake_gap(double h, double distance);

// The stagnation node of the node-sense speeds q (#stations): the node k with q_k > 0 >= q_k+1
// nearest to the leading-edge node `le` (le when there is none).
int stagnation_node(const Eigen::VectorXd& q, int n_surface, int le);

// The Newton system and state of one solve. Holds references to the solver, the coupling model
// and the options it was made with (they must outlive it).
class CoupledSystem {
 public:
  CoupledSystem(const InviscidSolver& inviscid, const CouplingModel& model,
                const ViscousOptions& options, const FlowConditions& flow);

  const Layout& layout() const { return lay_; }

  // Sets the stagnation node and the signs that go with it.
  void set_stagnation(int stag);

  // Cold start: march both surfaces and the wake on the inviscid edge velocity. (A second march
  // on the speeds of the marched layer's viscous flow, or on the inviscid flow at the angle of
  // its circulation, starts Newton further from the solution near the stagnation point.)
  void cold_start() { cold_march(model_.edge_velocity); }

  // One cold-start march on the node-sense speeds q (#stations).
  void cold_march(const Eigen::VectorXd& q);

  // The marches of cold_start on the boundary-layer-sense speeds cold_ue_.
  void march_on_cold_speed();

  // Warm start from a state of this shape (stations and a stagnation node inside the surface);
  // false, with nothing changed, when it does not fit.
  bool warm_start(const ViscousState& st);

  // Edge velocities from the current mass defects.
  void update_edge_velocity();

  // A laminar layer within two nodes of the stagnation point is close to the stagnation
  // similarity state, H = 2.22 for Hiemenz flow (Falkner-Skan m = 1; Schlichting, Boundary-Layer
  // Theory, table of the Falkner-Skan solutions, from memory); H outside (1.8, 4) there is not a
  // state of it (1.8 is beyond the most accelerated similar flows, 4 is laminar separation).
  static constexpr double kStagnationH = 2.2;
  static constexpr double kNearStagnationHMin = 1.8, kNearStagnationHMax = 4.0;

  // Moves the stagnation node when a first station's speed has turned; returns true if moved.
  bool relocate_stagnation();

  // Stations of one side in boundary-layer order (side 0 upper, 1 lower).
  std::vector<int> side_nodes(int side) const;

  // Where the stagnation point lies between the nodes k = stag and k + 1, as the fraction t of
  // that interval from the first node of `side` (t = u_k / (u_k + u_k+1) on the upper side), from
  // the current or inviscid speeds. The first station of a side is modelled at no less than
  // kMinStagnationFraction of the interval (smoothly): a node that sits on the stagnation point
  // would otherwise carry ue ~ 0, where delta* = m / ue and ln ue are ill-conditioned and the
  // Newton system near-singular. The model moves the stagnation point by at most that fraction of
  // one leading-edge panel (~1e-4 chord).
  static constexpr double kMinStagnationFraction = 0.05;
  struct StagnationFraction {
    double t = 0.5, sum = 1.0;       // modelled fraction and u_k + u_k+1
    double d_uk = 0.0, d_uk1 = 0.0;  // dt / du_k, dt / du_k+1
  };
  // The fraction for `side` from the current speeds (after a start) or the cold-start speeds.
  StagnationFraction stagnation_fraction(int side) const;
  // The same for the speeds a, b at the nodes stag and stag + 1.
  static StagnationFraction stagnation_fraction(int side, double a, double b);

  // Arc length from the stagnation point to the first station of a side, and its derivatives
  // with respect to ue at the two nodes around the stagnation point.
  double first_xi(int side, double* d_uk = nullptr, double* d_uk1 = nullptr) const;

  // The edge speed the boundary layer sees at the first station of a side: t (u_k + u_k+1), the
  // stagnation-point velocity gradient times first_xi (equal to the node's own speed unless the
  // node is within the modelled minimum distance of the stagnation point); derivatives as above.
  double first_speed(int side, double* d_uk = nullptr, double* d_uk1 = nullptr) const;

  // Side whose first station is node i, or -1.
  int first_station_side(int i) const;

  // Arc length along the side (same origin as the stations' x) of the forced transition point.
  double trip_arc(int side, const std::vector<int>& idx, const Eigen::VectorXd& x) const;

  // Trip fraction of the interval between BL positions p-1 and p of a side.
  double trip_fraction(int side, int i1, int i2) const;

  // The speed that converts m into delta* = m / ue: bounded below, because at a node on the
  // stagnation point ue ~ 0 is set by tiny mass-defect effects and m / ue would be meaningless
  // there (m -> 0 with ue; the similarity equations then fix delta* through m / kMinDstarSpeed).
  static constexpr double kMinDstarSpeed = 1e-4;
  double dstar_speed(int i) const;

  // The state of station i (theta, delta* in chords; ue, on free-stream speed, as the boundary
  // layer sees it: first_speed at a side's first station).
  StationState station(int i) const;

  // The state the two trailing-edge stations hand to the wake: thetas and delta*s (with the
  // trailing-edge gap) added, sqrt(Ctau) theta-weighted, the mean speed.
  StationState merged_state() const;

  // Station with ue from the current solution if set, else inviscid.
  StationState station_guess(int i) const;

  // sqrt(Ctau) a trailing-edge station hands to the wake (a laminar one as if it had just
  // become turbulent).
  double turbulent_c(int i, const StationState& s) const;

  // Before each Newton step: move the stagnation node to where the speed changes sign (the BL
  // positions of both sides shift with it), then decide the layer kinds.
  // At most this many one-node moves of the stagnation node per iteration (a bound on the loop).
  static constexpr int kMaxStagnationMoves = 40;
  void prepare_iteration();

  // turbulent_c and its derivatives with respect to the station's (c, theta, delta*, ue).
  std::array<double, 5> turbulent_c_linearized(int i, const StationState& s) const;

  // Decides laminar/turbulent per station from the current state (amplification, trips). The
  // transition interval moves by at most kMaxTransitionMove intervals per Newton iteration: a
  // transient state in early iterations can put the e^N point far from where it settles, and a
  // large jump of the laminar/turbulent split throws Newton far off. A solve is converged only
  // when that limit is not active (transition_limited() false).
  static constexpr int kMaxTransitionMove = 2;
  // A band of 0.15 interval lengths: wide enough to stop the flipping, narrow enough that nearby
  // shapes reach the same solution (at 0.25 a 1e-3 change of one CST coefficient could land a
  // climb-point solution in another interval and change its cd by 10 %).
  static constexpr double kTransitionHysteresis = 0.15;
  // Shape factors that tell a station that changes kind whether its state fits the new kind:
  // a turbulent station with H above kKeepStateH is reattaching from a bubble (laminar-like); a
  // laminar one above kSeparatedLaminarH is separated (laminar separation at H_k about 4.0 in the
  // closures of closures.h).
  static constexpr double kKeepStateH = 2.4;
  static constexpr double kSeparatedLaminarH = 3.5;
  void assign_transition();

  // The transition intervals implied by the layer kinds (after a start).
  void take_transition_from_kinds();
  bool transition_limited() const { return transition_limited_; }

  // A converged state whose transition point lies outside its interval (w < 0 or w > 1, which
  // the hysteresis band of assign_transition allows) is a second representation of a solution
  // whose transition point lies in the neighbouring interval, and not an equivalent one (the
  // station in between carries the wrong layer kind). Releases the hysteresis of such a side
  // for the next assignment, at most NewtonOptions::max_settles times per solve, so that the solve
  // goes on to the representation with w in [0, 1]: one solution whatever the path (warm start,
  // angle step, nearby shape).
  static constexpr double kSettleSlack = 1e-6;
  // Whether a side's transition point lies outside its interval by more than kSettleSlack and
  // may still be settled.
  bool outside_interval(int side) const;
  bool needs_settling() const { return outside_interval(0) || outside_interval(1); }
  // Releases the hysteresis of the sides outside their interval (counts one settle).
  void settle_transition();

  // Arc length from the stagnation point of BL position p of a side (idx: side_nodes(side)).
  double xi_of(int side, const std::vector<int>& idx, int p) const;

  // The Jacobian is kept in two parts, J = L + G D P (see block_linear_solver.h): L holds each
  // equation's direct dependence on the (c, theta, m) of the one or two stations of its interval,
  // G its dependence on the edge velocities.

  // Adds dR/d(c, theta, delta*, ue) of station i to row r of the Jacobian (chain rule through
  // delta* = m / ue and ue = ue_inv + D m; at a first station through first_speed).
  void add_row(int r, int i, double dc, double dth, double dds, double due);

  // Stations in marching order: upper side from the stagnation point, lower side, wake.
  void march_order(std::vector<int>& order) const;

  // The Newton step for the current Jacobian and residuals into step_ (var-major: c, theta, m
  // blocks of #stations each), solved by jac_ (block_linear_solver.h); false when it is not
  // finite.
  bool solve_newton();

  // The dense Jacobian L + G D P (var-major columns), for the consistency test.
  Eigen::MatrixXd dense_jacobian() const { return jac_.dense(lay_.d); }

  // Residuals and Jacobian at the current state; returns max |residual|.
  double assemble();

  // The closures of station i as a layer of kind `kind` (gap: its wake base thickness) in this
  // assembly: each station is the end of one interval and the start of the next, and closes
  // once for both.
  const Closure<StationDual>* closure_of(int i, LayerKind kind, double gap);

  // One limited Newton step; returns the relaxation factor used (0 if the solve failed).
  double newton_step();

  // State = saved state + rlx * step, with the positivity floors.
  void apply_step(double rlx);

  // The Jacobian of assemble() by central differences (kinds and transition intervals held),
  // column by column, with relative steps; restores the state. For the consistency test.
  Eigen::MatrixXd difference_jacobian(double rel_step);
  Eigen::MatrixXd jacobian() const { return dense_jacobian(); }

  // Where the largest residual is: (station, equation).
  std::pair<int, int> worst_residual() const;
  const std::string& limited_by() const { return limited_by_; }
  void mark_ue_valid() { ue_valid_ = true; }
  const Eigen::VectorXd& ue() const { return ue_; }
  const Eigen::VectorXd& c() const { return c_; }
  const Eigen::VectorXd& theta() const { return th_; }
  const Eigen::VectorXd& mu() const { return mu_; }
  const std::vector<LayerKind>& kinds() const { return kinds_; }
  int transition_interval(int side) const { return transition_interval_[side]; }
  double transition_weight(int side) const { return transition_weight_[side]; }
  const FlowConditions& flow() const { return flow_; }

 private:
  const InviscidSolver& inv_;
  const CouplingModel& model_;
  const ViscousOptions& opt_;
  FlowConditions flow_;
  Layout lay_;
  int le_ = 0;
  double te_gap_ = 0.0;
  BlockLinearSystem jac_;                      // the Newton Jacobian of the last assembly
  std::vector<int> order_;                     // marching order of the stations
  std::vector<Closure<StationDual>> closure_;  // per station, this assembly's (closure_of)
  std::vector<int> closure_kind_;              // the LayerKind of closure_, -1: none yet
  Eigen::VectorXd res_, step_;
  Eigen::VectorXd c_, th_, mu_, ue_;
  std::vector<LayerKind> kinds_;
  bool ue_valid_ = false;
  std::string limited_by_;
  Eigen::VectorXd saved_c_, saved_th_, saved_mu_;
  std::vector<double> h_floor_, h_before_;  // per station, before the step (newton_step)
  Eigen::VectorXd cold_ue_;                 // the speeds of the cold-start marches
  int transition_interval_[2] = {-1, -1};
  int previous_transition_[2] = {-1, -1};  // BL position of the last assignment (-1: none yet)
  bool transition_limited_ = false;
  double transition_weight_[2] = {1.0, 1.0};
  bool release_[2] = {false, false};  // hysteresis released for the next assignment
  int settles_ = 0;
};

}  // namespace fulmar::viscous::detail
