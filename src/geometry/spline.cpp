#include "geometry/spline.h"

#include <algorithm>
#include <cmath>

#include "common/error.h"

namespace fulmar {

double SplinePoint::curvature() const {
  const double v2 = dx * dx + dy * dy;
  return (dx * ddy - dy * ddx) / (v2 * std::sqrt(v2));
}

void SectionSpline::fit(const Points& p) {
  const Eigen::Index n_in = p.rows();
  for (Eigen::Index i = 0; i < n_in; ++i) {
    if (!std::isfinite(p(i, 0)) || !std::isfinite(p(i, 1))) {
      throw InputError("section point " + std::to_string(i) + " is not a finite number");
    }
  }
  double total = 0;
  for (Eigen::Index i = 1; i < n_in; ++i) total += (p.row(i) - p.row(i - 1)).norm();
  const double repeat = 1e-12 * total;
  s_.clear();
  x_.clear();
  y_.clear();
  for (Eigen::Index i = 0; i < n_in; ++i) {
    if (!s_.empty()) {
      const double d = std::hypot(p(i, 0) - x_.back(), p(i, 1) - y_.back());
      if (d <= repeat) continue;
      s_.push_back(s_.back() + d);
    } else {
      s_.push_back(0.0);
    }
    x_.push_back(p(i, 0));
    y_.push_back(p(i, 1));
  }
  const int n = static_cast<int>(s_.size()) - 1;  // intervals
  if (n < 3) {
    throw InputError("a spline through a section needs at least 4 distinct points, found " +
                     std::to_string(n + 1));
  }
  mx_.assign(n + 1, 0.0);
  my_.assign(n + 1, 0.0);
  // Unknowns M_1..M_{n-1}; not-a-knot eliminates M_0 and M_n (third derivative continuous at the
  // second and the second-to-last knot).
  const int m = n - 1;
  work_a_.assign(m, 0.0);  // sub-diagonal
  work_b_.assign(m, 0.0);  // diagonal
  work_c_.assign(m, 0.0);  // super-diagonal
  std::vector<double>& a = work_a_;
  std::vector<double>& b = work_b_;
  std::vector<double>& c = work_c_;
  auto h = [&](int i) { return s_[i + 1] - s_[i]; };
  // Right-hand sides are kept in mx_/my_ (interior entries) until solved.
  for (int i = 1; i < n; ++i) {
    const double h0 = h(i - 1), h1 = h(i);
    a[i - 1] = h0;
    b[i - 1] = 2 * (h0 + h1);
    c[i - 1] = h1;
    mx_[i] = 6 * ((x_[i + 1] - x_[i]) / h1 - (x_[i] - x_[i - 1]) / h0);
    my_[i] = 6 * ((y_[i + 1] - y_[i]) / h1 - (y_[i] - y_[i - 1]) / h0);
  }
  const double h0 = h(0), h1 = h(1), hl = h(n - 1), hk = h(n - 2);
  // m >= 2 here (n >= 3), so the first and last rows are distinct.
  b[0] = 3 * h0 + 2 * h1 + h0 * h0 / h1;
  c[0] = h1 - h0 * h0 / h1;
  a[m - 1] = hk - hl * hl / hk;
  b[m - 1] = 2 * hk + 3 * hl + hl * hl / hk;
  // Thomas algorithm on both right-hand sides.
  for (int i = 1; i < m; ++i) {
    const double w = a[i] / b[i - 1];
    b[i] -= w * c[i - 1];
    mx_[i + 1] -= w * mx_[i];
    my_[i + 1] -= w * my_[i];
  }
  mx_[m] /= b[m - 1];
  my_[m] /= b[m - 1];
  for (int i = m - 2; i >= 0; --i) {
    mx_[i + 1] = (mx_[i + 1] - c[i] * mx_[i + 2]) / b[i];
    my_[i + 1] = (my_[i + 1] - c[i] * my_[i + 2]) / b[i];
  }
  mx_[0] = (1 + h0 / h1) * mx_[1] - h0 / h1 * mx_[2];
  my_[0] = (1 + h0 / h1) * my_[1] - h0 / h1 * my_[2];
  mx_[n] = (1 + hl / hk) * mx_[n - 1] - hl / hk * mx_[n - 2];
  my_[n] = (1 + hl / hk) * my_[n - 1] - hl / hk * my_[n - 2];
}

int SectionSpline::interval(double s) const {
  const int n = static_cast<int>(s_.size()) - 1;
  if (s <= s_[0]) return 0;
  if (s >= s_[n]) return n - 1;
  const auto it = std::upper_bound(s_.begin(), s_.end(), s);
  return std::clamp(static_cast<int>(it - s_.begin()) - 1, 0, n - 1);
}

SplinePoint SectionSpline::at(double s) const {
  s = std::clamp(s, s_.front(), s_.back());
  return at(s, interval(s));
}

SplinePoint SectionSpline::at(double s, int i) const {
  const double h = s_[i + 1] - s_[i];
  const double a = (s_[i + 1] - s) / h, b = (s - s_[i]) / h;
  SplinePoint r;
  const double h2 = h * h / 6;
  r.x = a * x_[i] + b * x_[i + 1] + ((a * a * a - a) * mx_[i] + (b * b * b - b) * mx_[i + 1]) * h2;
  r.y = a * y_[i] + b * y_[i + 1] + ((a * a * a - a) * my_[i] + (b * b * b - b) * my_[i + 1]) * h2;
  r.dx =
      (x_[i + 1] - x_[i]) / h + ((1 - 3 * a * a) * mx_[i] + (3 * b * b - 1) * mx_[i + 1]) * h / 6;
  r.dy =
      (y_[i + 1] - y_[i]) / h + ((1 - 3 * a * a) * my_[i] + (3 * b * b - 1) * my_[i + 1]) * h / 6;
  r.ddx = a * mx_[i] + b * mx_[i + 1];
  r.ddy = a * my_[i] + b * my_[i + 1];
  return r;
}

namespace {
// Maximises f over [lo, hi] given f'(s) and f''(s) through `eval`, starting at s0: safeguarded
// Newton on f' = 0, falling back to bisection of the bracket.
template <class Eval>
double maximise(double lo, double hi, double s0, Eval eval) {
  double s = s0;
  for (int it = 0; it < 60; ++it) {
    double d1, d2;
    eval(s, d1, d2);
    if (d1 > 0)
      lo = s;
    else
      hi = s;
    double next = (d2 < 0) ? s - d1 / d2 : 0.5 * (lo + hi);
    if (!(next > lo && next < hi)) next = 0.5 * (lo + hi);
    if (std::abs(next - s) <= 1e-15 * (1 + std::abs(s)) || hi - lo <= 1e-15 * (1 + std::abs(s))) {
      return next;
    }
    s = next;
  }
  return s;
}
}  // namespace

double SectionSpline::minimum_x() const {
  const int n = static_cast<int>(s_.size()) - 1;
  const int k = static_cast<int>(std::min_element(x_.begin(), x_.end()) - x_.begin());
  if (k == 0 || k == n) return s_[k];
  return maximise(s_[k - 1], s_[k + 1], s_[k], [&](double s, double& d1, double& d2) {
    const SplinePoint p = at(s);
    d1 = -p.dx;
    d2 = -p.ddx;
  });
}

double SectionSpline::farthest_from(double px, double py) const {
  const int n = static_cast<int>(s_.size()) - 1;
  int k = 0;
  double best = -1;
  for (int i = 0; i <= n; ++i) {
    const double d = std::hypot(x_[i] - px, y_[i] - py);
    if (d > best) best = d, k = i;
  }
  if (k == 0 || k == n) return s_[k];
  // f = |P - p|^2 / 2: f' = (P - p).P', f'' = |P'|^2 + (P - p).P''
  return maximise(s_[k - 1], s_[k + 1], s_[k], [&](double s, double& d1, double& d2) {
    const SplinePoint q = at(s);
    const double ex = q.x - px, ey = q.y - py;
    d1 = ex * q.dx + ey * q.dy;
    d2 = q.dx * q.dx + q.dy * q.dy + ex * q.ddx + ey * q.ddy;
  });
}

}  // namespace fulmar
