#include "geometry/cst_measures.h"

#include <algorithm>
#include <cmath>
#include <numbers>
#include <utility>

#include "geometry/metrics.h"

namespace fulmar {
namespace {

// Maximum of f over [0, 1]: a dense cosine-spaced scan, then golden-section refinement around the
// best sample, so the result moves smoothly with the shape (no jumps from sample to sample).
template <class F>
std::pair<double, double> maximum_of(F&& f) {
  constexpr int n = 240;
  int best = 0;
  double best_v = -1e300;
  std::vector<double> xs(n + 1);
  for (int i = 0; i <= n; ++i) {
    xs[i] = 0.5 * (1 - std::cos(std::numbers::pi * i / n));
    const double v = f(xs[i]);
    if (v > best_v) best_v = v, best = i;
  }
  double a = xs[std::max(0, best - 1)], b = xs[std::min(n, best + 1)];
  const double g = (std::sqrt(5.0) - 1) / 2;
  double c = b - g * (b - a), d = a + g * (b - a);
  double fc = f(c), fd = f(d);
  for (int it = 0; it < 60 && b - a > 1e-12; ++it) {
    if (fc > fd) {
      b = d, d = c, fd = fc, c = b - g * (b - a), fc = f(c);
    } else {
      a = c, c = d, fc = fd, d = a + g * (b - a), fd = f(d);
    }
  }
  const double x = 0.5 * (a + b);
  const double v = f(x);
  return v >= best_v ? std::make_pair(x, v) : std::make_pair(xs[best], best_v);
}

// See CstMeasures::excess_reversal_*. y'' by central differences of the analytic surface on
// x in [0.03, 0.97] (the nose's sqrt singularity and the trailing-edge closure excluded).
double excess_reversal(const CstShape& s, Surface surface, int allowed) {
  constexpr int n = 160;
  constexpr double h = 1e-4;
  std::vector<std::pair<int, double>> runs;  // sign, peak |y''|
  for (int i = 0; i <= n; ++i) {
    const double x = 0.03 + 0.94 * i / n;
    const double d2 =
        (cst_y(s, surface, x + h) - 2 * cst_y(s, surface, x) + cst_y(s, surface, x - h)) / (h * h);
    const int sign = d2 > 0 ? 1 : (d2 < 0 ? -1 : 0);
    if (sign == 0) continue;
    if (runs.empty() || runs.back().first != sign) runs.push_back({sign, 0.0});
    runs.back().second = std::max(runs.back().second, std::abs(d2));
  }
  std::vector<double> strengths;
  for (size_t j = 0; j + 1 < runs.size(); ++j)
    strengths.push_back(std::min(runs[j].second, runs[j + 1].second));
  std::sort(strengths.rbegin(), strengths.rend());
  return size_t(allowed) < strengths.size() ? strengths[size_t(allowed)] : 0.0;
}

}  // namespace

double cst_thickness_at(const CstShape& shape, double x) {
  return cst_upper_y(shape, x) - cst_lower_y(shape, x);
}

CstMeasures measure_cst(const CstShape& s, const std::vector<double>& spar_x, int allowed_upper,
                        int allowed_lower) {
  CstMeasures g;
  auto [tx, t] = maximum_of([&](double x) { return cst_thickness_at(s, x); });
  g.thickness = t, g.thickness_x = tx;
  auto camber = [&](double x) { return 0.5 * (cst_upper_y(s, x) + cst_lower_y(s, x)); };
  auto [cxp, cp] = maximum_of(camber);
  auto [cxn, cn] = maximum_of([&](double x) { return -camber(x); });
  if (cp >= cn)
    g.camber = cp, g.camber_x = cxp;
  else
    g.camber = -cn, g.camber_x = cxn;
  for (double x : spar_x) g.spar_thickness.push_back(cst_thickness_at(s, x));
  g.te_gap = s.te_upper - s.te_lower;
  // dy/dx at x = 1: C'(1) = -1 and C(1) = 0, so y' = -a_n + y_te on each surface.
  const double slope_u = -s.upper[s.upper.size() - 1] + s.te_upper;
  const double slope_l = -s.lower[s.lower.size() - 1] + s.te_lower;
  g.te_angle_deg = (std::atan(slope_l) - std::atan(slope_u)) * 180 / std::numbers::pi;
  // Nose radius of a CST surface with class exponent 0.5: r = a_0^2 / 2 (Kulfan 2008).
  g.le_radius = 0.5 * std::min(s.upper[0] * s.upper[0], s.lower[0] * s.lower[0]);
  // Area by the trapezoidal rule in theta, x = (1 - cos theta)/2: the sqrt(x) nose becomes smooth.
  constexpr int n = 400;
  double area = 0;
  for (int i = 0; i <= n; ++i) {
    const double th = std::numbers::pi * i / n;
    const double x = 0.5 * (1 - std::cos(th));
    const double w = (i == 0 || i == n) ? 0.5 : 1.0;
    area += w * cst_thickness_at(s, x) * 0.5 * std::sin(th);
  }
  g.area = area * std::numbers::pi / n;
  double gap = 1e300;
  for (int i = 0; i <= 200; ++i) {
    const double x = 0.5 * (1 - std::cos(std::numbers::pi * i / 200));
    gap = std::min(
        gap, cst_shape_function(s, Surface::kUpper, x) - cst_shape_function(s, Surface::kLower, x));
  }
  g.min_shape_gap = gap;
  const CurvatureReversals rev = curvature_reversals(cst_section(s, 161, "design"));
  g.reversals_upper = rev.upper;
  g.reversals_lower = rev.lower;
  g.excess_reversal_upper = excess_reversal(s, Surface::kUpper, allowed_upper);
  g.excess_reversal_lower = excess_reversal(s, Surface::kLower, allowed_lower);
  return g;
}

}  // namespace fulmar
