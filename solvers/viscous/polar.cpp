#include "solvers/viscous/polar.h"

#include <algorithm>
#include <array>
#include <cmath>
#include <limits>
#include <numbers>
#include <sstream>

#include "common/error.h"

namespace fulmar::viscous {
namespace {

void require(bool ok, const char* field, double value, const std::string& rule) {
  if (ok) return;
  std::ostringstream msg;
  msg << "polar options: " << field << " = " << value << " " << rule;
  throw InputError(msg.str());
}

std::string fmt(double v, int precision = 4) {
  std::ostringstream s;
  s.precision(precision);
  s << v;
  return s.str();
}

void add_note(std::string& note, const std::string& text) {
  if (!note.empty()) note += "; ";
  note += text;
}

// Converged points sorted by alpha.
std::vector<const ViscousResult*> converged_by_alpha(const std::vector<ViscousResult>& points) {
  std::vector<const ViscousResult*> c;
  for (const ViscousResult& p : points)
    if (p.converged) c.push_back(&p);
  std::stable_sort(c.begin(), c.end(), [](auto* a, auto* b) { return a->alpha < b->alpha; });
  return c;
}

// Least-squares slope of y(x); false with fewer than two distinct x.
bool least_squares_slope(const std::vector<double>& x, const std::vector<double>& y,
                         double& slope) {
  const std::size_t n = x.size();
  if (n < 2) return false;
  double mx = 0, my = 0;
  for (std::size_t i = 0; i < n; ++i) {
    mx += x[i];
    my += y[i];
  }
  mx /= n;
  my /= n;
  double sxx = 0, sxy = 0;
  for (std::size_t i = 0; i < n; ++i) {
    sxx += (x[i] - mx) * (x[i] - mx);
    sxy += (x[i] - mx) * (y[i] - my);
  }
  if (!(sxx > 1e-300)) return false;
  slope = sxy / sxx;
  return true;
}

nlohmann::json value_or_null(bool has, double v) {
  return has && std::isfinite(v) ? nlohmann::json(v) : nlohmann::json(nullptr);
}

}  // namespace

void PolarOptions::Validate() const {
  require(std::isfinite(alpha_from) && std::abs(alpha_from) <= 60.0, "alpha_from", alpha_from,
          "must be an angle within -60..60 deg");
  require(std::isfinite(alpha_to) && std::abs(alpha_to) <= 60.0, "alpha_to", alpha_to,
          "must be an angle within -60..60 deg");
  require(alpha_to >= alpha_from, "alpha_to", alpha_to,
          "must not be below alpha_from = " + fmt(alpha_from));
  require(std::isfinite(alpha_step) && alpha_step > 0.0, "alpha_step", alpha_step,
          "must be a positive number of degrees");
  require((alpha_to - alpha_from) / alpha_step <= 2000.0, "alpha_step", alpha_step,
          "gives more than 2001 angles from alpha_from to alpha_to");
}

std::vector<double> PolarOptions::angles() const {
  Validate();
  const int n = static_cast<int>(std::floor((alpha_to - alpha_from) / alpha_step + 1e-9)) + 1;
  std::vector<double> a(static_cast<std::size_t>(n));
  for (int i = 0; i < n; ++i) a[i] = alpha_from + i * alpha_step;
  return a;
}

nlohmann::json PolarSummary::to_json() const {
  nlohmann::json j;
  j["has_cl_max"] = has_cl_max;
  j["cl_max_bracketed"] = has_cl_max && cl_max_bracketed;
  j["cl_max"] = value_or_null(has_cl_max, cl_max);
  j["alpha_cl_max"] = value_or_null(has_cl_max, alpha_cl_max);
  j["alpha_zero_lift"] = value_or_null(has_zero_lift, alpha_zero_lift);
  j["lift_slope_per_deg"] = value_or_null(has_zero_lift && has_linear_range, lift_slope_per_deg);
  j["cm_zero_lift"] = value_or_null(has_zero_lift, cm_zero_lift);
  j["x_ac"] = value_or_null(has_zero_lift && has_linear_range, x_ac);
  j["cd_min"] = value_or_null(has_cd_min, cd_min);
  j["cl_at_cd_min"] = value_or_null(has_cd_min, cl_at_cd_min);
  if (has_bucket) {
    j["bucket"] = {{"cl_lower", bucket_cl_lower},
                   {"cl_upper", bucket_cl_upper},
                   {"cd_limit", (1.0 + kBucketDragRise) * cd_min}};
  } else {
    j["bucket"] = nullptr;
  }
  j["note"] = note;
  return j;
}

PolarSummary summarize_polar(const std::vector<ViscousResult>& points,
                             const std::vector<ViscousResult>* extra) {
  PolarSummary s;
  const std::vector<const ViscousResult*> c = converged_by_alpha(points);
  const int n = static_cast<int>(c.size());
  if (n == 0) {
    s.note = "no converged point";
    return s;
  }
  const double last_alpha_any = [&] {
    double a = -std::numeric_limits<double>::infinity();
    for (const ViscousResult& p : points) a = std::max(a, p.alpha);
    return a;
  }();

  // Maximum lift, over the points and the extra samples between the first and last point.
  std::vector<const ViscousResult*> lift = c;
  if (extra) {
    for (const ViscousResult& e : *extra)
      if (e.converged && e.alpha >= c.front()->alpha - 1e-9 && e.alpha <= last_alpha_any + 1e-9)
        lift.push_back(&e);
    std::stable_sort(lift.begin(), lift.end(),
                     [](auto* a, auto* b) { return a->alpha < b->alpha; });
  }
  // The stall ends the search: once cl has fallen kStallLiftDrop below the highest value so far,
  // later points are post-stall, where a second rise (seen on NACA 2412 at Re 2e5: 1.09 at 20.5
  // deg, then 1.38 at 21, above the 1.24 of the stall at 14) is not the section's cl_max.
  int nl = static_cast<int>(lift.size());
  int k = 0;
  for (int i = 1; i < nl; ++i) {
    if (lift[i]->cl > lift[k]->cl) k = i;
    if (lift[i]->cl < lift[k]->cl - kStallLiftDrop) {
      if (i + 1 < nl)
        add_note(s.note, "stall: at alpha " + fmt(lift[i]->alpha) + " cl is more than " +
                             fmt(kStallLiftDrop) +
                             " below its maximum; the points beyond are post-stall and not "
                             "searched for cl_max");
      nl = i + 1;
      break;
    }
  }
  s.cl_max = lift[k]->cl;
  s.alpha_cl_max = lift[k]->alpha;
  if (k == 0 && nl > 1) {
    add_note(s.note, "cl falls over the whole range: the maximum lies at or below alpha " +
                         fmt(lift[0]->alpha));
  } else if (k < nl - 1) {
    s.has_cl_max = true;
    s.cl_max_bracketed = true;
    add_note(s.note, "cl_max bracketed: cl falls after alpha " + fmt(lift[k]->alpha) + " (at " +
                         fmt(lift[k + 1]->alpha) + ")");
  } else if (last_alpha_any > lift[k]->alpha) {
    s.has_cl_max = true;
    add_note(s.note, "cl_max at the last converged angle " + fmt(lift[k]->alpha) +
                         ": beyond it the solutions did not converge (stall and solver failure "
                         "not told apart), so cl_max is a lower bound");
  } else {
    add_note(s.note, "cl still rises at the end of the range (alpha " + fmt(lift[k]->alpha) +
                         "): no cl_max, extend the range");
  }

  // Zero lift: the upward crossing nearest alpha = 0.
  int z = -1;
  for (int i = 0; i + 1 < n; ++i) {
    if (c[i]->cl <= 0.0 && c[i + 1]->cl > 0.0) {
      const double mid = 0.5 * (c[i]->alpha + c[i + 1]->alpha);
      if (z < 0 || std::abs(mid) < std::abs(0.5 * (c[z]->alpha + c[z + 1]->alpha))) z = i;
    }
  }
  // No crossing: extrapolate from the two end points nearest cl = 0 when the line through them
  // reaches cl = 0 within one spacing outside them (e.g. a symmetric section's polar from 0 deg,
  // where cl(0) is +-1e-8 of round-off).
  bool extrapolated = false;
  if (z < 0 && n >= 2) {
    const int e = c[0]->cl > 0.0 ? 0 : n - 2;
    const ViscousResult& a = *c[e];
    const ViscousResult& b = *c[e + 1];
    if (b.cl > a.cl) {
      const double t = (0.0 - a.cl) / (b.cl - a.cl);
      if (t >= -1.0 && t <= 2.0) {
        z = e;
        extrapolated = true;
      }
    }
  }
  if (z >= 0) {
    const ViscousResult& a = *c[z];
    const ViscousResult& b = *c[z + 1];
    const double t = (0.0 - a.cl) / (b.cl - a.cl);
    s.has_zero_lift = true;
    if (extrapolated) {
      add_note(s.note,
               "zero-lift angle extrapolated from alpha " + fmt(a.alpha) + " and " + fmt(b.alpha));
    }
    s.alpha_zero_lift = a.alpha + t * (b.alpha - a.alpha);
    s.cm_zero_lift = a.cm + t * (b.cm - a.cm);
    std::vector<double> al, cl, cm;
    for (const ViscousResult* p : c) {
      if (p->alpha >= s.alpha_zero_lift - 2.0 - 1e-9 &&
          p->alpha <= s.alpha_zero_lift + 6.0 + 1e-9) {
        al.push_back(p->alpha);
        cl.push_back(p->cl);
        cm.push_back(p->cm);
      }
    }
    double dcm_dcl = 0.0;
    if (least_squares_slope(al, cl, s.lift_slope_per_deg) && least_squares_slope(cl, cm, dcm_dcl)) {
      s.has_linear_range = true;
      s.x_ac = 0.25 - dcm_dcl;
    } else {
      add_note(s.note,
               "fewer than two converged points in the linear range (alpha_zero_lift -2 "
               "to +6 deg): no lift slope or aerodynamic centre");
    }
  } else {
    add_note(s.note,
             "cl does not change sign between converged points: no zero-lift angle, "
             "lift slope, cm_zero_lift or aerodynamic centre");
  }

  // Minimum drag.
  int m = 0;
  for (int i = 1; i < n; ++i)
    if (c[i]->cd < c[m]->cd) m = i;
  s.has_cd_min = true;
  s.cd_min = c[m]->cd;
  s.cl_at_cd_min = c[m]->cl;
  if (m > 0 && m < n - 1) {
    // Parabola through (cl, cd) of the three points (divided differences).
    const double x0 = c[m - 1]->cl, x1 = c[m]->cl, x2 = c[m + 1]->cl;
    const double y0 = c[m - 1]->cd, y1 = c[m]->cd, y2 = c[m + 1]->cd;
    if (x0 < x1 && x1 < x2) {
      const double d01 = (y1 - y0) / (x1 - x0), d12 = (y2 - y1) / (x2 - x1);
      const double a2 = (d12 - d01) / (x2 - x0);
      if (a2 > 0.0) {
        const double b1 = d01 - a2 * (x0 + x1);  // y = a2 x^2 + b1 x + c0
        const double xv = -b1 / (2.0 * a2);
        if (xv > x0 && xv < x2) {
          const double yv = y1 + d01 * (xv - x1) + a2 * (xv - x0) * (xv - x1);
          if (std::isfinite(yv) && yv > 0.0 && yv <= y1) {
            s.cd_min = yv;
            s.cl_at_cd_min = xv;
          }
        }
      }
    }
  } else {
    add_note(s.note, "lowest cd at the end of the converged range (alpha " + fmt(c[m]->alpha) +
                         "): cd_min may lie outside it");
  }

  // Low-drag range.
  const double limit = (1.0 + kBucketDragRise) * s.cd_min;
  int lo = m, hi = m;
  while (lo > 0 && c[lo - 1]->cd <= limit) --lo;
  while (hi < n - 1 && c[hi + 1]->cd <= limit) ++hi;
  if (lo > 0 && hi < n - 1) {
    auto edge = [&](const ViscousResult& out, const ViscousResult& in) {
      const double t = (limit - in.cd) / (out.cd - in.cd);
      return in.cl + t * (out.cl - in.cl);
    };
    s.has_bucket = true;
    s.bucket_cl_lower = edge(*c[lo - 1], *c[lo]);
    s.bucket_cl_upper = edge(*c[hi + 1], *c[hi]);
  } else {
    add_note(s.note,
             "cd does not rise 10 % above cd_min on both sides inside the converged "
             "range: no low-drag range");
  }
  return s;
}

int refine_cl_max(const std::vector<ViscousResult>& known, const PointSolver& solve,
                  PolarSummary& summary) {
  if (!summary.has_cl_max || !summary.cl_max_bracketed) return 0;
  struct Sample {
    double alpha, cl;
    const ViscousState* state;
  };
  std::vector<Sample> samples;
  std::vector<ViscousResult> made;  // results of this refinement (their states warm-start)
  made.reserve(64);
  for (const ViscousResult& r : known)
    if (r.converged) samples.push_back({r.alpha, r.cl, &r.state});
  std::sort(samples.begin(), samples.end(), [](auto& a, auto& b) { return a.alpha < b.alpha; });
  int k = -1;
  for (int i = 0; i < static_cast<int>(samples.size()); ++i)
    if (k < 0 || samples[i].cl > samples[k].cl) k = i;
  if (k <= 0 || k + 1 >= static_cast<int>(samples.size())) return 0;

  int solves = 0;
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
    if (r.converged && near && r.cl > parabola(alpha) + kLiftJumpCheck) {
      ViscousResult anchor;
      anchor.converged = true;
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
    if (!r.converged) return -std::numeric_limits<double>::infinity();
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
  int failures = (f1 == -INFINITY) + (f2 == -INFINITY);
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
  summary.cl_max = best_cl;
  summary.alpha_cl_max = best_alpha;
  std::string text = "refined by golden-section search to a " + fmt(b - a, 2) + " deg bracket (" +
                     std::to_string(solves) + " solves";
  if (failures > 0) text += ", " + std::to_string(failures) + " of them not converged";
  add_note(summary.note, text + ")");
  return solves;
}

double lift_jump(const LiftPoint& before, const ViscousResult& anchor, const ViscousResult& r) {
  if (!before.valid || !r.converged || before.alpha == anchor.alpha) return 0.0;
  const double slope = (anchor.cl - before.cl) / (anchor.alpha - before.alpha);
  return r.cl - (anchor.cl + slope * (r.alpha - anchor.alpha));
}

ViscousResult sub_step_march(const PointSolver& solve, double target, ViscousResult& anchor,
                             LiftPoint& before, std::vector<ViscousResult>* sub_steps) {
  const double dir = target > anchor.alpha ? 1.0 : -1.0;
  ViscousResult cur = anchor;
  LiftPoint prior = before;
  double h = 0.5 * (target - anchor.alpha);
  ViscousResult t;
  t.reason = "sub-steps from " + fmt(anchor.alpha) + " deg did not reach " + fmt(target) + " deg";
  while (std::abs(h) >= kMinSubStep * (1.0 - 1e-9)) {
    double a = cur.alpha + h;
    if ((target - a) * dir < 1e-9) a = target;
    ViscousResult u = solve(a, &cur.state);
    u.alpha = a;
    const bool smallest = std::abs(0.5 * h) < kMinSubStep * (1.0 - 1e-9);
    if (!u.converged || (!smallest && std::abs(lift_jump(prior, cur, u)) > kLiftJumpCheck)) {
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
  if (!t.converged) t.alpha = target;
  return t;
}

Polar sweep_polar(const PointSolver& solve, double alpha_start_deg, const PolarOptions& options) {
  const std::vector<double> grid = options.angles();
  const int n = static_cast<int>(grid.size());
  Polar polar;
  polar.points.resize(static_cast<std::size_t>(n));
  std::vector<ViscousResult> sub_steps;  // converged off-grid results (sub-steps)

  int start = 0;
  for (int i = 1; i < n; ++i)
    if (std::abs(grid[i] - alpha_start_deg) < std::abs(grid[start] - alpha_start_deg)) start = i;

  auto call = [&](double alpha, const ViscousState* warm) {
    ++polar.solves;
    return solve(alpha, warm);
  };
  // The result at `target` from the last converged result `anchor` (null: none; `before`: the
  // converged angle before it in the march): warm; when that fails or jumps (lift_jump), and with
  // `sub_step`, the sub-step march; then the jumped warm result if it converged; then cold.
  auto advance = [&](ViscousResult* anchor, LiftPoint* before, double target, bool sub_step) {
    if (!anchor) return call(target, nullptr);
    ViscousResult r = call(target, &anchor->state);
    r.alpha = target;
    if (r.converged && std::abs(lift_jump(*before, *anchor, r)) <= kLiftJumpCheck) return r;
    if (sub_step) {
      ViscousResult t = sub_step_march(call, target, *anchor, *before, &sub_steps);
      if (t.converged) return t;
    }
    if (r.converged) return r;
    ViscousResult cold = call(target, nullptr);
    if (cold.converged) return cold;
    r.reason += sub_step ? "; sub-steps down to " + fmt(kMinSubStep, 2) +
                               " deg from the last converged angle and a cold start also failed"
                         : "; cold start also failed";
    return r;
  };

  // Lead-in: when the grid does not reach the zero-lift angle, march to its nearest end from
  // there (steps of at most alpha_step and 1 deg), since a cold start at high lift fails more
  // often. The lead-in solutions only warm-start the first grid angle.
  ViscousResult lead;
  bool have_lead = false;
  const double a0 = std::clamp(alpha_start_deg, -60.0, 60.0);
  bool lead_previous = false;
  LiftPoint lead_before;
  if (std::abs(grid[start] - a0) > options.alpha_step + 1e-9) {
    lead = call(a0, nullptr);
    have_lead = lead_previous = lead.converged;
    const double h = std::min(options.alpha_step, 1.0) * (grid[start] > a0 ? 1.0 : -1.0);
    for (double a = a0 + h; std::abs(grid[start] - a) > 1e-9 && (grid[start] - a) * h > 0; a += h) {
      ViscousResult r = advance(have_lead ? &lead : nullptr, &lead_before, a, lead_previous);
      lead_previous = r.converged;
      if (r.converged) {
        if (have_lead) lead_before = {lead.alpha, lead.cl, true};
        lead = std::move(r);
        have_lead = true;
      }
    }
  }
  polar.points[start] =
      advance(have_lead ? &lead : nullptr, &lead_before, grid[start], lead_previous);
  polar.points[start].alpha = grid[start];

  for (int dir : {+1, -1}) {
    // The last converged result of this march (its state warm-starts the next angle).
    ViscousResult anchor;
    bool have_anchor = polar.points[start].converged || have_lead;
    anchor = polar.points[start].converged ? polar.points[start] : lead;
    bool previous_converged = polar.points[start].converged;
    LiftPoint before;  // the converged angle before the anchor in this march
    for (int i = start + dir; i >= 0 && i < n; i += dir) {
      ViscousResult r =
          advance(have_anchor ? &anchor : nullptr, &before, grid[i], previous_converged);
      r.alpha = grid[i];
      previous_converged = r.converged;
      if (r.converged) {
        if (have_anchor) before = {anchor.alpha, anchor.cl, true};
        anchor = r;
        have_anchor = true;
      }
      polar.points[i] = std::move(r);
    }
  }

  // Back-fill: a failed angle next to a converged one is tried warm-started from that neighbour
  // (the far side first: the march reached the angle from one side only, and hysteresis and
  // the transition point's jumps make the sides differ). Each (angle, neighbour) pair once;
  // passes repeat while an angle converges, since it may open the way to the next.
  std::vector<std::array<bool, 2>> tried(static_cast<std::size_t>(n), {false, false});
  for (bool changed = true; changed;) {
    changed = false;
    for (int i = 0; i < n; ++i) {
      if (polar.points[i].converged) continue;
      const int far = i > start ? 1 : 0;  // index into {i - 1, i + 1}
      for (int side : {far, 1 - far}) {
        const int nb = side == 0 ? i - 1 : i + 1;
        if (nb < 0 || nb >= n || tried[i][side] || !polar.points[nb].converged) continue;
        tried[i][side] = true;
        ViscousResult r = call(grid[i], &polar.points[nb].state);
        if (r.converged) {
          r.alpha = grid[i];
          polar.points[i] = std::move(r);
          changed = true;
          break;
        }
      }
    }
  }

  polar.summary = summarize_polar(polar.points, &sub_steps);
  PolarSummary& s = polar.summary;
  if (options.refine_cl_max && s.cl_max_bracketed) {
    std::vector<ViscousResult> known;
    for (const ViscousResult& p : polar.points)
      if (p.converged && std::abs(p.alpha - s.alpha_cl_max) <= 2.0 * options.alpha_step + 1e-9)
        known.push_back(p);
    for (const ViscousResult& t : sub_steps)
      if (std::abs(t.alpha - s.alpha_cl_max) <= 2.0 * options.alpha_step + 1e-9 &&
          t.alpha >= grid.front() && t.alpha <= grid.back())
        known.push_back(t);
    polar.solves += refine_cl_max(known, solve, s);
  }
  return polar;
}

Polar sweep_polar(const ViscousSolver& solver, const PolarOptions& options) {
  options.Validate();
  InviscidResult zero;
  solver.inviscid().solve_for_cl(0.0, zero);
  const double start = zero.converged ? zero.alpha * 180.0 / std::numbers::pi : 0.0;
  // One Newton solve per call: the fallbacks are the sweep's own (solve_alpha's would nest).
  const PointSolver solve = [&solver](double alpha, const ViscousState* warm) {
    return solver.solve_from(alpha, warm);
  };
  return sweep_polar(solve, start, options);
}

}  // namespace fulmar::viscous
