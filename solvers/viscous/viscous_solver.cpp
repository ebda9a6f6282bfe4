#include "solvers/viscous/viscous_solver.h"

#include <Eigen/LU>
#include <algorithm>
#include <cmath>
#include <numbers>
#include <optional>
#include <sstream>
#include <tuple>

#include "common/error.h"
#include "solvers/viscous/coupled_system.h"
#include "solvers/viscous/result_extraction.h"

namespace fulmar::viscous {

namespace {

constexpr double kDeg = std::numbers::pi / 180.0;
// Angles of attack beyond this (deg, either sign) are refused: no attached or stalled solution
// of the coupled model is sought there.
constexpr double kMaxAngle = 60.0;
// solve_alpha's continuation: the remaining angle step is halved at each failure, at most
// kContinuationLevels failures and kContinuationTries sub-step solves in all.
constexpr int kContinuationLevels = 6;
constexpr int kContinuationTries = 16;
// solve_cl: stop at |cl - target| < kClTolerance (the documented rule); the second angle is
// kClFirstStep (deg) above the first, each secant step at most kClMaxStep (deg), at most
// kClIterations secant steps.
constexpr double kClTolerance = 1e-5;
constexpr double kClFirstStep = 0.5;
constexpr double kClMaxStep = 2.0;
constexpr int kClIterations = 20;
// jacobian_check: the relative step of the central differences.
constexpr double kDifferenceStep = 1e-6;

InviscidOptions inviscid_options(const ViscousOptions& o) {
  InviscidOptions io;
  io.mach = o.mach;
  io.wake_length = o.wake_length;
  return io;
}

}  // namespace

nlohmann::json ViscousResult::to_json() const {
  nlohmann::json j;
  j["alpha"] = alpha;
  j["cl"] = cl;
  j["cd"] = cd;
  j["cm"] = cm;
  j["cd_friction"] = cd_friction;
  j["cd_pressure"] = cd_pressure;
  j["transition_upper"] = transition_upper;
  j["transition_lower"] = transition_lower;
  j["converged"] = converged;
  j["status"] = to_string(status);
  j["reason"] = reason;
  j["residual"] = residual;
  j["iterations"] = iterations;
  j["residual_history"] = residual_history;
  nlohmann::json h = nlohmann::json::array();
  for (const NewtonIteration& it : history)
    h.push_back({{"residual", it.residual},
                 {"worst_station", it.worst_station},
                 {"worst_equation", it.worst_equation},
                 {"stagnation_node", it.stagnation_node},
                 {"transition_interval_upper", it.transition_upper},
                 {"transition_interval_lower", it.transition_lower},
                 {"relaxation", it.relaxation},
                 {"limited_by", it.limited_by}});
  j["history"] = h;
  return j;
}

ViscousSolver::ViscousSolver(const Points& nodes, const ViscousOptions& options)
    : inviscid_((options.Validate(), nodes), inviscid_options(options)), options_(options) {
  flow_.reynolds = options.reynolds;
  flow_.mach = options.mach;
  flow_.n_crit = options.n_crit;
  surface_response_ = inviscid_.surface_source_response();
}

CouplingModel ViscousSolver::model_at(double alpha_deg) const {
  return inviscid_.coupling_model(alpha_deg * kDeg, &surface_response_);
}

using detail::CoupledSystem;

JacobianCheck ViscousSolver::jacobian_check(double alpha_deg, int newton_steps,
                                            const ViscousState* warm_start) const {
  const CouplingModel model = model_at(alpha_deg);
  CoupledSystem sys(inviscid_, model, options_, flow_);
  if (!(warm_start && sys.warm_start(*warm_start))) sys.cold_start();
  sys.take_transition_from_kinds();
  sys.update_edge_velocity();
  sys.mark_ue_valid();
  for (int it = 0; it <= newton_steps; ++it) {
    sys.prepare_iteration();
    sys.assemble();
    if (it < newton_steps) sys.newton_step();
  }
  JacobianCheck out;
  out.analytic = sys.jacobian();
  out.difference = sys.difference_jacobian(kDifferenceStep);
  return out;
}

ViscousResult ViscousSolver::solve_alpha(double alpha_deg, const ViscousState* warm_start) const {
  const bool warm = warm_start && warm_start->valid();
  if (!std::isfinite(alpha_deg) || std::abs(alpha_deg) > kMaxAngle)
    return solve_from(alpha_deg, nullptr);
  // The warm and the cold attempt share the coupling model at this angle.
  const CouplingModel model = model_at(alpha_deg);
  int total = 0;
  auto finish = [&total](ViscousResult r, const std::string& how) {
    total += r.iterations;
    r.iterations = total;
    if (!how.empty()) r.reason += " (" + how + ")";
    return r;
  };
  if (warm) {
    ViscousResult r = solve_on(model, alpha_deg, warm_start);
    if (r.converged) return finish(std::move(r), "warm start");
    total += r.iterations;
  }
  ViscousResult cold = solve_on(model, alpha_deg, nullptr);
  if (cold.converged || !warm)
    return finish(std::move(cold), warm ? "cold start after the warm start failed" : "");
  total += cold.iterations;
  // Continuation from the warm state's angle: halve the remaining step until a sub-step
  // converges, then go on from there.
  ViscousState from = *warm_start;
  double step = alpha_deg - from.alpha;
  for (int level = 0, tries = 0; level < kContinuationLevels && tries < kContinuationTries;
       ++tries) {
    step *= 0.5;
    const double target = from.alpha + step;
    ViscousResult r = solve_from(target, &from);
    total += r.iterations;
    if (!r.converged) {
      ++level;
      continue;
    }
    from = r.state;
    step = alpha_deg - from.alpha;
    ViscousResult last = solve_on(model, alpha_deg, &from);
    if (last.converged) return finish(std::move(last), "continuation from the warm start's angle");
    total += last.iterations;
  }
  return finish(std::move(cold), "warm, cold and continuation starts all failed");
}

ViscousResult ViscousSolver::solve_from(double alpha_deg, const ViscousState* warm_start) const {
  ViscousResult res;
  res.alpha = alpha_deg;
  if (!std::isfinite(alpha_deg) || std::abs(alpha_deg) > kMaxAngle) {
    res.status = SolveStatus::kFailed;
    res.reason = "angle of attack must be finite and within +-60 deg";
    return res;
  }
  return solve_on(model_at(alpha_deg), alpha_deg, warm_start);
}

ViscousResult ViscousSolver::solve_on(const CouplingModel& model, double alpha_deg,
                                      const ViscousState* warm_start) const {
  ViscousResult res;
  res.alpha = alpha_deg;
  CoupledSystem sys(inviscid_, model, options_, flow_);
  bool warm = warm_start && warm_start->valid() && sys.warm_start(*warm_start);
  if (!warm) sys.cold_start();
  sys.take_transition_from_kinds();
  sys.update_edge_velocity();
  sys.mark_ue_valid();
  double r = INFINITY;
  bool done = false;
  int it = 0;
  std::size_t last_move = 0;
  int moved_upper = -2, moved_lower = -2;
  std::optional<CoupledSystem> settled_from;
  double settled_residual = INFINITY;
  int settled_at = 0;
  for (; it < options_.max_iterations; ++it) {
    sys.prepare_iteration();
    r = sys.assemble();
    res.residual_history.push_back(r);
    if (!std::isfinite(r)) break;
    if (r < options_.tolerance && it > 0 && !sys.transition_limited()) {
      if (!sys.needs_settling()) {
        done = true;
        break;
      }
      // This converged state stands if the settled representation does not converge within
      // NewtonOptions::settle_iterations (when the move starts the transition running, it does
      // not).
      settled_from.emplace(sys);
      settled_residual = r;
      settled_at = it;
      sys.settle_transition();
      continue;
    }
    if (settled_from &&
        (it - settled_at > options_.newton.settle_iterations || sys.transition_limited()))
      break;
    // Give up early when the residual has stopped falling (a fallback start is cheaper); a
    // move of the transition interval raises it legitimately and restarts the count.
    const std::size_t h = res.residual_history.size();
    if (sys.transition_interval(0) != moved_upper || sys.transition_interval(1) != moved_lower) {
      moved_upper = sys.transition_interval(0);
      moved_lower = sys.transition_interval(1);
      last_move = h - 1;
    }
    const NewtonOptions& nw = options_.newton;
    if (h > last_move + static_cast<std::size_t>(nw.stall_iterations) && r > nw.stall_residual &&
        r > nw.stall_ratio *
                res.residual_history[h - 1 - static_cast<std::size_t>(nw.stall_window)])
      break;
    NewtonIteration rec;
    rec.residual = r;
    std::tie(rec.worst_station, rec.worst_equation) = sys.worst_residual();
    rec.stagnation_node = sys.layout().stag;
    rec.transition_upper = sys.transition_interval(0);
    rec.transition_lower = sys.transition_interval(1);
    const double rlx = sys.newton_step();
    rec.relaxation = rlx;
    rec.limited_by = rlx <= 0.0 ? std::string("singular Newton system") : sys.limited_by();
    res.history.push_back(std::move(rec));
    if (rlx <= 0.0) {
      r = INFINITY;
      break;
    }
  }
  // The settled representation did not converge: the converged state before it stands.
  const bool use_settled = !done && settled_from.has_value();
  if (use_settled) {
    done = true;
    r = settled_residual;
  }
  const CoupledSystem& fin = use_settled ? *settled_from : sys;
  res.iterations = it;
  res.residual = r;
  std::ostringstream msg;
  if (done) {
    res.converged = true;
    res.status = SolveStatus::kConverged;
    msg << "converged: max residual " << r << " < tolerance " << options_.tolerance << " after "
        << it << " Newton iterations";
  } else if (std::isfinite(r)) {
    res.status = SolveStatus::kNotConverged;
    msg << "not converged: max residual " << r << " >= tolerance " << options_.tolerance
        << " after " << it << " Newton iterations";
  } else {
    res.status = SolveStatus::kFailed;
    msg << "failed: the Newton system became singular or non-finite after " << it << " iterations";
  }
  res.reason = msg.str();

  extract_result(fin, inviscid_, flow_, alpha_deg, res);
  if (!res.converged) res.state = ViscousState{};
  return res;
}

ViscousResult ViscousSolver::solve_cl(double cl_target, const ViscousState* warm_start) const {
  // Secant iteration on alpha from the inviscid angle (viscous lift is somewhat lower).
  InviscidResult inv;
  inviscid_.solve_for_cl(cl_target, inv);
  double a0 = inv.converged ? inv.alpha / kDeg : 0.0;
  ViscousResult r0 = solve_alpha(a0, warm_start);
  // A first angle that does not converge: try a few neighbours before giving up.
  for (double offset : {-0.7, 0.6, -1.5, 1.3, -2.5}) {
    if (r0.converged) break;
    r0 = solve_alpha(a0 + offset, warm_start);
    if (r0.converged) a0 += offset;
  }
  if (!r0.converged) {
    r0.reason = "target cl not reached: no converged solution near the inviscid angle " +
                std::to_string(inv.alpha / kDeg) + " deg; last: " + r0.reason;
    return r0;
  }
  double a1 = a0 + kClFirstStep;
  ViscousResult r1 = solve_alpha(a1, &r0.state);
  for (int k = 0; k < kClIterations; ++k) {
    if (!r1.converged) return r1;
    if (std::abs(r1.cl - cl_target) < kClTolerance) return r1;
    const double slope = (r1.cl - r0.cl) / (a1 - a0);
    if (!(std::abs(slope) > 1e-4)) break;
    const double a2 = a1 + std::clamp((cl_target - r1.cl) / slope, -kClMaxStep, kClMaxStep);
    r0 = std::move(r1);
    a0 = a1;
    a1 = a2;
    r1 = solve_alpha(a1, &r0.state);
  }
  r1.converged = false;
  r1.status = SolveStatus::kNotConverged;
  std::ostringstream msg;
  msg << "target cl " << cl_target << " not reached: cl " << r1.cl << " at alpha " << r1.alpha;
  r1.reason = msg.str();
  return r1;
}

}  // namespace fulmar::viscous
