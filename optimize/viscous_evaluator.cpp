#include "optimize/viscous_evaluator.h"

#include <algorithm>
#include <cmath>
#include <exception>
#include <optional>
#include <sstream>

#include "geometry/panelling.h"
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

// cl_max: march up in angle with warm starts, 2 deg at a time from 4 deg, until cl falls or two
// points in a row fail (beyond a converged maximum). A maximum with converged neighbours on both
// sides is refined by golden-section search (viscous::refine_cl_max) to a bracket of
// viscous::kClMaxRefineWidth: there cl is within about 1e-4 of the solver's own peak, so the value
// changes smoothly with the shape and the optimizer's finite differences see the shape's effect,
// not where the 2-deg grid happens to fall (a parabola through grid points jumped by up to 0.01
// when the best grid point changed). When the solutions stop converging beyond the best point,
// the march goes on from it in 0.5-deg steps and the last converged value is cl_max (a lower
// bound: stall and solver failure cannot be told apart). A step whose lift jumps up off the line
// through the two before it is checked by sub-steps (viscous::sub_step_march). A cl still rising at
// 26 deg is reported as not found (with the largest value seen).
ClMaxResult find_cl_max(const viscous::ViscousSolver& solver) {
  ClMaxResult out;
  std::vector<viscous::ViscousResult> done;  // converged, increasing alpha
  done.reserve(32);
  int failures = 0;
  // A lead-in from 0 deg when the cold start at 4 deg fails (seen on aft-loaded laminar shapes
  // whose cold march at 4 deg separates): its state warm-starts the march.
  std::optional<viscous::ViscousResult> lead_in;
  for (double alpha = 4.0; alpha <= 26.0; alpha += 2.0) {
    const viscous::ViscousState* warm = done.empty() ? nullptr : &done.back().state;
    if (!warm && lead_in && lead_in->converged) warm = &lead_in->state;
    viscous::ViscousResult r = solver.solve_alpha(alpha, warm);
    if (!r.converged && done.empty() && !lead_in) {
      lead_in = solver.solve_alpha(0.0, nullptr);
      if (lead_in->converged) r = solver.solve_alpha(alpha, &lead_in->state);
    }
    if (r.converged && done.size() >= 2) {
      // A lift above the line through the last two points by more than kLiftJumpCheck may be
      // another solution branch (near stall a long Newton path, or the cold fallback, can end on
      // one), which would pass for lift the section does not have: the step is made again by
      // checked sub-steps, and a jump they do not find again counts as a failed point. A jump
      // downward needs no check: it ends the march, and the refinement brackets the peak before it.
      const viscous::ViscousResult& b = done[done.size() - 2];
      const viscous::LiftPoint before_last{b.alpha, b.cl, true};
      if (viscous::lift_jump(before_last, done.back(), r) > viscous::kLiftJumpCheck) {
        viscous::ViscousResult anchor = done.back();
        viscous::LiftPoint before = before_last;
        r = viscous::sub_step_march(
            [&solver](double a, const viscous::ViscousState* w) { return solver.solve_from(a, w); },
            alpha, anchor, before, nullptr);
        r.alpha = alpha;
      }
    }
    if (!r.converged) {
      if (++failures >= 2 && done.size() >= 2) break;
      continue;
    }
    failures = 0;
    done.push_back(std::move(r));
    const std::size_t n = done.size();
    if (n >= 3 && done[n - 1].cl < done[n - 2].cl) break;
  }
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
    if (failures == 0) {
      out.found = false;
      out.reason = "no peak of cl up to 26 deg";
      return out;
    }
    // The solutions stop converging beyond the best point: creep on in 0.5-deg steps.
    viscous::ViscousResult last = done[best];
    for (double alpha = last.alpha + 0.5; alpha < last.alpha + 2.0 - 1e-9; alpha += 0.5) {
      viscous::ViscousResult r = solver.solve_from(alpha, &last.state);
      if (!r.converged || r.cl <= last.cl) break;
      last = std::move(r);
    }
    out.cl_max = last.cl;
    out.alpha_deg = last.alpha;
    return out;
  }
  if (best == 0) return out;
  viscous::PolarSummary summary;
  summary.has_cl_max = summary.cl_max_bracketed = true;
  summary.cl_max = out.cl_max;
  summary.alpha_cl_max = out.alpha_deg;
  // refine_cl_max brackets the best of `done` by its two neighbours itself.
  viscous::refine_cl_max(
      done,
      [&solver](double alpha, const viscous::ViscousState* warm) {
        // With solve_alpha's fallbacks: a failed solve inside the bracket would steer the search
        // away from the peak (seen at 200 panels as drops of 0.017 between shapes 1e-3 apart).
        return solver.solve_alpha(alpha, warm);
      },
      summary);
  out.cl_max = summary.cl_max;
  out.alpha_deg = summary.alpha_cl_max;
  return out;
}

class ViscousEvaluator final : public SectionEvaluator {
 public:
  std::string description() const override {
    return "viscous-inviscid (linear-vorticity panels, integral boundary layer, e^N transition)";
  }

  SectionAnalysis analyse(const Section& section, const AnalysisRequest& request) const override {
    SectionAnalysis out;
    const Points nodes = nodes_for(section, request.panels);
    for (const TargetPoint& t : request.points) {
      try {
        const viscous::ViscousSolver solver(nodes, options_for(t.flow));
        out.points.push_back(point_from(solver.solve_cl(t.cl)));
      } catch (const std::exception& e) {
        PointResult p;
        p.reason = e.what();
        out.points.push_back(p);
      }
    }
    if (request.cl_max_at) {
      try {
        const viscous::ViscousSolver solver(nodes, options_for(*request.cl_max_at));
        out.cl_max = find_cl_max(solver);
      } catch (const std::exception& e) {
        out.cl_max.reason = e.what();
      }
    }
    return out;
  }

  std::vector<PointResult> polar(const Section& section, const FlowCondition& flow,
                                 const std::vector<double>& alphas_deg, int panels) const override {
    std::vector<PointResult> out(alphas_deg.size());
    try {
      const viscous::ViscousSolver solver(nodes_for(section, panels), options_for(flow));
      viscous::ViscousResult previous;
      const viscous::ViscousState* warm = nullptr;
      for (size_t i = 0; i < alphas_deg.size(); ++i) {
        viscous::ViscousResult r = solver.solve_alpha(alphas_deg[i], warm);
        out[i] = point_from(r);
        if (r.converged) {
          previous = std::move(r);
          warm = &previous.state;
        } else {
          warm = nullptr;
        }
      }
    } catch (const std::exception& e) {
      for (auto& p : out) p.reason = e.what();
    }
    return out;
  }

  Points pressure(const Section& section, const FlowCondition& flow, double cl,
                  int panels) const override {
    try {
      const Points nodes = nodes_for(section, panels);
      const viscous::ViscousSolver solver(nodes, options_for(flow));
      const viscous::ViscousResult r = solver.solve_cl(cl);
      if (!r.converged || r.cp.size() != nodes.rows()) return {};
      Points out(nodes.rows(), 2);
      out.col(0) = nodes.col(0);
      out.col(1) = r.cp;
      return out;
    } catch (const std::exception&) {
      return {};
    }
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
