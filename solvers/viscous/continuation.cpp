#include "solvers/viscous/continuation.h"

#include <algorithm>
#include <array>
#include <cmath>

#include "common/error.h"
#include "common/number_text.h"
#include "common/rule_check.h"

namespace fulmar::viscous {
namespace {

void require(bool ok, const char* field, double value, const std::string& rule) {
  require_rule(ok, std::string("continuation options: ") + field, value, rule);
}

}  // namespace

void ContinuationOptions::Validate() const {
  require(std::isfinite(alpha_from) && std::abs(alpha_from) <= 60.0, "alpha_from", alpha_from,
          "must be an angle within -60..60 deg");
  require(std::isfinite(alpha_to) && std::abs(alpha_to) <= 60.0, "alpha_to", alpha_to,
          "must be an angle within -60..60 deg");
  require(alpha_to >= alpha_from, "alpha_to", alpha_to,
          "must not be below alpha_from = " + general_text(alpha_from, 4));
  require(std::isfinite(alpha_step) && alpha_step > 0.0, "alpha_step", alpha_step,
          "must be a positive number of degrees");
  require((alpha_to - alpha_from) / alpha_step <= 2000.0, "alpha_step", alpha_step,
          "gives more than 2001 angles from alpha_from to alpha_to");
  require(std::isfinite(lead_in_step) && lead_in_step > 0.0, "lead_in_step", lead_in_step,
          "must be a positive number of degrees");
  require(stop_at_lift_drop >= 0.0, "stop_at_lift_drop", stop_at_lift_drop,
          "must be >= 0 (infinity: no stop at the stall)");
  require(stop_after_failures >= 0, "stop_after_failures", stop_after_failures,
          "must be >= 0 (0: no stop after failures)");
  require(creep_step == 0.0 || (creep_step > 0.0 && creep_step < alpha_step), "creep_step",
          creep_step,
          "must be 0 (no creep) or between 0 and alpha_step = " + general_text(alpha_step, 4));
}

std::vector<double> ContinuationOptions::angles() const {
  Validate();
  const int n = static_cast<int>(std::floor((alpha_to - alpha_from) / alpha_step + 1e-9)) + 1;
  std::vector<double> a(static_cast<std::size_t>(n));
  for (int i = 0; i < n; ++i) a[i] = alpha_from + i * alpha_step;
  return a;
}

nlohmann::json Continuation::to_json() const {
  int converged = 0;
  for (const ViscousResult& p : points) converged += p.converged();
  const char* names[] = {"end", "stall", "failures"};
  return {
      {"solves", solves},       {"stop", names[static_cast<int>(stop)]}, {"angles", points.size()},
      {"converged", converged}, {"sub_steps", sub_steps.size()},         {"creep", creep.size()}};
}

double lift_jump(const LiftPoint& before, const ViscousResult& anchor, const ViscousResult& r) {
  if (!before.valid || !r.converged() || before.alpha == anchor.alpha) return 0.0;
  const double slope = (anchor.cl - before.cl) / (anchor.alpha - before.alpha);
  return r.cl - (anchor.cl + slope * (r.alpha - anchor.alpha));
}

int stall_index(const std::vector<double>& cl, double drop, int first) {
  const int n = static_cast<int>(cl.size());
  if (first < 1 || first >= n) return -1;
  double highest = cl[first - 1];
  for (int i = first; i < n; ++i) {
    if (cl[i] < highest - drop) return i;
    highest = std::max(highest, cl[i]);
  }
  return -1;
}

ViscousResult sub_step_march(const PointSolver& solve, double target, ViscousResult& anchor,
                             LiftPoint& before, std::vector<ViscousResult>* sub_steps) {
  const double dir = target > anchor.alpha ? 1.0 : -1.0;
  ViscousResult cur = anchor;
  LiftPoint prior = before;
  double h = 0.5 * (target - anchor.alpha);
  ViscousResult t;
  t.reason = "sub-steps from " + general_text(anchor.alpha, 4) + " deg did not reach " +
             general_text(target, 4) + " deg";
  while (std::abs(h) >= kMinSubStep * (1.0 - 1e-9)) {
    double a = cur.alpha + h;
    if ((target - a) * dir < 1e-9) a = target;
    ViscousResult u = solve(a, &cur.state);
    u.alpha = a;
    const bool smallest = std::abs(0.5 * h) < kMinSubStep * (1.0 - 1e-9);
    if (!u.converged() || (!smallest && std::abs(lift_jump(prior, cur, u)) > kLiftJumpCheck)) {
      h *= 0.5;
      continue;
    }
    if (a == target) {
      t = std::move(u);
      break;
    }
    if (sub_steps) sub_steps->push_back(u);
    prior = {cur.alpha, cur.cl, true};
    cur = std::move(u);
  }
  if (cur.alpha != anchor.alpha) {
    before = prior;
    anchor = std::move(cur);
  }
  if (!t.converged()) t.alpha = target;
  return t;
}

Continuation march(const PointSolver& solve, const PointSolver& attempt, double alpha_start_deg,
                   const ContinuationOptions& options) {
  const std::vector<double> grid = options.angles();
  const int n = static_cast<int>(grid.size());
  Continuation out;
  out.points.resize(static_cast<std::size_t>(n));

  int start = 0;
  for (int i = 1; i < n; ++i)
    if (std::abs(grid[i] - alpha_start_deg) < std::abs(grid[start] - alpha_start_deg)) start = i;

  auto call = [&](double alpha, const ViscousState* warm) {
    ++out.solves;
    return solve(alpha, warm);
  };
  const PointSolver single = [&](double alpha, const ViscousState* warm) {
    ++out.solves;
    return attempt(alpha, warm);
  };
  // The result at `target` from the last converged result `anchor` (null: none; `before`: the
  // converged angle before it in the march; `previous_converged`: the step before converged).
  auto advance = [&](ViscousResult* anchor, LiftPoint* before, double target,
                     bool previous_converged) {
    if (!anchor) return call(target, nullptr);
    ViscousResult r = call(target, &anchor->state);
    r.alpha = target;
    const double jump = lift_jump(*before, *anchor, r);
    const bool jumped = options.jump_check == JumpCheck::kBoth ? std::abs(jump) > kLiftJumpCheck
                                                               : jump > kLiftJumpCheck;
    if (r.converged() && !jumped) return r;
    if (!r.converged() && !options.recover_failures) return r;
    const bool sub_step = previous_converged || options.sub_steps_after_failure;
    ViscousResult t;
    if (sub_step) {
      t = sub_step_march(single, target, *anchor, *before, &out.sub_steps);
      if (t.converged()) return t;
    }
    if (r.converged()) {
      if (options.keep_unconfirmed_jump) return r;
      t.status = SolveStatus::kFailed;
      t.alpha = target;
      t.reason = "the lift jumped " + general_text(jump, 3) +
                 " off the line through the two angles " + "before it and " +
                 (sub_step ? "sub-steps did not reach it again (" + t.reason + ")"
                           : std::string("was not checked"));
      return t;
    }
    ViscousResult cold = call(target, nullptr);
    if (cold.converged()) return cold;
    r.reason += sub_step ? "; sub-steps down to " + general_text(kMinSubStep, 2) +
                               " deg from the last converged angle and a cold start also failed"
                         : "; cold start also failed";
    return r;
  };

  // Lead-in from the start angle itself: its solutions only warm-start the first grid angle.
  ViscousResult lead;
  bool have_lead = false;
  const double a0 = std::clamp(alpha_start_deg, -60.0, 60.0);
  bool lead_previous = false;
  LiftPoint lead_before;
  auto lead_in = [&] {
    lead = call(a0, nullptr);
    have_lead = lead_previous = lead.converged();
    if (!have_lead && options.lead_in == ContinuationOptions::LeadIn::kColdFailure) return false;
    const double h = options.lead_in_step * (grid[start] > a0 ? 1.0 : -1.0);
    for (double a = a0 + h; std::abs(grid[start] - a) > 1e-9 && (grid[start] - a) * h > 0; a += h) {
      ViscousResult r = advance(have_lead ? &lead : nullptr, &lead_before, a, lead_previous);
      lead_previous = r.converged();
      if (r.converged()) {
        if (have_lead) lead_before = {lead.alpha, lead.cl, true};
        lead = std::move(r);
        have_lead = true;
      }
    }
    return true;
  };
  if (options.lead_in == ContinuationOptions::LeadIn::kFarStart) {
    if (std::abs(grid[start] - a0) > options.alpha_step + 1e-9) lead_in();
    out.points[start] =
        advance(have_lead ? &lead : nullptr, &lead_before, grid[start], lead_previous);
  } else {
    out.points[start] = call(grid[start], nullptr);
    if (!out.points[start].converged() && lead_in())
      out.points[start] =
          advance(have_lead ? &lead : nullptr, &lead_before, grid[start], lead_previous);
  }
  out.points[start].alpha = grid[start];
  out.last_up = start;

  for (int dir : {+1, -1}) {
    if (dir < 0 && !options.march_down) break;
    // The last converged result of this march (its state warm-starts the next angle).
    bool have_anchor = out.points[start].converged() || have_lead;
    ViscousResult anchor = out.points[start].converged() ? out.points[start] : lead;
    bool previous_converged = out.points[start].converged();
    LiftPoint before;  // the converged angle before the anchor in this march
    // The upward march's stop rules: lifts of its converged grid angles, failures in a row.
    std::vector<double> lifts;
    if (out.points[start].converged()) lifts.push_back(out.points[start].cl);
    int failures = out.points[start].converged() ? 0 : 1;
    int i = start + dir;
    for (; i >= 0 && i < n; i += dir) {
      ViscousResult r =
          advance(have_anchor ? &anchor : nullptr, &before, grid[i], previous_converged);
      r.alpha = grid[i];
      previous_converged = r.converged();
      if (r.converged()) {
        if (have_anchor) before = {anchor.alpha, anchor.cl, true};
        anchor = r;
        have_anchor = true;
      }
      out.points[i] = std::move(r);
      if (dir < 0) continue;
      out.last_up = i;
      if (out.points[i].converged()) {
        failures = 0;
        lifts.push_back(out.points[i].cl);
        if (std::isfinite(options.stop_at_lift_drop) &&
            stall_index(lifts, options.stop_at_lift_drop, 2) ==
                static_cast<int>(lifts.size()) - 1) {
          out.stop = Continuation::Stop::kStall;
          break;
        }
      } else if (options.stop_after_failures > 0 && ++failures >= options.stop_after_failures &&
                 lifts.size() >= 2) {
        out.stop = Continuation::Stop::kFailures;
        break;
      }
    }
    if (dir > 0 && out.stop != Continuation::Stop::kEnd) {
      const std::string why =
          out.stop == Continuation::Stop::kStall
              ? "the march stopped at the stall (alpha " + general_text(grid[i], 4) + ")"
              : "the march stopped after " + std::to_string(options.stop_after_failures) +
                    " failed angles in a row";
      for (int j = i + 1; j < n; ++j) {
        out.points[j].alpha = grid[j];
        out.points[j].reason = "not solved: " + why;
      }
    }
    // Creep beyond a maximum at the last converged angle below a failed one.
    if (dir > 0 && options.creep_step > 0.0 && !out.points[out.last_up].converged()) {
      int best = -1, last = -1;
      for (int j = start; j <= out.last_up; ++j) {
        if (!out.points[j].converged()) continue;
        last = j;
        if (best < 0 || out.points[j].cl > out.points[best].cl) best = j;
      }
      if (best >= 0 && best == last) {
        const ViscousResult* from = &out.points[best];
        for (double a = from->alpha + options.creep_step; a <= 60.0; a += options.creep_step) {
          ViscousResult r = single(a, &from->state);
          if (!r.converged() || r.cl <= from->cl) break;
          out.creep.push_back(std::move(r));
          from = &out.creep.back();
        }
      }
    }
  }

  // Back-fill: a failed angle next to a converged one is tried warm-started from that neighbour
  // (the far side first: the march reached the angle from one side only, and hysteresis and
  // the transition point's jumps make the sides differ). Each (angle, neighbour) pair once;
  // passes repeat while an angle converges, since it may open the way to the next.
  if (!options.back_fill) return out;
  std::vector<std::array<bool, 2>> tried(static_cast<std::size_t>(n), {false, false});
  for (bool changed = true; changed;) {
    changed = false;
    for (int i = 0; i < n; ++i) {
      if (out.points[i].converged()) continue;
      const int far = i > start ? 1 : 0;  // index into {i - 1, i + 1}
      for (int side : {far, 1 - far}) {
        const int nb = side == 0 ? i - 1 : i + 1;
        if (nb < 0 || nb >= n || tried[i][side] || !out.points[nb].converged()) continue;
        tried[i][side] = true;
        ViscousResult r = call(grid[i], &out.points[nb].state);
        if (r.converged()) {
          r.alpha = grid[i];
          out.points[i] = std::move(r);
          changed = true;
          break;
        }
      }
    }
  }
  return out;
}

LiftMaximum refine_lift_maximum(const std::vector<ViscousResult>& known, const PointSolver& solve) {
  LiftMaximum out;
  struct Sample {
    double alpha, cl;
    const ViscousState* state;
  };
  std::vector<Sample> samples;
  std::vector<ViscousResult> made;  // results of this refinement (their states warm-start)
  made.reserve(64);
  for (const ViscousResult& r : known)
    if (r.converged()) samples.push_back({r.alpha, r.cl, &r.state});
  std::sort(samples.begin(), samples.end(), [](auto& a, auto& b) { return a.alpha < b.alpha; });
  int k = -1;
  for (int i = 0; i < static_cast<int>(samples.size()); ++i)
    if (k < 0 || samples[i].cl > samples[k].cl) k = i;
  if (k >= 0) {
    out.cl_max = samples[k].cl;
    out.alpha = samples[k].alpha;
  }
  if (k <= 0 || k + 1 >= static_cast<int>(samples.size())) return out;

  int& solves = out.solves;
  const PointSolver counted = [&](double alpha, const ViscousState* warm) {
    ++solves;
    return solve(alpha, warm);
  };
  double best_alpha = samples[k].alpha, best_cl = samples[k].cl;
  // The parabola through the bracket's three samples: a refined sample more than
  // kLiftJumpCheck above it may have jumped to another solution (NACA 0015 at Re 2e5: from 1.12
  // at 16.5 deg to 1.34 at 17.06, and the search then climbed that branch to 1.42), so it is
  // made again by checked sub-steps from its nearest sample. The bulge of a real peak above
  // the parabola was at most 0.022 over 2-deg brackets (NACA 0009 at Re 1e6).
  const Sample p0 = samples[k - 1], p1 = samples[k], p2 = samples[k + 1];
  auto parabola = [&](double x) {
    return p0.cl * (x - p1.alpha) * (x - p2.alpha) /
               ((p0.alpha - p1.alpha) * (p0.alpha - p2.alpha)) +
           p1.cl * (x - p0.alpha) * (x - p2.alpha) /
               ((p1.alpha - p0.alpha) * (p1.alpha - p2.alpha)) +
           p2.cl * (x - p0.alpha) * (x - p1.alpha) /
               ((p2.alpha - p0.alpha) * (p2.alpha - p1.alpha));
  };
  // cl at `alpha`, warm-started from the nearest converged sample; -inf when it fails.
  auto cl_at = [&](double alpha) {
    const Sample* near = nullptr;
    for (const Sample& s : samples)
      if (!near || std::abs(s.alpha - alpha) < std::abs(near->alpha - alpha)) near = &s;
    ViscousResult r = counted(alpha, near ? near->state : nullptr);
    r.alpha = alpha;
    if (r.converged() && near && r.cl > parabola(alpha) + kLiftJumpCheck) {
      ViscousResult anchor;
      anchor.status = SolveStatus::kConverged;
      anchor.alpha = near->alpha;
      anchor.cl = near->cl;
      anchor.state = *near->state;
      LiftPoint before;  // the sample next to `near` on the far side from alpha
      for (const Sample& s : samples)
        if ((s.alpha - near->alpha) * (alpha - near->alpha) < 0.0 &&
            (!before.valid ||
             std::abs(s.alpha - near->alpha) < std::abs(before.alpha - near->alpha)))
          before = {s.alpha, s.cl, true};
      r = sub_step_march(counted, alpha, anchor, before, nullptr);
    }
    if (!r.converged()) return -std::numeric_limits<double>::infinity();
    if (made.size() == made.capacity()) return r.cl;  // keep the states' addresses stable
    made.push_back(std::move(r));
    samples.push_back({alpha, made.back().cl, &made.back().state});
    if (made.back().cl > best_cl) {
      best_cl = made.back().cl;
      best_alpha = alpha;
    }
    return made.back().cl;
  };
  const double g = (std::sqrt(5.0) - 1.0) / 2.0;
  double a = samples[k - 1].alpha, b = samples[k + 1].alpha;
  double x1 = b - g * (b - a), x2 = a + g * (b - a);
  double f1 = cl_at(x1), f2 = cl_at(x2);
  int& failures = out.failures;
  failures = (f1 == -INFINITY) + (f2 == -INFINITY);
  while (b - a > kClMaxRefineWidth && solves < 60) {
    if (f1 >= f2) {
      b = x2;
      x2 = x1;
      f2 = f1;
      x1 = b - g * (b - a);
      f1 = cl_at(x1);
      failures += f1 == -INFINITY;
    } else {
      a = x1;
      x1 = x2;
      f1 = f2;
      x2 = a + g * (b - a);
      f2 = cl_at(x2);
      failures += f2 == -INFINITY;
    }
  }
  out.refined = true;
  out.cl_max = best_cl;
  out.alpha = best_alpha;
  out.bracket = b - a;
  out.note = "refined by golden-section search to a " + general_text(b - a, 2) + " deg bracket (" +
             std::to_string(solves) + " solves";
  if (failures > 0) out.note += ", " + std::to_string(failures) + " of them not converged";
  out.note += ")";
  return out;
}

}  // namespace fulmar::viscous
