#pragma once
// Drag polar of one section at one Reynolds number: viscous solutions over a grid of angles of
// attack by continuation (each angle warm-started from its converged neighbour), and the summary
// a designer reads from it (maximum lift, zero-lift angle, lift slope, aerodynamic centre,
// minimum drag, low-drag range).
#include <functional>
#include <nlohmann/json.hpp>
#include <string>
#include <vector>

#include "solvers/viscous/continuation.h"
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

// The polar of `solver` over options.angles(): the continuation of continuation.h (march) with
// its default options, each solve one ViscousSolver::solve_from (the march's fallbacks replace
// solve_alpha's). The first angle solved is the grid angle nearest the inviscid zero-lift angle
// (cold; when the grid does not reach the zero-lift angle, warm from a lead-in march from it in
// steps of at most alpha_step and 1 deg); the march goes up to alpha_to and down to alpha_from,
// checks lift jumps both ways, recovers failed warm starts by sub-steps (when the previous grid
// angle converged) and a cold start, keeps a jump the sub-steps do not reach again, and
// back-fills failed angles from converged neighbours. Then the summary (summarize_polar, with
// the sub-steps as extra lift samples) and, with options.refine_cl_max, refine_cl_max on the
// converged results within two steps of the maximum. Throws InputError for bad options; flow
// failures are in the points.
Polar sweep_polar(const ViscousSolver& solver, const PolarOptions& options);

// The same with any point solver; `alpha_start_deg` picks the first angle (nearest grid angle).
Polar sweep_polar(const PointSolver& solve, double alpha_start_deg, const PolarOptions& options);

// The summary of `points` (any order; only converged ones count), without further solves.
// `extra`: more converged results (e.g. the sweep's sub-steps) that count for the lift maximum
// only, when they lie between the first converged point and the last point.
PolarSummary summarize_polar(const std::vector<ViscousResult>& points,
                             const std::vector<ViscousResult>* extra = nullptr);

// refine_lift_maximum (continuation.h) of a bracketed lift maximum (summary.cl_max_bracketed):
// `known` are converged results (any order) around it to bracket and warm-start from. Updates
// cl_max, alpha_cl_max and note; leaves the summary as is when it is not bracketed or the
// highest known result has no neighbour on a side. Returns the number of solves made.
int refine_cl_max(const std::vector<ViscousResult>& known, const PointSolver& solve,
                  PolarSummary& summary);

}  // namespace fulmar::viscous
