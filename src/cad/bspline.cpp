#include "cad/bspline.h"

#include <algorithm>
#include <stdexcept>
#include <string>
#include <vector>

namespace fulmar::cad {

void BSplineCurve::check() const {
  const int n = control_count();
  if (degree < 1) throw std::invalid_argument("B-spline degree must be >= 1");
  if (n < degree + 1)
    throw std::invalid_argument("B-spline needs at least degree+1 control points");
  if (knots.size() != n + degree + 1) {
    throw std::invalid_argument(
        "B-spline knot count " + std::to_string(knots.size()) +
        " != control points + degree + 1 = " + std::to_string(n + degree + 1));
  }
  for (Eigen::Index i = 1; i < knots.size(); ++i) {
    if (knots(i) < knots(i - 1)) throw std::invalid_argument("B-spline knots decrease");
  }
  if (!(last_parameter() > first_parameter())) throw std::invalid_argument("empty B-spline domain");
}

int knot_span(const Eigen::VectorXd& knots, int degree, int control_count, double u) {
  const int n = control_count;
  const double lo = knots(degree);
  const double hi = knots(n);
  u = std::clamp(u, lo, hi);
  if (u >= hi) {
    int s = n - 1;
    while (s > degree && knots(s) >= knots(s + 1)) --s;
    return s;
  }
  // Binary search in [degree, n): the last s with knots(s) <= u.
  int low = degree;
  int high = n;
  while (high - low > 1) {
    const int mid = (low + high) / 2;
    if (u < knots(mid)) {
      high = mid;
    } else {
      low = mid;
    }
  }
  return low;
}

void basis_functions(const Eigen::VectorXd& knots, int degree, int span, double u, double* values) {
  // Cox-de Boor recurrence in the triangular form that never divides by an empty span.
  constexpr int kMaxDegree = 15;
  double left[kMaxDegree + 1];
  double right[kMaxDegree + 1];
  values[0] = 1.0;
  for (int j = 1; j <= degree; ++j) {
    left[j] = u - knots(span + 1 - j);
    right[j] = knots(span + j) - u;
    double saved = 0.0;
    for (int r = 0; r < j; ++r) {
      const double temp = values[r] / (right[r + 1] + left[j - r]);
      values[r] = saved + right[r + 1] * temp;
      saved = left[j - r] * temp;
    }
    values[j] = saved;
  }
}

Eigen::VectorXd point_at(const BSplineCurve& curve, double u) {
  const int p = curve.degree;
  const int n = curve.control_count();
  const Eigen::VectorXd& t = curve.knots;
  u = std::clamp(u, curve.first_parameter(), curve.last_parameter());
  const int s = knot_span(t, p, n, u);
  // d_j = P_{s-p+j}; then p rounds of convex combinations (de Boor 1978, ch. IX).
  Eigen::MatrixXd d = curve.control.middleRows(s - p, p + 1);
  for (int r = 1; r <= p; ++r) {
    for (int j = p; j >= r; --j) {
      const int i = s - p + j;
      const double denom = t(i + p + 1 - r) - t(i);
      const double alpha = denom > 0.0 ? (u - t(i)) / denom : 0.0;
      d.row(j) = (1.0 - alpha) * d.row(j - 1) + alpha * d.row(j);
    }
  }
  return d.row(p).transpose();
}

BSplineCurve derivative(const BSplineCurve& curve) {
  const int p = curve.degree;
  const int n = curve.control_count();
  if (p < 1) throw std::invalid_argument("derivative of a degree-0 B-spline");
  BSplineCurve d;
  d.degree = p - 1;
  d.knots = curve.knots.segment(1, curve.knots.size() - 2);
  d.control.resize(n - 1, curve.control.cols());
  for (int i = 0; i + 1 < n; ++i) {
    const double span = curve.knots(i + p + 1) - curve.knots(i + 1);
    if (span > 0.0) {
      d.control.row(i) = p * (curve.control.row(i + 1) - curve.control.row(i)) / span;
    } else {
      d.control.row(i).setZero();
    }
  }
  return d;
}

Eigen::MatrixXd sample_uniform(const BSplineCurve& curve, int count) {
  Eigen::MatrixXd out(count, curve.control.cols());
  const double a = curve.first_parameter();
  const double b = curve.last_parameter();
  for (int k = 0; k < count; ++k) {
    const double u = count > 1 ? a + (b - a) * k / (count - 1) : a;
    out.row(k) = point_at(curve, u).transpose();
  }
  return out;
}

}  // namespace fulmar::cad
