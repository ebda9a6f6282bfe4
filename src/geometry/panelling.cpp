#include "geometry/panelling.h"

#include <algorithm>
#include <cmath>
#include <vector>

#include "common/error.h"
#include "geometry/spline.h"

namespace fulmar {

void PanellingOptions::Validate() const {
  if (panels < 20 || panels > 4000) {
    throw InputError("panelling.panels = " + std::to_string(panels) + ": must be in [20, 4000]");
  }
  if (!(curvature_weight >= 0) || !std::isfinite(curvature_weight)) {
    throw InputError("panelling.curvature_weight = " + std::to_string(curvature_weight) +
                     ": must be finite and >= 0");
  }
  if (!(te_weight >= 0) || !std::isfinite(te_weight)) {
    throw InputError("panelling.te_weight = " + std::to_string(te_weight) +
                     ": must be finite and >= 0");
  }
  if (!(te_grading >= 0 && te_grading <= 0.5)) {
    throw InputError("panelling.te_grading = " + std::to_string(te_grading) +
                     ": must be in [0, 0.5]");
  }
  if (!(te_extent > 0) || !std::isfinite(te_extent)) {
    throw InputError("panelling.te_extent = " + std::to_string(te_extent) +
                     ": must be finite and > 0");
  }
}

namespace {

struct Workspace {
  SectionSpline spline;
  std::vector<double> s, w, cum;  // density samples: parameter, density, running integral
};

// Samples per side: enough that the trapezoidal integral of w resolves the nose for any input.
constexpr int kSamplesPerSide = 480;

// Samples w on [from, to] at the knots and `sub` points between consecutive knots, appending to
// the workspace; returns the integral of w.
void sample_side(Workspace& ws, double from, double to, const PanellingOptions& o, double chord) {
  const SectionSpline& sp = ws.spline;
  const int i0 = sp.interval(from), i1 = sp.interval(to);
  const int pieces = std::max(i1 - i0 + 1, 1);
  const int sub = std::max(2, kSamplesPerSide / pieces);
  const double total = sp.length();
  auto density = [&](double s, int interval) {
    const double kappa = std::abs(sp.at(s, interval).curvature());
    const double d_te = std::min(s, total - s);
    const double te_distance = d_te / (o.te_extent * chord);
    return std::sqrt(1.0 + o.curvature_weight * kappa * chord) +
           (te_distance < 40 ? o.te_weight * std::exp(-te_distance) : 0.0);
  };
  for (int i = i0; i <= i1; ++i) {
    const double a = std::max(sp.knot(i), from), b = std::min(sp.knot(i + 1), to);
    if (!(b > a)) continue;
    for (int k = 0; k < sub; ++k) {
      if (!ws.s.empty() && k == 0 && a <= ws.s.back()) continue;
      const double s = a + (b - a) * k / sub;
      ws.s.push_back(s);
      ws.w.push_back(density(s, i));
    }
  }
  ws.s.push_back(to);
  ws.w.push_back(density(to, i1));
}

// Fraction G(t) of a surface's density integral at which its node t = k / n sits, t = 0 at the
// trailing edge (PanellingOptions::te_grading): G' proportional to min(sqrt(t^2 + e^2), c),
// e = kGradingStart / n, integrated in closed form. Off (G(t) = t) when c <= e, i.e. when the
// graded zone would hold fewer than kGradingStart panels.
constexpr double kGradingStart = 4.0;

class Grading {
 public:
  Grading(double c, int n) : c_(c), e_(kGradingStart / n) {
    on_ = c_ > e_;
    if (!on_) return;
    t_star_ = std::sqrt(c_ * c_ - e_ * e_);  // where sqrt(t^2 + e^2) reaches c
    total_ = raw(1.0);
  }
  double operator()(double t) const { return on_ ? raw(t) / total_ : t; }

 private:
  // Integral from 0 to t of min(sqrt(u^2 + e^2), c).
  double raw(double t) const {
    auto f = [&](double u) { return 0.5 * (u * std::hypot(u, e_) + e_ * e_ * std::asinh(u / e_)); };
    return t <= t_star_ ? f(t) : f(t_star_) + c_ * (t - t_star_);
  }
  double c_, e_, t_star_ = 0, total_ = 1;
  bool on_ = false;
};

}  // namespace

void panel_nodes(const Section& section, const PanellingOptions& o, Points& nodes) {
  o.Validate();
  thread_local Workspace ws;
  SectionSpline& sp = ws.spline;
  sp.fit(section.points);
  const double s_le = sp.minimum_x();
  const double total = sp.length();
  const int n_knots = sp.knot_count();
  const double te_x = 0.5 * (sp.knot_x(0) + sp.knot_x(n_knots - 1));
  const double te_y = 0.5 * (sp.knot_y(0) + sp.knot_y(n_knots - 1));
  const SplinePoint le = sp.at(s_le);
  const double chord = std::hypot(te_x - le.x, te_y - le.y);
  if (!(chord > 0) || !(s_le > 0) || !(s_le < total)) {
    throw InputError("panelling '" + section.name +
                     "': the leading edge is not between the "
                     "trailing-edge points");
  }

  ws.s.clear();
  ws.w.clear();
  sample_side(ws, 0.0, s_le, o, chord);
  const std::size_t le_sample = ws.s.size() - 1;
  sample_side(ws, s_le, total, o, chord);
  const std::size_t m = ws.s.size();
  ws.cum.resize(m);
  ws.cum[0] = 0;
  for (std::size_t i = 1; i < m; ++i) {
    ws.cum[i] = ws.cum[i - 1] + 0.5 * (ws.w[i] + ws.w[i - 1]) * (ws.s[i] - ws.s[i - 1]);
  }
  const double w_upper = ws.cum[le_sample], w_total = ws.cum[m - 1];
  const int n_upper =
      std::clamp(static_cast<int>(std::lround(o.panels * w_upper / w_total)), 2, o.panels - 2);
  const int n_lower = o.panels - n_upper;

  if (nodes.rows() != o.panels + 1) nodes.resize(o.panels + 1, 2);
  // Walk the running integral once, placing node k where it reaches its share; w is linear
  // between samples, so the running integral is quadratic there: solve for s exactly.
  std::size_t j = 1;
  int interval = 0;
  auto place = [&](int row, double target) {
    while (j + 1 < m && ws.cum[j] < target) ++j;
    const double c0 = ws.cum[j - 1], w0 = ws.w[j - 1], w1 = ws.w[j];
    const double h = ws.s[j] - ws.s[j - 1];
    const double slope = (w1 - w0) / h;  // dw/ds
    const double r = target - c0;        // integral still to go from s[j-1]
    double ds;
    if (std::abs(slope) * h < 1e-12 * w0)
      ds = r / w0;
    else
      ds = (std::sqrt(std::max(w0 * w0 + 2 * slope * r, 0.0)) - w0) / slope;
    const double s = std::clamp(ws.s[j - 1] + ds, ws.s[j - 1], ws.s[j]);
    while (interval + 2 < n_knots && sp.knot(interval + 1) <= s) ++interval;
    const SplinePoint p = sp.at(s, interval);
    nodes(row, 0) = p.x;
    nodes(row, 1) = p.y;
  };
  nodes.row(0) = section.points.row(0);
  const Grading g_upper(o.te_grading, n_upper), g_lower(o.te_grading, n_lower);
  // Without grading the original expressions, so that the default nodes stay bit-identical.
  const bool graded = o.te_grading > 0;
  for (int k = 1; k < n_upper; ++k) {
    place(k, graded ? w_upper * g_upper(static_cast<double>(k) / n_upper) : w_upper * k / n_upper);
  }
  nodes(n_upper, 0) = le.x;
  nodes(n_upper, 1) = le.y;
  j = std::max<std::size_t>(le_sample, 1);
  for (int k = 1; k < n_lower; ++k) {
    const double t = static_cast<double>(n_lower - k) / n_lower;  // 0 at the trailing edge
    place(n_upper + k, graded ? w_upper + (w_total - w_upper) * (1.0 - g_lower(t))
                              : w_upper + (w_total - w_upper) * k / n_lower);
  }
  nodes.row(o.panels) = section.points.row(section.points.rows() - 1);
}

Points panel_nodes(const Section& section, const PanellingOptions& options) {
  Points nodes;
  panel_nodes(section, options, nodes);
  return nodes;
}

}  // namespace fulmar
