#include "optimize/viscous_evaluator.h"

#include <algorithm>
#include <cmath>
#include <exception>
#include <sstream>

#include "geometry/panelling.h"
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
// points in a row fail (beyond a converged maximum), then a parabola through the best converged
// point and its two neighbours; the peak is refined by one more solve at the parabola's vertex.
// A cl still rising at 26 deg is reported as not found (with the largest value seen).
ClMaxResult find_cl_max(const viscous::ViscousSolver& solver) {
  ClMaxResult out;
  viscous::ViscousResult previous;
  const viscous::ViscousState* warm = nullptr;
  std::vector<std::pair<double, double>> samples;  // (alpha, cl), converged, increasing alpha
  int failures = 0;
  for (double alpha = 4.0; alpha <= 26.0; alpha += 2.0) {
    viscous::ViscousResult r = solver.solve_alpha(alpha, warm);
    if (!r.converged) {
      if (++failures >= 2 && samples.size() >= 2) break;
      continue;
    }
    failures = 0;
    samples.emplace_back(alpha, r.cl);
    previous = std::move(r);
    warm = &previous.state;
    if (samples.size() >= 3 && samples.back().second < samples[samples.size() - 2].second) break;
  }
  if (samples.size() < 2) {
    out.reason = "fewer than two converged points in the angle sweep 4..26 deg";
    return out;
  }
  std::size_t best = 0;
  for (std::size_t i = 1; i < samples.size(); ++i)
    if (samples[i].second > samples[best].second) best = i;
  out.cl_max = samples[best].second;
  out.alpha_deg = samples[best].first;
  if (best + 1 == samples.size()) {
    if (failures == 0) {
      out.reason = "no peak of cl up to 26 deg";
      return out;
    }
    // The analysis stops converging beyond the last point: the peak lies there (the flow
    // separates); report the last converged value as cl_max.
    out.found = true;
    return out;
  }
  if (best == 0) {
    out.found = true;
    return out;
  }
  const auto [a0, c0] = samples[best - 1];
  const auto [a1, c1] = samples[best];
  const auto [a2, c2] = samples[best + 1];
  const double denom = (a0 - a1) * (a0 - a2) * (a1 - a2);
  const double pa = (a2 * (c1 - c0) + a1 * (c0 - c2) + a0 * (c2 - c1)) / denom;
  const double pb = (a2 * a2 * (c0 - c1) + a1 * a1 * (c2 - c0) + a0 * a0 * (c1 - c2)) / denom;
  out.found = true;
  if (pa < 0) {
    const double vertex = std::clamp(-pb / (2 * pa), a0, a2);
    const viscous::ViscousResult r = solver.solve_alpha(vertex, warm);
    if (r.converged && r.cl > out.cl_max) {
      out.cl_max = r.cl;
      out.alpha_deg = vertex;
    }
  }
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
                                 const std::vector<double>& alphas_deg,
                                 int panels) const override {
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

std::string viscous_unavailable_reason() { return {}; }

}  // namespace fulmar::optimize
