#pragma once
// Continuation in the angle of attack: the one march that every polar and cl_max search of fulmar
// runs. Viscous solutions are found angle by angle, each warm-started from the last converged
// one; a step that fails or whose lift jumps off the line through the two angles before it is
// made again by halved sub-steps, the march can stop at the stall, and a lift maximum bracketed
// by converged angles is refined by golden-section search. Callers differ only in the options
// (the polar's user grid marched both ways from zero lift; the optimizer's coarse march up from
// 4 deg that stops at the stall) and in the point solver they hand in.
#include <functional>
#include <limits>
#include <nlohmann/json.hpp>
#include <string>
#include <vector>

#include "solvers/viscous/viscous_solver.h"

namespace fulmar::viscous {

// Smallest sub-step (deg) when a warm start fails or jumps and the step is halved from the last
// converged state; also the width (deg) to which a lift maximum is refined.
inline constexpr double kMinSubStep = 0.05;
inline constexpr double kClMaxRefineWidth = 0.05;
// A converged step of a march whose cl differs by more than this from the line through the two
// converged angles before it is checked by halved sub-steps (it may have jumped to another
// solution branch near stall; a real jump is found again by the sub-steps).
inline constexpr double kLiftJumpCheck = 0.05;

// A fall of cl by this much below the highest value so far marks the stall in a polar's summary:
// cl_max is sought only up to that point (a post-stall rise is not the section's maximum). 0.05 is
// ten times the wiggles of converged polars near the peak at Re 2e5 (about 0.005) and below the
// fall of a trailing-edge stall over 2-3 deg past the peak (NACA 4412 at Re 6e6: 0.044 over 2 deg).
inline constexpr double kStallLiftDrop = 0.05;

// One viscous solve: the result at `alpha_deg` warm-started from `warm` (null: cold start).
// ViscousSolver::solve_from or solve_alpha in production; a stand-in in tests.
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

// The first index i >= first (first >= 1) at which cl[i] has fallen more than `drop` below the
// highest of cl[first - 1 .. i - 1]: the stall, beyond which a rise of lift is post-stall (NACA
// 2412 at Re 2e5: 1.09 at 20.5 deg, then 1.38 at 21, above the 1.24 of the stall at 14). -1 when
// cl does not fall so far. `cl`: the lifts of converged angles in increasing alpha.
int stall_index(const std::vector<double>& cl, double drop, int first);

// Which lift jumps a march checks by sub-steps.
enum class JumpCheck {
  kBoth,    // up and down: a polar shows every point, so a jump down must be real too
  kUpward,  // up only: for a march that ends at the first fall (a jump down ends it safely)
};

// How a march is made. Angles in degrees. Defaults: the polar's march.
struct ContinuationOptions {
  // The angle grid: alpha_from, alpha_from + alpha_step, ... up to alpha_to (included when it
  // lies on the grid within 1e-9 of a step). alpha_from <= alpha_to, both within +-60;
  // alpha_step > 0; at most 2001 angles.
  double alpha_from = -4.0;
  double alpha_to = 16.0;
  double alpha_step = 1.0;
  // The march starts at the grid angle nearest the start angle given to march() and goes up to
  // alpha_to, then (march_down) from the start down to alpha_from.
  bool march_down = true;
  // Lead-in: the first grid angle is reached by a march from the start angle itself (cold there,
  // then steps of lead_in_step, each made as a grid step is), since a cold start at high lift
  // fails more often. kFarStart: when the start angle lies more than alpha_step from the first
  // grid angle (a polar whose grid does not reach the zero-lift angle); kColdFailure: only when
  // the cold start at the first grid angle fails. lead_in_step > 0; its results only warm-start.
  enum class LeadIn { kFarStart, kColdFailure };
  LeadIn lead_in = LeadIn::kFarStart;
  double lead_in_step = 1.0;
  // Jumps checked by sub-steps (kLiftJumpCheck).
  JumpCheck jump_check = JumpCheck::kBoth;
  // A failed warm start is approached by sub-steps from the last converged state and then tried
  // cold. false for a point solver that makes these fallbacks itself (ViscousSolver::solve_alpha).
  bool recover_failures = true;
  // Sub-steps also when the grid angle before failed (the last converged state then lies two or
  // more steps back); false: a failure there goes straight to the cold start, and a jump is
  // kept or counted as failed as keep_unconfirmed_jump says.
  bool sub_steps_after_failure = false;
  // A jump that the sub-steps do not reach again: kept as the point (true; a polar shows it,
  // converged) or counted as a failed angle (false; a lift maximum must not come from a branch
  // the section may not have).
  bool keep_unconfirmed_jump = true;
  // Stop the upward march at the stall: from the third converged angle on, a cl more than
  // stop_at_lift_drop below the highest one from the second converged angle on (stall_index
  // with first = 2; the first angle may come from a cold start or lead-in and is no reference).
  // Infinity (the default): march the whole grid. >= 0.
  double stop_at_lift_drop = std::numeric_limits<double>::infinity();
  // Stop the upward march after this many failed angles in a row once two angles converged
  // (0: never). >= 0.
  int stop_after_failures = 0;
  // After the march, a failed angle next to a converged one is tried warm-started from it (far
  // side from the start first; repeated while angles converge).
  bool back_fill = true;
  // Creep: when the upward march ends on a failed angle just above its highest converged cl, it
  // goes on from that angle in steps of creep_step (single attempts, each warm-started from the
  // last) while they converge and cl rises, up to 60 deg. 0: no creep; else
  // 0 < creep_step < alpha_step.
  double creep_step = 0.0;

  // Throws InputError naming the field, its value and the rule it breaks.
  void Validate() const;
  // The grid angles (deg), increasing.
  std::vector<double> angles() const;
};

// The result of a march.
struct Continuation {
  // One result per grid angle, increasing alpha, converged or not (a point with converged = false
  // holds the last Newton iterate, not a solution). Angles the march did not reach (it stopped)
  // have converged false, iterations 0 and a reason that says so.
  std::vector<ViscousResult> points;
  std::vector<ViscousResult> sub_steps;  // converged off-grid results of the sub-step marches
  std::vector<ViscousResult> creep;      // converged creep steps, increasing alpha
  enum class Stop { kEnd, kStall, kFailures };
  Stop stop = Stop::kEnd;  // why the upward march ended
  int last_up = -1;        // index of the highest grid angle the upward march solved (-1: none)
  int solves = 0;          // point-solver calls (grid, lead-in, fallbacks, sub-steps, creep)

  // Keys solves, stop ("end", "stall", "failures"), angles, converged, sub_steps, creep.
  nlohmann::json to_json() const;
};

// The march over options.angles() from the grid angle nearest `alpha_start_deg` (deg; also where
// a lead-in starts). Each grid step is one call of `solve` warm-started from the last converged
// state (cold when there is none). A step that fails (with recover_failures) or converges with a
// checked jump of more than kLiftJumpCheck off the line through the two converged angles before
// it is approached by sub_step_march from the last converged state (each sub-step one call of
// `attempt`, a single solve whose failure just halves the step); then, as the options say, the
// jumped result or a cold start. The march goes on from the last converged state after a
// failure. Throws InputError for bad options; flow failures are in the points.
Continuation march(const PointSolver& solve, const PointSolver& attempt, double alpha_start_deg,
                   const ContinuationOptions& options);

// A refined lift maximum.
struct LiftMaximum {
  bool refined = false;  // false: no interior maximum among the known samples
  double cl_max = 0.0;   // the highest sample made or known
  double alpha = 0.0;    // deg
  double bracket = 0.0;  // final width of the search bracket (deg)
  int solves = 0;        // calls of the point solver
  int failures = 0;      // samples that did not converge
  std::string note;      // "refined by golden-section search ..."
};

// Golden-section refinement of the highest converged result of `known` (any order) between its
// converged neighbours in alpha, to a bracket narrower than kClMaxRefineWidth (at most 60
// solves). Each sample is warm-started from the nearest converged sample; a sample more than
// kLiftJumpCheck above the parabola through the bracket's three points is made again by
// sub_step_march (with `solve`) from its nearest sample, since it may have jumped to another
// solution branch. refined false when the highest result has no converged neighbour on a side.
LiftMaximum refine_lift_maximum(const std::vector<ViscousResult>& known, const PointSolver& solve);

}  // namespace fulmar::viscous
