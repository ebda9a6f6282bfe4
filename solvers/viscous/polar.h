#pragma once
// Drag polar of one section at one Reynolds number: viscous solutions over a grid of angles of
// attack by continuation (each angle warm-started from its converged neighbour), and the summary
// a designer reads from it (maximum lift, zero-lift angle, lift slope, aerodynamic centre,
// minimum drag, low-drag range).
#include <functional>
#include <nlohmann/json.hpp>
#include <string>
#include <vector>

#include "solvers/viscous/viscous_solver.h"

namespace fulmar::viscous {

struct PolarOptions {
  // The angle grid in degrees: alpha_from, alpha_from + alpha_step, ... up to alpha_to (included
  // when it lies on the grid within 1e-9 of a step). alpha_from <= alpha_to, both within +-60;
  // alpha_step > 0; at most 2001 angles.
  double alpha_from = -4.0;
  double alpha_to = 16.0;
  double alpha_step = 1.0;
  // Refine a bracketed lift maximum by golden-section search (warm-started solves) until the
  // bracket is narrower than kClMaxRefineWidth.
  bool refine_cl_max = true;
  // Throws InputError naming the field, its value and the rule it breaks.
  void Validate() const;
  // The grid angles (deg), increasing.
  std::vector<double> angles() const;
};

// Smallest sub-step (deg) when a warm start fails and the step is halved from the last converged
// state; also the width (deg) to which a lift maximum is refined.
inline constexpr double kMinSubStep = 0.05;
inline constexpr double kClMaxRefineWidth = 0.05;
// A converged step of a march whose cl differs by more than this from the line through the two
// converged angles before it is checked by halved sub-steps (it may have jumped to another
// solution branch near stall; a real jump is found again by the sub-steps).
inline constexpr double kLiftJumpCheck = 0.05;

// A fall of cl by this much below the highest value so far marks the stall: cl_max is sought
// only up to that point (a post-stall rise is not the section's maximum). 0.05 is ten times the
// wiggles of converged polars near the peak at Re 2e5 (about 0.005) and below the fall of a
// trailing-edge stall over 2-3 deg past the peak (NACA 4412 at Re 6e6: 0.044 over 2 deg).
inline constexpr double kStallLiftDrop = 0.05;

// Relative drag rise that bounds the low-drag range: the range is the cl interval around the
// drag minimum where cd <= (1 + kBucketDragRise) cd_min.
inline constexpr double kBucketDragRise = 0.10;

// What a polar says about the section. Only converged points are used. Angles in degrees,
// coefficients on the chord.
struct PolarSummary {
  // Maximum lift. has_cl_max: a maximum was found inside the range, either bracketed (cl falls
  // at a converged angle after it: cl_max_bracketed) or at the last converged angle before the
  // solutions stop converging (not bracketed: then a lower bound of the true maximum, since stall
  // and solver failure cannot be told apart). has_cl_max is false when cl still rises at the end
  // of the range or falls over all of it; `note` says which case applies.
  bool has_cl_max = false;
  bool cl_max_bracketed = false;
  double cl_max = 0.0, alpha_cl_max = 0.0;
  // Zero lift: linear interpolation between the two converged neighbours whose cl changes sign
  // from <= 0 to > 0 (the crossing nearest alpha = 0 when there are several; without a crossing,
  // extrapolated from the two converged end points nearest cl = 0 when it lies within one of
  // their spacings outside them, with a note). The linear range is
  // the converged points with alpha_zero_lift - 2 <= alpha <= alpha_zero_lift + 6 deg; the lift
  // slope (per deg) is the least-squares slope of cl(alpha) there and x_ac = 0.25 - dcm/dcl the
  // aerodynamic centre (x/c) from the least-squares slope of cm(cl) (cm about the quarter chord).
  // cm_zero_lift: cm interpolated at the same crossing. All false/unset without a crossing or
  // with fewer than two points in the linear range.
  bool has_zero_lift = false;
  double alpha_zero_lift = 0.0, lift_slope_per_deg = 0.0, cm_zero_lift = 0.0, x_ac = 0.0;
  bool has_linear_range = false;  // lift_slope_per_deg and x_ac are set
  // Minimum drag: the vertex of the parabola cd(cl) through the lowest converged cd and its two
  // converged neighbours (in alpha order) when it lies between them, else the lowest cd itself.
  bool has_cd_min = false;
  double cd_min = 0.0, cl_at_cd_min = 0.0;
  // Low-drag range (the laminar bucket when the section has one): the cl interval containing
  // cl_at_cd_min over which cd <= (1 + kBucketDragRise) cd_min, its edges linearly interpolated
  // between converged neighbours. has_bucket only when cd rises through that level on both
  // sides inside the range of converged points (an edge at the end of the range is unknown).
  bool has_bucket = false;
  double bucket_cl_lower = 0.0, bucket_cl_upper = 0.0;
  std::string note;  // what could not be determined, and why; how cl_max was found

  // Keys cl_max, alpha_cl_max, has_cl_max, cl_max_bracketed, alpha_zero_lift,
  // lift_slope_per_deg, cm_zero_lift, x_ac, cd_min, cl_at_cd_min (null when not available),
  // bucket ({cl_lower, cl_upper, cd_limit} or null), note.
  nlohmann::json to_json() const;
};

// A polar. `points`: one result per grid angle, increasing alpha, converged or not (a point with
// converged = false holds the last Newton iterate, not a solution; the summary ignores it). The
// results keep their per-node vectors and warm-start state (a few tens of kB per point at 160
// panels), so a caller can plot any point's boundary layer.
struct Polar {
  std::vector<ViscousResult> points;
  PolarSummary summary;
  int solves = 0;  // solver calls made (grid, fallbacks, sub-steps, refinement)
};

// One viscous solve: the result at `alpha_deg` warm-started from `warm` (null: cold start).
// ViscousSolver::solve_alpha in production; a stand-in in tests.
using PointSolver = std::function<ViscousResult(double alpha_deg, const ViscousState* warm)>;

// A converged angle of a continuation (deg) and its lift; valid false: none.
struct LiftPoint {
  double alpha = 0.0, cl = 0.0;
  bool valid = false;
};

// How far the lift of the converged `r` lies above (+) or below (-) the line through the two
// converged angles `before` and `anchor` of a march, at r.alpha; 0 when there is no line
// (before.valid false, the same angle twice, or r not converged).
double lift_jump(const LiftPoint& before, const ViscousResult& anchor, const ViscousResult& r);

// Continuation by halved sub-steps from the converged `anchor` to `target` (deg): the first step
// is half the interval; a step that fails, or converges with |lift_jump| > kLiftJumpCheck from
// the last two angles reached (except at the smallest step, above kMinSubStep, where any
// converged one is taken), is halved. Returns the result at `target`, or one with converged
// false (and a reason) when it was not reached. The converged intermediate results are appended
// to `sub_steps` (may be null), and `anchor` and `before` become the last two angles reached,
// so a march can go on from there.
ViscousResult sub_step_march(const PointSolver& solve, double target, ViscousResult& anchor,
                             LiftPoint& before, std::vector<ViscousResult>* sub_steps);

// The polar of `solver` over options.angles(). Continuation: the first angle solved is the grid
// angle nearest the inviscid zero-lift angle (cold; when the grid does not reach the zero-lift
// angle, warm from a lead-in march from it in steps of at most alpha_step and 1 deg); from there
// the march goes up to alpha_to and down to alpha_from, each angle warm-started from the last
// converged state. A warm start that fails, or converges with a lift more than kLiftJumpCheck
// off the line through the two converged angles before it, is (when the previous grid angle
// converged) approached by sub-steps from the last converged state, each checked in the same
// way, halving down to kMinSubStep; then the jumped warm result is taken if it converged, else a
// cold start is tried. Each solve is one ViscousSolver::solve_from (these fallbacks replace
// solve_alpha's). A point that still
// fails is recorded with converged = false and the march goes on from the last converged state;
// after the march, a failed angle next to a converged one is tried warm-started from it (far
// side first; repeated while angles converge). Then the summary (summarize_polar) and, with
// options.refine_cl_max, refine_cl_max. Throws InputError for bad options; flow failures are in the
// points.
Polar sweep_polar(const ViscousSolver& solver, const PolarOptions& options);

// The same with any point solver; `alpha_start_deg` picks the first angle (nearest grid angle).
Polar sweep_polar(const PointSolver& solve, double alpha_start_deg, const PolarOptions& options);

// The summary of `points` (any order; only converged ones count), without further solves.
// `extra`: more converged results (e.g. the sweep's sub-steps) that count for the lift maximum
// only, when they lie between the first converged point and the last point.
PolarSummary summarize_polar(const std::vector<ViscousResult>& points,
                             const std::vector<ViscousResult>* extra = nullptr);

// Golden-section refinement of a bracketed lift maximum (summary.cl_max_bracketed) between the
// converged grid neighbours of summary.alpha_cl_max, to a bracket narrower than
// kClMaxRefineWidth. `known`: converged results (any order) to warm-start from (the nearest in
// alpha is used); a sample more than kLiftJumpCheck above the parabola through the bracket's
// three points is made again by sub_step_march from its nearest sample (it may have jumped to
// another solution branch). Updates cl_max, alpha_cl_max and note; leaves the summary as is when
// it is not bracketed. Returns the number of solves made.
int refine_cl_max(const std::vector<ViscousResult>& known, const PointSolver& solve,
                  PolarSummary& summary);

}  // namespace fulmar::viscous
