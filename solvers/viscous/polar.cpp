#include "solvers/viscous/polar.h"

#include <algorithm>
#include <array>
#include <cmath>
#include <limits>
#include <numbers>

#include "common/error.h"
#include "common/number_text.h"
#include "common/rule_check.h"

namespace fulmar::viscous {
namespace {

void require(bool ok, const char* field, double value, const std::string& rule) {
  require_rule(ok, std::string("polar options: ") + field, value, rule);
}

void add_note(std::string& note, const std::string& text) {
  if (!note.empty()) note += "; ";
  note += text;
}

// Converged points sorted by alpha.
std::vector<const ViscousResult*> converged_by_alpha(const std::vector<ViscousResult>& points) {
  std::vector<const ViscousResult*> c;
  for (const ViscousResult& p : points)
    if (p.converged()) c.push_back(&p);
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
          "must not be below alpha_from = " + general_text(alpha_from, 4));
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
      if (e.converged() && e.alpha >= c.front()->alpha - 1e-9 && e.alpha <= last_alpha_any + 1e-9)
        lift.push_back(&e);
    std::stable_sort(lift.begin(), lift.end(),
                     [](auto* a, auto* b) { return a->alpha < b->alpha; });
  }
  // The stall ends the search: later points are post-stall (stall_index).
  int nl = static_cast<int>(lift.size());
  {
    std::vector<double> cl(lift.size());
    for (std::size_t i = 0; i < lift.size(); ++i) cl[i] = lift[i]->cl;
    const int stall = stall_index(cl, kStallLiftDrop, 1);
    if (stall >= 0) {
      if (stall + 1 < nl)
        add_note(s.note, "stall: at alpha " + general_text(lift[stall]->alpha, 4) +
                             " cl is more than " + general_text(kStallLiftDrop, 4) +
                             " below its maximum; the points beyond are post-stall and not "
                             "searched for cl_max");
      nl = stall + 1;
    }
  }
  int k = 0;
  for (int i = 1; i < nl; ++i)
    if (lift[i]->cl > lift[k]->cl) k = i;
  s.cl_max = lift[k]->cl;
  s.alpha_cl_max = lift[k]->alpha;
  if (k == 0 && nl > 1) {
    add_note(s.note, "cl falls over the whole range: the maximum lies at or below alpha " +
                         general_text(lift[0]->alpha, 4));
  } else if (k < nl - 1) {
    s.has_cl_max = true;
    s.cl_max_bracketed = true;
    add_note(s.note, "cl_max bracketed: cl falls after alpha " + general_text(lift[k]->alpha, 4) +
                         " (at " + general_text(lift[k + 1]->alpha, 4) + ")");
  } else if (last_alpha_any > lift[k]->alpha) {
    s.has_cl_max = true;
    add_note(s.note, "cl_max at the last converged angle " + general_text(lift[k]->alpha, 4) +
                         ": beyond it the solutions did not converge (stall and solver failure "
                         "not told apart), so cl_max is a lower bound");
  } else {
    add_note(s.note, "cl still rises at the end of the range (alpha " +
                         general_text(lift[k]->alpha, 4) + "): no cl_max, extend the range");
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
      add_note(s.note, "zero-lift angle extrapolated from alpha " + general_text(a.alpha, 4) +
                           " and " + general_text(b.alpha, 4));
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
    add_note(s.note, "lowest cd at the end of the converged range (alpha " +
                         general_text(c[m]->alpha, 4) + "): cd_min may lie outside it");
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
  const LiftMaximum m = refine_lift_maximum(known, solve);
  if (!m.refined) return 0;
  summary.cl_max = m.cl_max;
  summary.alpha_cl_max = m.alpha;
  add_note(summary.note, m.note);
  return m.solves;
}

Polar sweep_polar(const PointSolver& solve, double alpha_start_deg, const PolarOptions& options) {
  const std::vector<double> grid = options.angles();
  ContinuationOptions co;  // the defaults are the polar's march
  co.alpha_from = options.alpha_from;
  co.alpha_to = options.alpha_to;
  co.alpha_step = options.alpha_step;
  co.lead_in_step = std::min(options.alpha_step, 1.0);
  Continuation c = march(solve, solve, alpha_start_deg, co);
  Polar polar;
  polar.points = std::move(c.points);
  polar.solves = c.solves;
  polar.summary = summarize_polar(polar.points, &c.sub_steps);
  PolarSummary& s = polar.summary;
  if (options.refine_cl_max && s.cl_max_bracketed) {
    std::vector<ViscousResult> known;
    for (const ViscousResult& p : polar.points)
      if (p.converged() && std::abs(p.alpha - s.alpha_cl_max) <= 2.0 * options.alpha_step + 1e-9)
        known.push_back(p);
    for (const ViscousResult& t : c.sub_steps)
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
