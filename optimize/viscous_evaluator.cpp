#include "optimize/viscous_evaluator.h"

#include <algorithm>
#include <cmath>
#include <sstream>

#include "common/error.h"
#include "geometry/panelling.h"
#include "solvers/viscous/continuation.h"
#include "solvers/viscous/polar.h"
#include "solvers/viscous/viscous_solver.h"

namespace fulmar::optimize {
namespace {

viscous::ViscousOptions options_for(const FlowCondition& flow) {
  viscous::ViscousOptions o;
  o.reynolds = flow.reynolds;
  o.mach = flow.mach;
  o.n_crit = flow.ncrit;
  o.trip_upper = flow.trip_upper;
  o.trip_lower = flow.trip_lower;
  return o;
}

PointResult point_from(const viscous::ViscousResult& r) {
  PointResult p;
  p.converged = r.converged;
  p.reason = r.converged ? std::string() : r.reason;
  p.residual = std::isfinite(r.residual) ? r.residual : 1e300;
  p.iterations = r.iterations;
  p.alpha_deg = r.alpha;
  p.cl = r.cl;
  p.cd = r.cd;
  p.cd_friction = r.cd_friction;
  p.cd_pressure = r.cd_pressure;
  p.cm = r.cm;
  p.transition_upper = r.transition_upper;
  p.transition_lower = r.transition_lower;
  const double values[] = {p.alpha_deg, p.cl, p.cd, p.cd_friction, p.cd_pressure, p.cm};
  for (double v : values) {
    if (!std::isfinite(v)) {
      p = PointResult{};
      p.reason = "the solver returned a non-finite value";
      return p;
    }
  }
  return p;
}

Points nodes_for(const Section& section, int panels) {
  PanellingOptions po;
  po.panels = panels;
  return panel_nodes(section, po);
}

// The cl_max march: 2-deg steps up from 4 deg (viscous::march), each grid step one
// ViscousSolver::solve_alpha (with its own warm -> cold -> sub-step fallbacks), stopped at the
// first fall of cl (from the third converged angle on) or after two failed angles in a row; a
// failed cold start at 4 deg is replaced by one from 0 deg; a step whose lift jumps up more than
// viscous::kLiftJumpCheck off the line through the two before it is made again by single-solve
// sub-steps and counts as failed when they do not reach it (a jump down ends the march anyway).
viscous::ContinuationOptions cl_max_march() {
  viscous::ContinuationOptions o;
  o.alpha_from = 4.0;
  o.alpha_to = 26.0;
  o.alpha_step = 2.0;
  o.march_down = false;
  o.lead_in = viscous::ContinuationOptions::LeadIn::kColdFailure;
  o.lead_in_step = 4.0;  // from 0 deg straight to the first angle
  o.jump_check = viscous::JumpCheck::kUpward;
  o.recover_failures = false;
  o.sub_steps_after_failure = true;
  o.keep_unconfirmed_jump = false;
  o.stop_at_lift_drop = 0.0;
  o.stop_after_failures = 2;
  o.back_fill = false;
  o.creep_step = 0.5;
  return o;
}

}  // namespace

ClMaxResult find_cl_max(const viscous::ViscousSolver& solver, int* solves) {
  ClMaxResult out;
  const viscous::PointSolver with_fallbacks = [&solver](double a, const viscous::ViscousState* w) {
    return solver.solve_alpha(a, w);
  };
  const viscous::PointSolver single = [&solver](double a, const viscous::ViscousState* w) {
    return solver.solve_from(a, w);
  };
  const viscous::Continuation c = viscous::march(with_fallbacks, single, 0.0, cl_max_march());
  if (solves) *solves = c.solves;
  std::vector<viscous::ViscousResult> done;  // converged grid angles, increasing alpha
  for (const viscous::ViscousResult& p : c.points)
    if (p.converged) done.push_back(p);
  if (done.size() < 2) {
    out.reason = "fewer than two converged points in the angle sweep 4..26 deg";
    return out;
  }
  std::size_t best = 0;
  for (std::size_t i = 1; i < done.size(); ++i)
    if (done[i].cl > done[best].cl) best = i;
  out.cl_max = done[best].cl;
  out.alpha_deg = done[best].alpha;
  out.found = true;
  if (best + 1 == done.size()) {
    if (c.points[c.last_up].converged) {
      out.found = false;
      out.reason = "no peak of cl up to 26 deg";
      return out;
    }
    // The solutions stop converging beyond the best point: the march crept on from it, and the
    // last converged value is cl_max (a lower bound).
    if (!c.creep.empty()) {
      out.cl_max = c.creep.back().cl;
      out.alpha_deg = c.creep.back().alpha;
    }
    return out;
  }
  if (best == 0) return out;
  // With solve_alpha's fallbacks: a failed solve inside the bracket would steer the search away
  // from the peak (seen at 200 panels as drops of 0.017 between shapes 1e-3 apart).
  const viscous::LiftMaximum m = viscous::refine_lift_maximum(done, with_fallbacks);
  if (solves) *solves += m.solves;
  out.cl_max = m.cl_max;
  out.alpha_deg = m.alpha;
  return out;
}

namespace {

class ViscousEvaluator final : public SectionEvaluator {
 public:
  std::string description() const override {
    return "viscous-inviscid (linear-vorticity panels, integral boundary layer, e^N transition)";
  }

  // No catch here: the solver reports flow failures as a status, and what it throws is an
  // input error (InputError: bad nodes or options) that must reach the user, not pass for a
  // failed analysis.
  SectionAnalysis analyse(const Section& section, const AnalysisRequest& request) const override {
    SectionAnalysis out;
    const Points nodes = nodes_for(section, request.panels);
    for (const TargetPoint& t : request.points) {
      const viscous::ViscousSolver solver(nodes, options_for(t.flow));
      out.points.push_back(point_from(solver.solve_cl(t.cl)));
    }
    if (request.cl_max_at) {
      const viscous::ViscousSolver solver(nodes, options_for(*request.cl_max_at));
      out.cl_max = find_cl_max(solver);
    }
    return out;
  }

  // The polar as `fulmar polar` makes it (viscous::sweep_polar, without cl_max refinement).
  std::vector<PointResult> polar(const Section& section, const FlowCondition& flow,
                                 const std::vector<double>& alphas_deg, int panels) const override {
    std::vector<PointResult> out(alphas_deg.size());
    if (alphas_deg.empty()) return out;
    viscous::PolarOptions o;
    o.alpha_from = alphas_deg.front();
    o.alpha_to = alphas_deg.back();
    if (alphas_deg.size() > 1) o.alpha_step = alphas_deg[1] - alphas_deg[0];
    o.refine_cl_max = false;
    const std::vector<double> grid = o.angles();
    bool uniform = grid.size() == alphas_deg.size();
    for (std::size_t i = 0; uniform && i < grid.size(); ++i)
      uniform = std::abs(grid[i] - alphas_deg[i]) <= 1e-9 * std::max(1.0, std::abs(grid[i]));
    if (!uniform)
      throw InputError("polar angles: not an increasing grid of equal steps from " +
                       std::to_string(alphas_deg.front()) + " to " +
                       std::to_string(alphas_deg.back()) + " deg");
    const viscous::ViscousSolver solver(nodes_for(section, panels), options_for(flow));
    const viscous::Polar p = viscous::sweep_polar(solver, o);
    for (std::size_t i = 0; i < out.size(); ++i) out[i] = point_from(p.points[i]);
    return out;
  }

  Points pressure(const Section& section, const FlowCondition& flow, double cl,
                  int panels) const override {
    const Points nodes = nodes_for(section, panels);
    const viscous::ViscousSolver solver(nodes, options_for(flow));
    const viscous::ViscousResult r = solver.solve_cl(cl);
    if (!r.converged || r.cp.size() != nodes.rows()) return {};
    Points out(nodes.rows(), 2);
    out.col(0) = nodes.col(0);
    out.col(1) = r.cp;
    return out;
  }
};

}  // namespace

std::unique_ptr<SectionEvaluator> make_viscous_evaluator() {
  return std::make_unique<ViscousEvaluator>();
}

std::string viscous_unavailable_reason() {
  return {};
}

}  // namespace fulmar::optimize
