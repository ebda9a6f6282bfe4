#pragma once
// The options of the viscous solve (flow, transition, the Newton method's stopping rules and
// step limits) with their one set of rules (Validate), and the status a solve ends in.
#include <string>

#include "solvers/viscous/transition.h"

namespace fulmar::viscous {

// How the Newton iteration of one solve stops early and how far one step may move the state.
// The defaults are the measured ones (see DEVELOPERS.md, "The viscous solver"); changing any of
// them changes which points converge, so re-measure bench_polar's robustness table and regression
// polars when touching them.
struct NewtonOptions {
  // --- Stopping rules (besides ViscousOptions::tolerance and max_iterations) ---
  // Stall: the solve gives up (a fallback start is cheaper) at an iteration whose residual r
  // before the step satisfies all of: the iteration is at least `stall_iterations` after the last
  // one at which a transition interval moved (the first iteration counts as a move: a move raises
  // the residual legitimately), r > `stall_residual`, and r > `stall_ratio` times the residual
  // `stall_window` iterations earlier.
  int stall_iterations = 12;     // Newton iterations, 1 .. 500
  int stall_window = 6;          // Newton iterations, 1 .. stall_iterations
  double stall_ratio = 0.5;      // dimensionless, in (0, 1]
  double stall_residual = 1e-3;  // max |residual| (dimensionless), in (0, 1e3]
  // A converged state whose transition point lies outside its interval is solved again with the
  // interval released, at most `max_settles` times per solve (0 .. 10); that settled solve gets
  // `settle_iterations` further Newton iterations (1 .. 500) to converge, else the converged
  // state before it stands.
  int max_settles = 2;
  int settle_iterations = 8;

  // --- Step limits: the step is scaled by one factor so that every station obeys all of them ---
  // |d theta| <= `theta_change` theta (fraction, in (0, 10]).
  double theta_change = 0.5;
  // |d m| <= `mass_change` |m| + `mass_change_theta` theta (fractions, in (0, 10] and [0, 10]):
  // m relative to itself, but not below a part of theta (m ~ 0 at the stagnation point).
  double mass_change = 0.5;
  double mass_change_theta = 0.05;
  // |d N| <= `amplification_change` on a laminar station (amplification factor, in (0, 20]).
  double amplification_change = 2.0;
  // |d sqrt(Ctau)| <= `shear_change` sqrt(Ctau) on a turbulent or wake station (fraction, (0, 10]).
  double shear_change = 0.5;
  // A step that makes an edge velocity non-positive or a shape factor fall below its floor is
  // halved, at most `max_halvings` times (1 .. 60); after `floor_halvings` halvings (0 ..
  // max_halvings) a step that keeps every ue positive is taken and the stations below the floor
  // are put on it.
  int max_halvings = 20;
  int floor_halvings = 3;
  // The H - 1 of a turbulent or wake station may fall in one step to no less than
  // `shape_drop_fraction` of itself (fraction, in [0, 1)); the measurements behind 0.3 are in
  // step_control.cpp.
  double shape_drop_fraction = 0.3;

  // Throws InputError naming the field (as "newton.<field>"), its value and the rule it breaks.
  void Validate() const;
};

struct ViscousOptions {
  double reynolds = 1.0e6;        // chord Reynolds number, 1e4 .. 1e9
  double mach = 0.0;              // free-stream Mach number, 0 .. 0.7
  double n_crit = kDefaultNCrit;  // critical amplification factor, 0.5 .. 20
  double trip_upper = 1.0;        // forced transition x/c on the upper surface, 0 .. 1 (1: free)
  double trip_lower = 1.0;        // forced transition x/c on the lower surface, 0 .. 1 (1: free)
  int max_iterations = 30;        // Newton iterations, 1 .. 500
  // Stopping rule: converged when the largest absolute residual of all boundary-layer equations
  // (each a dimensionless increment of ln theta, ln H*, ln c or N over one interval) is below
  // `tolerance` after a full (unrelaxed) Newton step; 1e-14 .. 1e-3.
  double tolerance = 1.0e-9;
  double wake_length = 1.0;  // chords of wake behind the trailing edge, 1 .. 10
  NewtonOptions newton;      // early stops and step limits of the Newton iteration
  // Throws InputError naming the field, its value and the rule it breaks.
  void Validate() const;
};

enum class SolveStatus { kConverged, kNotConverged, kFailed };
std::string to_string(SolveStatus status);  // "converged", "not_converged", "failed"
SolveStatus solve_status_from_string(const std::string& text);  // throws InputError

}  // namespace fulmar::viscous
